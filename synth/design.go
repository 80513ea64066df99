package synth

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"
	"stubcraft/stackups/tomlx"
)

// Design is a decoded design file: what is to be matched, at what
// frequency, on which board, and how the rest of the pipeline is to lay
// out, check and sweep it. Every quantity is SI (Hz, ohm, m) and every
// tolerance a fraction (0.05 for "5%"). Exactly one of Match and Sections
// says what the network is.
type Design struct {
	Name    string  // design name, for artefact titles
	Freq    float64 // design frequency, Hz
	Z0      float64 // reference impedance of the feed lines and the source, ohm
	Stackup string  // stackup preset name or path, as written (see StackupRef)
	Load    LoadSpec

	// Match asks for a single-shunt-stub solution; nil when Sections
	// gives the network explicitly.
	Match *MatchSpec
	// Sections is an explicit electrical network, from the load toward
	// the source; nil when Match is set.
	Sections []Section

	Layout    LayoutSpec
	Fab       FabSpec
	Sweep     SweepSpec
	Tolerance ToleranceSpec
	Panel     PanelSpec

	Source string // the file's name for messages, as given to DecodeDesign
	Dir    string // the directory of the design file; relative paths start there

	// file and values remember where each key was written and how, so
	// that Validate can point at it. Read only after decoding.
	file   *tomlx.File
	values map[string]string
}

// LoadSpec is the load to be matched: a fixed impedance, or a one-port
// Touchstone file when Touchstone is not empty.
type LoadSpec struct {
	Impedance  complex128 // ohm, used when Touchstone is ""
	Touchstone string     // path of an .s1p file, resolved against Design.Dir
}

// MatchSpec asks for a matching network to be solved at the design
// frequency, or across a band.
type MatchSpec struct {
	Topology string  // one of Topologies
	End      StubEnd // stub termination
	Pick     Pick    // which solution of the solve
	StubZ0   float64 // stub impedance, ohm (default: the design z0)
	LineZ0   float64 // series line impedance, ohm (default: the design z0)

	// Band is the start and stop of the band to match, Hz; both zero when
	// the design matches at its frequency only.
	Band [2]float64
	// GoalDB is the worst |S11| wanted across Band, dB (negative); 0 when
	// no goal is given.
	GoalDB float64
	// Response is the quarter-wave transformer's response.
	Response Response
	// Sections is the number of quarter-wave sections, 1 to
	// MaxTransformerSections.
	Sections int
	// SpacingDeg is the double stub's spacing, electrical degrees at f0.
	SpacingDeg float64
	// Objective is what a band optimisation minimises: ObjectiveWorst or
	// ObjectiveYield.
	Objective string
}

// HasBand reports whether the match is asked for across a band.
func (m MatchSpec) HasBand() bool { return m.Band != [2]float64{} }

// The topology names of a [match] table.
const (
	TopologyShuntStub   = "shunt-stub"
	TopologyDoubleStub  = "double-stub"
	TopologyQuarterWave = "quarter-wave"
	TopologyAuto        = "auto"
)

// The objectives of a band optimisation.
const (
	// ObjectiveWorst minimises the worst |S11| across the band of the
	// nominal board.
	ObjectiveWorst = "worst"
	// ObjectiveYield minimises the 90th percentile, over boards drawn
	// within the [tolerance] spreads, of each board's worst |S11| across
	// the band.
	ObjectiveYield = "yield"
)

// DefaultMatch returns the [match] values used where the table does not
// give them: open stubs, the shortest solution, lines and stubs of z0, a
// two-section Chebyshev transformer, stubs 3λ/8 apart, the worst case.
func DefaultMatch(z0 float64) MatchSpec {
	return MatchSpec{Pick: PickShortest, StubZ0: z0, LineZ0: z0, Response: Chebyshev, Sections: 2,
		SpacingDeg: DefaultStubSpacingDeg, Objective: ObjectiveWorst}
}

// Resolved returns m with its unset (zero) band-matching fields at their
// defaults (DefaultMatch), so that a MatchSpec built in code needs only
// the fields it cares about.
func (m MatchSpec) Resolved() MatchSpec {
	def := DefaultMatch(0)
	if m.Response == 0 {
		m.Response = def.Response
	}
	if m.Sections == 0 {
		m.Sections = def.Sections
	}
	if m.SpacingDeg == 0 {
		m.SpacingDeg = def.SpacingDeg
	}
	if m.Objective == "" {
		m.Objective = def.Objective
	}
	if m.End == 0 {
		m.End = Open
	}
	return m
}

// Topologies returns the matching topologies a MatchSpec may name.
func Topologies() []string {
	return []string{TopologyShuntStub, TopologyDoubleStub, TopologyQuarterWave, TopologyAuto}
}

// SectionKind says what a Section is.
type SectionKind int

// Section kinds. The zero value is no kind, so a forgotten kind is noticed.
const (
	SeriesLine SectionKind = iota + 1 // a length of line in series
	ShuntStub                         // a stub to ground in shunt at this point
)

// String returns "line" or "stub", the words of a design file.
func (k SectionKind) String() string {
	switch k {
	case SeriesLine:
		return "line"
	case ShuntStub:
		return "stub"
	}
	return "SectionKind(" + strconv.Itoa(int(k)) + ")"
}

// ParseSectionKind reads "line" or "stub".
func ParseSectionKind(s string) (SectionKind, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "line":
		return SeriesLine, nil
	case "stub":
		return ShuntStub, nil
	}
	return 0, fmt.Errorf("unknown section kind %q (use line or stub)", s)
}

// Section is one element of an electrical network: a series line, or a
// shunt stub with its termination.
type Section struct {
	Kind      SectionKind
	End       StubEnd // stub termination; 0 for a line
	Z0        float64 // characteristic impedance, ohm
	LengthDeg float64 // electrical length at the design frequency, degrees
}

// LayoutSpec says how the copper is to be drawn.
type LayoutSpec struct {
	FeedLength float64    // feed line at each port, m
	StubSide   StubSide   // StubUp or StubDown: the side of the through line the stub goes
	Margin     float64    // board margin around the copper, m
	Mask       MaskMode   // MaskAuto (the default: follow the stackup), MaskOpen (a solder-mask window over the RF copper) or MaskCover (mask over it, the port pads open); see MaskRule
	MaxBoard   [2]float64 // largest board, width and height, m; zero: no limit
	ViaDrill   float64    // drill of the via of a shorted stub, m
	ViaPad     float64    // pad around that via, m
	// ViaPitch is the largest centre spacing of the row of vias that ends
	// a shorted stub wider than 1.5 via pads (physical.ViaRow), m; 0 means
	// the default, twice the via pad (see ViaRowPitch).
	ViaPitch float64
	// EdgeClearance is the copper pull-back from the routed outline, m:
	// everything but the signal line at the port edges keeps it.
	EdgeClearance float64
	// Trim is the trim allowance, m: every open stub is drawn this much
	// longer than its design length, with ticks every TrimTickPitch on the
	// legend layer and in the drawing, to be cut back at the bench.
	Trim float64
	// Port is how the ports are drawn: PortPad (the default) or PortEdge,
	// an edge-launch landing sized by Launch.
	Port   PortKind
	Launch LaunchSizes
	// FencePitch, when not 0, draws a via fence alongside the microstrip
	// lines at this largest centre spacing, m; FenceOffset is the distance
	// from the copper's edge to the fence's via centres, m (0: the
	// default, see FenceOffsetOr).
	FencePitch, FenceOffset float64
}

// PanelSpec holds what is made beside the board on its panel.
type PanelSpec struct {
	// Structures are the calibration and test structures, each with its
	// own outline, in StructureKinds order.
	Structures []StructureKind
}

// FabSpec holds the board maker's limits and what the board is ordered
// with.
type FabSpec struct {
	MinWidth float64 // narrowest track, m
	Finish   string  // surface finish, one of Finishes()
}

// Finishes returns the surface finishes a design may name ([fab] finish).
func Finishes() []string {
	return []string{"enig", "enepig", "hasl-lead-free", "osp", "immersion-silver", "immersion-tin", "none"}
}

// DefaultFinish is the finish ordered when a design names none: ENIG is
// flat (no solder levelling bumps on a line) and does not tarnish on the
// bench (common practice, no source).
const DefaultFinish = "enig"

// FinishJobName returns the words the Gerber job format uses for a finish
// of Finishes() (Gerber Job Format, GeneralSpecs.Finish, from memory), or
// "" for an unknown one.
func FinishJobName(f string) string {
	switch f {
	case "enig":
		return "ENIG"
	case "enepig":
		return "ENEPIG"
	case "hasl-lead-free":
		return "HAL lead-free"
	case "osp":
		return "OSP"
	case "immersion-silver":
		return "Immersion silver"
	case "immersion-tin":
		return "Immersion tin"
	case "none":
		return "None"
	}
	return ""
}

// SweepSpec is the frequency sweep of the reports.
type SweepSpec struct {
	Start, Stop float64 // Hz
	Points      int
	Span        float64 // fraction of the design frequency each side, when given as a span; 0 otherwise
}

// ToleranceSpec is the Monte Carlo yield analysis: how many boards to draw
// and the limit of each quantity's spread; values are drawn uniformly
// within ± that limit.
type ToleranceSpec struct {
	Samples   int     // boards drawn; 0 turns the analysis off
	Seed      int64   // random seed, for repeatable runs
	Er        float64 // relative spread of the permittivity (0.05 = 5 %)
	Thickness float64 // relative spread of the dielectric thickness
	Width     float64 // absolute spread of the etched width, m
	Copper    float64 // relative spread of the copper thickness
}

// Defaults of the optional tables (common practice, no source: values a
// small board house commonly quotes).

// DefaultEdgeClearance is the copper pull-back from the routed edge: board
// houses commonly pull copper back 0.2–0.25 mm by default, so 0.3 mm
// leaves them nothing to trim (common practice, no source).
const DefaultEdgeClearance = 0.3e-3

// ViaRowPitch returns the largest centre spacing of a shorted stub's via
// row: ViaPitch, or twice the via pad when it is not set, which leaves a
// pad's width of copper between neighbouring pads (common practice, no
// source).
func (l LayoutSpec) ViaRowPitch() float64 {
	if l.ViaPitch > 0 {
		return l.ViaPitch
	}
	return 2 * l.ViaPad
}

// DefaultLayout returns the layout used when a design file has none.
func DefaultLayout() LayoutSpec {
	return LayoutSpec{FeedLength: 5e-3, StubSide: StubUp, Margin: 5e-3, Mask: MaskAuto, ViaDrill: 0.3e-3, ViaPad: 0.6e-3,
		EdgeClearance: DefaultEdgeClearance, Port: PortPad}
}

// DefaultFab returns the board maker's limits used when a design file
// gives none.
func DefaultFab() FabSpec { return FabSpec{MinWidth: 0.15e-3, Finish: DefaultFinish} }

// DefaultSweepSpan is the sweep span, each side of the design frequency,
// used when a design file gives no sweep.
const DefaultSweepSpan = 0.3

// DefaultSweepPoints is the number of sweep points used when a design file
// gives none.
const DefaultSweepPoints = 401

// DefaultSweep returns the sweep used around freqHz when a design file
// gives none: ±30 %, 401 points.
func DefaultSweep(freqHz float64) SweepSpec {
	return SweepSpec{
		Start:  freqHz * (1 - DefaultSweepSpan),
		Stop:   freqHz * (1 + DefaultSweepSpan),
		Points: DefaultSweepPoints,
		Span:   DefaultSweepSpan,
	}
}

// DefaultTolerance returns the tolerance analysis used when a design file
// gives none.
func DefaultTolerance() ToleranceSpec {
	return ToleranceSpec{Samples: 1000, Seed: 1, Er: 0.05, Thickness: 0.10, Width: 20e-6, Copper: 0.10}
}

// StackupRef returns the stackup reference to load: a preset name as
// written, or a path (one that ends in ".toml" or holds a path separator)
// resolved against Dir when relative.
func (d Design) StackupRef() string {
	s := d.Stackup
	if strings.HasSuffix(strings.ToLower(s), ".toml") || strings.ContainsAny(s, `/\`) {
		if !filepath.IsAbs(s) && d.Dir != "" {
			return filepath.Join(d.Dir, s)
		}
	}
	return s
}

// Written reports whether the design file gave the dotted key
// ("tolerance.er") itself, rather than leaving it to its default.
func (d Design) Written(key string) bool {
	return d.file.Written(key)
}

// KeyError returns err as a *DesignError that points at key (a dotted path
// such as "fab.min_width") in the design file, with its line and value as
// written; an unwritten key points at its table.
func (d Design) KeyError(key string, err error) error {
	return &DesignError{Source: d.Source, Line: d.file.Line(key), Key: key, Value: d.values[key], Err: err}
}
