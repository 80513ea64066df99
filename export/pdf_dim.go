package export

import (
	"math"

	"github.com/jung-kurt/gofpdf"
)

// Dimension drawing on paper (mm, y down), after the conventions of ISO
// 129-1: thin extension lines that start a small gap off the object and
// run a little past the dimension line, filled arrowheads, the value in
// mm above a horizontal dimension line. Text is always horizontal
// (unidirectional dimensioning), so it reads from the foot of the sheet.
const (
	arrowLen   = 2.0  // arrowhead length
	arrowHalf  = 0.55 // arrowhead half width
	extGap     = 0.8  // object to the start of an extension line
	extPast    = 1.5  // extension line past the dimension line
	dimFontPt  = 6.5  // dimension values
	noteFontPt = 5.5  // small labels
	dimLineW   = 0.13 // dimension and extension lines
)

// arrow draws a filled arrowhead with its tip at (x, y) pointing along
// (dx, dy).
func arrow(f *gofpdf.Fpdf, x, y, dx, dy float64) {
	n := math.Hypot(dx, dy)
	dx, dy = dx/n, dy/n
	bx, by := x-dx*arrowLen, y-dy*arrowLen
	f.Polygon([]gofpdf.PointType{{X: x, Y: y}, {X: bx - dy*arrowHalf, Y: by + dx*arrowHalf}, {X: bx + dy*arrowHalf, Y: by - dx*arrowHalf}}, "F")
}

// dimPen sets the dimension line style.
func dimPen(f *gofpdf.Fpdf) {
	setDraw(f, colDim)
	setFill(f, colDim)
	f.SetLineWidth(dimLineW)
	f.SetDashPattern(nil, 0)
}

// label writes s with its reference point at (x, y): align is "L", "C" or
// "R" horizontally; the text is centred vertically on y, on a white
// ground so it reads over copper and hatching.
func label(f *gofpdf.Fpdf, s string, x, y float64, align string, pt float64, c rgb) {
	f.SetFont(fontSans, "", pt)
	w := f.GetStringWidth(s)
	switch align {
	case "C":
		x -= w / 2
	case "R":
		x -= w
	}
	h := pt * 25.4 / 72 * 0.72 // cap height
	setFill(f, 0xffffff)
	f.Rect(x-0.4, y-h/2-0.45, w+0.8, h+0.9, "F")
	setText(f, c)
	f.Text(x, y+h/2, s)
}

// textWidth is the width of s in the dimension font.
func textWidth(f *gofpdf.Fpdf, s string, pt float64) float64 {
	f.SetFont(fontSans, "", pt)
	return f.GetStringWidth(s)
}

// dimH dimensions the horizontal distance between the object points
// (x1, y1) and (x2, y2) with its dimension line at paper y = yd. When the
// value does not fit between the arrows it goes under the line (below
// set) or beside the right arrow.
func dimH(f *gofpdf.Fpdf, x1, y1, x2, y2, yd float64, s string, below bool) {
	if x2 < x1 {
		x1, y1, x2, y2 = x2, y2, x1, y1
	}
	dimPen(f)
	ext := func(x, y float64) {
		dir := math.Copysign(1, yd-y)
		f.Line(x, y+dir*extGap, x, yd+dir*extPast)
	}
	ext(x1, y1)
	ext(x2, y2)
	gap := x2 - x1
	if gap >= 2*arrowLen+0.8 {
		f.Line(x1, yd, x2, yd)
		arrow(f, x1, yd, -1, 0)
		arrow(f, x2, yd, 1, 0)
	} else {
		f.Line(x1-arrowLen-2, yd, x2+arrowLen+2, yd)
		arrow(f, x1, yd, 1, 0)
		arrow(f, x2, yd, -1, 0)
	}
	tw := textWidth(f, s, dimFontPt)
	switch {
	case tw <= gap-0.6:
		label(f, s, (x1+x2)/2, yd-1.7, "C", dimFontPt, colDim)
	case below:
		label(f, s, (x1+x2)/2, yd+1.9, "C", dimFontPt, colDim)
	case gap < 2*arrowLen+0.8:
		label(f, s, x2+arrowLen+2.6, yd, "L", dimFontPt, colDim)
	default:
		label(f, s, (x1+x2)/2, yd-1.7, "C", dimFontPt, colDim)
	}
}

// dimV dimensions the vertical distance between the object points
// (x1, y1) and (x2, y2) with its dimension line at paper x = xd; the value
// goes beside the line, on the right when right is set.
func dimV(f *gofpdf.Fpdf, x1, y1, x2, y2, xd float64, s string, right bool) {
	if y2 < y1 {
		x1, y1, x2, y2 = x2, y2, x1, y1
	}
	dimPen(f)
	ext := func(x, y float64) {
		dir := math.Copysign(1, xd-x)
		f.Line(x+dir*extGap, y, xd+dir*extPast, y)
	}
	ext(x1, y1)
	ext(x2, y2)
	gap := y2 - y1
	if gap >= 2*arrowLen+0.8 {
		f.Line(xd, y1, xd, y2)
		arrow(f, xd, y1, 0, -1)
		arrow(f, xd, y2, 0, 1)
	} else {
		f.Line(xd, y1-arrowLen-2, xd, y2+arrowLen+2)
		arrow(f, xd, y1, 0, 1)
		arrow(f, xd, y2, 0, -1)
	}
	if right {
		label(f, s, xd+1.2, (y1+y2)/2, "L", dimFontPt, colDim)
	} else {
		label(f, s, xd-1.2, (y1+y2)/2, "R", dimFontPt, colDim)
	}
}

// dimAcross dimensions a width across a line drawn at paper x from y1 to
// y2 (the two copper edges): arrows outside the copper point in at the
// edges, and the value sits at the end of the upper lead (up) or the
// lower one, extra mm further out.
func dimAcross(f *gofpdf.Fpdf, x, y1, y2 float64, s string, up bool, extra float64) {
	if y2 < y1 {
		y1, y2 = y2, y1
	}
	dimPen(f)
	lead := arrowLen + 2.2
	a, b := lead, lead
	if up {
		a += extra
	} else {
		b += extra
	}
	f.Line(x, y1-a, x, y2+b)
	arrow(f, x, y1, 0, 1)
	arrow(f, x, y2, 0, -1)
	if up {
		label(f, s, x, y1-a-1.6, "C", dimFontPt, colDim)
	} else {
		label(f, s, x, y2+b+1.6, "C", dimFontPt, colDim)
	}
}

// leader draws a line from the object point (x1, y1) with a dot to
// (x2, y2) and a short shoulder, the text beyond it, one line under the
// next.
func leader(f *gofpdf.Fpdf, x1, y1, x2, y2 float64, lines ...string) {
	dimPen(f)
	f.Circle(x1, y1, 0.35, "F")
	dir := math.Copysign(1, x2-x1)
	f.Line(x1, y1, x2, y2)
	f.Line(x2, y2, x2+dir*2, y2)
	align := "L"
	if dir < 0 {
		align = "R"
	}
	for i, s := range lines {
		label(f, s, x2+dir*2.6, y2+float64(i)*2.6, align, dimFontPt, colDim)
	}
}
