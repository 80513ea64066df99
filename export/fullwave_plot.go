package export

import (
	"fmt"
	"io"
	"math"
	"stubcraft/physical"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// FullwaveCurves are the matched input reflections a full-wave check
// compares: the full-wave solve's and the circuit model's, at the same
// frequencies.
type FullwaveCurves struct {
	Name     string
	F0       float64 // Hz
	Z0       float64 // ohm
	Freqs    []float64
	Fullwave []complex128
	Circuit  []complex128
}

// FullwavePlotNames are the plots WriteFullwavePlot draws.
func FullwavePlotNames() []string {
	return []string{"fullwave-s11.png", "fullwave-s11.svg", "fullwave-smith.png", "fullwave-smith.svg"}
}

// WriteFullwavePlot writes one of FullwavePlotNames of c to w: |S11| in dB
// of both models against frequency, or both on a Smith chart.
func WriteFullwavePlot(w io.Writer, name string, c FullwaveCurves) error {
	var p *plot.Plot
	var wd, ht vg.Length
	var format string
	var err error
	switch name {
	case "fullwave-s11.png", "fullwave-s11.svg":
		p, err = fullwaveS11Plot(c)
		wd, ht = 16*vg.Centimeter, 10*vg.Centimeter
	case "fullwave-smith.png", "fullwave-smith.svg":
		p, err = fullwaveSmithPlot(c)
		wd, ht = 14*vg.Centimeter, 14*vg.Centimeter
	default:
		return fmt.Errorf("export: no full-wave plot %q", name)
	}
	if err != nil {
		return fmt.Errorf("plot %s: %w", name, err)
	}
	format = name[len(name)-3:]
	wt, err := p.WriterTo(wd, ht, format)
	if err != nil {
		return fmt.Errorf("plot %s: %w", name, err)
	}
	_, err = wt.WriteTo(w)
	return err
}

func fullwaveS11Plot(c FullwaveCurves) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("%s: |S11|, full-wave and circuit model", c.Name)
	p.X.Label.Text = "frequency (GHz)"
	p.Y.Label.Text = "|S11| (dB)"
	p.Add(plotter.NewGrid())
	for _, tr := range []struct {
		s    []complex128
		col  rgb
		name string
	}{{c.Circuit, colCurveB, "circuit model"}, {c.Fullwave, colCurveA, "full-wave (FDTD)"}} {
		pts := make(plotter.XYs, len(c.Freqs))
		for i, f := range c.Freqs {
			pts[i] = plotter.XY{X: f / 1e9, Y: math.Max(physical.MagDB(tr.s[i]), -60)}
		}
		if len(pts) < 2 {
			continue
		}
		l, err := plotter.NewLine(pts)
		if err != nil {
			return nil, err
		}
		l.Color = colour(tr.col)
		l.Width = vg.Points(1.5)
		p.Add(l)
		p.Legend.Add(tr.name, l)
	}
	p.Y.Max = 0
	p.Legend.Top = false
	return p, nil
}

func fullwaveSmithPlot(c FullwaveCurves) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("%s: Smith chart, Z0 = %.4g Ω", c.Name, c.Z0)
	p.HideAxes()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = -1.1, 1.1, -1.1, 1.1
	add := func(run []ptMM, col rgb, w float64) error { return addRun(p, run, col, w) }
	for _, run := range smithGrid(180) {
		if err := add(run, colGrid, 0.6); err != nil {
			return nil, err
		}
	}
	if err := add(arcRuns(circle{0, 0, 1}, 360)[0], colInk, 1); err != nil {
		return nil, err
	}
	i0 := nearest(c.Freqs, c.F0)
	for _, tr := range []struct {
		s    []complex128
		col  rgb
		name string
	}{{c.Circuit, colCurveB, "circuit model"}, {c.Fullwave, colCurveA, "full-wave (FDTD)"}} {
		if len(tr.s) < 2 {
			continue
		}
		xy := make(plotter.XYs, len(tr.s))
		for i, g := range tr.s {
			xy[i] = plotter.XY{X: real(g), Y: imag(g)}
		}
		if err := addSmithTrace(p, xy, xy, i0, tr.col, tr.name); err != nil {
			return nil, err
		}
	}
	return p, nil
}
