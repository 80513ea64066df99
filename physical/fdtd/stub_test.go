package fdtd

import (
	"context"
	"math"
	"math/cmplx"
	"testing"

	"stubcraft/physical"
)

// The open-end case: 0.8 mm substrate of εr 3.66, a 1.6 mm strip (W/h = 2)
// from port 1 ending open 12 mm into the board; port 2's own strip starts
// 8 mm (10 h) beyond the open end, far enough that the gap's coupling does
// not move the end's reflection.
const (
	openEr, openH, openW = 3.66, 0.8e-3, 1.6e-3
	openLen, openGap     = 12e-3, 8e-3
	quarterStub          = 16e-3 // the λ/4 open stub whose notch the end moves
)

func openEndBoard(freqs []float64) Structure {
	n := func(v float64) int64 { return int64(math.Round(v * 1e9)) }
	w := n(openW)
	l1, l2 := n(openLen), n(openLen+openGap)
	end := l2 + n(4e-3)
	return Structure{Er: openEr, H: openH, BoardMinX: 0, BoardMaxX: end, Freqs: freqs,
		Copper: []Polygon{RectPolygon(0, -w/2, l1, w-w/2), RectPolygon(l2, -w/2, end, w-w/2)},
		Ports:  [2]Port{{Side: Left, Y: 0, Width: w}, {Side: Right, Y: 0, Width: w}}}
}

// openEndNotch runs the open-end board and returns the notch frequency of
// an open stub quarterStub long that ends like it: the root of
// β(f)·(quarterStub + Δl(f)) = π/2, with β from the run's own line
// calibration and Δl from the phase of S11 referred to the line's own Z0,
// S11 = e^{−2γ·(openLen + Δl)}.
func openEndNotch(t *testing.T, freqs []float64, mesh MeshParams) (notch float64, dl []float64) {
	t.Helper()
	r, err := Solve(context.Background(), openEndBoard(freqs), Options{Mesh: mesh})
	if err != nil {
		t.Fatal(err)
	}
	phase := make([]float64, len(freqs))
	for f := range freqs {
		z0 := r.Z0[0][f]
		s := renormalise(r.S[f], [2]complex128{complex(r.Zref, 0), complex(r.Zref, 0)}, z0)
		beta := real(cmplx.Sqrt(r.EpsEff[0][f])) * 2 * math.Pi * freqs[f] / c0
		phi := -cmplx.Phase(s[0][0]) - 2*beta*openLen
		phi = math.Remainder(phi, 2*math.Pi)
		d := phi / (2 * beta)
		dl = append(dl, d)
		phase[f] = beta*(quarterStub+d) - math.Pi/2
	}
	t.Logf("%d cells, %d steps, %.1f s", r.Cells, r.Steps, r.Seconds)
	return root(freqs, phase), dl
}

// root returns where the samples y over x cross zero (linear
// interpolation), or NaN.
func root(x, y []float64) float64 {
	for i := 1; i < len(x); i++ {
		if (y[i-1] <= 0) != (y[i] <= 0) {
			return x[i-1] + (x[i]-x[i-1])*y[i-1]/(y[i-1]-y[i])
		}
	}
	return math.NaN()
}

// kjkNotch is the same root with the Kirschning-Jansen εeff and the
// Kirschning-Jansen-Koster open-end extension of physical (Kirschning,
// Jansen and Koster, "Accurate model for open end effect of microstrip
// lines", Electronics Letters 17(3), 1981).
func kjkNotch(t *testing.T) (float64, func(float64) float64) {
	m, err := physical.NewMicrostrip(openW, physical.Substrate{Er: openEr, Height: openH})
	if err != nil {
		t.Fatal(err)
	}
	dl := func(f float64) float64 {
		d, _ := physical.OpenEndExtension(openW, openH, openEr, m.At(f).EpsEff, f)
		return d
	}
	lo, hi := 1e9, 5e9
	for i := 0; i < 60; i++ {
		mid := (lo + hi) / 2
		if m.At(mid).Beta()*(quarterStub+dl(mid)) > math.Pi/2 {
			hi = mid
		} else {
			lo = mid
		}
	}
	return (lo + hi) / 2, dl
}

// TestRecordedOpenEnd checks (d) on the record of testdata/fdtd/validate.sh
// (the coarse row of convergence.tsv): the notch of an open λ/4 stub whose
// end behaves as the full-wave open end lies within 1 % of the one the
// Kirschning-Jansen-Koster end extension gives. The stub is not drawn: the
// end's extension is measured on a straight line ending open (no
// T-junction in the way), and the stub's notch follows from it.
func TestRecordedOpenEnd(t *testing.T) {
	rows := readRecord(t, "convergence.tsv")
	got, want := rows[0][1], rows[0][2]
	if e := math.Abs(got/want - 1); !(e <= 0.01) {
		t.Errorf("notch %.4f GHz, Kirschning-Jansen-Koster %.4f GHz: off by %.2f %%, want ≤ 1 %%", got/1e9, want/1e9, 100*e)
	}
}

func linspace(a, b float64, n int) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = a + (b-a)*float64(i)/float64(n-1)
	}
	return out
}
