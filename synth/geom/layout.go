package geom

// Layout is the board geometry of one network, in nanometres, origin at the
// lower-left corner of the board.
type Layout struct {
	Name         string
	Board        Polygon // board outline, a rectangle
	Copper       []Net   // top copper, one merged outline per net; the RF net first, then the pieces of a coplanar ground pour
	Pads         []Pad   // flashed top-copper pads
	Vias         []Via   // plated through holes to the ground plane
	Ground       Polygon // bottom copper plane
	MaskOpenings []Polygon
	KeepOut      []Polygon // where no other copper may go on the top layer
	// Legend is the top silkscreen ink: strokes of a LegendLine pen, off
	// pads and mask openings (see AddLegend).
	Legend []Stroke
	Marks  Marks
}

// Net is the merged top copper of one net: a single simple polygon without
// holes.
type Net struct {
	Name    string
	Outline Polygon
}

// Pad functions, named after the Gerber aperture functions they become
// (Gerber Layer Format Specification 2023.08, .AperFunction): a port pad
// is a surface-mount pad defined by its copper, a via pad a via's annular
// ring.
const (
	SMDPad = "SMDPad,CuDef"
	ViaPad = "ViaPad"
)

// Pad is a flashed pad: a W×H rectangle, or a circle of diameter W when
// Round.
type Pad struct {
	Net      string
	Function string // SMDPad or ViaPad
	Center   Point
	W, H     int64
	Round    bool
	// Pin is the connector pin a port pad lands, as the Gerber .P
	// attribute's reference descriptor and pin number ("J1,1"); empty for
	// other pads.
	Pin string
}

// Port connectors: J1 at the source port, J2 at the load port, each landing
// its pin 1 on a port pad (the pin numbering of a generic two-terminal
// edge connector: 1 signal).
const (
	PinSource = "J1,1"
	PinLoad   = "J2,1"
)

// NetRFGround is the name of the one DC net that the RF copper and the
// ground become when a via joins them (a shorted stub).
const NetRFGround = "RF_GND"

// ShortedToGround reports whether a plated hole joins the RF copper to the
// ground plane, so that the two are one DC net.
func (l Layout) ShortedToGround() bool {
	for _, v := range l.Vias {
		if v.Net == NetRF {
			return true
		}
	}
	return false
}

// DCNet returns the net name that objects of the given role (NetRF or
// NetGround, as Copper, Pads and Vias are marked) carry in the fabrication
// files: objects joined by copper or plated holes carry one name, so with a
// shorted stub both roles are NetRFGround.
func (l Layout) DCNet(role string) string {
	if role != "" && l.ShortedToGround() {
		return NetRFGround
	}
	return role
}

// Via is a plated through hole.
type Via struct {
	Net    string
	Center Point
	Drill  int64 // finished hole diameter, nm
	Pad    int64 // top pad diameter, nm
}

// Marks are the positions a drawing dimensions and a report checks.
type Marks struct {
	// Ports are the load port (x = 0) and the source port on the through
	// line's centre line.
	Ports [2]Point
	// CentreY is the y of the through line's centre line.
	CentreY int64
	// Tees has one entry per stub, in Spec order.
	Tees []Tee
	// Elements has the extent of every segment, then every stub, in Spec
	// order.
	Elements []Element
	// Bends has one entry per stub laid out as a mitred L (because it did
	// not fit Spec.MaxBoard straight), in Spec order; nil when every stub
	// is straight.
	Bends []Bend
	// Trims has one entry per stub drawn with a trim allowance, in Spec
	// order.
	Trims []Trim
}

// TrimTickPitch is the spacing of the trim ticks along a stub drawn with a
// trim allowance: a quarter millimetre, what a knife and a ruler resolve
// at the bench (common practice, no source).
const TrimTickPitch = 250_000 // nm

// Trim locates the trim ticks of one open stub drawn longer than its
// design length. Tick k lies at DesignEnd + k·TrimTickPitch·Dir, for k = 0
// (the design length) … Ticks; the drawn end is End.
type Trim struct {
	StubID    string
	DesignEnd Point
	End       Point
	// Dir is the unit direction from the design end toward the drawn end
	// (one of ±x, ±y).
	Dir Point
	// Ticks is the number of whole pitches between the design end and the
	// drawn end.
	Ticks int
	// Across is the stub's width at its end, nm: the ticks run across it.
	Across int64
}

// Tick returns the position of tick k on the stub's centre line.
func (t Trim) Tick(k int) Point {
	d := int64(k) * TrimTickPitch
	return Point{t.DesignEnd.X + d*t.Dir.X, t.DesignEnd.Y + d*t.Dir.Y}
}

// Tee locates one stub.
type Tee struct {
	StubID string
	// Center is where the stub's centre line crosses the through line's
	// centre line.
	Center Point
	// RefY is the y of the through line's edge from which the stub's drawn
	// length is measured (its reference plane); EndY is the y of the stub's
	// end (of a bent stub: of its second leg's centre line, on which the
	// end lies; see Marks.Bends).
	RefY, EndY int64
}

// Element kinds.
const (
	KindSegment = "segment"
	KindStub    = "stub"
)

// Element is the rectangle a segment or stub occupies. A stub's rectangle
// runs from its reference plane to its end; a bent stub's is the bounding
// box of its L (via pad included) from the reference plane outward.
type Element struct {
	ID   string
	Kind string // KindSegment or KindStub
	Rect Rect
}
