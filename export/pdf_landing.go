package export

import (
	"fmt"
	"math"
	"sort"

	"stubcraft/synth/geom"
)

// landingMM is the edge-launch landing at the source port (J1), mm: the
// signal pad (pin 1) and the ground pads on its +y and −y sides (pins 2
// and 3), each a rectangle, and the ground pads' vias.
type landingMM struct {
	signal, up, down rect
	vias             []viaMM
}

// newLanding finds the source port's landing among the pads of lay; nil
// when the board has plain port pads.
func newLanding(lay geom.Layout) *landingMM {
	var l landingMM
	found := 0
	for _, p := range lay.Pads {
		r := padRect(p)
		switch p.Pin {
		case geom.PinSource:
			l.signal = r
		case "J1," + geom.PinGroundUp:
			l.up, found = r, found+1
		case "J1," + geom.PinGroundDown:
			l.down, found = r, found+1
		}
	}
	if found != 2 {
		return nil
	}
	for _, v := range lay.Vias {
		c := ptOf(v.Center)
		if l.up.contains(c) || l.down.contains(c) {
			l.vias = append(l.vias, viaMM{c: c, drill: nmToMM(v.Drill), pad: nmToMM(v.Pad), ground: true})
		}
	}
	return &l
}

// padRect is the rectangle of a flashed pad, mm.
func padRect(p geom.Pad) rect {
	c := ptOf(p.Center)
	return rect{c.x - nmToMM(p.W)/2, c.y - nmToMM(p.H)/2, c.x + nmToMM(p.W)/2, c.y + nmToMM(p.H)/2}
}

// fenceVias are the vias of a via fence in lay, mm: the ground vias that
// are neither in a landing's ground pad nor stitching a coplanar pour (a
// board with a pour has no fence; geom refuses one).
func fenceVias(lay geom.Layout) []viaMM {
	var grounds []rect
	for _, p := range lay.Pads {
		if p.Net == geom.NetGround && p.Function == geom.SMDPad {
			grounds = append(grounds, padRect(p))
		}
	}
	for _, n := range lay.Copper {
		if n.Name != geom.NetRF {
			return nil
		}
	}
	var out []viaMM
	for _, v := range lay.Vias {
		c := ptOf(v.Center)
		inPad := false
		for _, g := range grounds {
			inPad = inPad || g.contains(c)
		}
		if v.Net == geom.NetGround && !inPad {
			out = append(out, viaMM{c: c, drill: nmToMM(v.Drill), pad: nmToMM(v.Pad), ground: true})
		}
	}
	return out
}

// fenceRow finds the fence beside the last through segment (the source
// feed) on side (+1 above it, −1 below): the via nearest the line there,
// its distance from the line's edge (the fence offset as drawn), and its
// neighbour in the same row toward the board's inside. ok is false when
// the row has fewer than two vias.
func (b boardModel) fenceRow(side float64) (near, next viaMM, offset float64, ok bool) {
	if len(b.segs) == 0 {
		return viaMM{}, viaMM{}, 0, false
	}
	g := b.segs[len(b.segs)-1]
	edge := g.hi
	if side < 0 {
		edge = g.lo
	}
	offset = math.Inf(1)
	var row []viaMM
	for _, v := range b.fence {
		if v.c.x < g.x0 || v.c.x > g.x1 || side*(v.c.y-edge) <= 0 {
			continue
		}
		d := side * (v.c.y - edge)
		switch {
		case d < offset-1e-6:
			offset, row = d, []viaMM{v}
		case d < offset+1e-6:
			row = append(row, v)
		}
	}
	if len(row) < 2 {
		return viaMM{}, viaMM{}, 0, false
	}
	sort.Slice(row, func(i, j int) bool { return row[i].c.x > row[j].c.x })
	return row[0], row[1], offset, true
}

// landingSheet draws the source port's edge-launch landing and the via
// fence beside it, magnified, with what a fab and a bench need to check
// them: the signal pad's length and width, the gap to each ground pad,
// the ground pads' width and length and their pull-back from the edge,
// the fence's pitch and its offset from the line (to the via centres).
// The load port's landing is its mirror image. It joins the sheet the
// previous part ended on when it fits there.
func (d *doc) landingSheet(b boardModel) {
	l := b.landing
	side := -1.0 // the fence is dimensioned on the side without stubs
	for _, s := range b.stubs {
		if s.side < 0 {
			side = 1
		}
	}
	near, next, offset, fenced := b.fenceRow(side)
	if l == nil && !fenced {
		return
	}
	// The region shown, board mm: from the source edge inward past the
	// landing and two fence vias, across past the ground pads and the
	// fence row, 1 mm more all round, within the board.
	reach, across := 0.0, 0.0
	if l != nil {
		reach = math.Max(b.w-l.signal.x0, b.w-math.Min(l.up.x0, l.down.x0))
		across = math.Max(l.up.y1-b.centreY, b.centreY-l.down.y0)
	}
	if fenced {
		reach = math.Max(reach, b.w-next.c.x+near.pad/2)
		across = math.Max(across, math.Abs(near.c.y-b.centreY)+near.pad/2)
	}
	reg := rect{math.Max(0, b.w-reach-1), math.Max(0, b.centreY-across-1), b.w, math.Min(b.h, b.centreY+across+1)}
	x, y, w, h := d.contentBox()
	const room = 38.0 // paper mm around the board part for dimensions
	// The magnifications the detail view may take, largest first.
	scales := [...]float64{10, 8, 6, 5, 4, 3, 2, 1}
	scale := scales[len(scales)-1]
	for _, s := range scales {
		if (reg.x1-reg.x0)*s <= w-2*room && (reg.y1-reg.y0)*s <= h/2 {
			scale = s
			break
		}
	}
	pour := b.pourIn(reg)
	need := viewCaptionH + (reg.y1-reg.y0)*scale + 2*room
	if pour {
		need += landingKeyH
	}
	title := "Edge-launch landing and via fence"
	if l == nil {
		title = "Via fence"
	} else if !fenced {
		title = "Edge-launch landing"
	}
	top, ok := d.joinSheet(title, need)
	if !ok {
		d.newSheet(title, d.rep.Name+": detail at the source port")
		top = y
	}
	what := "the source port (J1); the load port's landing (J2) is its mirror image"
	if l == nil {
		what = "the fence beside the source feed"
	}
	d.viewCaption(x, top+4, fmt.Sprintf("DETAIL %g:1", scale), what+"; dimensions in mm, do not measure this view")
	ox := x + (w-(reg.x1-reg.x0)*scale)/2
	oy := top + viewCaptionH + room
	v := view{scale, ox - scale*reg.x0, oy + scale*reg.y1}
	f := d.pdf
	k := &ink{f: f, pl: newPlacer(pdfWidth(f), rect{x, top + viewCaptionH, x + w, oy + (reg.y1-reg.y0)*scale + room})}
	f.RawWriteStr("/LandingDetail BMC\n")
	d.landingArt(k, b, v, reg)
	f.RawWriteStr("EMC\n")
	if l != nil {
		d.landingDims(k, b, v, reg)
	}
	if fenced {
		pad := v.s * near.pad / 2
		k.dimV(v.X(near.c.x), v.Y(near.c.y-side*offset), v.X(near.c.x), v.Y(near.c.y), v.X(near.c.x), "fence offset "+mm3(offset), true)
		yd := v.Y(near.c.y) - side*(pad+4)
		k.dimH(v.X(next.c.x), v.Y(near.c.y), v.X(near.c.x), v.Y(near.c.y), yd, "fence pitch "+mm3(near.c.x-next.c.x), side > 0)
		k.leader(v.X(next.c.x), v.Y(next.c.y), v.X(next.c.x)-8, v.Y(next.c.y)-side*(pad+9),
			fmt.Sprintf("fence via: drill Ø%s", mm3(next.drill)), fmt.Sprintf("pad Ø%s", mm3(next.pad)))
	}
	k.flush()
	d.tailPage, d.tailY = f.PageNo(), oy+(reg.y1-reg.y0)*scale+room
	if pour {
		d.landingKey(x, d.tailY+3)
		d.tailY += landingKeyH
	}
}

// landingKeyH is the height (paper mm) of the landing detail's key.
const landingKeyH = 7.0

// landingKey draws the key of the landing detail's fills at (x, y), paper
// mm: the copper of the line, stubs and pads, and a coplanar ground pour,
// which sheet 1 and layout.svg fill alike.
func (d *doc) landingKey(x, y float64) {
	f := d.pdf
	f.SetFont(fontSans, "", 6.5)
	f.SetLineWidth(0.12)
	for _, e := range []struct {
		fill rgb
		what string
	}{{colCopper, "copper (line, stubs, pads)"}, {colPour, "coplanar ground pour (GND)"}} {
		setFill(f, e.fill)
		setDraw(f, colCopperEdg)
		f.Rect(x, y, 5, 3, "FD")
		setText(f, colInk)
		f.Text(x+6.5, y+2.5, e.what)
		x += 6.5 + f.GetStringWidth(e.what) + 6
	}
}

// pourIn says whether a coplanar ground pour shows in the part reg of the
// board.
func (b boardModel) pourIn(reg rect) bool {
	for i, poly := range b.copper {
		if b.pour[i] && len(clipPolygon(poly, reg)) >= 3 {
			return true
		}
	}
	return false
}

// landingDims dimensions the landing in view v: the signal pad's length
// under the view and its width, the gaps and the ground pads' widths in
// one chain right of the board edge; the ground pad's length and its
// pull-back from the edge above the view; a ground via's sizes.
func (d *doc) landingDims(k *ink, b boardModel, v view, reg rect) {
	l := b.landing
	s, u, dn := l.signal, l.up, l.down
	below := v.Y(reg.y0) + 6
	k.dimH(v.X(s.x0), v.Y(s.y0), v.X(s.x1), v.Y(s.y0), below, "pad length "+mm3(s.x1-s.x0), true)
	xd := v.X(b.w) + 5
	k.dimV(v.X(b.w), v.Y(s.y0), v.X(b.w), v.Y(s.y1), xd, "pad width "+mm3(s.y1-s.y0), true)
	k.dimV(v.X(u.x1), v.Y(s.y1), v.X(u.x1), v.Y(u.y0), xd, "gap "+mm3(u.y0-s.y1), true)
	k.dimV(v.X(u.x1), v.Y(u.y0), v.X(u.x1), v.Y(u.y1), xd, "ground pad width "+mm3(u.y1-u.y0), true)
	k.dimV(v.X(dn.x1), v.Y(dn.y1), v.X(dn.x1), v.Y(s.y0), xd, "gap "+mm3(s.y0-dn.y1), true)
	k.dimV(v.X(dn.x1), v.Y(dn.y0), v.X(dn.x1), v.Y(dn.y1), xd, "ground pad width "+mm3(dn.y1-dn.y0), true)
	above := v.Y(reg.y1) - 6
	k.dimH(v.X(u.x0), v.Y(u.y1), v.X(u.x1), v.Y(u.y1), above, "ground pad length "+mm3(u.x1-u.x0), false)
	k.dimH(v.X(u.x1), v.Y(u.y1), v.X(b.w), v.Y(u.y1), above, "pull-back "+mm3(b.w-u.x1), false)
	if len(l.vias) > 0 {
		c := l.vias[0]
		for _, o := range l.vias {
			if o.c.y > c.c.y || o.c.y == c.c.y && o.c.x < c.c.x {
				c = o
			}
		}
		k.leader(v.X(c.c.x), v.Y(c.c.y), v.X(c.c.x)-10, v.Y(reg.y1)-12,
			fmt.Sprintf("ground via: drill Ø%s", mm3(c.drill)), fmt.Sprintf("pad Ø%s", mm3(c.pad)))
	}
}

// landingArt draws the part reg of the board in view v: the board, the
// copper cut at reg's edges (a coplanar ground pour in its own fill), the
// pads and the vias, and registers the copper and the board edges with
// k's placer.
func (d *doc) landingArt(k *ink, b boardModel, v view, reg rect) {
	f := d.pdf
	setFill(f, colBoard)
	f.Rect(v.X(reg.x0), v.Y(reg.y1), v.s*(reg.x1-reg.x0), v.s*(reg.y1-reg.y0), "F")
	// The cut edges dashed, the board's own edges solid.
	setDraw(f, colBoardEdge)
	corners := reg.corners()
	for i := range corners {
		a, c := corners[i], corners[(i+1)%4]
		edge := a.x == c.x && (a.x == 0 || a.x == b.w) || a.y == c.y && (a.y == 0 || a.y == b.h)
		f.SetLineWidth(0.3)
		if !edge {
			f.SetLineWidth(0.15)
			f.SetDashPattern([]float64{1.2, 0.8}, 0)
		}
		f.Line(v.X(a.x), v.Y(a.y), v.X(c.x), v.Y(c.y))
		f.SetDashPattern(nil, 0)
		k.pl.line(obsLine, 0, v.X(a.x), v.Y(a.y), v.X(c.x), v.Y(c.y))
	}
	setDraw(f, colCopperEdg)
	f.SetLineWidth(0.12)
	f.RawWriteStr("/Copper BMC\n")
	for i, poly := range b.copper {
		cut := clipPolygon(poly, reg)
		if len(cut) < 3 {
			continue
		}
		setFill(f, colCopper)
		if b.pour[i] {
			setFill(f, colPour) // a coplanar ground pour, as on sheet 1
		}
		copperPolygon(f, k, v, cut)
	}
	var outlines []rect
	for _, p := range b.pads {
		r := rect{p.c.x - p.w/2, p.c.y - p.h/2, p.c.x + p.w/2, p.c.y + p.h/2}
		if p.round || !r.overlaps(reg) {
			continue
		}
		r = rect{math.Max(r.x0, reg.x0), math.Max(r.y0, reg.y0), math.Min(r.x1, reg.x1), math.Min(r.y1, reg.y1)}
		setFill(f, colCopper)
		f.Rect(v.X(r.x0), v.Y(r.y1), v.s*(r.x1-r.x0), v.s*(r.y1-r.y0), "F")
		k.pl.add(newObstacle(obsCopper, 0, true, rect{v.X(r.x0), v.Y(r.y1), v.X(r.x1), v.Y(r.y0)}.corners()...))
		outlines = append(outlines, r)
	}
	for _, via := range b.vias {
		if !reg.contains(via.c) {
			continue
		}
		setFill(f, colCopper)
		f.Circle(v.X(via.c.x), v.Y(via.c.y), v.s*via.pad/2, "FD")
		k.pl.add(newObstacle(obsCopper, 0, true, square(v.X(via.c.x), v.Y(via.c.y), v.s*via.pad/2)...))
	}
	f.RawWriteStr("EMC\n")
	for _, r := range outlines {
		f.SetDashPattern([]float64{0.6, 0.4}, 0)
		f.Rect(v.X(r.x0), v.Y(r.y1), v.s*(r.x1-r.x0), v.s*(r.y1-r.y0), "D")
		f.SetDashPattern(nil, 0)
	}
	for _, via := range b.vias {
		if !reg.contains(via.c) {
			continue
		}
		setFill(f, colDrill)
		setDraw(f, colInk)
		f.Circle(v.X(via.c.x), v.Y(via.c.y), v.s*via.drill/2, "FD")
	}
}

// clipPolygon cuts the polygon poly to the rectangle r (Sutherland and
// Hodgman's re-entrant clipping, one edge of r at a time); what is left
// may be empty.
func clipPolygon(poly []ptMM, r rect) []ptMM {
	type edge struct {
		in  func(p ptMM) bool
		cut func(a, b ptMM) ptMM
	}
	atX := func(a, b ptMM, x float64) ptMM { return ptMM{x, a.y + (b.y-a.y)*(x-a.x)/(b.x-a.x)} }
	atY := func(a, b ptMM, y float64) ptMM { return ptMM{a.x + (b.x-a.x)*(y-a.y)/(b.y-a.y), y} }
	edges := []edge{
		{func(p ptMM) bool { return p.x >= r.x0 }, func(a, b ptMM) ptMM { return atX(a, b, r.x0) }},
		{func(p ptMM) bool { return p.x <= r.x1 }, func(a, b ptMM) ptMM { return atX(a, b, r.x1) }},
		{func(p ptMM) bool { return p.y >= r.y0 }, func(a, b ptMM) ptMM { return atY(a, b, r.y0) }},
		{func(p ptMM) bool { return p.y <= r.y1 }, func(a, b ptMM) ptMM { return atY(a, b, r.y1) }},
	}
	out := poly
	for _, e := range edges {
		in := out
		out = nil
		for i, c := range in {
			p := in[(i+len(in)-1)%len(in)]
			switch {
			case e.in(c) && !e.in(p):
				out = append(out, e.cut(p, c), c)
			case e.in(c):
				out = append(out, c)
			case e.in(p):
				out = append(out, e.cut(p, c))
			}
		}
	}
	return out
}
