package synth

import (
	"errors"
	"fmt"

	"stubcraft/synth/geom"
)

// PortKind is how the ports are drawn ([layout] port).
type PortKind string

// Port kinds.
const (
	// PortPad flashes a pad of the port line's width on each end of the
	// through line (the default).
	PortPad PortKind = "pad"
	// PortEdge draws a generic edge-launch landing at each port: a signal
	// pad at the board edge and, beside it, top-side ground pads with
	// plated vias to the plane (LaunchSizes).
	PortEdge PortKind = "edge"
)

// String returns the word a design file uses.
func (p PortKind) String() string { return string(p) }

// ParsePortKind reads "pad" or "edge".
func ParsePortKind(s string) (PortKind, error) {
	switch v := PortKind(s); v {
	case PortPad, PortEdge:
		return v, nil
	}
	return "", errors.New(`use pad (a pad on each end of the line) or edge (an edge-launch landing with ground pads and vias)`)
}

// LaunchSizes are the design's sizes of the edge-launch landing, m ([layout]
// launch_*); a zero field takes its default (see Resolve).
type LaunchSizes struct {
	PadWidth     float64 // launch_pad_width: the signal pad across the line
	PadLength    float64 // launch_pad_length: the signal pad along the line from the edge
	Gap          float64 // launch_gap: signal pad to each ground pad
	GroundWidth  float64 // launch_ground_width: a ground pad across the line
	GroundLength float64 // launch_ground_length: a ground pad along the line
	ViaDrill     float64 // launch_via_drill: the ground vias' drill
	ViaPad       float64 // launch_via_pad: their pads
	ViaPitch     float64 // launch_via_pitch: their largest centre spacing
}

// Landing defaults, m. Common practice, no source: sizes a generic
// edge-launch connector of the 50 Ω class lands on (a signal pin a few
// tenths of a millimetre wide and 1–2 mm long, ground tabs a few
// millimetres wide); no one product's footprint.
const (
	DefaultLaunchPadLength    = 1.5e-3
	DefaultLaunchGap          = 0.5e-3
	DefaultLaunchGroundWidth  = 1.5e-3
	DefaultLaunchGroundLength = 2.5e-3
)

// Resolve returns the landing's geometry with the defaults filled: the
// signal pad as wide as the port line (portWidth, so that the pad adds no
// width step), the vias as the layout's via_drill and via_pad, at twice
// the via pad's pitch (as a shorted stub's via row).
func (s LaunchSizes) Resolve(l LayoutSpec, portWidth float64) geom.LaunchSpec {
	or := func(v, def float64) float64 {
		if v > 0 {
			return v
		}
		return def
	}
	g := geom.LaunchSpec{
		PadWidth:     or(s.PadWidth, portWidth),
		PadLength:    or(s.PadLength, DefaultLaunchPadLength),
		Gap:          or(s.Gap, DefaultLaunchGap),
		GroundWidth:  or(s.GroundWidth, DefaultLaunchGroundWidth),
		GroundLength: or(s.GroundLength, DefaultLaunchGroundLength),
		ViaDrill:     or(s.ViaDrill, l.ViaDrill),
		ViaPad:       or(s.ViaPad, l.ViaPad),
	}
	g.ViaPitch = or(s.ViaPitch, 2*g.ViaPad)
	return g
}

// launchKeys lists the landing's design keys with their fields, for the
// decoder and the checks.
func (s *LaunchSizes) launchKeys() []struct {
	key string
	v   *float64
} {
	return []struct {
		key string
		v   *float64
	}{
		{"layout.launch_pad_width", &s.PadWidth}, {"layout.launch_pad_length", &s.PadLength},
		{"layout.launch_gap", &s.Gap}, {"layout.launch_ground_width", &s.GroundWidth},
		{"layout.launch_ground_length", &s.GroundLength}, {"layout.launch_via_drill", &s.ViaDrill},
		{"layout.launch_via_pad", &s.ViaPad}, {"layout.launch_via_pitch", &s.ViaPitch},
	}
}

// MaxLaunchSize bounds every size of the landing (common practice, no
// source: a landing larger than this is no longer a connector's).
const MaxLaunchSize = 20e-3

// checkLaunch checks the landing's keys: each given size positive and at
// most MaxLaunchSize, given only with port = "edge", and a signal pad that
// fits the feed line it lies on.
func (c *designCheck) checkLaunch(l LayoutSpec) {
	s := l.Launch
	for _, k := range s.launchKeys() {
		if *k.v == 0 {
			continue
		}
		if l.Port != PortEdge {
			c.fail(k.key, designMM(*k.v), "the landing's sizes are for port = \"edge\" (port is %q)", l.Port.String())
			continue
		}
		if !(*k.v > 0 && *k.v <= MaxLaunchSize) {
			c.failErr(k.key, designMM(*k.v), rangeError("must be more than 0 mm and at most %s", formatMM(MaxLaunchSize)))
		}
	}
	if l.Port == PortEdge {
		if pl := s.Resolve(l, 0).PadLength; pl > l.FeedLength {
			c.fail("layout.feed_length", designMM(l.FeedLength), "the edge-launch signal pad (launch_pad_length %s) lies on the feed line and may not be longer than it", designMM(pl))
		}
	}
}

// LaunchNote says what the landing is and how the circuit model treats
// it, and warns when the signal pad is not as wide as the port line (a
// width step the model leaves out); both "" without a landing.
func (r *Result) LaunchNote() (note, warning string) {
	g := r.GeomSpec().Launch
	if g == nil {
		return "", ""
	}
	mmText := func(v float64) string { return fmt.Sprintf("%.4g", v*1e3) }
	if pw := r.portWidth(); geom.Nanometres(g.PadWidth) != geom.Nanometres(pw) {
		warning = fmt.Sprintf("the edge-launch signal pad is %s mm wide, the port line %s mm: the width step at the landing is not in the circuit model", mmText(g.PadWidth), mmText(pw))
	}
	note = fmt.Sprintf("edge-launch landing at both ports (no particular connector): signal pad %s × %s mm (along × across the line; pin 1) running to the board edge, ground pads %s × %s mm at %s mm gap (pins 2 and 3), each with %d plated vias of %s mm to the plane. "+
		"Circuit model: the network's reference planes stay at the board edges and the signal pad is counted as the port line; the ground pads beside it (and a signal pad of another width than the line) are not modelled: they belong, with the connector, to the launch, which the TRL structures (drawn with the same landing) or a calibration at the connector removes",
		mmText(g.PadLength), mmText(g.PadWidth), mmText(g.GroundLength), mmText(g.GroundWidth), mmText(g.Gap),
		geom.LaunchViaCount(*g), mmText(g.ViaDrill))
	return note, warning
}

// layoutKey returns the design key that sets a field of the landing's or
// the fence's geometry, so that a refusal from the layout names what the
// user wrote; "" when no key does.
func layoutKey(field string) string {
	switch field {
	case "Launch.PadWidth":
		return "layout.launch_pad_width"
	case "Launch.PadLength":
		return "layout.launch_pad_length"
	case "Launch.Gap":
		return "layout.launch_gap"
	case "Launch.GroundWidth":
		return "layout.launch_ground_width"
	case "Launch.GroundLength":
		return "layout.launch_ground_length"
	case "Launch.ViaDrill":
		return "layout.launch_via_drill (or layout.via_drill)"
	case "Launch.ViaPad":
		return "layout.launch_via_pad (or layout.via_pad)"
	case "Launch.ViaPitch":
		return "layout.launch_via_pitch"
	case "Launch":
		return "layout.port = \"edge\" (the landing's sizes)"
	case "Fence.Pitch":
		return "layout.fence_pitch"
	case "Fence.Offset":
		return "layout.fence_offset"
	case "Fence.Drill":
		return "layout.via_drill"
	case "Fence.Pad":
		return "layout.via_pad"
	case "Fence":
		return "layout.fence_pitch"
	}
	return ""
}

// DesignKeyError is a refusal of the layout traced back to the design key
// that caused it. It unwraps to the layout's *geom.SpecError.
type DesignKeyError struct {
	Key string          // the design key, e.g. "layout.fence_pitch"
	Err *geom.SpecError // the layout's refusal
}

func (e *DesignKeyError) Error() string {
	return fmt.Sprintf("%s: %s", e.Key, e.Err.Detail)
}

func (e *DesignKeyError) Unwrap() error { return e.Err }
