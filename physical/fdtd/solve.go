package fdtd

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"time"
)

// Options steer a solve. The zero value is a coarse mesh, every core, a
// 50 dB decay target, a step limit of 200 000 and a 1 GiB memory limit.
type Options struct {
	Mesh MeshParams // zero value: Coarse.Params()
	// DecayDB is the drop in field energy below its peak at which a run
	// stops; 0 means 50.
	DecayDB float64
	// MaxSteps caps each run's time steps; 0 means 200 000. A run that hits
	// it has not converged.
	MaxSteps int
	// MemoryLimit refuses grids whose estimate exceeds it, bytes; 0 means
	// 1 GiB.
	MemoryLimit int64
	// Workers is the number of goroutines the update runs on; 0 means
	// GOMAXPROCS.
	Workers int
	// Progress, when set, is called now and then from the solving goroutine.
	Progress func(Progress)
}

// Progress reports how far a solve has come.
type Progress struct {
	Run, Runs       int // which run (1-based) of how many
	Step, MaxSteps  int
	EnergyDB        float64 // field energy relative to its peak, dB (≤ 0)
	TargetDB        float64 // the decay at which the run stops, dB (< 0)
	Elapsed         time.Duration
	CellsPerSecond  float64
	EstimatedRemain time.Duration // rough, from the decay rate so far; 0 when unknown
}

// Result holds the two-port S-parameters at the sweep frequencies and the
// run's figures.
type Result struct {
	Freqs []float64
	// S[f] is the 2×2 matrix at Freqs[f]: S[f][0][1] is S12.
	S [][2][2]complex128
	// Z0 and EpsEff are each port line's characteristic impedance (ohm) and
	// effective permittivity (from γ) as measured in the run, per frequency.
	Z0, EpsEff [2][]complex128
	Zref       float64
	Cells      int // cells of the board's grid
	Steps      int // time steps summed over every run, the port-line calibrations included
	// CellUpdates is cells × steps summed over every run (a calibration
	// runs on its own, smaller grid).
	CellUpdates int64
	Seconds     float64
	Dt          float64 // time step, s
	Grid        *Grid
	Warnings    []string
}

// ErrNotConverged is returned when a run reached its step limit before the
// field energy decayed to the target; the S-parameters are then not a
// result.
var ErrNotConverged = errors.New("fdtd: run did not converge")

// ErrUnstable is returned when a run's fields grew without bound (their
// energy no longer finite): the update was numerically unstable, and the
// S-parameters are not a result.
var ErrUnstable = errors.New("fdtd: fields grew without bound")

// MemoryError says that a grid would need more memory than allowed.
type MemoryError struct {
	Cells int
	Bytes int64
	Limit int64
}

func (e *MemoryError) Error() string {
	return fmt.Sprintf("fdtd: the grid needs %d cells and about %.0f MiB, above the limit of %.0f MiB; a coarser mesh (coarse) or a narrower sweep (lower highest frequency) lowers it",
		e.Cells, float64(e.Bytes)/(1<<20), float64(e.Limit)/(1<<20))
}

// EstimateBytes returns the memory a run on g needs: six float32 fields,
// the CPML's auxiliary fields and the coefficient arrays.
func EstimateBytes(g *Grid) int64 {
	nx, ny, nz := int64(len(g.X)), int64(len(g.Y)), int64(len(g.Z))
	b := 6 * 4 * nx * ny * nz
	n := int64(g.NPML) + 1
	b += 4 * 4 * (2*n*ny*nz + 2*n*nx*nz + n*nx*ny)
	return b + 64*(nx+ny+nz) + 1<<20
}

func (o Options) withDefaults() Options {
	if o.Mesh.SubstrateCells == 0 {
		o.Mesh = Coarse.Params()
	}
	if o.DecayDB == 0 {
		o.DecayDB = 50
	}
	if o.MaxSteps == 0 {
		o.MaxSteps = 200000
	}
	if o.MemoryLimit == 0 {
		o.MemoryLimit = 1 << 30
	}
	return o
}

// probeSet is one port's recorded spectra from one run: the strip voltage
// at the two lines of the front and back probe pairs, and the +x strip
// current between each pair's lines.
type probeSet struct {
	vf1, vf2, ifr, vb1, vb2, ib []complex128
	xf1, xf2, xb1, xb2          float64 // x of the lines, m
}

// Solve runs the two excitations of s and returns its S-parameters. It
// returns ErrNotConverged (wrapped) when a run hits the step limit,
// ErrUnstable (wrapped) when a run's fields grow without bound, a
// *MemoryError when the grid is too big, and ctx's error when cancelled.
func Solve(ctx context.Context, s Structure, o Options) (*Result, error) {
	o = o.withDefaults()
	g, err := NewGrid(s, o.Mesh)
	if err != nil {
		return nil, err
	}
	if need := EstimateBytes(g); need > o.MemoryLimit {
		return nil, &MemoryError{Cells: g.Cells(), Bytes: need, Limit: o.MemoryLimit}
	}
	res := &Result{Freqs: append([]float64(nil), s.Freqs...), Zref: s.Zref, Cells: g.Cells(), Grid: g,
		Warnings: append([]string(nil), g.notes...)}
	if res.Zref == 0 {
		res.Zref = 50
	}
	start := time.Now()
	runs := 3
	if p0, p1 := s.Ports[0], s.Ports[1]; p0.Width != p1.Width || p0.Gap != p1.Gap || p0.GroundWidth != p1.GroundWidth {
		runs = 4
	}
	var lines [2]lineData
	for q := 0; q < 2; q++ {
		if q == 1 && runs == 3 {
			lines[1] = lines[0]
			break
		}
		var ys []float64
		if o.Mesh.PortLinesOnBoardGrid {
			dy := float64(s.Ports[q].Y) * 1e-9
			for _, y := range g.Y {
				ys = append(ys, y-dy)
			}
		}
		ld, steps, cells, err := calibrateOn(ctx, s, s.Ports[q].Width, g.EdgeCell, ys, o, q, runs, start)
		res.Steps += steps
		res.CellUpdates += int64(steps) * int64(cells)
		if err != nil {
			return nil, err
		}
		lines[q] = ld
	}
	var rec [2][2]probeSet // rec[run][port]
	for run := 0; run < 2; run++ {
		r, steps, err := runOnce(ctx, g, s, o, run, runs-2+run, runs, start)
		res.Steps += steps
		res.CellUpdates += int64(steps) * int64(g.Cells())
		if err != nil {
			return nil, err
		}
		rec[run] = r
	}
	res.Dt = timeStep(g)
	res.Seconds = time.Since(start).Seconds()
	extract(res, g, rec, lines)
	return res, nil
}

// lineData is a port line's propagation constant (1/m) and characteristic
// impedance (ohm) at the sweep frequencies.
type lineData struct{ gamma, z0 []complex128 }

// calibrateOn simulates a short straight line of the port's width on the same
// substrate and mesh density and measures its γ and Z0 between the two
// front probe pairs: for a uniform line between planes 1 and 2 carrying
// any mix of waves, cosh(γL) = (V1·I1 + V2·I2)/(V1·I2 + V2·I1) (from the
// line's ABCD matrix with A = D and AD − BC = 1), and Z0 is V/I averaged
// over both planes (the line is matched at both ends, so one wave
// dominates).
// It returns the line data, the run's steps and its grid's cells. The
// line is meshed on the y grid lines ys (the line centred on y = 0,
// absorbing layers included) when ys is not nil, else on its own.
func calibrateOn(ctx context.Context, s Structure, width int64, edge float64, ys []float64, o Options, q, runs int, start time.Time) (lineData, int, int, error) {
	// The two planes are about 0.35 of the shortest guided wavelength apart
	// (taken with εr, so shorter than the truth): long enough that the
	// near fields of the source leave cosh(γL) alone, short enough that γL
	// stays below π at the highest frequency, where acosh loses its footing.
	h := s.H
	hw := math.Max(h, float64(width)*1e-9)
	fmax := s.Freqs[len(s.Freqs)-1]
	span := 0.35 * c0 / (fmax * math.Sqrt(s.Er))
	L := int64(math.Round(math.Max(span-4*hw, 2*hw) * 1e9))
	c := Structure{Er: s.Er, TanD: s.TanD, F0: s.F0, H: s.H, Mask: s.Mask, CopperThickness: s.CopperThickness, BoardMinX: 0, BoardMaxX: L, Freqs: s.Freqs,
		Copper: []Polygon{RectPolygon(0, -width/2, L, width-width/2)},
		Ports:  [2]Port{{Side: Left, Y: 0, Width: width}, {Side: Right, Y: 0, Width: width}}}
	if p := s.Ports[q]; p.Gap > 0 {
		// A coplanar port line: its side grounds and their walls run the
		// calibration line's whole length.
		for i := range c.Ports {
			c.Ports[i].Gap, c.Ports[i].GroundWidth = p.Gap, p.GroundWidth
		}
		lo, hi, wy := c.Ports[0].sideGrounds()
		for k := range lo {
			c.Copper = append(c.Copper, RectPolygon(0, int64(math.Round(lo[k]*1e9)), L, int64(math.Round(hi[k]*1e9))))
			c.walls = append(c.walls, wall{y: wy[k], x0: 0, x1: float64(L) * 1e-9})
		}
	}
	g, err := newGrid(c, o.Mesh, edge, ys)
	if err != nil {
		return lineData{}, 0, 0, err
	}
	rec, steps, err := runOnce(ctx, g, c, o, 0, q, runs, start)
	if err != nil {
		return lineData{}, steps, g.Cells(), err
	}
	nf := len(s.Freqs)
	ld := lineData{gamma: make([]complex128, nf), z0: make([]complex128, nf)}
	r1, r2 := rec[0], rec[1]
	x1, x2 := (r1.xf1+r1.xf2)/2, (r2.xf1+r2.xf2)/2
	span = x2 - x1
	for f := range s.Freqs {
		// Rough γ from the back pair of the driven port (one outgoing wave)
		// to choose the branch of acosh.
		db := math.Abs(r1.xb2 - r1.xb1)
		rough := cmplx.Log(r1.vb1[f]/r1.vb2[f]) / complex(db, 0)
		g := rough
		var z complex128
		for it := 0; it < 3; it++ {
			d1, d2 := math.Abs(r1.xf2-r1.xf1), math.Abs(r2.xf2-r2.xf1)
			v1 := (r1.vf1[f] + r1.vf2[f]) / (2 * cmplx.Cosh(g*complex(d1/2, 0)))
			v2 := (r2.vf1[f] + r2.vf2[f]) / (2 * cmplx.Cosh(g*complex(d2/2, 0)))
			i1, i2 := r1.ifr[f], r2.ifr[f]
			ch := (v1*i1 + v2*i2) / (v1*i2 + v2*i1)
			// cosh is even and periodic in j2π: of ±acosh + j2πn take the
			// one whose phase is nearest the rough estimate (a tiny negative
			// attenuation is measurement noise on a near-lossless line).
			x0 := cmplx.Acosh(ch)
			target := imag(rough) * span
			best := x0
			for _, cand := range []complex128{x0, -x0} {
				n := math.Round((target - imag(cand)) / (2 * math.Pi))
				c := cand + complex(0, 2*math.Pi*n)
				if math.Abs(imag(c)-target) < math.Abs(imag(best)-target) {
					best = c
				}
			}
			g = best / complex(span, 0)
			z = (v1/i1 + v2/i2) / 2
		}
		ld.gamma[f], ld.z0[f] = g, z
	}
	return ld, steps, g.Cells(), nil
}

// runOnce drives port p and records every port's probes.
func runOnce(ctx context.Context, g *Grid, s Structure, o Options, p, runIdx, runs int, start time.Time) ([2]probeSet, int, error) {
	m := newSim(g, s, o.Workers)
	defer m.close()
	nf := len(s.Freqs)
	var out [2]probeSet
	type probeIdx struct {
		jc, ja, jb                  int
		if1, if2, ib1, ib2, isrc    int
		srcCells                    []int
		vf1, vf2, vb1, vb2, ifr, ib []complex128
	}
	var pr [2]probeIdx
	for q, pp := range g.ports {
		x := probeIdx{jc: nearest(g.Y, pp.yc)}
		out := float64(pp.side)
		x.if1 = nearest(g.X, pp.front)
		x.if2 = x.if1 + int(pp.side)
		x.ib1 = nearest(g.X, pp.back)
		x.ib2 = x.ib1 + int(pp.side)
		_ = out
		x.isrc = nearest(g.X, pp.source)
		yl, yr := pp.yc-pp.w/2, pp.yc+pp.w/2
		x.ja = nearest(g.Y, yl)
		for x.ja > 0 && g.Y[x.ja] >= yl {
			x.ja--
		}
		x.ja--
		x.jb = nearest(g.Y, yr)
		for x.jb < len(g.Y)-1 && g.Y[x.jb] <= yr {
			x.jb++
		}
		for j := range g.Y {
			if g.Y[j] > yl && g.Y[j] < yr {
				for k := 0; k < g.KH; k++ {
					x.srcCells = append(x.srcCells, (x.isrc*m.ny+j)*m.nz+k)
				}
			}
		}
		if len(x.srcCells) == 0 {
			for k := 0; k < g.KH; k++ {
				x.srcCells = append(x.srcCells, (x.isrc*m.ny+x.jc)*m.nz+k)
			}
		}
		for _, a := range []*[]complex128{&x.vf1, &x.vf2, &x.vb1, &x.vb2, &x.ifr, &x.ib} {
			*a = make([]complex128, nf)
		}
		pr[q] = x
	}
	voltage := func(i, j int) float64 {
		v := 0.0
		for k := 0; k < g.KH; k++ {
			v -= float64(m.ez[(i*m.ny+j)*m.nz+k]) * (g.Z[k+1] - g.Z[k])
		}
		return v
	}
	// current returns the +x strip current on the loop at x index i+½.
	// The loop runs under the copper's bottom face (Hy at kh−1), over its
	// top face (Hy at kt) and up the sides (Hz from kh to kt).
	current := func(i, ja, jb int) float64 {
		kh, kt := g.KH, g.KT
		sum := 0.0
		for j := ja + 1; j <= jb; j++ {
			dyd := (g.Y[j+1] - g.Y[j-1]) / 2
			sum += float64(m.hy[(i*m.ny+j)*m.nz+kh-1]-m.hy[(i*m.ny+j)*m.nz+kt]) * dyd
		}
		for k := kh; k <= kt; k++ {
			dzd := (g.Z[k+1] - g.Z[k-1]) / 2
			sum += float64(m.hz[(i*m.ny+jb)*m.nz+k]-m.hz[(i*m.ny+ja)*m.nz+k]) * dzd
		}
		return sum
	}
	// Source: a sine-modulated Gaussian, zero mean, covering the sweep.
	fmin, fmax := s.Freqs[0], s.Freqs[nf-1]
	fc := (fmin + fmax) / 2
	bw := math.Max((fmax-fmin)/2, 0.5*fc) * 1.2
	tau := math.Sqrt(math.Ln10) / (math.Pi * bw)
	t0 := 4 * tau
	dt := m.dt
	// Phasors of e^{-jωt} at t = n·dt (E) and (n−½)·dt (H), advanced by rotation.
	rot := make([]complex128, nf)
	phE := make([]complex128, nf)
	phH := make([]complex128, nf)
	for f, fr := range s.Freqs {
		w := 2 * math.Pi * fr
		rot[f] = cmplx.Exp(complex(0, -w*dt))
		phE[f] = cmplx.Exp(complex(0, -w*dt)) // E after step 0 is at t = dt
		phH[f] = cmplx.Exp(complex(0, -w*dt/2))
	}
	peak := 0.0
	target := math.Pow(10, -o.DecayDB/10)
	const check = 50
	last := time.Now()
	energyDB := 0.0
	var firstDecay struct {
		step int
		db   float64
	}
	for n := 0; n < o.MaxSteps; n++ {
		m.parallel(m.nx, m.updateH)
		// H is now at (n+½)·dt.
		for q := range pr {
			x := &pr[q]
			cf := current(x.if1+minInt(0, int(g.ports[q].side)), x.ja, x.jb)
			cb := current(x.ib1+minInt(0, int(g.ports[q].side)), x.ja, x.jb)
			for f := range phH {
				x.ifr[f] += complex(cf, 0) * phH[f]
				x.ib[f] += complex(cb, 0) * phH[f]
			}
		}
		m.parallel(m.nx, m.updateE)
		t := float64(n+1) * dt
		u := (t - t0) / tau
		amp := float32(math.Exp(-u*u) * math.Sin(2*math.Pi*fc*(t-t0)))
		for _, c := range pr[p].srcCells {
			m.ez[c] += amp
		}
		for q := range pr {
			x := &pr[q]
			v1, v2 := voltage(x.if1, x.jc), voltage(x.if2, x.jc)
			b1, b2 := voltage(x.ib1, x.jc), voltage(x.ib2, x.jc)
			for f := range phE {
				ph := phE[f]
				x.vf1[f] += complex(v1, 0) * ph
				x.vf2[f] += complex(v2, 0) * ph
				x.vb1[f] += complex(b1, 0) * ph
				x.vb2[f] += complex(b2, 0) * ph
			}
		}
		for f := range phE {
			phE[f] *= rot[f]
			phH[f] *= rot[f]
		}
		if n%check == check-1 {
			for f := range phE { // keep the phasors on the unit circle
				phE[f] /= complex(cmplx.Abs(phE[f]), 0)
				phH[f] /= complex(cmplx.Abs(phH[f]), 0)
			}
			if err := ctx.Err(); err != nil {
				return out, n + 1, err
			}
			e := m.energy()
			if math.IsInf(e, 0) || math.IsNaN(e) {
				// An unstable run's energy overflows long before its fields
				// do: as the peak it would pass the decay test below.
				return out, n + 1, fmt.Errorf("%w: run %d of %d, step %d: the field energy is %v", ErrUnstable, runIdx+1, runs, n+1, e)
			}
			peak = math.Max(peak, e)
			if peak > 0 {
				energyDB = 10 * math.Log10(math.Max(e/peak, 1e-30))
			}
			if t > 2*t0 && e <= target*peak {
				for q := range pr {
					x := pr[q]
					out[q] = probeSet{x.vf1, x.vf2, x.ifr, x.vb1, x.vb2, x.ib, g.X[x.if1], g.X[x.if2], g.X[x.ib1], g.X[x.ib2]}
				}
				return out, n + 1, nil
			}
			if o.Progress != nil && time.Since(last) > 500*time.Millisecond {
				last = time.Now()
				el := time.Since(start)
				pg := Progress{Run: runIdx + 1, Runs: runs, Step: n + 1, MaxSteps: o.MaxSteps, EnergyDB: energyDB,
					TargetDB: -o.DecayDB, Elapsed: el}
				if t > 2*t0 {
					if firstDecay.step == 0 {
						firstDecay.step, firstDecay.db = n+1, energyDB
					} else if rate := (energyDB - firstDecay.db) / float64(n+1-firstDecay.step); rate < 0 {
						left := (-o.DecayDB - energyDB) / rate
						perStep := el.Seconds() / float64(n+1)
						pg.EstimatedRemain = time.Duration((left + float64(n+1)*float64(runs-1-runIdx)) * perStep * float64(time.Second))
					}
				}
				o.Progress(pg)
			}
		}
	}
	return out, o.MaxSteps, fmt.Errorf("%w: run %d of %d reached %d steps with the field energy at %.1f dB, short of −%.0f dB", ErrNotConverged, runIdx+1, runs, o.MaxSteps, energyDB, o.DecayDB)
}

func minInt(a, b int) int {
	if a < b {
		return a
	}
	return b
}

// extract turns the two runs' probe spectra into S-parameters.
func extract(res *Result, g *Grid, rec [2][2]probeSet, lines [2]lineData) {
	nf := len(res.Freqs)
	res.S = make([][2][2]complex128, nf)
	for q := range res.Z0 {
		res.Z0[q] = make([]complex128, nf)
		res.EpsEff[q] = make([]complex128, nf)
	}
	for f, fr := range res.Freqs {
		w := 2 * math.Pi * fr
		var gam, z0 [2]complex128
		for q := 0; q < 2; q++ {
			gam[q], z0[q] = lines[q].gamma[f], lines[q].z0[f]
			res.Z0[q][f] = z0[q]
			k := gam[q] * complex(c0/w, 0)
			res.EpsEff[q][f] = -k * k
		}
		var A, B [2][2]complex128
		for p := 0; p < 2; p++ { // run
			for q := 0; q < 2; q++ { // port
				r := rec[p][q]
				pp := g.ports[q]
				side := complex(float64(pp.side), 0)
				d := math.Abs(r.xf2 - r.xf1)
				vmid := (r.vf1[f] + r.vf2[f]) / (2 * cmplx.Cosh(gam[q]*complex(d/2, 0)))
				iin := -side * r.ifr[f]
				dist := math.Abs((r.xf1+r.xf2)/2 - pp.edge)
				a := (vmid + z0[q]*iin) / 2 * cmplx.Exp(-gam[q]*complex(dist, 0))
				b := (vmid - z0[q]*iin) / 2 * cmplx.Exp(gam[q]*complex(dist, 0))
				sq := cmplx.Sqrt(z0[q])
				A[q][p], B[q][p] = a/sq, b/sq
			}
		}
		S := mul2(B, inv2(A))
		res.S[f] = renormalise(S, z0, complex(res.Zref, 0))
	}
}

func mul2(a, b [2][2]complex128) (c [2][2]complex128) {
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			c[i][j] = a[i][0]*b[0][j] + a[i][1]*b[1][j]
		}
	}
	return c
}

func inv2(a [2][2]complex128) [2][2]complex128 {
	det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	return [2][2]complex128{{a[1][1] / det, -a[0][1] / det}, {-a[1][0] / det, a[0][0] / det}}
}

// renormalise moves S from port impedances z0 to zref: Z = √Z0·(I+S)·(I−S)⁻¹·√Z0,
// S' = (Z − zref)(Z + zref)⁻¹.
func renormalise(s [2][2]complex128, z0 [2]complex128, zref complex128) [2][2]complex128 {
	id := [2][2]complex128{{1, 0}, {0, 1}}
	var ip, im [2][2]complex128
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			ip[i][j] = id[i][j] + s[i][j]
			im[i][j] = id[i][j] - s[i][j]
		}
	}
	z := mul2(ip, inv2(im))
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			z[i][j] *= cmplx.Sqrt(z0[i]) * cmplx.Sqrt(z0[j])
		}
	}
	var zm, zp [2][2]complex128
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			zm[i][j] = z[i][j] - id[i][j]*zref
			zp[i][j] = z[i][j] + id[i][j]*zref
		}
	}
	return mul2(zm, inv2(zp))
}
