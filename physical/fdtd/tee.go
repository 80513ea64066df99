package fdtd

import "math"

// TeeBoard describes a symmetric T-junction test board: a straight through
// line of width ThroughW (m) between the two ports, and an open stub of
// width StubW (m) hung on it at the board's centre, running in +y from the
// through line's edge for StubLen (m). Each through arm runs ArmLen (m)
// from a board edge to the stub's centre line.
type TeeBoard struct {
	Er, H           float64   // substrate relative permittivity and height, m
	ThroughW, StubW float64   // strip widths, m
	StubLen, ArmLen float64   // stub length from the through line's edge, arm length, m
	Freqs           []float64 // sweep frequencies, Hz, ascending
}

// DefaultArmLen is an arm long enough that the junction's evanescent
// fields have died out before the port probes (which lie about two
// strip widths or substrate heights beyond the board edge): half the stub
// width plus three times the larger of h and the through width.
func DefaultArmLen(h, throughW, stubW float64) float64 {
	return stubW/2 + 3*math.Max(h, throughW)
}

// Structure returns the board as the solver takes it. The stub's copper
// starts on the through line's centre line (overlapping the through
// strip), so that the two polygons touch along the whole junction.
func (b TeeBoard) Structure() Structure {
	n := func(v float64) int64 { return int64(math.Round(v * 1e9)) }
	wt, ws := n(b.ThroughW), n(b.StubW)
	arm := n(b.ArmLen)
	xc := arm
	end := 2 * arm
	return Structure{Er: b.Er, H: b.H, BoardMinX: 0, BoardMaxX: end, Freqs: b.Freqs,
		Copper: []Polygon{
			RectPolygon(0, -wt/2, end, wt-wt/2),
			RectPolygon(xc-ws/2, 0, xc+ws-ws/2, wt-wt/2+n(b.StubLen)),
		},
		Ports: [2]Port{{Side: Left, Y: 0, Width: wt}, {Side: Right, Y: 0, Width: wt}}}
}
