package fdtd

import (
	"math"
	"runtime"
	"slices"
	"sync"
	"time"
)

// pmlAxis holds the convolutional PML of one axis: the positions along the
// axis that lie in an absorbing layer, the recursive-convolution
// coefficients b and c there (for E at the lines, for H half a cell on),
// and the auxiliary ψ fields of the two E and two H components whose update
// takes a derivative along this axis.
type pmlAxis struct {
	idx            []int // positions along the axis inside a layer, ascending
	bE, cE, invDE  []float32
	bH, cH, invDH  []float32
	psiE1, psiE2   []float32
	psiH1, psiH2   []float32
	other1, other2 int // sizes of the two other axes
}

// sim is one FDTD run's state.
type sim struct {
	nx, ny, nz             int
	ex, ey, ez, hx, hy, hz []float32
	// Inverse spacings with the PML's κ folded in: primary (for H) and dual
	// (for E).
	ixh, iyh, izh, ixe, iye, ize []float32
	caT, cbT, caZ, cbZ           []float32 // E coefficients by z index: tangential (Ex, Ey) and Ez
	dtmu                         float32
	pecX, pecY, pecZ             []int32
	fixes                        [3]fixList // Ex, Ey, Ez whose coefficients differ from their z layer's (conformal mask)
	wireX, wireY                 []wireFix  // thin-wire corrections of Hx and Hy (thinwire.go)
	pml                          [3]pmlAxis
	xRow, yRow, zRow             []pmlRow // CPML coefficients by x, y and z index (p < 0 outside the layers)
	zLo                          int      // the first z index of the top layer
	dt                           float64
	team                         *team
}

// cpmlProfile returns σ, κ, α at depth ρ ∈ [0, 1] into a layer whose cells
// are delta thick (Roden and Gedney 2000; grading of Taflove and Hagness
// 2005, §7.9: m = 3, σmax = 0.8·(m+1)/(η0·Δ), κmax = 3, α from 0.05 S/m at
// the inner face to 0 at the outer).
func cpmlProfile(rho, delta float64) (sigma, kappa, alpha float64) {
	const m = 3
	smax := 0.8 * (m + 1) / (eta0 * delta)
	sigma = smax * math.Pow(rho, m)
	kappa = 1 + 2*math.Pow(rho, m)
	alpha = 0.05 * (1 - rho)
	return
}

// axisPML builds one axis's layer coefficients. lines are the axis's mesh
// lines; low and high say which ends carry n layer cells. It returns the
// per-position κ for E (at lines) and H (at half lines) too.
func axisPML(lines []float64, n int, low, high bool, dt float64) (ax pmlAxis, kE, kH []float64) {
	N := len(lines)
	kE = make([]float64, N)
	kH = make([]float64, N)
	for i := range kE {
		kE[i], kH[i] = 1, 1
	}
	rho := func(x float64) (float64, float64, bool) {
		if low {
			in, out := lines[n], lines[0]
			if x < in {
				return (in - x) / (in - out), lines[1] - lines[0], true
			}
		}
		if high {
			in, out := lines[N-1-n], lines[N-1]
			if x > in {
				return (x - in) / (out - in), lines[N-1] - lines[N-2], true
			}
		}
		return 0, 0, false
	}
	coef := func(r, d float64) (b, c, k float64) {
		s, k, a := cpmlProfile(r, d)
		b = math.Exp(-(s/k + a) * dt / eps0)
		if s > 0 {
			c = s / (s*k + k*k*a) * (b - 1)
		}
		return b, c, k
	}
	for i := 0; i < N; i++ {
		rE, dE, inE := rho(lines[i])
		var rH, dH float64
		inH := false
		if i+1 < N {
			rH, dH, inH = rho((lines[i] + lines[i+1]) / 2)
		}
		if !inE && !inH {
			continue
		}
		ax.idx = append(ax.idx, i)
		var b, c float64
		b, c = 1, 0
		if inE {
			b, c, kE[i] = coef(rE, dE)
		}
		ax.bE = append(ax.bE, float32(b))
		ax.cE = append(ax.cE, float32(c))
		b, c = 1, 0
		if inH {
			b, c, kH[i] = coef(rH, dH)
		}
		ax.bH = append(ax.bH, float32(b))
		ax.cH = append(ax.cH, float32(c))
		dual := 0.0
		switch {
		case i == 0:
			dual = lines[1] - lines[0]
		case i == N-1:
			dual = lines[N-1] - lines[N-2]
		default:
			dual = (lines[i+1] - lines[i-1]) / 2
		}
		ax.invDE = append(ax.invDE, float32(1/dual))
		prim := lines[min(i+1, N-1)] - lines[min(i+1, N-1)-1]
		ax.invDH = append(ax.invDH, float32(1/prim))
	}
	return ax, kE, kH
}

// inverse spacings: primary (i to i+1) and dual, each divided by κ.
func invSpacings(lines, kE, kH []float64) (prim, dual []float32) {
	N := len(lines)
	prim = make([]float32, N)
	dual = make([]float32, N)
	for i := 0; i < N; i++ {
		if i+1 < N {
			prim[i] = float32(1 / (kH[i] * (lines[i+1] - lines[i])))
		}
		var d float64
		switch {
		case i == 0:
			d = lines[1] - lines[0]
		case i == N-1:
			d = lines[N-1] - lines[N-2]
		default:
			d = (lines[i+1] - lines[i-1]) / 2
		}
		dual[i] = float32(1 / (kE[i] * d))
	}
	return prim, dual
}

// timeStep returns the Courant-limited step of the grid with a 0.9 safety
// factor.
func timeStep(g *Grid) float64 {
	dx, dy, dz := minSpacing(g.X), minSpacing(g.Y), minSpacing(g.Z)
	return 0.9 / (c0 * math.Sqrt(1/(dx*dx)+1/(dy*dy)+1/(dz*dz)))
}

// eCoef returns the E update coefficients ca and cb of a medium of
// relative permittivity er and conductivity sg (S/m) at time step dt
// (the semi-implicit loss term of Taflove and Hagness, ch. 3).
func eCoef(er, sg, dt float64) (ca, cb float32) {
	e := eps0 * er
	q := sg * dt / (2 * e)
	return float32((1 - q) / (1 + q)), float32(dt / e / (1 + q))
}

// newSim allocates the fields and coefficients for grid g.
func newSim(g *Grid, s Structure, workers int) *sim {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	nx, ny, nz := len(g.X), len(g.Y), len(g.Z)
	n := nx * ny * nz
	dt := timeStep(g)
	m := &sim{nx: nx, ny: ny, nz: nz, dt: dt, team: newTeam(workers, spinWait)}
	m.ex, m.ey, m.ez = make([]float32, n), make([]float32, n), make([]float32, n)
	m.hx, m.hy, m.hz = make([]float32, n), make([]float32, n), make([]float32, n)
	var kxE, kxH, kyE, kyH, kzE, kzH []float64
	m.pml[0], kxE, kxH = axisPML(g.X, g.NPML, true, true, dt)
	m.pml[1], kyE, kyH = axisPML(g.Y, g.NPML, true, true, dt)
	m.pml[2], kzE, kzH = axisPML(g.Z, g.NPML, false, true, dt)
	m.ixh, m.ixe = invSpacings(g.X, kxE, kxH)
	m.iyh, m.iye = invSpacings(g.Y, kyE, kyH)
	m.izh, m.ize = invSpacings(g.Z, kzE, kzH)
	m.pml[0].other1, m.pml[0].other2 = ny, nz
	m.pml[1].other1, m.pml[1].other2 = nx, nz
	m.pml[2].other1, m.pml[2].other2 = nx, ny
	for a := range m.pml {
		p := &m.pml[a]
		sz := len(p.idx) * p.other1 * p.other2
		p.psiE1, p.psiE2 = make([]float32, sz), make([]float32, sz)
		p.psiH1, p.psiH2 = make([]float32, sz), make([]float32, sz)
	}
	m.xRow, m.yRow, m.zRow = m.rowPML(0, nx), m.rowPML(1, ny), m.rowPML(2, nz)
	m.zLo = nz
	if len(m.pml[2].idx) > 0 {
		m.zLo = m.pml[2].idx[0]
	}
	for p, k := range m.pml[2].idx {
		if k != m.zLo+p {
			panic("fdtd: the top absorbing layer's z indices are not contiguous")
		}
	}
	m.dtmu = float32(dt / mu0)
	// Materials by z (substrate, mask, air; see zMaterials).
	coef := func(er, sg float64) (float32, float32) { return eCoef(er, sg, dt) }
	m.caT, m.cbT = make([]float32, nz), make([]float32, nz)
	m.caZ, m.cbZ = make([]float32, nz), make([]float32, nz)
	erT, sgT, erZ, sgZ := zMaterials(g, s)
	for k := 0; k < nz; k++ {
		m.caZ[k], m.cbZ[k] = coef(erZ[k], sgZ[k])
		m.caT[k], m.cbT[k] = coef(erT[k], sgT[k])
	}
	m.markPEC(g)
	m.wireX, m.wireY = m.wireFixes(g)
	for _, l := range []*[]int32{&m.pecX, &m.pecY, &m.pecZ} {
		slices.Sort(*l)
		*l = slices.Compact(*l)
	}
	m.fixes = conformalFixes(g, s, m.caT, m.cbT, m.caZ, m.cbZ, [3][]int32{m.pecX, m.pecY, m.pecZ}, coef)
	return m
}

// markPEC lists the E components forced to zero: tangential E on the copper
// plane inside copper (on both faces of thick copper, with Ez between
// them), and Ez at every node of a via column from the ground plane to the
// copper plane. The Ex and Ey between two nodes of a column are left free:
// a column of several nodes is a bundle of posts, not a solid barrel.
func (m *sim) markPEC(g *Grid) {
	s := g.ext
	kh := g.KH
	nz, ny := m.nz, m.ny
	at := func(i, j, k int) int32 { return int32((i*ny+j)*nz + k) }
	kt := g.KT
	for i := 0; i+1 < m.nx; i++ {
		xm := (g.X[i] + g.X[i+1]) / 2
		for j := 0; j < m.ny; j++ {
			if s.inCopper(xm, g.Y[j]) {
				m.pecX = append(m.pecX, at(i, j, kh))
				if kt != kh {
					m.pecX = append(m.pecX, at(i, j, kt))
				}
			}
		}
	}
	for i := 0; i < m.nx; i++ {
		for j := 0; j+1 < m.ny; j++ {
			if s.inCopper(g.X[i], (g.Y[j]+g.Y[j+1])/2) {
				m.pecY = append(m.pecY, at(i, j, kh))
				if kt != kh {
					m.pecY = append(m.pecY, at(i, j, kt))
				}
			}
		}
	}
	// Thick copper: vertical E inside its outline, between the faces.
	if kt != kh {
		for i := 0; i < m.nx; i++ {
			for j := 0; j < m.ny; j++ {
				if s.inCopper(g.X[i], g.Y[j]) {
					for k := kh; k < kt; k++ {
						m.pecZ = append(m.pecZ, at(i, j, k))
					}
				}
			}
		}
	}
	m.markWalls(g)
	for vi, v := range s.Vias {
		col := viaColumn(g, v)
		if g.viaCols != nil {
			col = g.viaCols[vi]
		}
		for _, c := range col {
			for k := 0; k < kh; k++ {
				m.pecZ = append(m.pecZ, at(c[0], c[1], k))
			}
		}
	}
}

// team runs the update over x slabs on persistent goroutines: the caller
// takes the first slab range and each helper one other. A half step of a
// board takes a fraction of a millisecond, while waking a parked thread
// through the kernel took about 0.2 ms on the 2-core virtual machine
// (BenchmarkCellUpdates: two workers that parked at once ran at 60 M
// cell updates/s against 95 M/s for one). So each side first polls its
// channel for up to spin and blocks on it only after that: a send to a
// goroutine that is polling costs no wake-up, and the channels keep every
// hand-off safe whichever side gets there first.
type team struct {
	helpers []chan slabJob
	done    chan struct{} // one receive per helper per half step
	spin    time.Duration // how long a side polls before it blocks
}

// slabJob is one helper's share of a half step.
type slabJob struct {
	fn   func(a, b int)
	a, b int
}

// spinWait bounds how long a worker polls before it blocks: longer than
// the imbalance between slabs and the caller's serial work between half
// steps (probes and DFTs, a few tens of microseconds), short enough that
// a loaded machine loses little to it.
const spinWait = 100 * time.Microsecond

// newTeam starts workers−1 helpers that poll for up to spin before they
// block (0: block at once).
func newTeam(workers int, spin time.Duration) *team {
	t := &team{done: make(chan struct{}, max(workers-1, 0)), spin: spin}
	for h := 1; h < workers; h++ {
		c := make(chan slabJob, 1)
		t.helpers = append(t.helpers, c)
		go func() {
			for {
				j, ok := receive(c, spin)
				if !ok {
					return
				}
				j.fn(j.a, j.b)
				t.done <- struct{}{}
			}
		}()
	}
	return t
}

// receive polls c for up to spin, then blocks on it; ok is false once c
// is closed.
func receive[T any](c chan T, spin time.Duration) (v T, ok bool) {
	if spin > 0 {
		deadline := time.Now().Add(spin)
		for polls := 1; ; polls++ {
			select {
			case v, ok = <-c:
				return v, ok
			default:
			}
			if polls%64 == 0 {
				if time.Now().After(deadline) {
					break
				}
				runtime.Gosched()
			}
		}
	}
	v, ok = <-c
	return v, ok
}

// run calls fn over [0, n) split into one contiguous range per worker and
// returns when all are done.
func (t *team) run(n int, fn func(a, b int)) {
	w := min(len(t.helpers)+1, n)
	if w <= 1 {
		fn(0, n)
		return
	}
	for h := 1; h < w; h++ {
		t.helpers[h-1] <- slabJob{fn, h * n / w, (h + 1) * n / w}
	}
	fn(0, n/w)
	for range w - 1 {
		receive(t.done, t.spin)
	}
}

// stop ends the helper goroutines.
func (t *team) stop() {
	for _, c := range t.helpers {
		close(c)
	}
	t.helpers = nil
}

// parallel runs fn over [0, n) split into one contiguous range per worker.
func (m *sim) parallel(n int, fn func(a, b int)) { m.team.run(n, fn) }

// close stops the sim's worker goroutines; the sim must not step after it.
func (m *sim) close() { m.team.stop() }

// pmlRow is the CPML of one row position along x or y: the index into the
// axis's ψ arrays and the recursive-convolution coefficients b and c/Δ for
// H and E.
type pmlRow struct {
	p                int
	bH, ccH, bE, ccE float32
}

// rowPML returns, for every position along axis a, its CPML coefficients,
// p < 0 where the axis has no absorbing layer.
func (m *sim) rowPML(a, n int) []pmlRow {
	out := make([]pmlRow, n)
	for i := range out {
		out[i].p = -1
	}
	ax := &m.pml[a]
	for p, i := range ax.idx {
		out[i] = pmlRow{p: p, bH: ax.bH[p], ccH: ax.cH[p] * ax.invDH[p], bE: ax.bE[p], ccE: ax.cE[p] * ax.invDE[p]}
	}
	return out
}

// updateH advances H by one step over x slabs [ia, ib), the CPML included,
// then applies the slabs' thin-wire via corrections:
// each z-row gets its curl update, then, while the row is in cache, the
// ψ recursions of the layers it lies in (x, then y, then z: the order in
// which the corrections were always added, so the sums round the same).
// Every row is resliced to one length so that the loops carry no bounds
// checks.
func (m *sim) updateH(ia, ib int) {
	ny, nz := m.ny, m.nz
	sx := ny * nz
	n := nz - 1 // H rows run over k in [0, nz−1)
	dtmu := m.dtmu
	px, py, pz := &m.pml[0], &m.pml[1], &m.pml[2]
	npy, npz := len(py.idx), len(pz.idx)
	kz0, kz1 := max(m.zLo, 0), min(m.zLo+npz, n) // the top layer's rows
	for i := ia; i < ib && i < m.nx-1; i++ {
		ix := m.ixh[i]
		xr := m.xRow[i]
		for j := 0; j < ny-1; j++ {
			iy := m.iyh[j]
			n0 := (i*ny + j) * nz
			hx := m.hx[n0 : n0+n]
			hy := m.hy[n0 : n0+n][:len(hx)]
			hz := m.hz[n0 : n0+n][:len(hx)]
			ex := m.ex[n0 : n0+n][:len(hx)]
			ey := m.ey[n0 : n0+n][:len(hx)]
			ez := m.ez[n0 : n0+n][:len(hx)]
			exK := m.ex[n0+1 : n0+1+n][:len(hx)]
			eyK := m.ey[n0+1 : n0+1+n][:len(hx)]
			exJ := m.ex[n0+nz : n0+nz+n][:len(hx)]
			ezJ := m.ez[n0+nz : n0+nz+n][:len(hx)]
			eyI := m.ey[n0+sx : n0+sx+n][:len(hx)]
			ezI := m.ez[n0+sx : n0+sx+n][:len(hx)]
			izh := m.izh[:len(hx)]
			for k := range hx {
				iz := izh[k]
				hx[k] -= dtmu * ((ezJ[k]-ez[k])*iy - (eyK[k]-ey[k])*iz)
				hy[k] -= dtmu * ((exK[k]-ex[k])*iz - (ezI[k]-ez[k])*ix)
				hz[k] -= dtmu * ((eyI[k]-ey[k])*ix - (exJ[k]-ex[k])*iy)
			}
			if xr.p >= 0 {
				// x: Hy += dtmu·ψ(∂Ez/∂x), Hz −= dtmu·ψ(∂Ey/∂x)
				q := (xr.p*ny + j) * nz
				p1 := px.psiH1[q : q+n][:len(hx)]
				p2 := px.psiH2[q : q+n][:len(hx)]
				b, c := xr.bH, xr.ccH
				for k := range hx {
					v1 := b*p1[k] + c*(ezI[k]-ez[k])
					p1[k] = v1
					hy[k] += dtmu * v1
					v2 := b*p2[k] + c*(eyI[k]-ey[k])
					p2[k] = v2
					hz[k] -= dtmu * v2
				}
			}
			if yr := m.yRow[j]; yr.p >= 0 {
				// y: Hx −= dtmu·ψ(∂Ez/∂y), Hz += dtmu·ψ(∂Ex/∂y)
				q := (i*npy + yr.p) * nz
				p1 := py.psiH1[q : q+n][:len(hx)]
				p2 := py.psiH2[q : q+n][:len(hx)]
				b, c := yr.bH, yr.ccH
				for k := range hx {
					v1 := b*p1[k] + c*(ezJ[k]-ez[k])
					p1[k] = v1
					hx[k] -= dtmu * v1
					v2 := b*p2[k] + c*(exJ[k]-ex[k])
					p2[k] = v2
					hz[k] += dtmu * v2
				}
			}
			if kz0 < kz1 {
				// z: Hx += dtmu·ψ(∂Ey/∂z), Hy −= dtmu·ψ(∂Ex/∂z); the ψ
				// of cell k sits at k − zLo in the row's run.
				q := (i*ny+j)*npz - m.zLo
				hxz := hx[kz0:kz1]
				hyz := hy[kz0:kz1][:len(hxz)]
				p1 := pz.psiH1[q+kz0 : q+kz1][:len(hxz)]
				p2 := pz.psiH2[q+kz0 : q+kz1][:len(hxz)]
				zr := m.zRow[kz0:kz1][:len(hxz)]
				exz, exzK := ex[kz0:kz1][:len(hxz)], exK[kz0:kz1][:len(hxz)]
				eyz, eyzK := ey[kz0:kz1][:len(hxz)], eyK[kz0:kz1][:len(hxz)]
				for k := range hxz {
					b, c := zr[k].bH, zr[k].ccH
					v1 := b*p1[k] + c*(eyzK[k]-eyz[k])
					p1[k] = v1
					hxz[k] += dtmu * v1
					v2 := b*p2[k] + c*(exzK[k]-exz[k])
					p2[k] = v2
					hyz[k] -= dtmu * v2
				}
			}
		}
	}
	m.thinWire(ia, ib)
}

// updateE advances E by one step over x slabs [ia, ib), the CPML included
// as in updateH, then turns the layer's update into their own for the
// components a conformal mask gives other coefficients (m.fixes; their
// values before the update are kept first) and zeroes the slabs' copper
// and via components.
func (m *sim) updateE(ia, ib int) {
	ny, nz := m.ny, m.nz
	sx := ny * nz
	n := nz - 2  // tangential E rows run over k in [1, nz−1)
	nn := nz - 1 // Ez rows run over k in [0, nz−1)
	px, py, pz := &m.pml[0], &m.pml[1], &m.pml[2]
	npy, npz := len(py.idx), len(pz.idx)
	kz0, kz1 := max(m.zLo, 1), min(m.zLo+npz, nz-1) // the top layer's rows
	var fixes [3]fixList
	if m.fixes[0] != nil || m.fixes[1] != nil || m.fixes[2] != nil {
		lo, hi := int32(ia*sx), int32(min(ib, m.nx)*sx)
		for c, f := range [3][]float32{m.ex, m.ey, m.ez} {
			fixes[c] = m.fixes[c].span(lo, hi)
			fixes[c].save(f)
		}
	}
	for i := ia; i < ib && i < m.nx-1; i++ {
		ix := m.ixe[i]
		xr := m.xRow[i]
		for j := 0; j < ny-1; j++ {
			iy := m.iye[j]
			yr := m.yRow[j]
			n0 := (i*ny + j) * nz
			// Tangential rows start at k = 1: index k here is cell k+1.
			hx := m.hx[n0+1 : n0+1+n]
			hy := m.hy[n0+1 : n0+1+n][:len(hx)]
			hz := m.hz[n0+1 : n0+1+n][:len(hx)]
			hxK := m.hx[n0 : n0+n][:len(hx)]
			hyK := m.hy[n0 : n0+n][:len(hx)]
			ize := m.ize[1 : 1+n][:len(hx)]
			caT, cbT := m.caT[1 : 1+n][:len(hx)], m.cbT[1 : 1+n][:len(hx)]
			if j >= 1 {
				ex := m.ex[n0+1 : n0+1+n][:len(hx)]
				hzJ := m.hz[n0+1-nz : n0+1-nz+n][:len(hx)]
				for k := range hx {
					ex[k] = caT[k]*ex[k] + cbT[k]*((hz[k]-hzJ[k])*iy-(hy[k]-hyK[k])*ize[k])
				}
				if yr.p >= 0 {
					// y: Ex += cb·ψ(∂Hz/∂y)
					q := (i*npy+yr.p)*nz + 1
					p1 := py.psiE1[q : q+n][:len(hx)]
					b, c := yr.bE, yr.ccE
					for k := range hx {
						v := b*p1[k] + c*(hz[k]-hzJ[k])
						p1[k] = v
						ex[k] += cbT[k] * v
					}
				}
				if kz0 < kz1 {
					// z: Ex −= cb·ψ(∂Hy/∂z)
					q := (i*ny+j)*npz - m.zLo
					p1 := pz.psiE1[q+kz0 : q+kz1]
					zr := m.zRow[kz0:kz1][:len(p1)]
					exz, cbz := ex[kz0-1 : kz1-1][:len(p1)], cbT[kz0-1 : kz1-1][:len(p1)]
					hyz, hyzK := hy[kz0-1 : kz1-1][:len(p1)], hyK[kz0-1 : kz1-1][:len(p1)]
					for k := range p1 {
						v := zr[k].bE*p1[k] + zr[k].ccE*(hyz[k]-hyzK[k])
						p1[k] = v
						exz[k] -= cbz[k] * v
					}
				}
			}
			if i < 1 {
				continue
			}
			ey := m.ey[n0+1 : n0+1+n][:len(hx)]
			hzI := m.hz[n0+1-sx : n0+1-sx+n][:len(hx)]
			for k := range hx {
				ey[k] = caT[k]*ey[k] + cbT[k]*((hx[k]-hxK[k])*ize[k]-(hz[k]-hzI[k])*ix)
			}
			if xr.p >= 0 {
				// x: Ey −= cb·ψ(∂Hz/∂x)
				q := (xr.p*ny+j)*nz + 1
				p1 := px.psiE1[q : q+n][:len(hx)]
				b, c := xr.bE, xr.ccE
				for k := range hx {
					v := b*p1[k] + c*(hz[k]-hzI[k])
					p1[k] = v
					ey[k] -= cbT[k] * v
				}
			}
			if kz0 < kz1 {
				// z: Ey += cb·ψ(∂Hx/∂z)
				q := (i*ny+j)*npz - m.zLo
				p1 := pz.psiE2[q+kz0 : q+kz1]
				zr := m.zRow[kz0:kz1][:len(p1)]
				eyz, cbz := ey[kz0-1 : kz1-1][:len(p1)], cbT[kz0-1 : kz1-1][:len(p1)]
				hxz, hxzK := hx[kz0-1 : kz1-1][:len(p1)], hxK[kz0-1 : kz1-1][:len(p1)]
				for k := range p1 {
					v := zr[k].bE*p1[k] + zr[k].ccE*(hxz[k]-hxzK[k])
					p1[k] = v
					eyz[k] += cbz[k] * v
				}
			}
			if j < 1 {
				continue
			}
			ez := m.ez[n0 : n0+nn]
			hxa := m.hx[n0 : n0+nn][:len(ez)]
			hya := m.hy[n0 : n0+nn][:len(ez)]
			hyI := m.hy[n0-sx : n0-sx+nn][:len(ez)]
			hxJ := m.hx[n0-nz : n0-nz+nn][:len(ez)]
			caZ, cbZ := m.caZ[:nn][:len(ez)], m.cbZ[:nn][:len(ez)]
			for k := range ez {
				ez[k] = caZ[k]*ez[k] + cbZ[k]*((hya[k]-hyI[k])*ix-(hxa[k]-hxJ[k])*iy)
			}
			if xr.p >= 0 {
				// x: Ez += cb·ψ(∂Hy/∂x)
				q := (xr.p*ny + j) * nz
				p1 := px.psiE2[q : q+nn][:len(ez)]
				b, c := xr.bE, xr.ccE
				for k := range ez {
					v := b*p1[k] + c*(hya[k]-hyI[k])
					p1[k] = v
					ez[k] += cbZ[k] * v
				}
			}
			if yr.p >= 0 {
				// y: Ez −= cb·ψ(∂Hx/∂y)
				q := (i*npy + yr.p) * nz
				p1 := py.psiE2[q : q+nn][:len(ez)]
				b, c := yr.bE, yr.ccE
				for k := range ez {
					v := b*p1[k] + c*(hxa[k]-hxJ[k])
					p1[k] = v
					ez[k] -= cbZ[k] * v
				}
			}
		}
	}
	for c, f := range [3][]float32{m.ex, m.ey, m.ez} {
		fixes[c].apply(f)
	}
	m.zeroPEC(ia, ib)
}

// zeroPEC forces the listed E components in x slabs [ia, ib) to zero (the
// lists are sorted by cell index, and a slab's cells are contiguous).
func (m *sim) zeroPEC(ia, ib int) {
	lo, hi := int32(ia*m.ny*m.nz), int32(min(ib, m.nx)*m.ny*m.nz)
	for _, c := range []struct {
		cells []int32
		f     []float32
	}{{m.pecX, m.ex}, {m.pecY, m.ey}, {m.pecZ, m.ez}} {
		a, _ := slices.BinarySearch(c.cells, lo)
		b, _ := slices.BinarySearch(c.cells, hi)
		for _, n := range c.cells[a:b] {
			c.f[n] = 0
		}
	}
}

// step advances the fields by one time step (H then E), each half on every
// worker.
func (m *sim) step() {
	m.parallel(m.nx, m.updateH)
	m.parallel(m.nx, m.updateE)
}

// energy returns Σ(E² + H²) over the grid, a decay measure (unweighted).
func (m *sim) energy() float64 {
	var total float64
	var mu sync.Mutex
	sx := m.ny * m.nz
	m.parallel(m.nx, func(a, b int) {
		var e, h float64
		for n := a * sx; n < b*sx; n++ {
			e += float64(m.ex[n]*m.ex[n] + m.ey[n]*m.ey[n] + m.ez[n]*m.ez[n])
			h += float64(m.hx[n]*m.hx[n] + m.hy[n]*m.hy[n] + m.hz[n]*m.hz[n])
		}
		mu.Lock()
		total += e*eps0 + h*mu0
		mu.Unlock()
	})
	return total
}
