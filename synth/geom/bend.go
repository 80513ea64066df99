package geom

import (
	"fmt"
	"math"
)

// Douville and James's optimal miter, from R. J. P. Douville and D. S.
// James, "Experimental study of symmetric microstrip bends and their
// compensation", IEEE Trans. Microwave Theory Tech. 26(3), 1978: the
// measured best cut of a 90° bend's outer corner, as a fraction of the
// corner's diagonal, m = 0.52 + 0.65·exp(−1.35·W/h), for W/h ≥ 0.25 and
// εr ≤ 25.
const (
	// MiterMinWidthRatio is the smallest W/h of the measurements. Build
	// refuses to bend a narrower stub: the fraction grows toward 1.17 as
	// W/h → 0, and a cut past the whole diagonal would sever the bend.
	MiterMinWidthRatio = 0.25
	// MiterMaxEr is the largest εr of the measurements. Build bends a stub
	// on a higher-permittivity substrate all the same and says so in
	// Bend.Warning.
	MiterMaxEr = 25.0
)

// MiterFraction returns Douville and James's optimal miter fraction
// m = 0.52 + 0.65·exp(−1.35·w/h) for a microstrip of width w on a
// dielectric of height h (any one unit): the cut is perpendicular to the
// outer corner's diagonal d = w·√2 at m·d from the corner, which removes an
// isosceles right triangle of legs 2·m·w. Outside W/h ≥ MiterMinWidthRatio
// it extrapolates the formula. It returns NaN when w or h is not positive
// and finite.
func MiterFraction(w, h float64) float64 {
	if !(w > 0) || !(h > 0) || math.IsInf(w, 0) || math.IsInf(h, 0) {
		return math.NaN()
	}
	return 0.52 + 0.65*math.Exp(-1.35*w/h)
}

// Bend describes one stub laid out as an L because its straight copper did
// not fit Spec.MaxBoard in y. Its first leg runs from the through line
// perpendicular to the bend's centre point, its second leg from there
// parallel to the through line to the stub's end; the L's outer corner is
// cut by Douville and James's optimal miter.
//
// The stub's drawn length is the centre-line length Leg1 + Leg2, which
// equals Spec's Stub.Length. The network's simulation takes the bent stub
// as a straight line of that length: with the optimal miter the bend's own
// reflection is small, and counting a mitred bend at its centre-line
// length is common practice, no source.
//
// The solder-mask window, the keep-out and a grounded-coplanar pour's
// clearance are grown from the un-chamfered L (rectilinear), so beside the
// miter they keep more than their distance: along the cut's middle the
// pour is ChamferLeg/2 + the gap away, where an exact offset would keep
// the gap.
type Bend struct {
	StubID string
	// Toward is +1 when the second leg runs toward the source port (+x),
	// −1 toward the load port.
	Toward int
	// Center is the bend's centre point, where the two legs' centre lines
	// cross; End is the stub's end on the second leg's centre line (the
	// open end, or the far edge of a shorted stub's via pad, whose centre
	// is half a pad before it).
	Center, End Point
	// Corner is the L's outer corner, cut away; Chamfer are the cut's ends:
	// Chamfer[0] on the first leg's outer edge, Chamfer[1] on the second
	// leg's, each ChamferLeg from Corner.
	Corner     Point
	Chamfer    [2]Point
	ChamferLeg int64 // 2·m·W, nm, rounded once
	// Leg1 is the centre-line length from the through line's edge (the
	// stub's reference plane) to Center, Leg2 from Center to End, nm.
	Leg1, Leg2 int64
	// Miter is Douville and James's fraction m of the corner's diagonal.
	Miter float64
	// Warning is non-empty when the bend is outside the range of Douville
	// and James's measurements (εr > MiterMaxEr).
	Warning string
}

// bendNM is a bent stub's layout relative to the through line's centre
// line, before the board's shift.
type bendNM struct {
	dir        int64 // +1 toward +x, −1 toward −x
	legs       [2]Rect
	center     Point // on the second leg's centre line
	end        Point
	via        Point // via centre, for a shorted stub
	corner     Point
	chamfer    [2]Point
	a          int64
	leg1, leg2 int64
	m          float64
	xs         [2]int64 // x extent of the whole L, via pad included
	top        int64    // outward extent from y = 0 (copper and via pad)
	warn       string
}

// bendRules is what planBends needs besides the stubs: the board's x size,
// the port pads' length (0 without pads), the margin and the y limit.
type bendRules struct {
	boardX, padL, margin, maxY int64
}

// planBends bends the stubs that do not fit maxY straight. straight is the
// copper's extent above and below y = 0 with every stub straight, base
// without the stubs. It returns one entry per stub (nil where the stub
// stays straight) and the copper's new extent, or a *SpecError when some
// stub can neither stay straight nor bend within the board.
func planBends(s Spec, segs []segNM, stubs []stubNM, base, straight [2]int64, r bendRules) ([]*bendNM, [2]int64, error) {
	avail := r.maxY - 2*r.margin
	var has [2]bool // stubs on the up (0) and down (1) side
	for _, t := range s.Stubs {
		has[sideIndex(t.Side)] = true
	}
	caps := straight
	switch {
	case has[0] && !has[1]:
		caps[0] = avail - straight[1]
	case has[1] && !has[0]:
		caps[1] = avail - straight[0]
	default:
		big := 0
		if straight[1] > straight[0] {
			big = 1
		}
		caps[big] = max(avail-straight[1-big], avail/2)
		caps[1-big] = avail - caps[big]
	}
	noFit := func(k int, reason string, a ...any) error {
		t := s.Stubs[k]
		return specErr("MaxBoard[1]", ErrNoFit,
			"the board needs %s mm in y (copper %s mm + 2 × %s mm margin), the limit is %s mm, and stub %q cannot bend 90° to fit: %s",
			mm(straight[0]+straight[1]+2*r.margin), mm(straight[0]+straight[1]), mm(r.margin), mm(r.maxY), t.ID, fmt.Sprintf(reason, a...))
	}
	for i := range caps {
		if caps[i] < base[i] {
			return nil, caps, specErr("MaxBoard[1]", ErrNoFit,
				"the through line and port pads need %s mm in y with 2 × %s mm margin, the limit is %s mm",
				mm(base[0]+base[1]+2*r.margin), mm(r.margin), mm(r.maxY))
		}
	}
	bends := make([]*bendNM, len(stubs))
	ext := base
	for k, st := range stubs {
		t := s.Stubs[k]
		i := sideIndex(t.Side)
		sd := int64(t.Side)
		if sd*st.end <= caps[i] {
			ext[i] = max(ext[i], sd*st.end)
			continue
		}
		var reasons []string
		for _, dir := range []int64{1, -1} {
			b, why := bendOne(s, k, dir, segs, stubs, bends, caps[i], r)
			if b != nil {
				bends[k] = b
				break
			}
			reasons = append(reasons, why)
		}
		if bends[k] == nil {
			return nil, caps, noFit(k, "toward the source port %s; toward the load port %s", reasons[0], reasons[1])
		}
		ext[i] = max(ext[i], bends[k].top)
	}
	return bends, ext, nil
}

func sideIndex(side int) int {
	if side > 0 {
		return 0
	}
	return 1
}

// bendOne lays stub k out as an L whose second leg runs toward dir, with
// its copper and via pad within cap of the through line's centre line. It
// returns nil and the reason when that does not fit.
func bendOne(s Spec, k int, dir int64, segs []segNM, stubs []stubNM, bends []*bendNM, capOut int64, r bendRules) (*bendNM, string) {
	t, st := s.Stubs[k], stubs[k]
	sd := int64(t.Side)
	w, L := Nanometres(t.Width), Nanometres(t.Length)
	P := st.viaPad
	if s.Height <= 0 {
		return nil, "needs the dielectric Height to size the miter"
	}
	if ratio := t.Width / s.Height; ratio < MiterMinWidthRatio {
		return nil, fmt.Sprintf("W/h = %.3f is below the %.2f of Douville and James's miter measurements", ratio, MiterMinWidthRatio)
	}
	m := MiterFraction(t.Width, s.Height)
	a := Nanometres(2 * m * t.Width)
	x0 := st.cx - w/2
	// The outer edge of the first leg is the one away from dir.
	xOuter, halfOuter := x0, st.cx-x0
	if dir < 0 {
		xOuter, halfOuter = x0+w, x0+w-st.cx
	}
	refU := sd * st.ref
	// Outward coordinate u = sd·y. The second leg spans u in
	// [uIn, uIn + w], its centre line at ub = uIn + w/2; a via pad sits
	// centred on it.
	half := w - w/2
	if P > 0 {
		half = max(half, P-P/2)
	}
	leg2Min := max(w, a-halfOuter+1)
	if P > 0 {
		leg2Min = max(leg2Min, P+(w-w/2))
	}
	ub := capOut - half
	if L-(ub-refU) < leg2Min {
		ub = refU + L - leg2Min
	}
	leg1 := ub - refU
	leg2 := L - leg1
	uIn := ub - w/2
	uOut := uIn + w
	if leg1 <= 0 || uOut-a <= refU {
		return nil, fmt.Sprintf("the first leg (%s mm to the bend centre) leaves no room for the %s mm miter above the through line", mm(leg1), mm(a))
	}
	xe := st.cx + dir*leg2
	b := &bendNM{dir: dir, leg1: leg1, leg2: leg2, m: m, a: a}
	y := func(u int64) int64 { return sd * u }
	yIn, yOut := y(uIn), y(uOut)
	b.legs[0] = Rect{Point{x0, min(0, yOut)}, Point{x0 + w, max(0, yOut)}}
	b.legs[1] = Rect{Point{min(xOuter, xe), min(yIn, yOut)}, Point{max(xOuter, xe), max(yIn, yOut)}}
	b.center = Point{st.cx, y(ub)}
	b.end = Point{xe, y(ub)}
	b.corner = Point{xOuter, yOut}
	b.chamfer = [2]Point{{xOuter, yOut - sd*a}, {xOuter + dir*a, yOut}}
	b.xs = [2]int64{b.legs[1].Min.X, b.legs[1].Max.X}
	b.top = uOut
	inner := uIn // the second leg's (and its pad's) inner extent
	if P > 0 {
		b.via = Point{xe - dir*(P/2), y(ub)}
		lo, hi := b.via.Y-P/2, b.via.Y-P/2+P
		b.top = max(b.top, sd*lo, sd*hi)
		inner = min(inner, sd*lo, sd*hi)
		b.xs = [2]int64{min(b.xs[0], b.via.X-P/2), max(b.xs[1], b.via.X-P/2+P)}
	}
	if b.top > capOut {
		return nil, fmt.Sprintf("the bend needs %s mm from the centre line, the board allows %s mm", mm(b.top), mm(capOut))
	}
	// The second leg keeps KeepOutHeights·Height from the through line it
	// runs along (common practice, no source: closer, the two couple).
	gap := Nanometres(KeepOutHeights * s.Height)
	far := [2]int64{x0 + w, b.xs[1]} // the second leg beyond the first
	if dir < 0 {
		far = [2]int64{b.xs[0], x0}
	}
	var through int64
	for _, g := range segs {
		if g.x1 > far[0] && g.x0 < far[1] {
			through = max(through, sd*g.hi, sd*g.lo)
		}
	}
	if inner-through < gap {
		return nil, fmt.Sprintf("its second leg would run %s mm from the through line, closer than %g × the height (%s mm)",
			mm(inner-through), KeepOutHeights, mm(gap))
	}
	lo, hi := int64(0), r.boardX
	if r.padL > 0 {
		lo, hi = r.padL, r.boardX-r.padL
	}
	if b.xs[0] < lo || b.xs[1] > hi || (r.padL == 0 && (b.xs[0] <= 0 || b.xs[1] >= r.boardX)) {
		return nil, fmt.Sprintf("its second leg (x %s..%s mm) would reach beyond x %s..%s mm (the through line between its port pads; "+
			"the board is not lengthened in x, whose size the through line sets)",
			mm(b.xs[0]), mm(b.xs[1]), mm(lo), mm(hi))
	}
	// Beyond its first leg the L keeps the same clearance from every other
	// stub on its side: from a straight one's copper and via pad, from a
	// bent one's whole L.
	for j, o := range stubs {
		if j == k || s.Stubs[j].Side != t.Side {
			continue
		}
		oxs := o.xs
		if bends[j] != nil {
			oxs = bends[j].xs
		}
		if far[0]-gap < oxs[1] && oxs[0] < far[1]+gap {
			return nil, fmt.Sprintf("its second leg (x %s..%s mm) would come within %s mm of stub %q (x %s..%s mm)",
				mm(far[0]), mm(far[1]), mm(gap), s.Stubs[j].ID, mm(oxs[0]), mm(oxs[1]))
		}
	}
	if s.Er > MiterMaxEr {
		b.warn = fmt.Sprintf("stub %q: εr = %g is above the %g of Douville and James's miter measurements", t.ID, s.Er, MiterMaxEr)
	}
	return b, ""
}

// chamfer replaces the vertex c of p, an outer corner of the L, by the two
// chamfer points q: the polygon stays simple because each q lies strictly
// inside one of the corner's two edges.
func chamfer(p Polygon, c Point, q [2]Point) (Polygon, error) {
	n := len(p)
	for i, v := range p {
		if v != c {
			continue
		}
		prev, next := p[(i+n-1)%n], p[(i+1)%n]
		first, second := q[0], q[1]
		if !onEdge(c, prev, first) {
			first, second = q[1], q[0]
		}
		if !onEdge(c, prev, first) || !onEdge(c, next, second) {
			return nil, fmt.Errorf("the miter's ends (%v, %v) do not lie inside the corner's edges to %v and %v", q[0], q[1], prev, next)
		}
		out := make(Polygon, 0, n+1)
		out = append(out, p[:i]...)
		out = append(out, first, second)
		return append(out, p[i+1:]...), nil
	}
	return nil, fmt.Errorf("the corner %v is not a vertex of the copper outline", c)
}

// onEdge reports whether q lies on the axis-parallel segment from c to e,
// strictly between them.
func onEdge(c, e, q Point) bool {
	switch {
	case c.X == e.X && q.X == c.X:
		return min(c.Y, e.Y) < q.Y && q.Y < max(c.Y, e.Y)
	case c.Y == e.Y && q.Y == c.Y:
		return min(c.X, e.X) < q.X && q.X < max(c.X, e.X)
	}
	return false
}

// addBend records the bent stub t (laid out straight as st, bent as b) in
// l's marks, shifted up by yc, and returns the rectangles of its two legs.
// Its element is the L's bounding box from the reference plane outward;
// its tee's EndY is the y of the second leg's centre line, on which the
// stub's end lies.
func (l *Layout) addBend(t Stub, st stubNM, b *bendNM, yc int64) []Rect {
	up := func(p Point) Point { return Point{p.X, p.Y + yc} }
	legs := []Rect{b.legs[0], b.legs[1]}
	box := Rect{Point{b.xs[0], min(legs[1].Min.Y, st.ref)}, Point{b.xs[1], max(legs[1].Max.Y, st.ref)}}
	for i := range legs {
		legs[i].Min.Y += yc
		legs[i].Max.Y += yc
	}
	box.Min.Y += yc
	box.Max.Y += yc
	l.Marks.Elements = append(l.Marks.Elements, Element{t.ID, KindStub, box})
	l.Marks.Tees = append(l.Marks.Tees, Tee{
		StubID: t.ID, Center: Point{st.cx, yc}, RefY: st.ref + yc, EndY: b.center.Y + yc,
	})
	l.Marks.Bends = append(l.Marks.Bends, Bend{
		StubID: t.ID, Toward: int(b.dir), Center: up(b.center), End: up(b.end),
		Corner: up(b.corner), Chamfer: [2]Point{up(b.chamfer[0]), up(b.chamfer[1])}, ChamferLeg: b.a,
		Leg1: b.leg1, Leg2: b.leg2, Miter: b.m, Warning: b.warn,
	})
	return legs
}
