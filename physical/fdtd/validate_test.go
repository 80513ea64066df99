package fdtd

import (
	"context"
	"math"
	"math/cmplx"
	"testing"
	"time"

	"stubcraft/physical"
)

// straight returns a board of one straight strip of width w (m), length
// l (m) on substrate (er, h), swept at freqs.
func straight(er, h, w, l float64, freqs []float64) Structure {
	wn, ln := int64(math.Round(w*1e9)), int64(math.Round(l*1e9))
	return Structure{Er: er, H: h, BoardMinX: 0, BoardMaxX: ln, Freqs: freqs,
		Copper: []Polygon{RectPolygon(0, -wn/2, ln, wn-wn/2)},
		Ports:  [2]Port{{Side: Left, Y: 0, Width: wn}, {Side: Right, Y: 0, Width: wn}}}
}

// lineCase simulates a straight line and returns its measured Z0 and εeff
// at f next to the closed forms of Hammerstad and Jensen, "Accurate models
// for microstrip computer-aided design", IEEE MTT-S Digest 1980 (static Z0)
// and Kirschning and Jansen, Electronics Letters 18(6), 1982 (dispersive
// εeff), as the physical package implements them.
func lineCase(t *testing.T, er, h, wh float64, mesh MeshParams) (z, zHJ, ee, eeKJ float64) {
	t.Helper()
	w := wh * h
	f := 1e9 * 1e-3 / h // f·h = 1 GHz·mm: the static Z0 still applies
	z, ee = measureLine(t, straight(er, h, w, 2*h, []float64{0.5 * f, f, 1.5 * f}), mesh)
	m, err := physical.NewMicrostrip(w, physical.Substrate{Er: er, Height: h})
	if err != nil {
		t.Fatal(err)
	}
	lp := m.At(f)
	return z, lp.Z0, ee, lp.EpsEff
}

// measureLine runs the port-line calibration of s's first port (a uniform
// line of its width on s's layers) and returns the full-wave Z0 (ohm) and
// εeff at s.Freqs[1].
func measureLine(t *testing.T, s Structure, mesh MeshParams) (z0, epsEff float64) {
	t.Helper()
	return measureLineEdge(t, s, mesh, 0)
}

// measureLineEdge is measureLine with the edge cell forced to edge (m)
// when edge > 0.
func measureLineEdge(t *testing.T, s Structure, mesh MeshParams, edge float64) (z0, epsEff float64) {
	t.Helper()
	o := Options{Mesh: mesh}.withDefaults()
	if edge <= 0 {
		g, err := NewGrid(s, o.Mesh)
		if err != nil {
			t.Fatal(err)
		}
		edge = g.EdgeCell
	}
	ld, _, _, err := calibrateOn(context.Background(), s, s.Ports[0].Width, edge, nil, o, 0, 1, time.Now())
	if err != nil {
		t.Fatal(err)
	}
	k := ld.gamma[1] * complex(c0/(2*math.Pi*s.Freqs[1]), 0)
	return real(ld.z0[1]), real(-k * k)
}

// TestUniformLine checks a uniform line on the coarse mesh: its full-wave
// εeff within 1.5 % of Kirschning-Jansen and its Z0 within 1.5 % of
// Hammerstad-Jensen (the tolerances). The full set (W/h 0.3–3,
// εr 2.2–10) is recorded by testdata/fdtd/validate.sh and checked by
// TestRecordedLines.
func TestUniformLine(t *testing.T) {
	cases := []struct{ er, h, wh float64 }{
		{4.35, 1.6e-3, 1.0},
		{2.2, 0.8e-3, 3.0},
	}
	for _, c := range cases {
		z, zHJ, ee, eeKJ := lineCase(t, c.er, c.h, c.wh, Coarse.Params())
		t.Logf("εr %.2f W/h %.1f: Z0 %.2f Ω (HJ %.2f), εeff %.4f (KJ %.4f)", c.er, c.wh, z, zHJ, ee, eeKJ)
		if e := math.Abs(ee/eeKJ - 1); e > 0.015 {
			t.Errorf("εr %.2f W/h %.1f: εeff %.4f, Kirschning-Jansen %.4f: off by %.2f %%", c.er, c.wh, ee, eeKJ, 100*e)
		}
		if e := math.Abs(z/zHJ - 1); e > 0.015 {
			t.Errorf("εr %.2f W/h %.1f: Z0 %.2f Ω, Hammerstad-Jensen %.2f Ω: off by %.2f %%", c.er, c.wh, z, zHJ, 100*e)
		}
	}
}

// TestLosslessThrough checks energy conservation and reciprocity on a
// lossless straight line: |S11|² + |S21|² = 1 within 0.01 and
// |S12 − S21| ≤ 0.005 (exact properties of a lossless reciprocal
// two-port).
func TestLosslessThrough(t *testing.T) {
	s := straight(4.35, 1.6e-3, 3.0e-3, 20e-3, []float64{1e9, 2e9, 3e9})
	r, err := Solve(context.Background(), s, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for f, fr := range r.Freqs {
		S := r.S[f]
		p := sq(cmplx.Abs(S[0][0])) + sq(cmplx.Abs(S[1][0]))
		d := cmplx.Abs(S[0][1] - S[1][0])
		t.Logf("%.1f GHz: |S11|²+|S21|² = %.4f, |S12−S21| = %.4f", fr/1e9, p, d)
		if math.Abs(p-1) > 0.01 {
			t.Errorf("%.1f GHz: |S11|²+|S21|² = %.4f, want 1 ± 0.01", fr/1e9, p)
		}
		if d > 0.005 {
			t.Errorf("%.1f GHz: |S12 − S21| = %.4f, want ≤ 0.005", fr/1e9, d)
		}
	}
}

func sq(x float64) float64 { return x * x }
