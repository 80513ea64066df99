package export

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// markedTicker puts ticks on a 1-2-5 step and labels each with its value
// in as many decimals as the step needs, so a label always reads the
// value under it; a marked value (f0) gets its own labelled tick, and the
// regular ticks too close to it lose their labels.
type markedTicker struct {
	marks []float64
}

// decimalsOf is the number of decimals that write multiples of step
// exactly (0.25 → 2, 0.1 → 1, 5 → 0).
func decimalsOf(step float64) int {
	for d := 0; d < 9; d++ {
		s := step * math.Pow(10, float64(d))
		if math.Abs(s-math.Round(s)) < 1e-6*s {
			return d
		}
	}
	return 9
}

// Ticks returns the ticks of [min, max].
func (t markedTicker) Ticks(min, max float64) []plot.Tick {
	step := niceStep(max-min, 7)
	dec := decimalsOf(step)
	var out []plot.Tick
	for _, v := range ticks(min, max, step) {
		lab := strconv.FormatFloat(v, 'f', dec, 64)
		for _, m := range t.marks {
			switch d := math.Abs(v - m); {
			case d <= 1e-9*step:
				v = m // the mark itself
			case d < 0.35*step:
				lab = ""
			}
		}
		out = append(out, plot.Tick{Value: v, Label: lab})
		for k := 1; k < 5; k++ { // minor ticks
			if w := v + float64(k)*step/5; w <= max {
				out = append(out, plot.Tick{Value: w})
			}
		}
	}
	for _, m := range t.marks {
		if m < min || m > max {
			continue
		}
		dup := false
		for _, o := range out {
			if o.Label != "" && math.Abs(o.Value-m) <= 1e-9*step {
				dup = true
			}
		}
		if !dup {
			out = append(out, plot.Tick{Value: m, Label: strconv.FormatFloat(m, 'g', 6, 64)})
		}
	}
	return out
}

// dataBox is a rectangle in a plot's data coordinates.
type dataBox struct{ x0, y0, x1, y1 float64 }

// placeLegend puts p's legend in the first corner (top right, top left,
// bottom right, bottom left) where a box of its estimated size covers no
// point of lines (sampled between their vertices) and no box of boxes;
// when every corner holds data it raises the top of the y axis so the
// legend gets a band of its own. names are the legend's entries. Call it
// after every plotter is added and the axis ranges are final.
func placeLegend(p *plot.Plot, names []string, lines []plotter.XYs, boxes []dataBox) {
	xlo, xhi, ylo, yhi := p.X.Min, p.X.Max, p.Y.Min, p.Y.Max
	long := 0
	for _, n := range names {
		long = max(long, len([]rune(n)))
	}
	// Estimated from gonum's default legend font (12 px text, 20 pt
	// thumbnails) on our plots of about 380 × 220 pt of data area.
	fw := math.Min(0.9, (30+6*float64(long))/380)
	fh := math.Min(0.8, (14*float64(len(names))+8)/220)
	hit := func(b dataBox) bool {
		for _, l := range lines {
			for i := range l {
				if i == 0 {
					if inBox(l[0].X, l[0].Y, b) {
						return true
					}
					continue
				}
				for k := 1; k <= 20; k++ {
					s := float64(k) / 20
					if inBox(l[i-1].X+s*(l[i].X-l[i-1].X), l[i-1].Y+s*(l[i].Y-l[i-1].Y), b) {
						return true
					}
				}
			}
		}
		for _, o := range boxes {
			if o.x0 <= b.x1 && b.x0 <= o.x1 && o.y0 <= b.y1 && b.y0 <= o.y1 {
				return true
			}
		}
		return false
	}
	w, h := fw*(xhi-xlo), fh*(yhi-ylo)
	for _, c := range []struct{ top, left bool }{{true, false}, {true, true}, {false, false}, {false, true}} {
		b := dataBox{xhi - w, yhi - h, xhi, yhi}
		if c.left {
			b.x0, b.x1 = xlo, xlo+w
		}
		if !c.top {
			b.y0, b.y1 = ylo, ylo+h
		}
		if !hit(b) {
			p.Legend.Top, p.Legend.Left = c.top, c.left
			return
		}
	}
	p.Y.Max = yhi + (yhi-ylo)*fh/(1-fh)*1.15
	p.Legend.Top, p.Legend.Left = true, false
}

func inBox(x, y float64, b dataBox) bool { return x >= b.x0 && x <= b.x1 && y >= b.y0 && y <= b.y1 }

// smithGridValues labels the Smith chart's grid: each constant-resistance
// circle where it meets the real axis, each constant-reactance arc (±j)
// just outside the rim where it meets it.
func smithGridValues(p *plot.Plot) error {
	var xy plotter.XYs
	var labels []string
	for _, v := range smithValues() {
		// Γ of z = r on the real axis: (r−1)/(r+1); the label sits just
		// above the axis, right of the crossing.
		xy = append(xy, plotter.XY{X: (v-1)/(v+1) + 0.01, Y: 0.02})
		labels = append(labels, trimFloat(v))
		for _, sg := range []float64{1, -1} {
			g := (complex(0, sg*v) - 1) / (complex(0, sg*v) + 1)
			r := 1.08
			x, y := real(g)*r, imag(g)*r
			xy = append(xy, plotter.XY{X: x - 0.05, Y: y - 0.02})
			s := "+j" + trimFloat(v)
			if sg < 0 {
				s = "−j" + trimFloat(v)
			}
			labels = append(labels, s)
		}
	}
	l, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: labels})
	if err != nil {
		return err
	}
	for i := range l.TextStyle {
		l.TextStyle[i].Font.Size = vg.Points(7)
		l.TextStyle[i].Color = colour(colMuted)
	}
	p.Add(l)
	return nil
}
