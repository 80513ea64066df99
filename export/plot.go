package export

import (
	"fmt"
	"image/color"
	"image/png"
	"io"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"stubcraft/physical/units"
)

// Plot is one of the plots of a report.
type Plot int

// The plots, in the order a build writes them.
const (
	PlotS11       Plot = iota + 1 // |S11| across the sweep
	PlotSmith                     // the input reflection on a Smith chart
	PlotTolerance                 // the Monte Carlo histogram of |S11| at f0
)

// Plots returns every plot, in order.
func Plots() []Plot { return []Plot{PlotS11, PlotSmith, PlotTolerance} }

// String returns the plot's name, the base of its file name.
func (p Plot) String() string {
	switch p {
	case PlotS11:
		return "s11"
	case PlotSmith:
		return "smith"
	case PlotTolerance:
		return "tolerance"
	}
	return "Plot(" + strconv.Itoa(int(p)) + ")"
}

// FileName returns the plot's file name in format f: "s11.png".
func (p Plot) FileName(f ImageFormat) string { return p.String() + "." + f.String() }

// ImageFormat is the file format of a plot.
type ImageFormat int

// Image formats.
const (
	PNG ImageFormat = iota + 1
	SVG
)

// ImageFormats returns every image format, in order.
func ImageFormats() []ImageFormat { return []ImageFormat{PNG, SVG} }

// String returns "png" or "svg", the file extension.
func (f ImageFormat) String() string {
	switch f {
	case PNG:
		return "png"
	case SVG:
		return "svg"
	}
	return "ImageFormat(" + strconv.Itoa(int(f)) + ")"
}

// WritePlot renders plot p of rep in format f to w. A report without a
// tolerance analysis gets a tolerance plot that says so.
func WritePlot(w io.Writer, rep Report, p Plot, f ImageFormat) error {
	var (
		build func(Report) (*plot.Plot, error)
		wd    = 16 * vg.Centimeter
		ht    = 10 * vg.Centimeter
	)
	switch p {
	case PlotS11:
		build = s11Plot
	case PlotSmith:
		build, wd, ht = smithPlot, 14*vg.Centimeter, 14*vg.Centimeter
	case PlotTolerance:
		build = tolerancePlot
	default:
		return fmt.Errorf("plot: unknown %v", p)
	}
	if f != PNG && f != SVG {
		return fmt.Errorf("plot %s: unknown %v", p, f)
	}
	pl, err := build(rep)
	if err != nil {
		return fmt.Errorf("plot %s: %w", p, err)
	}
	if f == PNG {
		// The canvas gonum/plot would make for "png", encoded at
		// png.BestSpeed: the same pixels, and deflate's default level
		// spent most of a closed-form build's time for a few kB.
		c := vgimg.New(wd, ht)
		pl.Draw(draw.New(c))
		enc := png.Encoder{CompressionLevel: png.BestSpeed}
		if err := enc.Encode(w, c.Image()); err != nil {
			return fmt.Errorf("plot %s: %w", p.FileName(f), err)
		}
		return nil
	}
	wt, err := pl.WriterTo(wd, ht, f.String())
	if err != nil {
		return fmt.Errorf("plot %s: %w", p.FileName(f), err)
	}
	if _, err := wt.WriteTo(w); err != nil {
		return fmt.Errorf("plot %s: %w", p.FileName(f), err)
	}
	return nil
}

func colour(c rgb) color.RGBA {
	r, g, b := c.parts()
	return color.RGBA{uint8(r), uint8(g), uint8(b), 255}
}

// s11Plot is |S11| in dB against frequency with the −10 dB line and f0.
func s11Plot(rep Report) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("%s: input match |S11|", rep.Name)
	sw := rep.Sweep
	top := rep.FrequencyHz
	if len(sw.FreqHz) > 0 {
		top = sw.FreqHz[len(sw.FreqHz)-1]
	}
	per, unit := units.FrequencyUnit(top)
	p.X.Label.Text = "frequency (" + unit + ")"
	p.Y.Label.Text = "|S11| (dB)"
	p.X.Tick.Marker = markedTicker{marks: []float64{rep.FrequencyHz / per}}
	p.Y.Tick.Marker = markedTicker{}
	p.Add(plotter.NewGrid())
	pts := make(plotter.XYs, len(sw.FreqHz))
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, f := range sw.FreqHz {
		pts[i] = plotter.XY{X: f / per, Y: math.Max(sw.S11DB[i], -60)}
		lo, hi = math.Min(lo, f/per), math.Max(hi, f/per)
	}
	if len(pts) < 2 {
		return p, nil
	}
	pts = thinEnvelope(pts)
	l, err := plotter.NewLine(pts)
	if err != nil {
		return nil, err
	}
	l.Color = colour(colCurveA)
	l.Width = vg.Points(1.5)
	limit, err := plotter.NewLine(plotter.XYs{{X: lo, Y: -10}, {X: hi, Y: -10}})
	if err != nil {
		return nil, err
	}
	limit.Color = colour(colLimit)
	limit.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
	p.Add(limit, l)
	p.Legend.Add("|S11|", l)
	p.Legend.Add("−10 dB", limit)
	p.Y.Max = 0
	if f0 := rep.FrequencyHz / per; f0 >= lo && f0 <= hi {
		ymin := -10.0
		for _, q := range pts {
			ymin = math.Min(ymin, q.Y)
		}
		mark, err := plotter.NewLine(plotter.XYs{{X: f0, Y: ymin}, {X: f0, Y: 0}})
		if err != nil {
			return nil, err
		}
		mark.Color = colour(colCurveB)
		mark.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
		p.Add(mark)
		p.Legend.Add("f0 "+formatFreq(rep.FrequencyHz), mark)
	}
	ymin := -10.0
	for _, q := range pts {
		ymin = math.Min(ymin, q.Y)
	}
	names := []string{"|S11|", "−10 dB", "f0 " + formatFreq(rep.FrequencyHz)}
	lines := []plotter.XYs{pts, {{X: lo, Y: -10}, {X: hi, Y: -10}}}
	if b := rep.Band; b != nil {
		// The band as a bracket down to its goal (or to the worst |S11|
		// reached in it when no goal was given).
		level := b.WorstS11DB
		if b.GoalDB != nil {
			level = *b.GoalDB
		}
		level = math.Max(level, -60)
		ymin = math.Min(ymin, level)
		x1, x2 := b.StartHz/per, b.StopHz/per
		bracket := plotter.XYs{{X: x1, Y: 0}, {X: x1, Y: level}, {X: x2, Y: level}, {X: x2, Y: 0}}
		bl, err := plotter.NewLine(bracket)
		if err != nil {
			return nil, err
		}
		bl.Color = colour(colLimit)
		bl.Width = vg.Points(1)
		p.Add(bl)
		name := fmt.Sprintf("band %s, worst %s dB", units.FormatFrequencyRange(b.StartHz, b.StopHz, 6), minusSign(b.WorstS11DB))
		if b.GoalDB != nil {
			name = fmt.Sprintf("band %s, goal %s dB", units.FormatFrequencyRange(b.StartHz, b.StopHz, 6), minusSign(*b.GoalDB))
		}
		p.Legend.Add(name, bl)
		names = append(names, name)
		lines = append(lines, bracket)
	}
	p.X.Min, p.X.Max, p.Y.Min = lo, hi, ymin
	placeLegend(p, names, lines, nil)
	return p, nil
}

// minusSign writes v to one decimal with a typographic minus, as the
// plot's other labels.
func minusSign(v float64) string {
	return strings.Replace(fmt.Sprintf("%.1f", v), "-", "−", 1)
}

// smithPlot is the Smith chart with the load and input trajectories.
func smithPlot(rep Report) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = fmt.Sprintf("%s: Smith chart, Z0 = %.4g Ω", rep.Name, rep.Z0Ohm)
	p.HideAxes()
	// Room under the disc for the legend, the same on x to keep it round.
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = -1.3, 1.3, -1.5, 1.1
	p.Legend.Top, p.Legend.Left = false, true
	add := func(run []ptMM, c rgb, w float64) error { return addRun(p, run, c, w) }
	for _, run := range smithGrid(180) {
		if err := add(run, colGrid, 0.6); err != nil {
			return nil, err
		}
	}
	if err := add([]ptMM{{-1, 0}, {1, 0}}, colGrid, 0.6); err != nil {
		return nil, err
	}
	if err := add(arcRuns(circle{0, 0, 1}, 360)[0], colInk, 1); err != nil {
		return nil, err
	}
	if err := smithGridValues(p); err != nil {
		return nil, err
	}
	sw := rep.Sweep
	i0 := nearest(sw.FreqHz, rep.FrequencyHz)
	for _, tr := range []struct {
		re, im []float64
		c      rgb
		name   string
	}{{sw.LoadRe, sw.LoadIm, colCurveB, "load"}, {sw.S11Re, sw.S11Im, colCurveA, "matched input"}} {
		if len(tr.re) < 2 || len(tr.re) != len(tr.im) {
			continue
		}
		xy := make(plotter.XYs, len(tr.re))
		for i := range tr.re {
			xy[i] = plotter.XY{X: tr.re[i], Y: tr.im[i]}
		}
		// 1e-3 of the unit circle is about 0.06 mm on the page.
		if err := addSmithTrace(p, thinPath(xy, 1e-3), xy, i0, tr.c, tr.name); err != nil {
			return nil, err
		}
	}
	return p, nil
}

// tolerancePlot is the histogram of the Monte Carlo |S11| at f0.
func tolerancePlot(rep Report) (*plot.Plot, error) {
	p := plot.New()
	t := rep.Tolerance
	if t == nil || len(t.SamplesS11DB) == 0 {
		p.Title.Text = fmt.Sprintf("%s: tolerance analysis not run", rep.Name)
		p.HideAxes()
		return p, nil
	}
	p.Title.Text = fmt.Sprintf("%s: |S11| at f0 over %d boards (seed %d)", rep.Name, t.Samples, t.Seed)
	p.X.Label.Text = "|S11| at f0 (dB)"
	p.Y.Label.Text = "boards"
	p.X.Tick.Marker = markedTicker{}
	p.Add(plotter.NewGrid())
	h, err := plotter.NewHist(plotter.Values(t.SamplesS11DB), 24)
	if err != nil {
		return nil, err
	}
	h.FillColor = colour(colCurveA)
	h.LineStyle.Color = color.White
	p.Add(h)
	top := 0.0
	for _, b := range h.Bins {
		top = math.Max(top, b.Weight)
	}
	var names []string
	var marks []dataBox
	for _, m := range []struct {
		v    float64
		c    rgb
		name string
	}{{t.YieldBelowDB, colLimit, fmt.Sprintf("yield threshold %.0f dB", t.YieldBelowDB)}, {t.P50S11DB, colCurveB, "median"}, {t.P90S11DB, colInk, "90th percentile"}} {
		l, err := plotter.NewLine(plotter.XYs{{X: m.v, Y: 0}, {X: m.v, Y: top}})
		if err != nil {
			return nil, err
		}
		l.Color = colour(m.c)
		l.Dashes = []vg.Length{vg.Points(3), vg.Points(2)}
		p.Add(l)
		p.Legend.Add(m.name, l)
		names = append(names, m.name)
		marks = append(marks, dataBox{m.v, 0, m.v, top})
	}
	for _, b := range h.Bins {
		marks = append(marks, dataBox{b.Min, 0, b.Max, b.Weight})
	}
	p.Y.Min = 0
	placeLegend(p, names, nil, marks)
	return p, nil
}

// smithGrid samples the Smith chart's constant-resistance and
// constant-reactance circles (smithValues, both signs of reactance) with
// n points per full circle, keeping the runs inside |Γ| ≤ 1.
func smithGrid(n int) [][]ptMM {
	var out [][]ptMM
	for _, v := range smithValues() {
		out = append(out, arcRuns(resistanceCircle(v), n)...)
		out = append(out, arcRuns(reactanceCircle(v), n)...)
		out = append(out, arcRuns(reactanceCircle(-v), n)...)
	}
	return out
}

// arcRuns samples circle c at n points and returns the maximal runs of
// consecutive points inside the unit disc (with a small allowance for
// rounding on its rim).
func arcRuns(c circle, n int) [][]ptMM {
	var runs [][]ptMM
	var cur []ptMM
	start := 0
	// Begin at a point outside the disc, if any, so no run wraps.
	for i := 0; i < n; i++ {
		a := 2 * math.Pi * float64(i) / float64(n)
		if math.Hypot(c.cx+c.r*math.Cos(a), c.cy+c.r*math.Sin(a)) > 1+1e-9 {
			start = i
			break
		}
	}
	for k := 0; k <= n; k++ {
		a := 2 * math.Pi * float64(start+k) / float64(n)
		q := ptMM{c.cx + c.r*math.Cos(a), c.cy + c.r*math.Sin(a)}
		if math.Hypot(q.x, q.y) <= 1+1e-9 {
			cur = append(cur, q)
			continue
		}
		if len(cur) > 1 {
			runs = append(runs, cur)
		}
		cur = nil
	}
	if len(cur) > 1 {
		runs = append(runs, cur)
	}
	return runs
}

// addRun draws a polyline of chart points (a Smith-chart grid line or
// trace) on p in colour c, w points wide.
func addRun(p *plot.Plot, run []ptMM, c rgb, w float64) error {
	xy := make(plotter.XYs, len(run))
	for i, q := range run {
		xy[i] = plotter.XY{X: q.x, Y: q.y}
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return err
	}
	l.Color = colour(c)
	l.Width = vg.Points(w)
	p.Add(l)
	return nil
}

// addSmithTrace draws a reflection trace on a Smith chart: line through
// the points path, in the legend as name, and, when i0 ≥ 0, a dot on
// points[i0] (the value at f0).
func addSmithTrace(p *plot.Plot, path, points plotter.XYs, i0 int, c rgb, name string) error {
	l, err := plotter.NewLine(path)
	if err != nil {
		return err
	}
	l.Color = colour(c)
	l.Width = vg.Points(1.6)
	p.Add(l)
	p.Legend.Add(name, l)
	if i0 >= 0 {
		s, err := plotter.NewScatter(plotter.XYs{points[i0]})
		if err != nil {
			return err
		}
		s.GlyphStyle = draw.GlyphStyle{Color: colour(c), Radius: vg.Points(3.5), Shape: draw.CircleGlyph{}}
		p.Add(s)
	}
	return nil
}
