package export

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"stubcraft/synth/geom"
)

// boardModel is the layout in millimetres, board origin at the lower-left
// corner, y up: what the drawing and the SVG dimension.
type boardModel struct {
	name    string
	w, h    float64 // board outline size
	copper  [][]ptMM
	pour    []bool // copper[i] is not the RF net (a coplanar ground pour)
	pads    []padMM
	vias    []viaMM
	segs    []segMM
	stubs   []stubMM
	centreY float64
	ports   [2]ptMM
	trims   []trimMM
	landing *landingMM // the source port's edge-launch landing, nil without one
	fence   []viaMM    // the vias of a via fence
}

// trimMM is the row of trim ticks of a stub drawn with a trim allowance:
// tick k at at[k], running across the stub (dir is the stub's direction
// toward its drawn end, a unit vector), tick 0 at the design length.
type trimMM struct {
	at     []ptMM
	dir    ptMM
	across float64
}

type ptMM struct{ x, y float64 }

// padMM is a flashed pad: a rectangle, or a circle of diameter w.
type padMM struct {
	c      ptMM
	w, h   float64
	round  bool
	ground bool // a landing's ground pad (or its via pad): copper of its own
}

type viaMM struct {
	c          ptMM
	drill, pad float64
	ground     bool // a stitching via of a coplanar pour
}

// segMM is one through-line segment: x0..x1 along the line, lo..hi across.
type segMM struct {
	id             string
	x0, x1, lo, hi float64
}

// stubMM is one stub: x0..x1 across it, cx its centre line; ref the y of
// its reference plane, end the y its drawn length reaches (the via centre
// of a shorted stub), tip the y of its copper's far edge; side +1 up, −1
// down.
type stubMM struct {
	id             string
	x0, x1, cx     float64
	ref, end, tip  float64
	side           float64
	via            *viaMM
	teeX, teeY     float64
	drawnLengthAbs float64
	// bend is set for a stub laid out as a mitred L; then x0..x1 is its
	// first leg, end the y of its second leg's centre line, tip the y of
	// its copper's (or via pad's) outermost edge, and via nil (the via is
	// bend.via).
	bend *bendMM
}

// bendMM is a bent stub's L (see geom.Bend), mm.
type bendMM struct {
	toward         float64 // +1: the second leg runs toward +x
	center, end    ptMM    // bend centre; the stub's end (open end or via pad's far edge)
	corner         ptMM    // the cut outer corner
	chamfer        [2]ptMM // the miter's ends
	chamferLeg     float64 // 2·m·W
	leg1, leg2     float64 // centre-line lengths; leg2 to the end
	drawn2         float64 // leg2 as the report counts it: to the via centre of a shorted stub
	miter          float64 // Douville and James's fraction
	inner, outer   float64 // y of the second leg's edges toward and away from the through line
	via            *viaMM
	firstX, innerX float64 // x of the first leg's outer and inner edges
}

func nmToMM(v int64) float64 { return float64(v) / 1e6 }

func ptOf(p geom.Point) ptMM { return ptMM{nmToMM(p.X), nmToMM(p.Y)} }

// newBoardModel converts lay to millimetres and pairs every stub with its
// tee and via.
func newBoardModel(lay geom.Layout) (boardModel, error) {
	if len(lay.Board) < 3 {
		return boardModel{}, errors.New("layout has no board outline")
	}
	lo, hi := lay.Board.Bounds()
	if lo != (geom.Point{}) {
		return boardModel{}, fmt.Errorf("board outline starts at %v nm, want the origin", lo)
	}
	b := boardModel{name: lay.Name, w: nmToMM(hi.X), h: nmToMM(hi.Y), centreY: nmToMM(lay.Marks.CentreY),
		ports: [2]ptMM{ptOf(lay.Marks.Ports[0]), ptOf(lay.Marks.Ports[1])}, landing: newLanding(lay), fence: fenceVias(lay)}
	for _, n := range lay.Copper {
		var p []ptMM
		for _, q := range n.Outline {
			p = append(p, ptOf(q))
		}
		b.copper = append(b.copper, p)
		b.pour = append(b.pour, n.Name != geom.NetRF)
	}
	for _, p := range lay.Pads {
		b.pads = append(b.pads, padMM{c: ptOf(p.Center), w: nmToMM(p.W), h: nmToMM(p.H), round: p.Round, ground: p.Net == geom.NetGround})
	}
	for _, v := range lay.Vias {
		b.vias = append(b.vias, viaMM{c: ptOf(v.Center), drill: nmToMM(v.Drill), pad: nmToMM(v.Pad), ground: v.Net != geom.NetRF})
	}
	tees := map[string]geom.Tee{}
	for _, t := range lay.Marks.Tees {
		tees[t.StubID] = t
	}
	bends := map[string]geom.Bend{}
	for _, bd := range lay.Marks.Bends {
		bends[bd.StubID] = bd
	}
	designEnd := map[string]geom.Trim{}
	for _, tr := range lay.Marks.Trims {
		tm := trimMM{dir: ptMM{float64(tr.Dir.X), float64(tr.Dir.Y)}, across: nmToMM(tr.Across)}
		for k := 0; k <= tr.Ticks; k++ {
			tm.at = append(tm.at, ptOf(tr.Tick(k)))
		}
		b.trims = append(b.trims, tm)
		designEnd[tr.StubID] = tr
	}
	for _, e := range lay.Marks.Elements {
		r := e.Rect
		switch e.Kind {
		case geom.KindSegment:
			b.segs = append(b.segs, segMM{id: e.ID, x0: nmToMM(r.Min.X), x1: nmToMM(r.Max.X), lo: nmToMM(r.Min.Y), hi: nmToMM(r.Max.Y)})
		case geom.KindStub:
			t, ok := tees[e.ID]
			if !ok {
				return boardModel{}, fmt.Errorf("stub %q has no tee mark", e.ID)
			}
			s := stubMM{id: e.ID, x0: nmToMM(r.Min.X), x1: nmToMM(r.Max.X), cx: nmToMM(t.Center.X),
				ref: nmToMM(t.RefY), tip: nmToMM(t.EndY), teeX: nmToMM(t.Center.X), teeY: nmToMM(t.Center.Y), side: 1}
			if t.EndY < t.RefY {
				s.side = -1
			}
			if bd, ok := bends[e.ID]; ok {
				b.stubs = append(b.stubs, bentStub(s, bd, lay.Vias, b.vias))
				continue
			}
			if tr, ok := designEnd[e.ID]; ok {
				// Dimension the design length, to tick 0; the
				// allowance beyond it carries the trim ticks.
				s.tip = nmToMM(tr.DesignEnd.Y)
			}
			s.end = s.tip
			for i, v := range lay.Vias {
				if v.Center.X == t.Center.X && between(v.Center.Y, t.RefY, t.EndY) {
					s.via = &b.vias[i]
					s.end = b.vias[i].c.y
				}
			}
			s.drawnLengthAbs = math.Abs(s.end - s.ref)
			b.stubs = append(b.stubs, s)
		}
	}
	return b, nil
}

// bentStub completes s, a stub with its tee's marks, from its bend: the
// first leg's x extent, the second leg's edges, its via (vias and mm are
// the layout's vias in nm and mm).
func bentStub(s stubMM, bd geom.Bend, vias []geom.Via, mm []viaMM) stubMM {
	c := ptOf(bd.Center)
	k := &bendMM{
		toward: float64(bd.Toward), center: c, end: ptOf(bd.End), corner: ptOf(bd.Corner),
		chamfer: [2]ptMM{ptOf(bd.Chamfer[0]), ptOf(bd.Chamfer[1])}, chamferLeg: nmToMM(bd.ChamferLeg),
		leg1: nmToMM(bd.Leg1), leg2: nmToMM(bd.Leg2), miter: bd.Miter,
		firstX: nmToMM(bd.Corner.X), innerX: nmToMM(2*bd.Center.X - bd.Corner.X),
		outer: nmToMM(bd.Corner.Y), inner: nmToMM(2*bd.Center.Y - bd.Corner.Y),
	}
	k.drawn2 = k.leg2
	s.x0, s.x1 = math.Min(k.firstX, k.innerX), math.Max(k.firstX, k.innerX)
	s.end, s.tip = c.y, k.outer
	for i, v := range vias {
		if v.Net == geom.NetRF && v.Center.Y == bd.End.Y && between(v.Center.X, bd.Center.X, bd.End.X) {
			k.via = &mm[i]
			k.drawn2 = math.Abs(mm[i].c.x - c.x)
			s.tip = s.side * math.Max(s.side*s.tip, s.side*(mm[i].c.y+s.side*mm[i].pad/2))
		}
	}
	s.drawnLengthAbs = k.leg1 + k.drawn2
	s.bend = k
	return s
}

func between(v, a, b int64) bool {
	if a > b {
		a, b = b, a
	}
	return a <= v && v <= b
}

// boardPlan is how sheet 1 places the board: its scale, and the tiles
// when it is drawn at 1:1 across several pages.
type boardPlan struct {
	scale float64 // paper mm per board mm
	ratio string  // "1:1", "1:2", ...
	// detail is the enlargement of a second, magnified view under a
	// 1:1 drawing with room to spare (0 for none); detailRatio its "5:1".
	detail      float64
	detailRatio string
	tiled       bool
	nx, ny      int     // tiles across and down
	ext         extents // paper room around the board at this scale
	area        rectMM  // the drawing area of a sheet
	reserve     float64 // height of the headline strip under the area
}

// rectMM is a paper rectangle: left, top, width, height.
type rectMM struct{ x, y, w, h float64 }

// extents is the paper room the dimensions need beyond each board edge.
type extents struct{ left, right, top, bottom float64 }

// canvas is the paper size of board and dimensions together.
func (p boardPlan) canvas(b boardModel) (w, h float64) {
	return p.scale*b.w + p.ext.left + p.ext.right, p.scale*b.h + p.ext.top + p.ext.bottom
}

// Dimension layout on paper, mm.
const (
	dimRowGap    = 7.5  // between rows of dimensions below the board
	dimFirstRow  = 8.0  // board (or lowest copper dimension) to the first row
	dimStubGap   = 5.5  // stub copper to its width or length dimension
	portLabelW   = 17.0 // room for a port label beside the board
	rowCaptionW  = 20.0 // room for a row caption left of the board
	heightDimOff = 21.0 // right board edge to the board-height dimension
	tileOverlap  = 12.0 // overlap of neighbouring tiles
	scaleStripH  = 19.0 // scale bar and print note at the foot of sheet 1
	bannerH      = 9.0  // NOT TO SCALE banner
	viewCaptionH = 7.0  // caption above a view
)

// reductionScales are the preferred reduction scales of ISO 5455
// (technical drawings — scales), largest first.
func reductionScales() []struct {
	s     float64
	ratio string
} {
	return []struct {
		s     float64
		ratio string
	}{{0.5, "1:2"}, {0.2, "1:5"}, {0.1, "1:10"}, {0.05, "1:20"}, {0.02, "1:50"}, {0.01, "1:100"}}
}

// enlargementScales are the enlargement scales of ISO 5455, largest first.
func enlargementScales() []struct {
	s     float64
	ratio string
} {
	return []struct {
		s     float64
		ratio string
	}{{10, "10:1"}, {5, "5:1"}, {2, "2:1"}}
}

// belowRows is the number of dimension rows under the board: the line
// segments, each stub's position, the board length.
func (b boardModel) belowRows() int { return 2 + len(b.stubs) }

// extentsAt returns the paper room the dimensions need at scale s.
func (b boardModel) extentsAt(s float64) extents {
	e := extents{left: math.Max(portLabelW, rowCaptionW), right: heightDimOff + 14}
	top, low := 0.0, 0.0 // paper reach above the board top and below its bottom
	for _, st := range b.stubs {
		far := st.tip
		if st.via != nil {
			far = st.via.c.y + st.side*st.via.pad/2
		}
		reach := s*far + st.side*(dimStubGap+5)
		if st.bend != nil {
			reach = s*far + st.side*(dimStubGap+12) // the second leg's dimension and note, the miter's leader
		}
		if st.via != nil {
			reach = math.Max(reach, s*st.via.c.y+9) // via leader label
		}
		top = math.Max(top, reach-s*b.h)
		low = math.Min(low, reach)
	}
	// Segment width values sit beyond the through line on the side the
	// stubs leave free (below, unless a stub goes down).
	const widthReach = 11.5
	up := true
	for _, st := range b.stubs {
		if st.side > 0 {
			up = false
		}
	}
	for _, g := range b.segs {
		if up {
			top = math.Max(top, s*g.hi+widthReach-s*b.h)
		} else {
			low = math.Min(low, s*g.lo-widthReach)
		}
	}
	e.top = math.Max(6, top+2)
	e.bottom = -low + dimFirstRow + dimRowGap*float64(b.belowRows()-1) + 6
	return e
}

// planBoard chooses the scale (and tiles) for sheet 1 on paper pg.
// reserve is the paper height kept under the drawing area for the
// headline figures and the verdict.
func planBoard(b boardModel, pg paper, fit Fit, reserve float64) boardPlan {
	m := pageMargin
	x, y := m+3, m+headerH+3
	area := rectMM{x, y, pg.w - 2*x, pg.h - m - titleBlockH - 3 - y - scaleStripH - reserve}
	p := boardPlan{scale: 1, ratio: "1:1", area: area, nx: 1, ny: 1, ext: b.extentsAt(1), reserve: reserve}
	if cw, ch := p.canvas(b); cw <= area.w && ch <= area.h {
		for _, k := range enlargementScales() {
			q := boardPlan{scale: k.s, ext: b.extentsAt(k.s)}
			if dw, dh := q.canvas(b); dw <= area.w && ch+dh+2*viewCaptionH <= area.h {
				p.detail, p.detailRatio = k.s, k.ratio
				break
			}
		}
		return p
	}
	if fit == FitTile {
		p.tiled = true
		cw, ch := p.canvas(b)
		p.nx = tiles(cw, area.w)
		p.ny = tiles(ch, area.h)
		return p
	}
	area.y += bannerH
	area.h -= bannerH
	p.area = area
	for _, r := range reductionScales() {
		p.scale, p.ratio, p.ext = r.s, r.ratio, b.extentsAt(r.s)
		if cw, ch := p.canvas(b); cw <= area.w && ch <= area.h {
			break
		}
	}
	return p
}

// tiles is how many pages of width a, overlapping by tileOverlap, cover
// length c.
func tiles(c, a float64) int {
	if c <= a {
		return 1
	}
	return int(math.Ceil((c - tileOverlap) / (a - tileOverlap)))
}

// bentStubDims dimensions a bent stub s in view v: its first leg from the
// through line's edge to the bend's centre line, beside the leg's outer
// edge; its second leg from the bend's centre line to the end (the via
// centre of a shorted stub), beyond the leg's outer edge; its width across
// the second leg beyond the end; and the miter, by a leader from the
// chamfer. It returns the lowest paper y it drew at.
func (d *doc) bentStubDims(pen *ink, s stubMM, v view) float64 {
	k := s.bend
	tw, sd := k.toward, s.side
	pad := 0.0
	if k.via != nil {
		pad = k.via.pad
	}
	// First leg, on its outer side (away from the second leg).
	xd := v.X(k.firstX) - tw*dimStubGap
	pen.dimV(v.X(k.firstX), v.Y(s.ref), v.X(k.firstX), v.Y(k.center.y), xd, mm3(k.leg1), tw < 0)
	align, lx := byte('R'), xd-1.2
	if tw < 0 {
		align, lx = 'L', xd+1.2
	}
	ly := (v.Y(s.ref)+v.Y(k.center.y))/2 - 2.8
	pen.note("1st leg, to bend centre", ptMM{xd, ly + 2.8}, spot{x: lx, y: ly, align: align}, spot{x: lx, y: ly + 5.6, align: align})
	// Second leg, beyond its outer edge (and the via pad).
	far := sd * math.Max(sd*k.outer, sd*(k.center.y+sd*pad/2))
	yd := v.Y(far) - sd*(dimStubGap+2) // clear of the width dimension's extension lines
	endX := k.end.x
	if k.via != nil {
		endX = k.via.c.x
	}
	pen.dimH(v.X(k.center.x), v.Y(k.center.y), v.X(endX), v.Y(k.center.y), yd, mm3(k.drawn2), sd < 0)
	note := "2nd leg, from bend centre"
	if k.via != nil {
		note += " to via centre"
	}
	nx := v.X((k.center.x + endX) / 2)
	pen.note(note, ptMM{nx, yd}, spot{x: nx, y: yd - sd*3.4, align: 'C'}, spot{x: nx, y: yd - sd*6, align: 'C'})
	// Width across the second leg, beyond its end.
	xw := v.X(k.end.x) + tw*(dimStubGap+v.s*pad/2)
	pen.dimV(v.X(k.end.x), v.Y(k.inner), v.X(k.end.x), v.Y(k.outer), xw, mm3(math.Abs(k.outer-k.inner)), tw > 0)
	if k.via != nil {
		vx, vy := v.X(k.via.c.x), v.Y(k.via.c.y)
		pen.leader(vx, vy, vx+tw*6, v.Y(k.inner)+sd*4, fmt.Sprintf("via: drill Ø%s", mm3(k.via.drill)), fmt.Sprintf("pad Ø%s", mm3(k.via.pad)))
	} else {
		align := byte('R')
		if tw > 0 {
			align = 'L'
		}
		ex, ey := v.X(k.end.x), v.Y(k.inner)
		pen.note("open end", ptMM{ex, ey}, spot{x: ex + tw*1.2, y: ey + sd*1.8, align: align}, spot{x: ex + tw*1.2, y: ey + sd*4.4, align: align})
	}
	// The miter: a leader from the chamfer's middle, outward along the
	// corner's diagonal.
	mx, my := v.X((k.chamfer[0].x+k.chamfer[1].x)/2), v.Y((k.chamfer[0].y+k.chamfer[1].y)/2)
	cx, cy := v.X(k.corner.x), v.Y(k.corner.y)
	ox, oy := cx-tw*6, cy-sd*6
	pen.leader(mx, my, ox, oy, fmt.Sprintf("miter %.0f %%", math.Round(100*k.miter)),
		fmt.Sprintf("cut %s × %s", mm3(k.chamferLeg), mm3(k.chamferLeg)))
	return math.Max(math.Max(yd+2.5, oy+6), v.Y(far))
}

// bentCentreLine draws a bent stub's centre line: up its first leg to the
// bend's centre, then along its second leg past the end.
func (d *doc) bentCentreLine(s stubMM, v view, centreY float64) {
	f := d.pdf
	k := s.bend
	f.Line(v.X(s.cx), v.Y(centreY), v.X(k.center.x), v.Y(k.center.y))
	f.Line(v.X(k.center.x), v.Y(k.center.y), v.X(k.end.x)+k.toward*2.5, v.Y(k.center.y))
}

// pourGap finds the coplanar gap over the first through-line segment: at
// x, from the segment's upper edge lo to the pour's edge hi above it.
func (b boardModel) pourGap() (x, lo, hi float64, ok bool) {
	if len(b.segs) == 0 {
		return 0, 0, 0, false
	}
	g := b.segs[0]
	x, lo = g.x0+0.3*(g.x1-g.x0), g.hi
	hi = math.Inf(1)
	for i, poly := range b.copper {
		if !b.pour[i] {
			continue
		}
		for j := range poly {
			a, c := poly[j], poly[(j+1)%len(poly)]
			if a.y == c.y && a.y > lo && math.Min(a.x, c.x) <= x && x <= math.Max(a.x, c.x) {
				hi = math.Min(hi, a.y)
			}
		}
	}
	return x, lo, hi, !math.IsInf(hi, 1)
}

// stitchPitch finds the longest straight row of stitching vias and returns
// the centres of its first two, ordered along the row; vertical says the
// row runs along y. Only a board with a coplanar pour has stitching vias
// (the ground vias of an edge-launch landing or a via fence are not).
func (b boardModel) stitchPitch() (p, q ptMM, vertical, ok bool) {
	pour := false
	for _, isPour := range b.pour {
		pour = pour || isPour
	}
	if !pour {
		return ptMM{}, ptMM{}, false, false
	}
	rows := map[[2]float64][]ptMM{} // (axis, coordinate) → centres
	for _, v := range b.vias {
		if v.ground {
			rows[[2]float64{0, v.c.y}] = append(rows[[2]float64{0, v.c.y}], v.c)
			rows[[2]float64{1, v.c.x}] = append(rows[[2]float64{1, v.c.x}], v.c)
		}
	}
	var best [2]float64
	n := 1
	for k, r := range rows {
		if len(r) > n || (len(r) == n && n > 1 && (k[0] < best[0] || (k[0] == best[0] && k[1] < best[1]))) {
			best, n = k, len(r)
		}
	}
	if n < 2 {
		return ptMM{}, ptMM{}, false, false
	}
	r := append([]ptMM(nil), rows[best]...)
	vertical = best[0] == 1
	sort.Slice(r, func(i, j int) bool {
		if vertical {
			return r[i].y < r[j].y
		}
		return r[i].x < r[j].x
	})
	return r[0], r[1], vertical, true
}
