package export

import (
	"math"

	"github.com/jung-kurt/gofpdf"
	"gonum.org/v1/plot/plotter"
)

// chart is an x–y plot area on paper with linear axes.
type chart struct {
	x, y, w, h     float64 // plot frame, paper mm
	xlo, xhi, xst  float64 // x range and tick step
	ylo, yhi, yst  float64
	xlabel, ylabel string
}

func (c chart) X(v float64) float64 { return c.x + (v-c.xlo)/(c.xhi-c.xlo)*c.w }
func (c chart) Y(v float64) float64 { return c.y + c.h - (v-c.ylo)/(c.yhi-c.ylo)*c.h }

// niceStep returns a 1-2-5 tick step giving about n intervals over span.
func niceStep(span float64, n int) float64 {
	if !(span > 0) || n < 1 {
		return 1
	}
	raw := span / float64(n)
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= raw*(1-1e-9) {
			return m * p
		}
	}
	return 10 * p
}

// ticks returns the multiples of step within [lo, hi].
func ticks(lo, hi, step float64) []float64 {
	var t []float64
	for k := math.Ceil(lo/step - 1e-9); k*step <= hi+step*1e-9; k++ {
		v := k * step
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		t = append(t, v)
	}
	return t
}

// frame draws the chart's grid, axes, tick values and labels; format
// writes a tick value.
func (d *doc) frame(c chart, title string, format func(float64) string) {
	f := d.pdf
	f.SetFont(fontSans, "B", 7.5)
	setText(f, colInk)
	f.Text(c.x, c.y-2.2, title)
	setDraw(f, colGrid)
	f.SetLineWidth(0.1)
	f.SetFont(fontSans, "", 5.5)
	setText(f, colMuted)
	for _, v := range ticks(c.xlo, c.xhi, c.xst) {
		f.Line(c.X(v), c.y, c.X(v), c.y+c.h)
		s := format(v)
		f.Text(c.X(v)-f.GetStringWidth(s)/2, c.y+c.h+3, s)
	}
	for _, v := range ticks(c.ylo, c.yhi, c.yst) {
		f.Line(c.x, c.Y(v), c.x+c.w, c.Y(v))
		s := format(v)
		f.Text(c.x-1-f.GetStringWidth(s), c.Y(v)+0.8, s)
	}
	setDraw(f, colInk)
	f.SetLineWidth(0.2)
	f.Rect(c.x, c.y, c.w, c.h, "D")
	f.SetFont(fontSans, "", 6)
	setText(f, colInk)
	f.Text(c.x+c.w-f.GetStringWidth(c.xlabel), c.y+c.h+6, c.xlabel)
	f.TransformBegin()
	f.TransformRotate(90, c.x-7.5, c.y+c.h/2)
	f.Text(c.x-7.5-f.GetStringWidth(c.ylabel)/2, c.y+c.h/2, c.ylabel)
	f.TransformEnd()
}

// polyline draws the points (xs[i], ys[i]) clipped to the chart frame.
func (d *doc) polyline(c chart, xs, ys []float64, col rgb, width float64) {
	f := d.pdf
	if len(xs) < 2 {
		return
	}
	n := min(len(xs), len(ys))
	pts := make(plotter.XYs, n)
	increasing := true
	for i := range pts {
		pts[i] = plotter.XY{X: xs[i], Y: ys[i]}
		increasing = increasing && (i == 0 || xs[i] > xs[i-1])
	}
	if increasing {
		pts = thinEnvelope(pts) // a long sweep, drawn at page resolution
	}
	f.ClipRect(c.x, c.y, c.w, c.h, false)
	setDraw(f, col)
	f.SetLineWidth(width)
	f.SetLineJoinStyle("round")
	f.MoveTo(c.X(pts[0].X), c.Y(pts[0].Y))
	for _, q := range pts[1:] {
		f.LineTo(c.X(q.X), c.Y(q.Y))
	}
	f.DrawPath("D")
	f.ClipEnd()
}

// dashed draws a dashed line in colour col.
func dashed(f *gofpdf.Fpdf, x1, y1, x2, y2 float64, col rgb) {
	setDraw(f, col)
	f.SetLineWidth(0.25)
	f.SetDashPattern([]float64{1.5, 1}, 0)
	f.Line(x1, y1, x2, y2)
	f.SetDashPattern(nil, 0)
}

// circle is a circle in the reflection-coefficient plane.
type circle struct{ cx, cy, r float64 }

// smithValues are the resistances and reactances (normalised) of the
// Smith chart grid.
func smithValues() []float64 { return []float64{0.2, 0.5, 1, 2, 5} }

// resistanceCircle is the locus of constant normalised resistance r in the
// Γ plane: centre r/(1+r), radius 1/(1+r) (exact, from Γ = (z−1)/(z+1)).
func resistanceCircle(r float64) circle { return circle{r / (1 + r), 0, 1 / (1 + r)} }

// reactanceCircle is the locus of constant normalised reactance x ≠ 0:
// centre (1, 1/x), radius 1/|x|; only its part inside |Γ| ≤ 1 belongs to
// the chart.
func reactanceCircle(x float64) circle { return circle{1, 1 / x, 1 / math.Abs(x)} }

// gammaOf returns the reflection coefficient of normalised impedance z.
func gammaOf(z complex128) complex128 { return (z - 1) / (z + 1) }
