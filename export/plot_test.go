package export

import (
	"bytes"
	"encoding/xml"
	"image/png"
	"io"
	"math"
	"math/cmplx"
	"slices"
	"testing"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

func TestWritePlots(t *testing.T) {
	for _, c := range []struct {
		name string
		rep  Report
	}{
		{"with tolerance", fixtureReport(openStub())},
		{"without tolerance", func() Report { r := fixtureReport(openStub()); r.Tolerance = nil; return r }()},
	} {
		t.Run(c.name, func(t *testing.T) {
			render := func() map[string][]byte {
				m := map[string][]byte{}
				for _, p := range Plots() {
					for _, f := range ImageFormats() {
						var buf bytes.Buffer
						if err := WritePlot(&buf, c.rep, p, f); err != nil {
							t.Fatal(err)
						}
						m[p.FileName(f)] = buf.Bytes()
					}
				}
				return m
			}
			m := render()
			names := []string{"s11.png", "s11.svg", "smith.png", "smith.svg", "tolerance.png", "tolerance.svg"}
			if len(m) != len(names) {
				t.Errorf("%d plots, want %d", len(m), len(names))
			}
			for _, n := range names {
				b, ok := m[n]
				if !ok {
					t.Errorf("no %s", n)
					continue
				}
				switch n[len(n)-3:] {
				case "png":
					img, err := png.Decode(bytes.NewReader(b))
					if err != nil {
						t.Errorf("%s: %v", n, err)
					} else if r := img.Bounds(); r.Dx() < 100 || r.Dy() < 100 {
						t.Errorf("%s: %v pixels", n, r)
					}
				case "svg":
					d := xml.NewDecoder(bytes.NewReader(b))
					for {
						_, err := d.Token()
						if err == io.EOF {
							break
						}
						if err != nil {
							t.Errorf("%s is not XML: %v", n, err)
							break
						}
					}
				}
			}
			again := render()
			for _, n := range names {
				if !bytes.Equal(m[n], again[n]) {
					t.Errorf("%s differs between two runs", n)
				}
			}
		})
	}
}

// The grid circles are the exact loci of the Smith chart: with z the
// impedance normalised to Z0 and Γ = (z − 1)/(z + 1), every point of a
// constant-resistance circle has Re z = r and every point of a
// constant-reactance arc has Im z = x (exact, from z = (1 + Γ)/(1 − Γ)).
func TestSmithGridIsExact(t *testing.T) {
	z := func(q ptMM) complex128 { g := complex(q.x, q.y); return (1 + g) / (1 - g) }
	for _, v := range smithValues() {
		for _, run := range arcRuns(resistanceCircle(v), 360) {
			for _, q := range run {
				if math.Hypot(q.x-1, q.y) < 1e-6 {
					continue // the point at infinity
				}
				if got := real(z(q)); math.Abs(got-v) > 1e-9*(1+v) {
					t.Fatalf("r = %v circle: point %v has Re z = %v", v, q, got)
				}
			}
		}
		for _, x := range []float64{v, -v} {
			runs := arcRuns(reactanceCircle(x), 720)
			if len(runs) != 1 {
				t.Errorf("x = %v: %d arcs inside the chart, want 1", x, len(runs))
			}
			for _, run := range runs {
				for _, q := range run {
					if math.Hypot(q.x-1, q.y) < 1e-6 {
						continue
					}
					if math.Hypot(q.x, q.y) > 1+1e-9 {
						t.Fatalf("x = %v: point %v outside |Γ| ≤ 1", x, q)
					}
					if got := imag(z(q)); math.Abs(got-x) > 1e-9*(1+math.Abs(x)) {
						t.Fatalf("x = %v arc: point %v has Im z = %v", x, q, got)
					}
				}
			}
		}
	}
	// Γ of a few impedances, exact: z = 1 → 0; z = 0 → −1; z = j → j;
	// z = 2 → 1/3.
	for _, c := range []struct{ z, want complex128 }{{1, 0}, {0, -1}, {1i, 1i}, {2, complex(1.0/3, 0)}} {
		if got := gammaOf(c.z); cmplx.Abs(got-c.want) > 1e-15 {
			t.Errorf("Γ(%v) = %v, want %v", c.z, got, c.want)
		}
	}
}

func TestHistBins(t *testing.T) {
	// Worked by hand: 0..4 in 4 bins of width 1; 1 and 2 fall in the upper
	// bin at an edge, the maximum 4 in the last bin.
	h := histBins([]float64{0, 0.5, 1, 2, 2.5, 4}, 4)
	if h.lo != 0 || h.width != 1 || !slices.Equal(h.counts, []int{2, 1, 2, 1}) {
		t.Errorf("got %+v, want lo 0, width 1, counts [2 1 2 1]", h)
	}
	if h := histBins([]float64{3, 3}, 2); h.width != 0.5 || !slices.Equal(h.counts, []int{0, 2}) {
		t.Errorf("equal values: %+v, want a unit span around them", h)
	}
}

func TestNiceStep(t *testing.T) {
	// The 1-2-5 series of tick steps (common practice, no source).
	for _, c := range []struct{ span, want float64 }{
		{0.9, 0.2}, {40, 10}, {28, 10}, {1, 0.2}, {7, 2}, {0.001, 0.0002},
	} {
		if got := niceStep(c.span, 5); math.Abs(got-c.want) > 1e-12*c.want {
			t.Errorf("niceStep(%v, 5) = %v, want %v", c.span, got, c.want)
		}
	}
	if got := ticks(-40, 0, 10); !slices.Equal(got, []float64{-40, -30, -20, -10, 0}) {
		t.Errorf("ticks(-40, 0, 10) = %v", got)
	}
}

func TestThinEnvelope(t *testing.T) {
	// A long curve keeps its extremes exactly, its end points and its
	// order, within maxPlotPoints+2 points; a short one is unchanged.
	n := 100001
	pts := make(plotter.XYs, n)
	for i := range pts {
		x := float64(i) / float64(n-1)
		pts[i] = plotter.XY{X: x, Y: math.Sin(40*x) + 0.001*math.Sin(9000*x)}
	}
	pts[54321].Y = -5 // a narrow notch
	got := thinEnvelope(pts)
	if len(got) > maxPlotPoints+2 || got[0] != pts[0] || got[len(got)-1] != pts[n-1] {
		t.Fatalf("%d points, first %v, last %v", len(got), got[0], got[len(got)-1])
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, q := range got {
		if i > 0 && !(q.X > got[i-1].X) {
			t.Fatalf("point %d out of order", i)
		}
		lo, hi = math.Min(lo, q.Y), math.Max(hi, q.Y)
	}
	wlo, whi := math.Inf(1), math.Inf(-1)
	for _, q := range pts {
		wlo, whi = math.Min(wlo, q.Y), math.Max(whi, q.Y)
	}
	if lo != wlo || hi != whi {
		t.Errorf("range [%g, %g], want [%g, %g]", lo, hi, wlo, whi)
	}
	short := pts[:maxPlotPoints]
	if got := thinEnvelope(short); len(got) != len(short) {
		t.Errorf("a curve of %d points was thinned to %d", len(short), len(got))
	}
}

func TestThinPath(t *testing.T) {
	// A circle drawn with 100,000 points keeps points no further apart than
	// the tolerance allows (a chord of the kept polygon stays within tol
	// of the original points) and both ends.
	n := 100000
	pts := make(plotter.XYs, n)
	for i := range pts {
		a := 2 * math.Pi * float64(i) / float64(n-1)
		pts[i] = plotter.XY{X: math.Cos(a), Y: math.Sin(a)}
	}
	got := thinPath(pts, 1e-3)
	if len(got) >= n/10 || got[0] != pts[0] || got[len(got)-1] != pts[n-1] {
		t.Fatalf("%d points, ends %v %v", len(got), got[0], got[len(got)-1])
	}
	for i := 1; i+1 < len(got); i++ {
		d := math.Hypot(got[i].X-got[i-1].X, got[i].Y-got[i-1].Y)
		if d > 2e-3 {
			t.Errorf("kept points %d and %d are %g apart", i-1, i, d)
		}
	}
}

func TestPlotPNGPixelsAsGonumWrites(t *testing.T) {
	// The faster PNG encoding changes only the compression: the decoded
	// pixels equal those of gonum/plot's own PNG writer (png.Encode at the
	// default level) for the same plot.
	rep := fixtureReport(openStub())
	var got bytes.Buffer
	if err := WritePlot(&got, rep, PlotS11, PNG); err != nil {
		t.Fatal(err)
	}
	pl, err := s11Plot(rep)
	if err != nil {
		t.Fatal(err)
	}
	wt, err := pl.WriterTo(16*vg.Centimeter, 10*vg.Centimeter, "png")
	if err != nil {
		t.Fatal(err)
	}
	var want bytes.Buffer
	if _, err := wt.WriteTo(&want); err != nil {
		t.Fatal(err)
	}
	a, err := png.Decode(&got)
	if err != nil {
		t.Fatal(err)
	}
	b, err := png.Decode(&want)
	if err != nil {
		t.Fatal(err)
	}
	if a.Bounds() != b.Bounds() {
		t.Fatalf("bounds %v, gonum's %v", a.Bounds(), b.Bounds())
	}
	for y := a.Bounds().Min.Y; y < a.Bounds().Max.Y; y++ {
		for x := a.Bounds().Min.X; x < a.Bounds().Max.X; x++ {
			if a.At(x, y) != b.At(x, y) {
				t.Fatalf("pixel (%d, %d): %v, gonum's %v", x, y, a.At(x, y), b.At(x, y))
			}
		}
	}
}

// BenchmarkPlotPNG renders the |S11| plot as PNG with gonum/plot's own
// writer (png.Encode, default compression) and with WritePlot (the same
// canvas at png.BestSpeed), a pair to compare in one run.
func BenchmarkPlotPNG(b *testing.B) {
	rep := fixtureReport(openStub())
	b.Run("gonum-default", func(b *testing.B) {
		for b.Loop() {
			pl, err := s11Plot(rep)
			if err != nil {
				b.Fatal(err)
			}
			wt, err := pl.WriterTo(16*vg.Centimeter, 10*vg.Centimeter, "png")
			if err != nil {
				b.Fatal(err)
			}
			if _, err := wt.WriteTo(io.Discard); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("WritePlot", func(b *testing.B) {
		for b.Loop() {
			if err := WritePlot(io.Discard, rep, PlotS11, PNG); err != nil {
				b.Fatal(err)
			}
		}
	})
}
