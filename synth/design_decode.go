package synth

import (
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"stubcraft/physical/units"
	"stubcraft/stackups/tomlx"
)

// The file as the TOML reader sees it. Leaf values are `any` so that a
// value of the wrong kind is reported by this package, with its key and
// line, in the same words as every other fault.
type designRaw struct {
	Name      any            `toml:"name"`
	Frequency any            `toml:"frequency"`
	Z0        any            `toml:"z0"`
	Stackup   any            `toml:"stackup"`
	Load      toml.Primitive `toml:"load"`
	Match     toml.Primitive `toml:"match"`
	Section   toml.Primitive `toml:"section"`
	Layout    toml.Primitive `toml:"layout"`
	Fab       toml.Primitive `toml:"fab"`
	Sweep     toml.Primitive `toml:"sweep"`
	Tolerance toml.Primitive `toml:"tolerance"`
	Panel     toml.Primitive `toml:"panel"`
}

// designTables are the tables of designRaw, decoded once their kind has
// been checked.
type designTables struct {
	Load      *designRawLoad
	Match     *designRawMatch
	Section   []designRawSection
	Layout    *designRawLayout
	Fab       *designRawFab
	Sweep     *designRawSweep
	Tolerance *designRawTolerance
	Panel     *designRawPanel
}

type designRawPanel struct {
	Structures any `toml:"structures"`
}

type designRawLoad struct {
	Impedance  any `toml:"impedance"`
	Touchstone any `toml:"touchstone"`
}

type designRawMatch struct {
	Topology  any `toml:"topology"`
	Stub      any `toml:"stub"`
	Pick      any `toml:"pick"`
	StubZ0    any `toml:"stub_z0"`
	LineZ0    any `toml:"line_z0"`
	Band      any `toml:"band"`
	Goal      any `toml:"goal"`
	Response  any `toml:"response"`
	Sections  any `toml:"sections"`
	Spacing   any `toml:"spacing"`
	Objective any `toml:"objective"`
}

type designRawSection struct {
	Kind   any `toml:"kind"`
	End    any `toml:"end"`
	Z0     any `toml:"z0"`
	Length any `toml:"length"`
}

type designRawLayout struct {
	FeedLength any `toml:"feed_length"`
	StubSide   any `toml:"stub_side"`
	Margin     any `toml:"margin"`
	Mask       any `toml:"mask"`
	MaxBoard   any `toml:"max_board"`
	ViaDrill   any `toml:"via_drill"`
	ViaPad     any `toml:"via_pad"`
	ViaPitch   any `toml:"via_pitch"`
	EdgeClear  any `toml:"edge_clearance"`
	Trim       any `toml:"trim"`
	Port       any `toml:"port"`
	LaunchPadW any `toml:"launch_pad_width"`
	LaunchPadL any `toml:"launch_pad_length"`
	LaunchGap  any `toml:"launch_gap"`
	LaunchGndW any `toml:"launch_ground_width"`
	LaunchGndL any `toml:"launch_ground_length"`
	LaunchDrl  any `toml:"launch_via_drill"`
	LaunchPad  any `toml:"launch_via_pad"`
	LaunchPtch any `toml:"launch_via_pitch"`
	FencePitch any `toml:"fence_pitch"`
	FenceOff   any `toml:"fence_offset"`
}

type designRawFab struct {
	MinWidth any `toml:"min_width"`
	Finish   any `toml:"finish"`
}

type designRawSweep struct {
	Span   any `toml:"span"`
	Start  any `toml:"start"`
	Stop   any `toml:"stop"`
	Points any `toml:"points"`
}

type designRawTolerance struct {
	Samples   any `toml:"samples"`
	Seed      any `toml:"seed"`
	Er        any `toml:"er"`
	Thickness any `toml:"thickness"`
	Width     any `toml:"width"`
	Copper    any `toml:"copper"`
}

// DecodeDesign reads a design file. source names it in error messages
// (usually the file name as the user typed it) and dir is the directory
// that relative paths in it start from. Unknown keys are errors. Every
// error is a *DesignError. The design returned has passed Validate.
func DecodeDesign(r io.Reader, source, dir string) (Design, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return Design{}, &DesignError{Source: source, Err: fmt.Errorf("reading the design: %w", err)}
	}
	var raw designRaw
	f, err := tomlx.Decode(b, source, &raw)
	if err != nil {
		return Design{}, err
	}
	if err := f.Unknown(designSchema(), "a design"); err != nil {
		return Design{}, err
	}
	var tables designTables
	if err := designDecodeTables(f, &raw, &tables); err != nil {
		return Design{}, err
	}
	dd := &designDecoder{file: f, values: map[string]string{}}
	d := dd.design(&raw, &tables, dir)
	if dd.err != nil {
		return Design{}, dd.err
	}
	d.file, d.values = f, dd.values
	if err := d.Validate(); err != nil {
		return Design{}, err
	}
	return d, nil
}

// designSchema lists the keys of a design file, table by table.
func designSchema() tomlx.Schema {
	return tomlx.Schema{
		"":          tomlx.Keys(designRaw{}),
		"load":      tomlx.Keys(designRawLoad{}),
		"match":     tomlx.Keys(designRawMatch{}),
		"section":   tomlx.Keys(designRawSection{}),
		"layout":    tomlx.Keys(designRawLayout{}),
		"fab":       tomlx.Keys(designRawFab{}),
		"sweep":     tomlx.Keys(designRawSweep{}),
		"tolerance": tomlx.Keys(designRawTolerance{}),
		"panel":     tomlx.Keys(designRawPanel{}),
	}
}

// designDecodeTables checks the kind of each table and decodes it.
func designDecodeTables(f *tomlx.File, raw *designRaw, t *designTables) error {
	table := func(key string, p toml.Primitive, dst any, set func()) error {
		ok, err := f.Table(key, p, dst)
		if ok {
			set()
		}
		return err
	}
	var (
		load      designRawLoad
		match     designRawMatch
		layout    designRawLayout
		fab       designRawFab
		sweep     designRawSweep
		tolerance designRawTolerance
		panel     designRawPanel
	)
	for _, err := range []error{
		table("load", raw.Load, &load, func() { t.Load = &load }),
		table("match", raw.Match, &match, func() { t.Match = &match }),
		table("layout", raw.Layout, &layout, func() { t.Layout = &layout }),
		table("fab", raw.Fab, &fab, func() { t.Fab = &fab }),
		table("sweep", raw.Sweep, &sweep, func() { t.Sweep = &sweep }),
		table("tolerance", raw.Tolerance, &tolerance, func() { t.Tolerance = &tolerance }),
		table("panel", raw.Panel, &panel, func() { t.Panel = &panel }),
	} {
		if err != nil {
			return err
		}
	}
	_, err := f.Tables("section", raw.Section, &t.Section)
	return err
}

// designDecoder converts the raw file into a Design, keeping the first
// fault.
type designDecoder struct {
	file   *tomlx.File
	values map[string]string
	err    error
}

func (dd *designDecoder) fail(path string, v any, err error) {
	if dd.err == nil {
		dd.err = dd.file.Fail(path, v, err)
	}
}

// designRead converts the value v of key path with conv, unless it is absent
// (v == nil), in which case it reports whether the key was present. A
// missing required key is a fault whose reason gives an example.
func designRead[T any](dd *designDecoder, path string, v any, conv func(any) (T, error), dst *T, example string) bool {
	if v == nil {
		if example != "" {
			dd.fail(path, nil, fmt.Errorf("%w; for example %s", ErrMissingKey, example))
		}
		return false
	}
	x, err := conv(v)
	if err != nil {
		dd.fail(path, v, err)
		return false
	}
	dd.values[path] = tomlx.Literal(v)
	*dst = x
	return true
}

func (dd *designDecoder) design(raw *designRaw, tb *designTables, dir string) Design {
	d := Design{Source: dd.file.Source, Dir: dir}
	designRead(dd, "name", raw.Name, designString, &d.Name, `name = "sensor-antenna-match"`)
	freqExample := `frequency = "2.45GHz"`
	if tb.Match != nil && tb.Match.Band != nil {
		freqExample = "" // f0 defaults to the band's centre
	}
	designRead(dd, "frequency", raw.Frequency, designFrequency, &d.Freq, freqExample)
	designRead(dd, "z0", raw.Z0, designOhms, &d.Z0, `z0 = 50`)
	designRead(dd, "stackup", raw.Stackup, designString, &d.Stackup, `stackup = "my-board.toml"`)

	if tb.Load == nil {
		dd.fail("load", nil, fmt.Errorf("%w; for example [load] impedance = \"22-j31\"", ErrMissingKey))
	} else {
		hasZ := designRead(dd, "load.impedance", tb.Load.Impedance, designImpedance, &d.Load.Impedance, "")
		hasTS := designRead(dd, "load.touchstone", tb.Load.Touchstone, designString, &d.Load.Touchstone, "")
		switch {
		case hasZ && hasTS:
			dd.fail("load.touchstone", tb.Load.Touchstone, errors.New("give either load.impedance or load.touchstone, not both"))
		case !hasZ && !hasTS && dd.err == nil:
			dd.fail("load", nil, fmt.Errorf("%w: the load needs impedance = \"22-j31\" or touchstone = \"antenna.s1p\"", ErrMissingKey))
		case hasTS && d.Load.Touchstone != "" && !filepath.IsAbs(d.Load.Touchstone) && dir != "":
			d.Load.Touchstone = filepath.Join(dir, d.Load.Touchstone)
		}
	}

	switch {
	case tb.Match != nil && len(tb.Section) > 0:
		dd.fail("match", nil, errors.New("give either a [match] table or [[section]] tables, not both"))
	case tb.Match != nil:
		d.Match = dd.match(tb.Match, d.Z0)
		if d.Freq == 0 && d.Match.HasBand() {
			d.Freq = (d.Match.Band[0] + d.Match.Band[1]) / 2
		}
	case len(tb.Section) > 0:
		for i, rs := range tb.Section {
			d.Sections = append(d.Sections, dd.section(i+1, rs, d.Z0))
		}
	default:
		if dd.err == nil {
			dd.fail("match", nil, fmt.Errorf("%w: the design needs a [match] table or [[section]] tables", ErrMissingKey))
		}
	}

	d.Layout = DefaultLayout()
	if l := tb.Layout; l != nil {
		designRead(dd, "layout.feed_length", l.FeedLength, designLength, &d.Layout.FeedLength, "")
		designRead(dd, "layout.stub_side", l.StubSide, designWord[StubSide], &d.Layout.StubSide, "")
		designRead(dd, "layout.margin", l.Margin, designLength, &d.Layout.Margin, "")
		designRead(dd, "layout.mask", l.Mask, designWord[MaskMode], &d.Layout.Mask, "")
		designRead(dd, "layout.max_board", l.MaxBoard, designBoardSize, &d.Layout.MaxBoard, "")
		designRead(dd, "layout.via_drill", l.ViaDrill, designLength, &d.Layout.ViaDrill, "")
		designRead(dd, "layout.via_pad", l.ViaPad, designLength, &d.Layout.ViaPad, "")
		designRead(dd, "layout.via_pitch", l.ViaPitch, designLength, &d.Layout.ViaPitch, "")
		designRead(dd, "layout.edge_clearance", l.EdgeClear, designLength, &d.Layout.EdgeClearance, "")
		designRead(dd, "layout.trim", l.Trim, designLength, &d.Layout.Trim, "")
		designRead(dd, "layout.port", l.Port, designWord[PortKind], &d.Layout.Port, "")
		designRead(dd, "layout.fence_pitch", l.FencePitch, designLength, &d.Layout.FencePitch, "")
		designRead(dd, "layout.fence_offset", l.FenceOff, designLength, &d.Layout.FenceOffset, "")
		for i, v := range []any{l.LaunchPadW, l.LaunchPadL, l.LaunchGap, l.LaunchGndW, l.LaunchGndL, l.LaunchDrl, l.LaunchPad, l.LaunchPtch} {
			k := d.Layout.Launch.launchKeys()[i]
			designRead(dd, k.key, v, designLength, k.v, "")
		}
	}
	d.Fab = DefaultFab()
	if f := tb.Fab; f != nil {
		designRead(dd, "fab.min_width", f.MinWidth, designLength, &d.Fab.MinWidth, "")
		designRead(dd, "fab.finish", f.Finish, designString, &d.Fab.Finish, "")
	}
	d.Sweep = DefaultSweep(d.Freq)
	if s := tb.Sweep; s != nil {
		hasSpan := designRead(dd, "sweep.span", s.Span, designPercent, &d.Sweep.Span, "")
		hasStart := designRead(dd, "sweep.start", s.Start, designFrequency, &d.Sweep.Start, "")
		hasStop := designRead(dd, "sweep.stop", s.Stop, designFrequency, &d.Sweep.Stop, "")
		designRead(dd, "sweep.points", s.Points, designInt, &d.Sweep.Points, "")
		switch {
		case hasSpan && (hasStart || hasStop):
			dd.fail("sweep.span", s.Span, errors.New("give either span or start and stop, not both"))
		case hasStart != hasStop:
			dd.fail("sweep", nil, fmt.Errorf("%w: start and stop go together", ErrMissingKey))
		case hasSpan:
			d.Sweep.Start, d.Sweep.Stop = d.Freq*(1-d.Sweep.Span), d.Freq*(1+d.Sweep.Span)
		case hasStart:
			d.Sweep.Span = 0
		}
	}
	d.Tolerance = DefaultTolerance()
	if t := tb.Tolerance; t != nil {
		designRead(dd, "tolerance.samples", t.Samples, designInt, &d.Tolerance.Samples, "")
		var seed int
		if designRead(dd, "tolerance.seed", t.Seed, designInt, &seed, "") {
			d.Tolerance.Seed = int64(seed)
		}
		designRead(dd, "tolerance.er", t.Er, designPercent, &d.Tolerance.Er, "")
		designRead(dd, "tolerance.thickness", t.Thickness, designPercent, &d.Tolerance.Thickness, "")
		designRead(dd, "tolerance.width", t.Width, designLength, &d.Tolerance.Width, "")
		designRead(dd, "tolerance.copper", t.Copper, designPercent, &d.Tolerance.Copper, "")
	}
	if p := tb.Panel; p != nil {
		designRead(dd, "panel.structures", p.Structures, designStructures, &d.Panel.Structures, "")
	}
	return d
}

func (dd *designDecoder) match(rm *designRawMatch, z0 float64) *MatchSpec {
	m := DefaultMatch(z0)
	p := &m
	designRead(dd, "match.topology", rm.Topology, designString, &m.Topology, `topology = "shunt-stub"`)
	stubExample := `stub = "open"`
	if m.Topology == TopologyQuarterWave || m.Topology == TopologyAuto {
		stubExample = "" // no stub, or every end tried
	}
	if !designRead(dd, "match.stub", rm.Stub, designStubEnd, &m.End, stubExample) {
		m.End = Open
	}
	designRead(dd, "match.band", rm.Band, designBand, &m.Band, "")
	designRead(dd, "match.goal", rm.Goal, designDB, &m.GoalDB, "")
	designRead(dd, "match.response", rm.Response, designResponse, &m.Response, "")
	designRead(dd, "match.sections", rm.Sections, designInt, &m.Sections, "")
	designRead(dd, "match.spacing", rm.Spacing, designElectricalLength, &m.SpacingDeg, "")
	designRead(dd, "match.objective", rm.Objective, designString, &m.Objective, "")
	designRead(dd, "match.pick", rm.Pick, designPick, &m.Pick, "")
	designRead(dd, "match.stub_z0", rm.StubZ0, designOhms, &m.StubZ0, "")
	designRead(dd, "match.line_z0", rm.LineZ0, designOhms, &m.LineZ0, "")
	return p
}

func (dd *designDecoder) section(n int, rs designRawSection, z0 float64) Section {
	p := "section[" + strconv.Itoa(n) + "]."
	s := Section{Z0: z0}
	designRead(dd, p+"kind", rs.Kind, designSectionKind, &s.Kind, `kind = "line"`)
	if s.Kind == ShuntStub {
		designRead(dd, p+"end", rs.End, designStubEnd, &s.End, `end = "open"`)
	} else if rs.End != nil && dd.err == nil {
		dd.fail(p+"end", rs.End, errors.New("only a stub has an end; a line section takes kind, z0 and length"))
	}
	designRead(dd, p+"z0", rs.Z0, designOhms, &s.Z0, "")
	designRead(dd, p+"length", rs.Length, designElectricalLength, &s.LengthDeg, `length = "0.25wl"`)
	return s
}

// Converters of single values. Each says what it wanted when the value is
// of the wrong kind.

func designString(v any) (string, error) {
	s, ok := v.(string)
	if !ok {
		return "", errors.New("want a string in quotes")
	}
	if strings.TrimSpace(s) == "" {
		return "", errors.New("must not be empty")
	}
	return s, nil
}

// designQuantity reads a quantity that must be written as a string with
// its unit.
func designQuantity(v any, parse func(string) (float64, error), example string) (float64, error) {
	s, ok := v.(string)
	if !ok {
		return 0, fmt.Errorf("write it as a string with its unit, for example %q", example)
	}
	return parse(s)
}

func designFrequency(v any) (float64, error) {
	return designQuantity(v, units.ParseFrequency, "2.45GHz")
}

func designLength(v any) (float64, error) { return designQuantity(v, units.ParseLength, "5mm") }

func designElectricalLength(v any) (float64, error) {
	return designQuantity(v, units.ParseElectricalLength, "0.25wl")
}

// designPercent reads "5%" as 0.05.
func designPercent(v any) (float64, error) {
	s, ok := v.(string)
	if !ok || !strings.HasSuffix(strings.TrimSpace(s), "%") {
		return 0, errors.New(`write it as a percentage, for example "5%"`)
	}
	f, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(s), "%")), 64)
	if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
		return 0, fmt.Errorf("cannot read %q as a percentage", s)
	}
	return f / 100, nil
}

// designNumber reads a TOML integer or float.
func designNumber(v any) (float64, bool) {
	switch x := v.(type) {
	case int64:
		return float64(x), true
	case float64:
		return x, true
	}
	return 0, false
}

// designOhms reads a real impedance: 50, 50.0 or "50ohm".
func designOhms(v any) (float64, error) {
	if f, ok := designNumber(v); ok {
		return f, nil
	}
	s, ok := v.(string)
	if !ok {
		return 0, errors.New("want an impedance in ohms, for example 50")
	}
	z, err := units.ParseImpedance(s)
	if err != nil {
		return 0, err
	}
	if imag(z) != 0 {
		return 0, errors.New("a characteristic impedance is real")
	}
	return real(z), nil
}

// designImpedance reads a complex impedance: "22-j31" or a number.
func designImpedance(v any) (complex128, error) {
	if f, ok := designNumber(v); ok {
		return complex(f, 0), nil
	}
	s, ok := v.(string)
	if !ok {
		return 0, errors.New(`want an impedance in ohms, for example "22-j31"`)
	}
	return units.ParseImpedance(s)
}

func designInt(v any) (int, error) {
	n, ok := v.(int64)
	if !ok {
		return 0, errors.New("want a whole number")
	}
	if n > math.MaxInt32 || n < math.MinInt32 {
		return 0, errors.New("out of range")
	}
	return int(n), nil
}

// designWord reads a string naming one of a set of options; Validate
// checks it is one of them.
func designWord[T ~string](v any) (T, error) {
	s, err := designString(v)
	return T(s), err
}

func designStubEnd(v any) (StubEnd, error) {
	s, ok := v.(string)
	if !ok {
		return 0, errors.New(`want "open" or "short"`)
	}
	return ParseStubEnd(s)
}

func designSectionKind(v any) (SectionKind, error) {
	s, ok := v.(string)
	if !ok {
		return 0, errors.New(`want "line" or "stub"`)
	}
	return ParseSectionKind(s)
}

// designPick reads "shortest", "1", "2", 1 or 2.
func designPick(v any) (Pick, error) {
	switch x := v.(type) {
	case int64:
		return ParsePick(strconv.FormatInt(x, 10))
	case string:
		return ParsePick(x)
	}
	return 0, errors.New(`want "shortest", 1 or 2`)
}

// designBand reads ["2.4GHz", "2.4835GHz"].
func designBand(v any) ([2]float64, error) {
	a, ok := v.([]any)
	if !ok || len(a) != 2 {
		return [2]float64{}, errors.New(`want a start and a stop frequency, for example ["2.4GHz", "2.4835GHz"]`)
	}
	var out [2]float64
	for i, e := range a {
		f, err := designFrequency(e)
		if err != nil {
			return [2]float64{}, err
		}
		out[i] = f
	}
	return out, nil
}

// designDB reads a level in decibels: "-15dB".
func designDB(v any) (float64, error) {
	s, ok := v.(string)
	t := strings.TrimSpace(s)
	if !ok || !strings.HasSuffix(strings.ToLower(t), "db") {
		return 0, errors.New(`write it in decibels, for example "-15dB"`)
	}
	f, err := strconv.ParseFloat(strings.TrimSpace(t[:len(t)-2]), 64)
	if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
		return 0, fmt.Errorf("cannot read %q as decibels", s)
	}
	return f, nil
}

func designResponse(v any) (Response, error) {
	s, ok := v.(string)
	if !ok {
		return 0, errors.New(`want "binomial" or "chebyshev"`)
	}
	return ParseResponse(s)
}

// designBoardSize reads ["60mm", "40mm"].
func designBoardSize(v any) ([2]float64, error) {
	a, ok := v.([]any)
	if !ok || len(a) != 2 {
		return [2]float64{}, errors.New(`want a width and a height, for example ["60mm", "40mm"]`)
	}
	var out [2]float64
	for i, e := range a {
		m, err := designLength(e)
		if err != nil {
			return [2]float64{}, err
		}
		out[i] = m
	}
	return out, nil
}

// designStructures reads ["thru", "line", "reflect", "coupon"]: each at
// most once, kept in the order StructureKinds gives.
func designStructures(v any) ([]StructureKind, error) {
	a, ok := v.([]any)
	if !ok {
		return nil, errors.New(`want a list, for example ["thru", "line", "reflect", "coupon"]`)
	}
	seen := map[StructureKind]bool{}
	for _, e := range a {
		s, ok := e.(string)
		if !ok {
			return nil, fmt.Errorf("%v is not a structure name; the structures are \"thru\", \"line\", \"reflect\", \"coupon\"", e)
		}
		k, err := ParseStructureKind(s)
		if err != nil {
			return nil, err
		}
		if seen[k] {
			return nil, fmt.Errorf("%q is listed twice", s)
		}
		seen[k] = true
	}
	var out []StructureKind
	for _, k := range StructureKinds() {
		if seen[k] {
			out = append(out, k)
		}
	}
	return out, nil
}
