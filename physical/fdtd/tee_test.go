package fdtd

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"stubcraft/physical"
)

// The T-junction sweep (issue 11 §4). Each geometry is simulated with
// four open-stub lengths; at each frequency the symmetric two-port at the
// board edges splits into its odd and even modes:
//
//   - odd mode (S11 − S21): an electric wall on the stub's centre line, so
//     the stub is not excited and the mode sees a short at the through
//     arm's reference plane. Its phase gives d1, the through-arm shift
//     from the stub's centre line, with the through line's γ measured in
//     the same run.
//   - even mode (S11 + S21): moved from the board edge to the reference
//     planes (arm length − d1) it is the shunt admittance Ysh of the
//     junction with its stub. The equivalent circuit of the model is
//     Ysh = jB + k·Ystub, Ystub = j·Y0s·tan(βs·(L + Wt/2 − d2 + Δl)),
//     with Y0s and βs the stub line's own full-wave figures on the same
//     mesh, Δl the Kirschning-Jansen-Koster open end (physical) and L the
//     drawn stub length from the through line's edge. Four lengths give
//     four real equations for B, k and d2: d2 is found by a scan, B and k
//     by least squares at each d2.
//
// k is the factor on the stub's admittance at the junction node; in the
// transformer picture it is the inverse of the impedance ratio.

// teeCase is one geometry of the sweep; fh is the centre of its band as
// frequency times substrate height, GHz·mm.
type teeCase struct{ er, h, wt, ws, fh float64 }

// teeSet spans width ratios Wt/Ws 0.3–3, εr 2.2–10.2, h 0.2–1.6 mm and
// f·h 1–5 GHz·mm (each case's band is ±10 % around fh).
var teeSet = []teeCase{
	{er: 3.66, h: 1.6e-3, wt: 3.5e-3, ws: 3.5e-3, fh: 3.9},   // a 50 Ω FR-4 class tee near the demo's
	{er: 3.66, h: 0.8e-3, wt: 1.7e-3, ws: 1.7e-3, fh: 2.0},   // same, thinner and lower f·h
	{er: 3.66, h: 0.8e-3, wt: 1.7e-3, ws: 0.57e-3, fh: 2.0},  // Wt/Ws = 3
	{er: 3.66, h: 0.8e-3, wt: 0.57e-3, ws: 1.7e-3, fh: 2.0},  // Wt/Ws = 0.33
	{er: 2.2, h: 0.5e-3, wt: 1.5e-3, ws: 1.5e-3, fh: 1.2},    // low εr, 50 Ω
	{er: 2.2, h: 1.6e-3, wt: 4.8e-3, ws: 1.6e-3, fh: 5.0},    // low εr, high f·h, Wt/Ws = 3
	{er: 10.2, h: 0.635e-3, wt: 0.6e-3, ws: 0.6e-3, fh: 2.5}, // ceramic class, 50 Ω
	{er: 10.2, h: 0.2e-3, wt: 0.2e-3, ws: 0.6e-3, fh: 1.0},   // thin ceramic, Wt/Ws = 0.33
	{er: 6.15, h: 1.0e-3, wt: 2.0e-3, ws: 0.7e-3, fh: 3.0},   // mid εr, Wt/Ws ≈ 3
	{er: 4.3, h: 1.6e-3, wt: 1.6e-3, ws: 4.8e-3, fh: 4.0},    // wide stub, Wt/Ws = 0.33
}

// teeAngles are the stub's electrical lengths (from the model's reference
// plane, with the open end) at the band centre: a short, a long, one past
// the quarter wave and one near 3λ/8, so that B, k and d2 are each well
// conditioned and the fourth length checks the equivalent circuit (resid).
var teeAngles = []float64{40, 75, 110, 140}

// teeFreqFactors place the sweep frequencies around the band centre.
var teeFreqFactors = []float64{0.9, 1.0, 1.1}

// teeRow is what the sweep extracts for one geometry at one frequency.
type teeRow struct {
	c                      teeCase
	f                      float64
	z0t, eeT, z0s, eeS     float64 // full-wave line figures (through, stub)
	d1, d1Spread, d2, k, b float64 // extracted: m, m, m, 1, S
	resid, gs              float64 // fit residual (S) and the largest Re Ysh (S)
	cells, steps           int
	seconds                float64
	lengths                []float64
	mesh                   string
}

// teeRun is one tee board's symmetric two-port at the board edges,
// referred to the through line's own full-wave Z0, per frequency.
type teeRun struct {
	s11, s21     []complex128
	beta, z0, ee []float64 // through line: β (1/m), Z0 (ohm), εeff
	cells, steps int
	seconds      float64
	edge         float64
}

func runTee(t *testing.T, b TeeBoard, mesh MeshParams) teeRun {
	t.Helper()
	r, err := Solve(context.Background(), b.Structure(), Options{Mesh: mesh})
	if err != nil {
		t.Fatal(err)
	}
	out := teeRun{cells: r.Cells, steps: r.Steps, seconds: r.Seconds, edge: r.Grid.EdgeCell}
	for f, fr := range r.Freqs {
		z0 := r.Z0[0][f]
		S := renormalise(r.S[f], [2]complex128{complex(r.Zref, 0), complex(r.Zref, 0)}, z0)
		out.s11 = append(out.s11, (S[0][0]+S[1][1])/2)
		out.s21 = append(out.s21, (S[0][1]+S[1][0])/2)
		out.beta = append(out.beta, real(cmplx.Sqrt(r.EpsEff[0][f]))*2*math.Pi*fr/c0)
		out.z0 = append(out.z0, real(z0))
		out.ee = append(out.ee, real(r.EpsEff[0][f]))
	}
	return out
}

// oddD1 is d1 from the odd mode, −e^{−2jβ(La − d1)}, on the branch
// nearest zero.
func oddD1(s11, s21 complex128, beta, arm float64) float64 {
	d1 := arm + cmplx.Phase(-(s11-s21))/(2*beta)
	half := math.Pi / beta
	return d1 - half*math.Round(d1/half)
}

// evenShunt is the shunt admittance (S) at the through arms' reference
// planes, d1 from the stub centre line, from the even mode.
func evenShunt(s11, s21 complex128, beta, z0, arm, d1 float64) complex128 {
	g := (s11 + s21) * cmplx.Exp(complex(0, 2*beta*(arm-d1)))
	return complex(2/z0, 0) * (1 - g) / (1 + g)
}

// fitStub finds d2, B and k from x_i = B + k·y0s·tan(βs·(L_i + wt/2 − d2 + Δl_i)),
// scanning d2 over [lo, hi] and solving B, k by least squares at each.
func fitStub(x, L, dl []float64, wt, y0s, betaS, lo, hi float64) (d2, b, k, resid float64) {
	solve := func(d float64) (b, k, r float64) {
		var n, st, stt, sx, stx float64
		ts := make([]float64, len(x))
		for i := range x {
			ts[i] = math.Tan(betaS * (L[i] + wt/2 - d + dl[i]))
			n++
			st += ts[i]
			stt += ts[i] * ts[i]
			sx += x[i]
			stx += ts[i] * x[i]
		}
		det := n*stt - st*st
		b = (stt*sx - st*stx) / det
		kk := (n*stx - st*sx) / det
		for i := range x {
			e := b + kk*ts[i] - x[i]
			r += e * e
		}
		return b, kk / y0s, math.Sqrt(r / n)
	}
	best := math.Inf(1)
	const steps = 2000
	for i := 0; i <= steps; i++ {
		d := lo + (hi-lo)*float64(i)/steps
		_, kk, r := solve(d)
		if kk > 0 && r < best {
			best, d2 = r, d
		}
	}
	// Refine around the best scan point by golden section.
	a, c := d2-(hi-lo)/steps, d2+(hi-lo)/steps
	for i := 0; i < 60; i++ {
		m1, m2 := a+(c-a)*0.382, a+(c-a)*0.618
		_, _, r1 := solve(m1)
		_, _, r2 := solve(m2)
		if r1 < r2 {
			c = m2
		} else {
			a = m1
		}
	}
	d2 = (a + c) / 2
	b, k, resid = solve(d2)
	return d2, b, k, resid
}

// extractTee simulates c at the stub lengths of teeAngles and returns one row
// per frequency.
func extractTee(t *testing.T, c teeCase, mesh MeshParams, meshName string) []teeRow {
	t.Helper()
	sub := physical.Substrate{Er: c.er, Height: c.h}
	f0 := c.fh * 1e6 / c.h
	var freqs []float64
	for _, m := range teeFreqFactors {
		freqs = append(freqs, m*f0)
	}
	mt, err := physical.NewMicrostrip(c.wt, sub)
	if err != nil {
		t.Fatal(err)
	}
	ms, err := physical.NewMicrostrip(c.ws, sub)
	if err != nil {
		t.Fatal(err)
	}
	pt, ps := mt.At(f0), ms.At(f0)
	guess := physical.Tee{ThroughZ0: pt.Z0, ThroughEpsEff: pt.EpsEff, StubZ0: ps.Z0, StubEpsEff: ps.EpsEff, H: c.h, Er: c.er}.At(f0)
	dl0, _ := physical.OpenEndExtension(c.ws, c.h, c.er, ps.EpsEff, f0)
	var lengths []float64
	for _, a := range teeAngles {
		l := a*math.Pi/180/ps.Beta() - c.wt/2 + guess.StubShift - dl0
		l = math.Max(l, 0.1*c.h)
		lengths = append(lengths, math.Round(l*1e6)/1e6) // whole µm
	}
	arm := DefaultArmLen(c.h, c.wt, c.ws)
	var runs []teeRun
	row0 := teeRow{c: c, lengths: lengths, mesh: meshName}
	for _, l := range lengths {
		r := runTee(t, TeeBoard{Er: c.er, H: c.h, ThroughW: c.wt, StubW: c.ws, StubLen: l, ArmLen: arm, Freqs: freqs}, mesh)
		runs = append(runs, r)
		row0.cells = max(row0.cells, r.cells)
		row0.steps += r.steps
		row0.seconds += r.seconds
		t.Logf("stub %.3f mm: %d cells, %d steps, %.0f s", l*1e3, r.cells, r.steps, r.seconds)
	}
	// The stub line on the same mesh (the tee grid's edge cell).
	line := TeeBoard{Er: c.er, H: c.h, ThroughW: c.wt, StubW: c.ws, StubLen: lengths[0], ArmLen: arm, Freqs: freqs}.Structure()
	o := Options{Mesh: mesh}.withDefaults()
	ld, steps, _, err := calibrateOn(context.Background(), line, int64(math.Round(c.ws*1e9)), runs[0].edge, nil, o, 0, 1, time.Now())
	if err != nil {
		t.Fatal(err)
	}
	row0.steps += steps
	var rows []teeRow
	for f, fr := range freqs {
		row := row0
		row.f = fr
		row.z0t, row.eeT = runs[0].z0[f], runs[0].ee[f]
		k := ld.gamma[f] * complex(c0/(2*math.Pi*fr), 0)
		row.z0s, row.eeS = real(ld.z0[f]), real(-k*k)
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, r := range runs {
			d := oddD1(r.s11[f], r.s21[f], r.beta[f], arm)
			row.d1 += d / float64(len(runs))
			lo, hi = math.Min(lo, d), math.Max(hi, d)
		}
		row.d1Spread = hi - lo
		var x, dl []float64
		for _, r := range runs {
			y := evenShunt(r.s11[f], r.s21[f], r.beta[f], r.z0[f], arm, row.d1)
			x = append(x, imag(y))
			row.gs = math.Max(row.gs, math.Abs(real(y)))
			d, _ := physical.OpenEndExtension(c.ws, c.h, c.er, ms.At(fr).EpsEff, fr)
			dl = append(dl, d)
		}
		betaS := imag(ld.gamma[f])
		d1w := physical.Eta0 * c.h / (pt.Z0 * math.Sqrt(pt.EpsEff))
		quarter := math.Pi / 2 / betaS
		row.d2, row.b, row.k, row.resid = fitStub(x, lengths, dl, c.wt, 1/row.z0s, betaS,
			math.Max(-0.5*d1w, guess.StubShift-0.9*quarter), math.Min(1.5*d1w, guess.StubShift+0.9*quarter))
		rows = append(rows, row)
	}
	return rows
}

const teeRecord = "../../testdata/tee/tee.tsv"

// TestRecordTee runs the tee sweep and records it (testdata/tee/sweep.sh).
func TestRecordTee(t *testing.T) {
	if os.Getenv("STUBCRAFT_TEE_RECORD") == "" {
		t.Skip("long: run testdata/tee/sweep.sh")
	}
	meshName := os.Getenv("STUBCRAFT_TEE_MESH")
	mesh := Coarse
	switch meshName {
	case "normal":
		mesh = Normal
	case "", "coarse":
		meshName = "coarse"
	default:
		t.Fatalf("STUBCRAFT_TEE_MESH=%q: want coarse or normal", meshName)
	}
	commit := os.Getenv("STUBCRAFT_TEE_COMMIT")
	var b strings.Builder
	only := os.Getenv("STUBCRAFT_TEE_ONLY")
	fmt.Fprintf(&b, "# made by: testdata/tee/sweep.sh (STUBCRAFT_TEE_RECORD=1 STUBCRAFT_TEE_MESH=%s STUBCRAFT_TEE_ONLY=%s go test ./physical/fdtd -run TestRecordTee) at %s, %s\n",
		meshName, only, commit, time.Now().UTC().Format("2006-01-02T15:04Z"))
	b.WriteString("# Full-wave T-junction parameters (physical/fdtd): d1 the through arms' reference-plane shift from the stub centre line,\n")
	b.WriteString("# d2 the stub's from the through centre line, k the factor on the stub admittance at the junction node, b the node\n")
	b.WriteString("# susceptance; stub lengths from the through line's edge; open end by Kirschning-Jansen-Koster (absorbed into d2).\n")
	b.WriteString("er\th_mm\twt_mm\tws_mm\tf_hz\tz0t_ohm\teefft\tz0s_ohm\teeffs\td1_mm\td1_spread_mm\td2_mm\tk\tb_ms\tresid_ms\tmax_g_ms\tstubs_mm\tmesh\tcells\tsteps\tseconds\n")
	for i, c := range teeSet {
		if only != "" && !strings.Contains(","+only+",", fmt.Sprintf(",%d,", i)) {
			continue
		}
		for _, r := range extractTee(t, c, mesh.Params(), meshName) {
			var ls []string
			for _, l := range r.lengths {
				ls = append(ls, fmt.Sprintf("%.3f", l*1e3))
			}
			line := fmt.Sprintf("%g\t%g\t%g\t%g\t%.6g\t%.3f\t%.4f\t%.3f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%s\t%s\t%d\t%d\t%.0f",
				c.er, c.h*1e3, c.wt*1e3, c.ws*1e3, r.f, r.z0t, r.eeT, r.z0s, r.eeS, r.d1*1e3, r.d1Spread*1e3, r.d2*1e3, r.k, r.b*1e3, r.resid*1e3, r.gs*1e3,
				strings.Join(ls, ","), r.mesh, r.cells, r.steps, r.seconds)
			t.Log(line)
			b.WriteString(line + "\n")
		}
	}
	path := teeRecord
	if only != "" {
		path = filepath.Join(os.TempDir(), "tee-partial.tsv")
	}
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("wrote %s", path)
}
