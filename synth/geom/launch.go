package geom

import "math"

// LaunchSpec is a generic edge-launch landing, drawn at both ports instead
// of the plain port pad: a signal pad at the board edge on the through
// line's centre line (it replaces Spec.PortPad), and on each side of it,
// Gap away, a top-side ground pad with a row of plated vias to the ground
// plane. It describes no one connector: every size is the design's. The
// signal pad runs to the board edge (the edge-launch exception to the
// pull-back); the ground pads keep Spec.EdgeClearance from it. Lengths are
// metres.
type LaunchSpec struct {
	// PadWidth and PadLength size the signal pad: across the line (y)
	// and along it from the board edge (x).
	PadWidth, PadLength float64
	// Gap is the clearance between the signal pad and each ground pad.
	Gap float64
	// GroundWidth is a ground pad's size across the line (y), from Gap
	// outward; GroundLength its size along the line (x), from the
	// pulled-back edge inward.
	GroundWidth, GroundLength float64
	// ViaDrill and ViaPad size the ground vias; ViaPitch is their largest
	// centre spacing along the ground pad. Each ground pad carries one
	// row of vias along x on its centre line, as many as fit at that pitch
	// with the pads inside the ground pad, spread evenly and centred.
	ViaDrill, ViaPad, ViaPitch float64
}

// Connector pins of the landing's ground pads (the pin numbering of a
// generic edge-launch connector: 1 the signal, 2 and 3 the ground tabs on
// the +y and −y sides).
const (
	PinGroundUp   = "2"
	PinGroundDown = "3"
)

// checkLaunch refuses a landing with a non-positive or non-finite size, a
// via pad not wider than its drill, a via row that does not fit its
// ground pad or holes that would touch.
func checkLaunch(l LaunchSpec) error {
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"Launch.PadWidth", l.PadWidth}, {"Launch.PadLength", l.PadLength}, {"Launch.Gap", l.Gap},
		{"Launch.GroundWidth", l.GroundWidth}, {"Launch.GroundLength", l.GroundLength},
		{"Launch.ViaDrill", l.ViaDrill}, {"Launch.ViaPad", l.ViaPad}, {"Launch.ViaPitch", l.ViaPitch},
	} {
		if !(f.v > 0) || math.IsInf(f.v, 0) || Nanometres(f.v) <= 0 {
			return specErr(f.name, ErrSize, "%g mm", f.v*1e3)
		}
	}
	switch {
	case l.ViaPad <= l.ViaDrill:
		return specErr("Launch.ViaPad", ErrVia, "ground via pad %g mm is not wider than its drill %g mm", l.ViaPad*1e3, l.ViaDrill*1e3)
	case l.ViaPad > l.GroundWidth || l.ViaPad > l.GroundLength:
		return specErr("Launch.ViaPad", ErrVia, "ground via pad %g mm does not fit the %g × %g mm ground pad", l.ViaPad*1e3, l.GroundLength*1e3, l.GroundWidth*1e3)
	case l.ViaPitch <= l.ViaDrill:
		return specErr("Launch.ViaPitch", ErrVia, "ground vias at %g mm pitch: the holes (%g mm) would touch", l.ViaPitch*1e3, l.ViaDrill*1e3)
	}
	return nil
}

// launchVias returns the centre offsets of a ground pad's via row along
// its length gl (nm), about the pad's centre: as many vias as fit with
// their pads inside the length at no more than pitch apart, evenly spread.
func launchVias(gl, pad, pitch int64) []int64 {
	span := gl - pad // centre to centre of the outermost two
	n := int64(1)
	if span > 0 {
		n = (span+pitch-1)/pitch + 1 // the fewest vias not more than pitch apart
	}
	if n == 1 {
		return []int64{0}
	}
	o := make([]int64, n)
	for i := range o {
		o[i] = -span/2 + (int64(i)*span+(n-1)/2)/(n-1)
	}
	return o
}

// landingExtent returns how far the landing reaches across the line on
// each side of the centre line (the ground pads' outer edges), nm, for the
// signal pad of width padW.
func landingExtent(l LaunchSpec, padW int64) int64 {
	return padW - padW/2 + Nanometres(l.Gap) + Nanometres(l.GroundWidth)
}

// landingLength returns how far from each board edge along the line the
// landing, with its gap, keeps other copper away, nm: the signal pad or
// the ground pads (from the pulled-back edge) plus the gap, whichever
// reaches further.
func landingLength(l LaunchSpec, edge int64) int64 {
	return maxI(Nanometres(l.PadLength), edge+Nanometres(l.GroundLength)+Nanometres(l.Gap))
}

// addLanding draws the landing's ground pads and their vias at both ports
// of l (the board ends at x = boardX, the centre line at y = yc, the
// signal pad is padW wide) and returns the ground pads' rectangles. A
// ground pad that comes closer than the gap to other RF copper (rf: the
// line, the stubs, the via pads) is refused.
func (l *Layout) addLanding(s LaunchSpec, boardX, yc, padW, edge int64, rf []Rect) ([]Rect, error) {
	gap, gw, gl := Nanometres(s.Gap), Nanometres(s.GroundWidth), Nanometres(s.GroundLength)
	drill, vpad, pitch := Nanometres(s.ViaDrill), Nanometres(s.ViaPad), Nanometres(s.ViaPitch)
	up := yc - padW/2 + padW + gap // the +y ground pad's lower edge
	down := yc - padW/2 - gap      // the −y ground pad's upper edge
	var out []Rect
	for i, x0 := range []int64{edge, boardX - edge - gl} {
		ref := [2]string{"J2", "J1"}[i]
		for _, g := range []struct {
			r   Rect
			pin string
		}{
			{Rect{Point{x0, up}, Point{x0 + gl, up + gw}}, PinGroundUp},
			{Rect{Point{x0, down - gw}, Point{x0 + gl, down}}, PinGroundDown},
		} {
			for _, c := range rf {
				if !g.r.Inset(gap).Intersect(c).Empty() {
					return nil, specErr("Launch", ErrOverlap,
						"the %s ground pad (pin %s, x %s..%s mm, y %s..%s mm) comes within the %s mm gap of the RF copper at x %s..%s mm, y %s..%s mm",
						ref, g.pin, mm(g.r.Min.X), mm(g.r.Max.X), mm(g.r.Min.Y), mm(g.r.Max.Y), mm(gap),
						mm(c.Min.X), mm(c.Max.X), mm(c.Min.Y), mm(c.Max.Y))
				}
			}
			c := Point{(g.r.Min.X + g.r.Max.X) / 2, (g.r.Min.Y + g.r.Max.Y) / 2}
			l.Pads = append(l.Pads, Pad{Net: NetGround, Function: SMDPad, Center: c, W: gl, H: gw, Pin: ref + "," + g.pin})
			for _, o := range launchVias(gl, vpad, pitch) {
				v := Point{c.X + o, c.Y}
				l.Vias = append(l.Vias, Via{Net: NetGround, Center: v, Drill: drill, Pad: vpad})
				l.Pads = append(l.Pads, Pad{Net: NetGround, Function: ViaPad, Center: v, W: vpad, H: vpad, Round: true})
			}
			out = append(out, g.r)
		}
	}
	return out, nil
}

// LaunchViaCount returns the number of vias in each ground pad of the
// landing s.
func LaunchViaCount(s LaunchSpec) int {
	return len(launchVias(Nanometres(s.GroundLength), Nanometres(s.ViaPad), Nanometres(s.ViaPitch)))
}
