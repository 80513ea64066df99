package export

import (
	"math"
	"sort"
)

// Label placement for every view of the board (the 1:1, enlarged, scaled
// and tiled views of the drawing, and layout.svg). A view registers what
// its labels must not cover as obstacles — copper, dimension and
// extension lines, centre lines, the board edge — and asks for each label
// with an ordered list of candidate positions; the placer takes the first
// candidate that covers no other label and no copper and crosses the
// fewest lines that are not its own. Every label also gets a ring of
// positions on a leader around its anchor as a last resort. Units are the
// view's paper units (mm), y down.
//
// The placer knows nothing of dimensions: a new element (a legend, an
// edge launch, a via row, a transformer section) registers its copper and
// lines as obstacles and asks for its labels in the same way.

// rect is an axis-aligned box: x0 ≤ x1, y0 ≤ y1.
type rect struct{ x0, y0, x1, y1 float64 }

func (r rect) overlaps(o rect) bool {
	return r.x0 < o.x1 && o.x0 < r.x1 && r.y0 < o.y1 && o.y0 < r.y1
}

func (r rect) grow(d float64) rect { return rect{r.x0 - d, r.y0 - d, r.x1 + d, r.y1 + d} }

func (r rect) contains(p ptMM) bool { return p.x > r.x0 && p.x < r.x1 && p.y > r.y0 && p.y < r.y1 }

// corners are r's corners as a polygon: (x0, y0), (x1, y0), (x1, y1), (x0, y1).
func (r rect) corners() []ptMM {
	return []ptMM{{r.x0, r.y0}, {r.x1, r.y0}, {r.x1, r.y1}, {r.x0, r.y1}}
}

// inside reports whether r lies wholly within o.
func (r rect) inside(o rect) bool {
	return r.x0 >= o.x0 && r.x1 <= o.x1 && r.y0 >= o.y0 && r.y1 <= o.y1
}

// nearest is the point of r nearest to p.
func (r rect) nearest(p ptMM) ptMM {
	return ptMM{math.Max(r.x0, math.Min(p.x, r.x1)), math.Max(r.y0, math.Min(p.y, r.y1))}
}

// Obstacle kinds, in the order of how much a label must avoid them.
const (
	obsCentre = iota // a centre line or reference mark: crossing it costs little
	obsLine          // a dimension, extension or leader line, a board edge
	obsCopper        // copper (an area): a label never covers it
)

// obstacle is an area (a closed polygon) or a polyline that labels avoid.
// owner is the label group allowed to cover it (0: none).
type obstacle struct {
	kind  int
	owner int
	pts   []ptMM
	area  bool
	box   rect
}

func newObstacle(kind, owner int, area bool, pts ...ptMM) obstacle {
	b := rect{math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)}
	for _, p := range pts {
		b.x0, b.y0 = math.Min(b.x0, p.x), math.Min(b.y0, p.y)
		b.x1, b.y1 = math.Max(b.x1, p.x), math.Max(b.y1, p.y)
	}
	return obstacle{kind: kind, owner: owner, pts: pts, area: area, box: b}
}

// hits reports whether the obstacle touches r.
func (o obstacle) hits(r rect) bool {
	if !o.box.grow(1e-9).overlaps(r) {
		return false
	}
	n := len(o.pts)
	if n == 1 {
		return r.contains(o.pts[0])
	}
	last := n - 1
	if o.area {
		last = n
	}
	for i := 0; i < last; i++ {
		if segHitsRect(o.pts[i], o.pts[(i+1)%n], r) {
			return true
		}
	}
	return o.area && inPolygon(ptMM{(r.x0 + r.x1) / 2, (r.y0 + r.y1) / 2}, o.pts)
}

// segHitsRect reports whether the segment a–b meets the inside of r
// (Liang–Barsky clipping).
func segHitsRect(a, b ptMM, r rect) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := b.x-a.x, b.y-a.y
	for _, c := range [4][2]float64{{-dx, a.x - r.x0}, {dx, r.x1 - a.x}, {-dy, a.y - r.y0}, {dy, r.y1 - a.y}} {
		p, q := c[0], c[1]
		if p == 0 {
			if q <= 0 {
				return false
			}
			continue
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 >= t1 {
			return false
		}
	}
	return true
}

// inPolygon reports whether p lies inside the polygon pts (even-odd).
func inPolygon(p ptMM, pts []ptMM) bool {
	in := false
	for i, j := 0, len(pts)-1; i < len(pts); j, i = i, i+1 {
		a, b := pts[i], pts[j]
		if (a.y > p.y) != (b.y > p.y) && p.x < (b.x-a.x)*(p.y-a.y)/(b.y-a.y)+a.x {
			in = !in
		}
	}
	return in
}

// spot is one candidate position of a label: the reference point (x, y)
// is the middle of the first line's capitals, align 'L', 'C' or 'R' says
// which end of the text it is; leader draws a line from the label's
// anchor to the text.
type spot struct {
	x, y   float64
	align  byte
	leader bool
}

// labelReq is a label to place: one or more lines of text in a font size
// (pt), with candidate spots in order of preference. owner is the group
// (a dimension) whose lines it may cross; anchor is the point a leader
// starts from. An optional label may be dropped when no spot is clear
// (the 1:1 view leaves it to the enlarged view).
type labelReq struct {
	lines    []string
	pt       float64
	bold     bool
	col      rgb
	owner    int
	anchor   ptMM
	spots    []spot
	optional bool
	priority int // lower places first
}

// placedLabel is a label where the placer put it.
type placedLabel struct {
	req    labelReq
	at     spot
	box    rect // the text's extent (ascent to descent)
	ok     bool // clear of other labels and copper
	leader bool
}

// Text metrics as fractions of the font size (Go fonts' ascent and
// descent, rounded up), and the line pitch of a multi-line label in mm.
const (
	ascentEm  = 0.95
	descentEm = 0.25
	capEm     = 0.72
	pitchEm   = 1.3  // line pitch of a multi-line label
	labelPad  = 0.35 // clear room kept around every label, mm
)

// placer places labels in one view.
type placer struct {
	width  func(s string, pt float64, bold bool) float64 // mm
	bounds rect                                          // labels stay inside
	obs    []obstacle
	texts  []rect
	owner  int
}

func newPlacer(width func(string, float64, bool) float64, bounds rect) *placer {
	return &placer{width: width, bounds: bounds}
}

// group returns a fresh owner id for the lines and labels of one element.
func (p *placer) group() int {
	p.owner++
	return p.owner
}

// add registers an obstacle.
func (p *placer) add(o obstacle) { p.obs = append(p.obs, o) }

// line registers a line of group owner.
func (p *placer) line(kind, owner int, x1, y1, x2, y2 float64) {
	p.add(newObstacle(kind, owner, false, ptMM{x1, y1}, ptMM{x2, y2}))
}

// reserve marks r as taken by fixed text.
func (p *placer) reserve(r rect) { p.texts = append(p.texts, r) }

// boxAt is the extent of the label's text at spot s.
func (p *placer) boxAt(l labelReq, s spot) rect {
	em := l.pt * 25.4 / 72
	w := 0.0
	for _, t := range l.lines {
		w = math.Max(w, p.width(t, l.pt, l.bold))
	}
	x := s.x
	switch s.align {
	case 'C':
		x -= w / 2
	case 'R':
		x -= w
	}
	base := s.y + capEm*em/2
	return rect{x, base - ascentEm*em, x + w, base + descentEm*em + float64(len(l.lines)-1)*pitchEm*em}
}

// cost scores l at spot s: 1000 and more when it covers text or copper
// or leaves the bounds, otherwise the lines it crosses.
func (p *placer) cost(l labelReq, s spot) float64 {
	b := p.boxAt(l, s)
	g := b.grow(labelPad)
	c := 0.0
	if !b.inside(p.bounds) {
		c += 1000
	}
	for _, t := range p.texts {
		if t.overlaps(g) {
			c += 1000
		}
	}
	for _, o := range p.obs {
		if o.owner != 0 && o.owner == l.owner {
			continue
		}
		if !o.hits(g) {
			continue
		}
		switch o.kind {
		case obsCopper:
			c += 1000
		case obsLine:
			c += 12
		default:
			c += 3
		}
	}
	if s.leader {
		a := b.nearest(l.anchor)
		c += 6 + 0.3*math.Hypot(a.x-l.anchor.x, a.y-l.anchor.y)
		// A leader must not cross copper or other text either.
		for _, t := range p.texts {
			if segHitsRect(l.anchor, a, t) {
				c += 1000
			}
		}
		for _, o := range p.obs {
			if o.kind == obsCopper && o.area && (o.owner == 0 || o.owner != l.owner) && o.hits(rect{a.x - 0.05, a.y - 0.05, a.x + 0.05, a.y + 0.05}) {
				c += 1000
			}
		}
	}
	return c
}

// leaderRing adds spots on leaders around the anchor, nearest first.
func leaderRing(l *labelReq) {
	a := l.anchor
	for _, r := range []float64{3, 5, 8, 12, 17, 23} {
		for _, d := range [][2]float64{{1, -1}, {-1, -1}, {1, 1}, {-1, 1}, {0, -1}, {0, 1}, {1, 0}, {-1, 0}} {
			s := spot{x: a.x + d[0]*r, y: a.y + d[1]*r*0.7, leader: true}
			switch {
			case d[0] > 0:
				s.align = 'L'
			case d[0] < 0:
				s.align = 'R'
			default:
				s.align = 'C'
			}
			l.spots = append(l.spots, s)
		}
	}
}

// placeAll places every label, lower priority numbers first (in the order
// asked within a priority), each against the obstacles and the labels
// already placed. A label's leader becomes an obstacle for the next.
func (p *placer) placeAll(ls []labelReq) []placedLabel {
	order := make([]int, len(ls))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(i, j int) bool { return ls[order[i]].priority < ls[order[j]].priority })
	out := make([]placedLabel, len(ls))
	for _, i := range order {
		l := ls[i]
		leaderRing(&l)
		best, bestCost := 0, math.Inf(1)
		for k, s := range l.spots {
			c := p.cost(l, s) + 0.01*float64(k)
			if c < bestCost {
				best, bestCost = k, c
			}
			if c < 1 {
				break
			}
		}
		s := l.spots[best]
		pl := placedLabel{req: l, at: s, box: p.boxAt(l, s), ok: bestCost < 1000, leader: s.leader}
		out[i] = pl
		if !pl.ok && l.optional {
			continue
		}
		p.texts = append(p.texts, pl.box)
		if s.leader {
			a := pl.box.nearest(l.anchor)
			p.line(obsLine, l.owner, l.anchor.x, l.anchor.y, a.x, a.y)
		}
	}
	return out
}

// hSpots are the spots for the value of a horizontal dimension line from
// x1 to x2 at y: centred above it (up is the distance from the line to
// the text's middle) or under it (down), staggered further out on a
// leader; beside an arrow (out from the extension line) only when the
// text does not fit between the arrows, since beside a wide gap it would
// read as a neighbour's value. preferBelow puts under first.
func hSpots(x1, x2, y, tw, up, down, out float64, preferBelow bool) []spot {
	mid := (x1 + x2) / 2
	above := spot{x: mid, y: y - up, align: 'C'}
	under := spot{x: mid, y: y + down, align: 'C'}
	spots := []spot{above, under}
	if preferBelow {
		spots = []spot{under, above}
	}
	if tw > x2-x1-0.6 {
		spots = append(spots, spot{x: x2 + out, y: y, align: 'L'}, spot{x: x1 - out, y: y, align: 'R'})
	}
	pitch := 1.6 * (up + down) / 2
	for i := 1; i <= 3; i++ {
		st := float64(i) * pitch
		spots = append(spots, spot{x: mid, y: y - up - st, align: 'C', leader: true}, spot{x: mid, y: y + down + st, align: 'C', leader: true})
	}
	return spots
}

// vSpots are the spots for the value of a vertical dimension line at x
// from y1 to y2: beside its middle, off away from the line, on the right
// first when right is set, then moved along the line by steps of step.
func vSpots(x, y1, y2, off, step float64, right bool) []spot {
	mid := (y1 + y2) / 2
	r := spot{x: x + off, y: mid, align: 'L'}
	l := spot{x: x - off, y: mid, align: 'R'}
	spots := []spot{r, l}
	if !right {
		spots = []spot{l, r}
	}
	for i := 1; i <= 3; i++ {
		for _, sg := range []float64{-1, 1} {
			for _, base := range spots[:2] {
				q := base
				q.y += sg * float64(i) * step
				spots = append(spots, q)
			}
		}
	}
	return spots
}
