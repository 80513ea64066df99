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
	styledLabel(f, s, x, y, align, pt, "", c)
}

// styledLabel is label in a font style ("" or "B").
func styledLabel(f *gofpdf.Fpdf, s string, x, y float64, align string, pt float64, style string, c rgb) {
	f.SetFont(fontSans, style, pt)
	w := f.GetStringWidth(s)
	switch align {
	case "C":
		x -= w / 2
	case "R":
		x -= w
	}
	h := pt * 25.4 / 72 * capEm // cap height
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

// ink draws dimensions on a sheet. With a placer, every line it draws is
// an obstacle of the current group and every label is queued, to be placed
// clear of the others by flush; without one, a label is drawn at its
// first spot at once.
type ink struct {
	f        *gofpdf.Fpdf
	pl       *placer
	owner    int
	queue    []labelReq
	optional bool // queued dimension values may be dropped (left to an enlarged view)
}

// pdfWidth measures text in the drawing's sans font, mm.
func pdfWidth(f *gofpdf.Fpdf) func(string, float64, bool) float64 {
	return func(s string, pt float64, bold bool) float64 {
		style := ""
		if bold {
			style = "B"
		}
		f.SetFont(fontSans, style, pt)
		return f.GetStringWidth(s)
	}
}

// group starts the lines and labels of one element.
func (k *ink) group() {
	if k.pl != nil {
		k.owner = k.pl.group()
	}
}

// line draws a line of the current group.
func (k *ink) line(x1, y1, x2, y2 float64) {
	k.f.Line(x1, y1, x2, y2)
	if k.pl != nil {
		k.pl.line(obsLine, k.owner, x1, y1, x2, y2)
	}
}

// text asks for a label of the current group.
func (k *ink) text(l labelReq) {
	l.owner = k.owner
	if l.col == 0 {
		l.col = colDim
	}
	if k.pl == nil {
		drawPlaced(k.f, placedLabel{req: l, at: l.spots[0]})
		return
	}
	k.queue = append(k.queue, l)
}

// value asks for a dimension value: droppable in a view that leaves
// tight values to an enlarged view.
func (k *ink) value(s string, anchor ptMM, spots ...spot) {
	k.text(labelReq{lines: []string{s}, pt: dimFontPt, anchor: anchor, spots: spots, optional: k.optional, priority: 1})
}

// note asks for a small muted label.
func (k *ink) note(s string, anchor ptMM, spots ...spot) {
	k.text(labelReq{lines: []string{s}, pt: noteFontPt, col: colMuted, anchor: anchor, spots: spots, priority: 2, optional: k.optional})
}

// flush places the queued labels and draws them; it returns how many
// optional labels found no clear spot and were left out.
func (k *ink) flush() int {
	if k.pl == nil {
		return 0
	}
	dropped := 0
	for _, p := range k.pl.placeAll(k.queue) {
		if !p.ok && p.req.optional {
			dropped++
			continue
		}
		drawPlaced(k.f, p)
	}
	k.queue = nil
	return dropped
}

// drawPlaced draws a placed label and its leader.
func drawPlaced(f *gofpdf.Fpdf, p placedLabel) {
	l := p.req
	if p.leader {
		box := p.box
		if box == (rect{}) {
			return
		}
		a := box.nearest(l.anchor)
		dimPen(f)
		f.Circle(l.anchor.x, l.anchor.y, 0.3, "F")
		f.Line(l.anchor.x, l.anchor.y, a.x, a.y)
	}
	style := ""
	if l.bold {
		style = "B"
	}
	for i, s := range l.lines {
		styledLabel(f, s, p.at.x, p.at.y+float64(i)*pitchEm*l.pt*25.4/72, string(p.at.align), l.pt, style, l.col)
	}
}

// dimH dimensions the horizontal distance between the object points
// (x1, y1) and (x2, y2) with its dimension line at paper y = yd. The value
// goes above the line between the arrows when it fits, else under it
// (below set) or beside an arrow, else staggered on a leader.
func (k *ink) dimH(x1, y1, x2, y2, yd float64, s string, below bool) {
	if x2 < x1 {
		x1, y1, x2, y2 = x2, y2, x1, y1
	}
	k.group()
	dimPen(k.f)
	ext := func(x, y float64) {
		dir := math.Copysign(1, yd-y)
		k.line(x, y+dir*extGap, x, yd+dir*extPast)
	}
	ext(x1, y1)
	ext(x2, y2)
	gap := x2 - x1
	small := gap < 2*arrowLen+0.8
	if !small {
		k.line(x1, yd, x2, yd)
		arrow(k.f, x1, yd, -1, 0)
		arrow(k.f, x2, yd, 1, 0)
	} else {
		k.line(x1-arrowLen-2, yd, x2+arrowLen+2, yd)
		arrow(k.f, x1, yd, 1, 0)
		arrow(k.f, x2, yd, -1, 0)
	}
	k.value(s, ptMM{(x1 + x2) / 2, yd}, hSpots(x1, x2, yd, textWidth(k.f, s, dimFontPt), 1.7, 1.9, arrowLen+2.6, below)...)
}

// dimV dimensions the vertical distance between the object points
// (x1, y1) and (x2, y2) with its dimension line at paper x = xd; the value
// goes beside the line, on the right when right is set, else on the
// other side or moved along the line.
func (k *ink) dimV(x1, y1, x2, y2, xd float64, s string, right bool) {
	if y2 < y1 {
		x1, y1, x2, y2 = x2, y2, x1, y1
	}
	k.group()
	dimPen(k.f)
	ext := func(x, y float64) {
		dir := math.Copysign(1, xd-x)
		k.line(x+dir*extGap, y, xd+dir*extPast, y)
	}
	ext(x1, y1)
	ext(x2, y2)
	gap := y2 - y1
	if gap >= 2*arrowLen+0.8 {
		k.line(xd, y1, xd, y2)
		arrow(k.f, xd, y1, 0, -1)
		arrow(k.f, xd, y2, 0, 1)
	} else {
		k.line(xd, y1-arrowLen-2, xd, y2+arrowLen+2)
		arrow(k.f, xd, y1, 0, 1)
		arrow(k.f, xd, y2, 0, -1)
	}
	k.value(s, ptMM{xd, (y1 + y2) / 2}, vSpots(xd, y1, y2, 1.2, 2.7, right)...)
}

// dimAcross dimensions a width across a line drawn at paper x from y1 to
// y2 (the two copper edges): arrows outside the copper point in at the
// edges, and the value sits at the end of the upper lead (up) or the
// lower one, extra mm further out, or elsewhere along the leads.
func (k *ink) dimAcross(x, y1, y2 float64, s string, up bool, extra float64) {
	if y2 < y1 {
		y1, y2 = y2, y1
	}
	k.group()
	dimPen(k.f)
	lead := arrowLen + 2.2
	a, b := lead, lead
	if up {
		a += extra
	} else {
		b += extra
	}
	k.line(x, y1-a, x, y2+b)
	arrow(k.f, x, y1, 0, 1)
	arrow(k.f, x, y2, 0, -1)
	top := spot{x: x, y: y1 - a - 1.6, align: 'C'}
	bot := spot{x: x, y: y2 + b + 1.6, align: 'C'}
	spots := []spot{top, bot}
	anchor := ptMM{x, y1 - a}
	if !up {
		spots = []spot{bot, top}
		anchor = ptMM{x, y2 + b}
	}
	spots = append(spots,
		spot{x: x + 1, y: y1 - a + 1, align: 'L'}, spot{x: x - 1, y: y1 - a + 1, align: 'R'},
		spot{x: x + 1, y: y2 + b - 1, align: 'L'}, spot{x: x - 1, y: y2 + b - 1, align: 'R'},
	)
	for i := 1; i <= 3; i++ {
		st := float64(i) * 2.7
		spots = append(spots, spot{x: x, y: top.y - st, align: 'C', leader: true}, spot{x: x, y: bot.y + st, align: 'C', leader: true})
	}
	k.value(s, anchor, spots...)
}

// leader calls out the object point (x1, y1) with lines of text, first
// choice beside (x2, y2), on a leader.
func (k *ink) leader(x1, y1, x2, y2 float64, lines ...string) {
	k.group()
	dir := math.Copysign(1, x2-x1)
	align := byte('L')
	if dir < 0 {
		align = 'R'
	}
	spots := []spot{{x: x2 + dir*0.6, y: y2, align: align, leader: true}, {x: x1 - (x2 - x1) - dir*0.6, y: y2, align: 'L' + 'R' - align, leader: true}}
	k.text(labelReq{lines: lines, pt: dimFontPt, anchor: ptMM{x1, y1}, spots: spots, priority: 1})
}
