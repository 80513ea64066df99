package geom

import (
	"fmt"
	"math"
	"strings"
)

// NetRF is the name of the matching network's copper net; NetGround is the
// name of the ground plane and the vias' far side.
const (
	NetRF     = "RF"
	NetGround = "GND"
)

// MaxViaPadRatio bounds a via pad's diameter to this many stub widths. A
// pad much wider than its stub is no longer a small load at the stub's end:
// the width step and the pad's own capacitance move the short-circuit
// plane by an amount the via and open-end corrections do not model, and the
// pad starts to crowd the neighbouring copper. Three widths is common
// practice, no source.
const MaxViaPadRatio = 3.0

// KeepOutHeights is the keep-out distance around the RF copper in
// dielectric heights: other top copper closer than about three heights
// couples into a microstrip's fringing field. Common practice, no source.
const KeepOutHeights = 3.0

// Build lays out the network described by s. Every length is rounded once
// to whole nanometres. A malformed Spec returns a *SpecError and no layout.
func Build(s Spec) (Layout, error) {
	if s.Launch != nil {
		if err := checkLaunch(*s.Launch); err != nil {
			return Layout{}, err
		}
		if n := len(s.Segments); n > 1 {
			if a, b := Nanometres(s.Segments[0].Width), Nanometres(s.Segments[n-1].Width); a != b {
				return Layout{}, specErr("Launch", ErrRange, "an edge launch lands one connector at each end, but the load's port line is %s mm wide and the source's %s mm: draw port pads, or end both feeds in lines of one impedance", mm(a), mm(b))
			}
		}
		s.PortPad = PadSpec{Width: s.Launch.PadWidth, Length: s.Launch.PadLength}
	}
	if err := check(s); err != nil {
		return Layout{}, err
	}
	if s.Fence != nil {
		if err := checkFence(s); err != nil {
			return Layout{}, err
		}
	}
	cpw, hasPour, err := coplanarRule(s)
	if err != nil {
		return Layout{}, err
	}
	n := len(s.Segments)

	// Through line, relative to its centre line y = 0.
	segs := make([]segNM, n)
	var x int64
	for i, g := range s.Segments {
		w, l := Nanometres(g.Width), Nanometres(g.Length)
		segs[i] = segNM{x, x + l, -(w / 2), -(w / 2) + w}
		x += l
	}
	boardX := x
	padWs, padL := s.PortPad.widths(), Nanometres(s.PortPad.Length)
	padW := padWs[0] // the launch's pad (one width at both ends)
	hasPad := padW > 0
	// landX is how far from each board edge the port's copper keeps the
	// stubs away: the port pad, or the edge-launch landing with its gap.
	landX := padL
	if s.Launch != nil {
		landX = landingLength(*s.Launch, Nanometres(s.EdgeClearance))
	}

	up, down := int64(0), int64(0) // copper extent above and below y = 0
	for _, g := range segs {
		up, down = maxI(up, g.hi), maxI(down, -g.lo)
	}
	if hasPad {
		for _, w := range padWs {
			up, down = maxI(up, -(w/2)+w), maxI(down, w/2)
		}
	}
	if s.Launch != nil {
		e := landingExtent(*s.Launch, padW)
		up, down = maxI(up, e), maxI(down, e+padW/2-(padW-padW/2))
	}

	base := [2]int64{up, down} // the through line's and port pads' extent, before the stubs
	stubs := make([]stubNM, len(s.Stubs))
	for k, t := range s.Stubs {
		w, l := Nanometres(t.Width), Nanometres(t.Length+t.TrimAllowance)
		a, b := segs[t.At], segs[t.At+1]
		x0 := a.x1 - w/2
		st := stubNM{cx: x0 + w/2, xs: [2]int64{x0, x0 + w}}
		if t.Side > 0 {
			st.ref = maxI(a.hi, b.hi)
			st.end = st.ref + l
			st.r = Rect{Point{x0, 0}, Point{x0 + w, st.end}}
			up = maxI(up, st.end)
		} else {
			st.ref = minI(a.lo, b.lo)
			st.end = st.ref - l
			st.r = Rect{Point{x0, st.end}, Point{x0 + w, 0}}
			down = maxI(down, -st.end)
		}
		if t.Via != nil {
			st.drill, st.viaPad = Nanometres(t.Via.Drill), Nanometres(t.Via.Pad)
			st.viaY = st.end - int64(t.Side)*(st.viaPad/2)
			st.xs = [2]int64{minI(x0, st.cx-st.viaPad/2), maxI(x0+w, st.cx-st.viaPad/2+st.viaPad)}
		}
		field := fmt.Sprintf("Stubs[%d]", k)
		// The stub must stay on the two segments that meet at its tee.
		if st.xs[0] < a.x0 || st.xs[1] > b.x1 {
			return Layout{}, specErr(field, ErrOverlap,
				"stub %q (x %s..%s mm) reaches beyond segments %q and %q (x %s..%s mm)",
				t.ID, mm(st.xs[0]), mm(st.xs[1]), s.Segments[t.At].ID, s.Segments[t.At+1].ID, mm(a.x0), mm(b.x1))
		}
		if hasPad && (st.xs[0] < landX || st.xs[1] > boardX-landX) {
			what := "a port pad"
			if s.Launch != nil {
				what = "an edge-launch landing with its gap"
			}
			return Layout{}, specErr(field, ErrOverlap,
				"stub %q (x %s..%s mm) overlaps %s (x 0..%s and %s..%s mm)",
				t.ID, mm(st.xs[0]), mm(st.xs[1]), what, mm(landX), mm(boardX-landX), mm(boardX))
		}
		for j := 0; j < k; j++ {
			if s.Stubs[j].Side != t.Side {
				continue
			}
			o := stubs[j]
			if st.xs[0] <= o.xs[1] && o.xs[0] <= st.xs[1] {
				return Layout{}, specErr(field, ErrOverlap,
					"stub %q (x %s..%s mm) overlaps or touches stub %q (x %s..%s mm) on the same side",
					t.ID, mm(st.xs[0]), mm(st.xs[1]), s.Stubs[j].ID, mm(o.xs[0]), mm(o.xs[1]))
			}
		}
		stubs[k] = st
	}

	margin := Nanometres(s.Margin)
	boardY := up + down + 2*margin
	if mx := Nanometres(s.MaxBoard[0]); mx > 0 && boardX > mx {
		return Layout{}, specErr("MaxBoard[0]", ErrNoFit,
			"the through line is %s mm long, the limit is %s mm", mm(boardX), mm(mx))
	}
	var bends []*bendNM
	if my := Nanometres(s.MaxBoard[1]); my > 0 && boardY > my {
		// Too tall with straight stubs: bend the ones that do not fit.
		var ext [2]int64
		var err error
		bends, ext, err = planBends(s, segs, stubs, base, [2]int64{up, down},
			bendRules{boardX: boardX, padL: landX, margin: margin, maxY: my})
		if err != nil {
			return Layout{}, err
		}
		up, down = ext[0], ext[1]
		boardY = up + down + 2*margin
	}

	// Shift everything so the board's lower-left corner is the origin.
	yc := margin + down
	sh := func(r Rect) Rect {
		r.Min.Y += yc
		r.Max.Y += yc
		return r
	}
	board := Rect{Point{0, 0}, Point{boardX, boardY}}
	// inner is the board pulled back by the edge clearance: all copper
	// but the signal line at the two port edges stays inside it.
	inner := board.Inset(-Nanometres(s.EdgeClearance))
	l := Layout{
		Name:   s.Name,
		Board:  board.Polygon(),
		Ground: inner.Polygon(),
	}
	l.Marks.CentreY = yc
	l.Marks.Ports = [2]Point{{0, yc}, {boardX, yc}}

	var copper, mask, keep []Rect
	for i, g := range segs {
		r := sh(Rect{Point{g.x0, g.lo}, Point{g.x1, g.hi}})
		copper = append(copper, r)
		l.Marks.Elements = append(l.Marks.Elements, Element{s.Segments[i].ID, KindSegment, r})
	}
	for k, st := range stubs {
		t := s.Stubs[k]
		if bends != nil && bends[k] != nil {
			copper = append(copper, l.addBend(t, st, bends[k], yc)...)
		} else {
			r := sh(st.r)
			copper = append(copper, r)
			ext := r
			if t.Side > 0 {
				ext.Min.Y = st.ref + yc
			} else {
				ext.Max.Y = st.ref + yc
			}
			l.Marks.Elements = append(l.Marks.Elements, Element{t.ID, KindStub, ext})
			l.Marks.Tees = append(l.Marks.Tees, Tee{
				StubID: t.ID, Center: Point{st.cx, yc}, RefY: st.ref + yc, EndY: st.end + yc,
			})
		}
		if t.Via != nil {
			c := Point{st.cx, st.viaY + yc}
			if bends != nil && bends[k] != nil {
				c = Point{bends[k].via.X, bends[k].via.Y + yc}
			}
			// A row lies across the stub's end: along x on a straight
			// stub, along y on a bent one's second leg.
			across := Point{1, 0}
			if bends != nil && bends[k] != nil {
				across = Point{0, 1}
			}
			for _, o := range t.Via.offsets() {
				c := Point{c.X + across.X*o, c.Y + across.Y*o}
				l.Vias = append(l.Vias, Via{Net: NetRF, Center: c, Drill: st.drill, Pad: st.viaPad})
				l.Pads = append(l.Pads, Pad{Net: NetRF, Function: ViaPad, Center: c, W: st.viaPad, H: st.viaPad, Round: true})
				sq := Rect{Point{c.X - st.viaPad/2, c.Y - st.viaPad/2}, Point{c.X - st.viaPad/2 + st.viaPad, c.Y - st.viaPad/2 + st.viaPad}}
				mask = append(mask, sq)
				keep = append(keep, sq)
			}
		}
	}
	for k, t := range s.Stubs {
		if t.TrimAllowance > 0 {
			l.Marks.Trims = append(l.Marks.Trims, trimMark(t, stubs[k], bends, k, yc))
		}
	}
	outline := Union(copper)
	if len(outline) != 1 {
		return Layout{}, specErr("Segments", ErrOverlap, "the copper is not one simple polygon (%d loops)", len(outline))
	}
	rf := outline[0]
	for _, b := range l.Marks.Bends {
		var err error
		if rf, err = chamfer(rf, b.Corner, b.Chamfer); err != nil {
			return Layout{}, specErr("Stubs", ErrOverlap, "stub %q: %v", b.StubID, err)
		}
	}
	l.Copper = []Net{{Name: NetRF, Outline: rf}}
	mask = append(mask, copper...)
	keep = append(keep, copper...)

	var padRects []Rect
	if hasPad {
		for i, cx := range []int64{padL / 2, boardX - padL + padL/2} {
			c := Point{cx, yc}
			pin, w := [2]string{PinLoad, PinSource}[i], padWs[i]
			l.Pads = append(l.Pads, Pad{Net: NetRF, Function: SMDPad, Center: c, W: padL, H: w, Pin: pin})
			padRects = append(padRects, Rect{Point{cx - padL/2, yc - w/2}, Point{cx - padL/2 + padL, yc - w/2 + w}})
		}
	}
	mask = append(mask, padRects...)
	keep = append(keep, padRects...)
	var ground []Rect // the landing's ground pads
	if s.Launch != nil {
		var err error
		if ground, err = l.addLanding(*s.Launch, boardX, yc, padW, Nanometres(s.EdgeClearance), keep); err != nil {
			return Layout{}, err
		}
	}
	if s.Fence != nil {
		l.addFence(*s.Fence, keep, inner, ground)
	}
	if hasPour {
		if err := l.addCoplanar(s, mask, inner, cpw); err != nil {
			return Layout{}, err
		}
	}
	if s.Mask == "cover" {
		mask = padRects
	}
	mask = append(mask, ground...)
	keep = append(keep, ground...)
	l.MaskOpenings = grownUnion(mask, maskGrowth(s, cpw, hasPour), board)
	ko := margin
	if s.Height > 0 {
		ko = Nanometres(KeepOutHeights * s.Height)
	}
	l.KeepOut = grownUnion(keep, ko, board)
	if s.LegendTitle != "" {
		l.addLegend(s.LegendTitle, s.LegendNote, Nanometres(s.EdgeClearance))
	}
	l.addTrimTicks(Nanometres(s.MaskExpansion), Nanometres(s.EdgeClearance))
	return l, nil
}

// Trim tick strokes on the legend, nm: beside the stub on both sides, off
// its mask opening; tick 0 (the design length) longer than the others.
const (
	trimTickLen  = 800_000
	trimTick0Len = 1_600_000
)

// addTrimTicks prints the trim ticks of Marks.Trims on the legend: at each
// tick a short stroke on each side of the stub, clear of its copper and
// mask opening, so that the bench can cut back to a tick under a loupe.
// A tick that does not fit (another opening, the board edge) is left out.
func (l *Layout) addTrimTicks(maskGrowth, edge int64) {
	gap := maskGrowth + LegendClearance + LegendLine
	for _, t := range l.Marks.Trims {
		px, py := -t.Dir.Y, t.Dir.X // across the stub
		for k := 0; k <= t.Ticks; k++ {
			p := t.Tick(k)
			n := int64(trimTickLen)
			if k == 0 {
				n = trimTick0Len
			}
			for _, side := range []int64{1, -1} {
				a := t.Across/2 + gap
				s := Stroke{
					{p.X + side*px*a, p.Y + side*py*a},
					{p.X + side*px*(a+n), p.Y + side*py*(a+n)},
				}
				l.AddLegend([]Stroke{s}, edge)
			}
		}
	}
}

// addLegend places the title (and the note after it, or on a line below
// when the two do not fit on one) along the top edge of the board, or the
// bottom when they do not fit there, and the port names with the signal
// arrow along the other long edge, each where it fits off the pads and
// mask openings (AddLegend); an item that fits nowhere is left out.
func (l *Layout) addLegend(title, note string, edge int64) {
	lo, hi := l.Board.Bounds()
	h := int64(LegendHeight)
	pad := edge + LegendLine
	x0 := lo.X + pad + LegendLine
	room := (hi.X - x0 - pad - LegendLine) / (6 * (h / 6)) // characters per line
	fit := func(s string) string {
		if r := []rune(s); room >= 0 && int64(len(r)) > room {
			return string(r[:room])
		}
		return s
	}
	var lines []string
	if one := title + " " + note; note == "" || int64(len([]rune(one))) <= room {
		lines = []string{strings.TrimSpace(one)}
	} else {
		lines = []string{fit(title), fit(note)}
	}
	lead := h * 16 / 10
	place := func(topLine int64, down bool) bool {
		var ss []Stroke
		for i, ln := range lines {
			y := topLine - int64(i)*lead
			if !down {
				y = topLine + int64(len(lines)-1-i)*lead
			}
			ss = append(ss, LegendText(ln, Point{x0, y}, h)...)
		}
		return l.AddLegend(ss, edge)
	}
	bottomY := lo.Y + pad
	if !place(hi.Y-pad-h, true) {
		if place(bottomY, false) {
			bottomY = hi.Y - pad - h
		}
	}
	// J2 at the load port (left), J1 at the source port (right), the
	// arrow from J1 toward J2: the signal's way from the source.
	xr := hi.X - pad - LegendLine - LegendTextWidth("J1", h)
	l.AddLegend(LegendText("J2", Point{x0, bottomY}, h), edge)
	l.AddLegend(LegendText("J1", Point{xr, bottomY}, h), edge)
	a := Point{xr - h, bottomY + h/2}
	b := Point{x0 + LegendTextWidth("J2", h) + h, bottomY + h/2}
	if a.X-b.X > 2*h {
		l.AddLegend(LegendArrow(a, b, h/2), edge)
	}
}

// segNM is one through-line segment in nanometres, relative to the line's
// centre line y = 0: x0..x1 along it, lo..hi across.
type segNM struct {
	x0, x1, lo, hi int64
}

// stubNM is one stub laid out straight, in nanometres relative to the
// through line's centre line.
type stubNM struct {
	r      Rect // drawn copper, from the centre line to the end
	ref    int64
	end    int64
	xs     [2]int64 // x extent including the via pad
	cx     int64
	viaY   int64
	drill  int64
	viaPad int64
}

// grownUnion grows every rectangle by d, clips it to the board and returns
// the union.
func grownUnion(rs []Rect, d int64, board Rect) []Polygon {
	g := make([]Rect, 0, len(rs))
	for _, r := range rs {
		g = append(g, r.Inset(d).Intersect(board))
	}
	return Union(g)
}

// check refuses non-positive or non-finite sizes, stubs at no boundary and
// vias that do not fit their stub.
func check(s Spec) error {
	pos := func(field string, v float64) error {
		if !(v > 0) || math.IsInf(v, 0) || Nanometres(v) <= 0 {
			return specErr(field, ErrSize, "%g m", v)
		}
		return nil
	}
	nonNeg := func(field string, v float64) error {
		if !(v >= 0) || math.IsInf(v, 0) {
			return specErr(field, ErrSize, "%g m must be zero or positive", v)
		}
		return nil
	}
	if len(s.Segments) == 0 {
		return specErr("Segments", ErrRange, "at least one segment is needed")
	}
	for i, g := range s.Segments {
		f := fmt.Sprintf("Segments[%d]", i)
		if err := pos(f+".Width", g.Width); err != nil {
			return err
		}
		if err := pos(f+".Length", g.Length); err != nil {
			return err
		}
	}
	for k, t := range s.Stubs {
		f := fmt.Sprintf("Stubs[%d]", k)
		if t.At < 0 || t.At > len(s.Segments)-2 {
			return specErr(f+".At", ErrRange, "stub %q: At = %d, but the boundaries between %d segments are 0..%d",
				t.ID, t.At, len(s.Segments), len(s.Segments)-2)
		}
		if t.Side != 1 && t.Side != -1 {
			return specErr(f+".Side", ErrRange, "stub %q: Side = %d, want +1 or -1", t.ID, t.Side)
		}
		if err := pos(f+".Width", t.Width); err != nil {
			return err
		}
		if err := pos(f+".Length", t.Length); err != nil {
			return err
		}
		if err := nonNeg(f+".TrimAllowance", t.TrimAllowance); err != nil {
			return err
		}
		if t.TrimAllowance > 0 && t.Via != nil {
			return specErr(f+".TrimAllowance", ErrRange, "stub %q ends in a via and cannot be trimmed", t.ID)
		}
		if v := t.Via; v != nil {
			if err := pos(f+".Via.Drill", v.Drill); err != nil {
				return err
			}
			if err := pos(f+".Via.Pad", v.Pad); err != nil {
				return err
			}
			switch {
			case v.Pad <= v.Drill:
				return specErr(f+".Via.Pad", ErrVia, "stub %q: pad %g m is not wider than the drill %g m", t.ID, v.Pad, v.Drill)
			case v.Pad > MaxViaPadRatio*t.Width:
				return specErr(f+".Via.Pad", ErrVia, "stub %q: pad %g m exceeds %g × the stub width %g m", t.ID, v.Pad, MaxViaPadRatio, t.Width)
			case v.Pad > t.Length:
				return specErr(f+".Via.Pad", ErrVia, "stub %q: pad %g m is longer than the stub %g m and would reach the through line", t.ID, v.Pad, t.Length)
			}
			if v.Count > 1 {
				if !(v.Spacing > v.Drill) || math.IsInf(v.Spacing, 0) {
					return specErr(f+".Via.Spacing", ErrVia, "stub %q: a row of %d vias at %g m spacing: the holes (%g m) would touch", t.ID, v.Count, v.Spacing, v.Drill)
				}
				if span := float64(v.Count-1)*v.Spacing + v.Pad; span > t.Width*(1+1e-9) {
					return specErr(f+".Via.Count", ErrVia, "stub %q: a row of %d vias at %g m spacing spans %g m, wider than the stub %g m", t.ID, v.Count, v.Spacing, span, t.Width)
				}
			}
		}
	}
	p := s.PortPad
	if p.Width != 0 || p.Length != 0 {
		if err := pos("PortPad.Width", p.Width); err != nil {
			return err
		}
		if err := pos("PortPad.Length", p.Length); err != nil {
			return err
		}
		if err := nonNeg("PortPad.SourceWidth", p.SourceWidth); err != nil {
			return err
		}
		var total float64
		for _, g := range s.Segments {
			total += g.Length
		}
		if 2*p.Length > total {
			return specErr("PortPad.Length", ErrOverlap, "two port pads of %g m do not fit a %g m line", p.Length, total)
		}
	}
	if err := nonNeg("Margin", s.Margin); err != nil {
		return err
	}
	if err := nonNeg("EdgeClearance", s.EdgeClearance); err != nil {
		return err
	}
	if Nanometres(s.Margin) < Nanometres(s.EdgeClearance) {
		return specErr("Margin", ErrRange, "%s mm is less than the edge clearance %s mm: the stubs' copper would come closer to the routed edge",
			mm(Nanometres(s.Margin)), mm(Nanometres(s.EdgeClearance)))
	}
	if err := nonNeg("MaxBoard[0]", s.MaxBoard[0]); err != nil {
		return err
	}
	if err := nonNeg("MaxBoard[1]", s.MaxBoard[1]); err != nil {
		return err
	}
	if err := nonNeg("Height", s.Height); err != nil {
		return err
	}
	if err := nonNeg("MaskExpansion", s.MaskExpansion); err != nil {
		return err
	}
	switch s.Mask {
	case "", "open", "cover":
	default:
		return specErr("Mask", ErrRange, "%q, want \"open\" or \"cover\"", s.Mask)
	}
	return nil
}

// mm formats nanometres as millimetres for error messages.
func mm(nm int64) string { return FormatMM(nm) }

// trimMark places the ticks of stub t (laid out as st, or bent by
// bends[k]) drawn TrimAllowance longer than its design length.
func trimMark(t Stub, st stubNM, bends []*bendNM, k int, yc int64) Trim {
	a := Nanometres(t.TrimAllowance)
	tr := Trim{StubID: t.ID, Across: Nanometres(t.Width), Ticks: int(a / TrimTickPitch)}
	if bends != nil && bends[k] != nil {
		b := bends[k]
		tr.End = Point{b.end.X, b.end.Y + yc}
		tr.Dir = Point{b.dir, 0}
	} else {
		tr.End = Point{st.cx, st.end + yc}
		tr.Dir = Point{0, int64(t.Side)}
	}
	tr.DesignEnd = Point{tr.End.X - a*tr.Dir.X, tr.End.Y - a*tr.Dir.Y}
	return tr
}
