package geom

// Spec describes one matching network to lay out. Lengths are metres.
type Spec struct {
	Name string
	// Segments make the through line, from the load port (x = 0) toward
	// the source port (+x). The feed lines at the ports are segments too.
	Segments []Segment
	// Stubs are the shunt stubs, perpendicular to the through line.
	Stubs []Stub
	// PortPad is a rectangular pad flashed at each port end of the through
	// line; the zero value means none.
	PortPad PadSpec
	// Launch, when not nil, draws an edge-launch landing at each port: its
	// signal pad replaces PortPad, and ground pads with vias to the plane
	// flank it (see LaunchSpec).
	Launch *LaunchSpec
	// Fence, when not nil, draws a via fence alongside the RF copper
	// (see FenceSpec); it may not be combined with CoplanarGap.
	Fence *FenceSpec
	// Margin is the board margin around the copper in ±y. In x the through
	// line's ends touch the board edge (edge launch).
	Margin float64
	// EdgeClearance is the pull-back of copper from the routed outline:
	// the ground plane, a coplanar pour and its stitching vias stay this
	// far inside the board, and Margin may not be less. Only the signal
	// line (and its port pads) reaches the board edge at the two ports,
	// for an edge-launch connector. 0: no pull-back.
	EdgeClearance float64
	// LegendTitle, when not empty, puts a legend on the board (top
	// silkscreen): this title (the board name and f0) along one long
	// edge, the port names J2 (load, x = 0) and J1 (source) and a signal
	// arrow from J1 toward J2 along the other, wherever they fit off the
	// pads and mask openings; what does not fit is left out.
	LegendTitle string
	// LegendNote is a second legend item (f0) set after the title, or on
	// a line of its own below it when the two do not fit on one.
	LegendNote string
	// MaxBoard is an optional board size limit (x, y); 0 means unlimited.
	// A stub whose straight copper would make the board taller than
	// MaxBoard[1] is laid out as a mitred L (see Bend); the board is never
	// lengthened in x, whose size the through line sets.
	MaxBoard [2]float64
	// Height is the dielectric thickness. It bounds the keep-out (3·Height),
	// sizes the miter of a bent stub and its second leg's clearance from
	// the through line (3·Height). A stub that does not fit MaxBoard[1]
	// straight is bent only when Height > 0.
	Height float64
	// Er is the dielectric's relative permittivity, used only to tell when
	// a bent stub's miter is outside Douville and James's measured range
	// (Bend.Warning); 0 means unknown.
	Er float64
	// Mask is "open" (a solder-mask window over the RF copper, grown by
	// MaskExpansion) or "cover" (mask over the RF copper; the port pads are
	// always open). The empty string means "open".
	Mask          string
	MaskExpansion float64
	// CoplanarGap, when > 0, draws a top-layer ground pour (grounded
	// coplanar waveguide) that keeps exactly this clearance from all RF
	// copper: through line, stubs, port pads and the bounding squares of
	// the via pads of shorted stubs (a shorted stub's via keeps its net; its
	// pad keeps the gap like the rest). The pour reaches the board edge
	// beside the port pads (edge launch). With Mask "open" the mask window
	// spans the gap: the RF copper grown by CoplanarGap + MaskExpansion.
	// Margin must exceed the gap, or the pour would be cut off.
	CoplanarGap float64
	// StitchPitch is the centre spacing of the stitching vias along the
	// pour's edges that face the RF copper, set back StitchPad/2 +
	// StitchSetback from them: exact along straight runs; between two
	// corners of the pour (a stub's side or end) the vias sit on the
	// corners and are spread evenly at most this far apart. 0 means
	// DefaultStitchPitch (callers that know λg pass the smaller of
	// StitchMaxPitch and that).
	// StitchDrill and StitchPad size them; 0 means the via size of the
	// first shorted stub, or DefaultStitchDrill and DefaultStitchPad.
	StitchPitch, StitchDrill, StitchPad float64
}

// Segment is one piece of the through line.
type Segment struct {
	ID     string
	Width  float64 // across the line (y), m
	Length float64 // along the line (x), m
}

// Stub is a shunt stub.
type Stub struct {
	ID string
	// At places the stub's centre line at the boundary after Segments[At];
	// it must be a boundary between two segments.
	At    int
	Width float64 // along x, m
	// Length is the drawn copper from the through line's edge to the
	// stub's end, m. The edge is that of the wider of the two segments
	// that meet at the tee.
	Length float64
	Side   int // +1: the stub goes toward +y; −1: toward −y
	// Via, when not nil, shorts the stub's end to ground.
	Via *ViaSpec
	// TrimAllowance draws an open stub this much longer than Length, m,
	// to be cut back at the bench; Marks.Trims places its ticks.
	TrimAllowance float64
}

// ViaSpec is the via, or row of vias, at the end of a shorted stub. A
// single via's round pad is centred on the stub's centre line with its far
// edge on the stub's end. A row of Count vias lies across the stub's width
// at centre spacing Spacing, centred on the stub, every pad's far edge on
// the stub's end; the row's pads must lie within the stub's width and its
// holes must not touch (neighbouring pads may overlap).
type ViaSpec struct {
	Drill float64 // finished hole diameter, m
	Pad   float64 // pad diameter, m
	// Count is the number of vias in the row; 0 and 1 mean one via.
	Count int
	// Spacing is the centre spacing of the row, m (unused for one via).
	Spacing float64
}

// offsets returns the vias' centre offsets across the stub from its
// centre line, nm, symmetric about zero.
func (v ViaSpec) offsets() []int64 {
	if v.Count <= 1 {
		return []int64{0}
	}
	o := make([]int64, v.Count)
	for i := range o {
		o[i] = Nanometres(float64(2*i-(v.Count-1)) * v.Spacing / 2)
	}
	return o
}

// PadSpec is the rectangular port pad on each end of the through line:
// Length along the line (x) from the board edge, Width across it (y) at the
// load port (x = 0), SourceWidth at the source port (0: Width). The two
// differ when the port lines do (a transformer from a low load impedance).
type PadSpec struct {
	Width, Length float64
	SourceWidth   float64
}

// widths returns the load and source pads' widths, nm.
func (p PadSpec) widths() [2]int64 {
	w := [2]int64{Nanometres(p.Width), Nanometres(p.SourceWidth)}
	if p.SourceWidth == 0 {
		w[1] = w[0]
	}
	return w
}
