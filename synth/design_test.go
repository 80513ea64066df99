package synth

import (
	"bufio"
	"errors"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

const designDir = "../testdata/designs"

func designDecodeFile(t *testing.T, name string) (Design, error) {
	t.Helper()
	f, err := os.Open(filepath.Join(designDir, name))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	return DecodeDesign(f, name, designDir)
}

func designNear(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(1, math.Abs(b)) }

// Every value written in the full example comes back in SI (the expected
// values are the file's own text converted by hand; exact).
func TestDecodeDesignFull(t *testing.T) {
	d, err := designDecodeFile(t, "sensor-antenna.toml")
	if err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		what      string
		got, want float64
	}{
		{"frequency 2.45GHz", d.Freq, 2.45e9},
		{"z0", d.Z0, 50},
		{"load re", real(d.Load.Impedance), 22},
		{"load im", imag(d.Load.Impedance), -31},
		{"stub_z0", d.Match.StubZ0, 50},
		{"line_z0", d.Match.LineZ0, 50},
		{"feed 6mm", d.Layout.FeedLength, 6e-3},
		{"margin 4mm", d.Layout.Margin, 4e-3},
		{"max board w", d.Layout.MaxBoard[0], 60e-3},
		{"max board h", d.Layout.MaxBoard[1], 40e-3},
		{"via drill", d.Layout.ViaDrill, 0.35e-3},
		{"via pad", d.Layout.ViaPad, 0.7e-3},
		{"min width", d.Fab.MinWidth, 0.2e-3},
		{"sweep start", d.Sweep.Start, 1.9e9},
		{"sweep stop", d.Sweep.Stop, 3e9},
		{"sweep points", float64(d.Sweep.Points), 221},
		{"sweep span (not given)", d.Sweep.Span, 0},
		{"samples", float64(d.Tolerance.Samples), 500},
		{"seed", float64(d.Tolerance.Seed), 7},
		{"er 4%", d.Tolerance.Er, 0.04},
		{"thickness 8%", d.Tolerance.Thickness, 0.08},
		{"width 25um", d.Tolerance.Width, 25e-6},
		{"copper 12%", d.Tolerance.Copper, 0.12},
	}
	for _, c := range checks {
		if !designNear(c.got, c.want) {
			t.Errorf("%s: got %g, want %g", c.what, c.got, c.want)
		}
	}
	if d.Name != "sensor-antenna-match" || d.Stackup != "fr4-1.6mm" || d.StackupRef() != "fr4-1.6mm" {
		t.Errorf("name %q, stackup %q (%q)", d.Name, d.Stackup, d.StackupRef())
	}
	if d.Match.Topology != "shunt-stub" || d.Match.End != Open || d.Match.Pick != PickShortest || d.Sections != nil {
		t.Errorf("match %+v, sections %v", d.Match, d.Sections)
	}
	if d.Layout.StubSide != "down" || d.Layout.Mask != "cover" || d.Load.Touchstone != "" {
		t.Errorf("layout %+v, load %+v", d.Layout, d.Load)
	}
}

// Omitted tables take the documented defaults; pick may be a TOML integer.
func TestDecodeDesignDefaults(t *testing.T) {
	d, err := designDecodeFile(t, "minimal.toml")
	if err != nil {
		t.Fatal(err)
	}
	if d.Layout != DefaultLayout() || d.Fab != DefaultFab() || d.Tolerance != DefaultTolerance() {
		t.Errorf("defaults not applied: %+v %+v %+v", d.Layout, d.Fab, d.Tolerance)
	}
	// 915 MHz ± 30 %, 401 points (the documented default sweep)
	if !designNear(d.Sweep.Start, 640.5e6) || !designNear(d.Sweep.Stop, 1189.5e6) || d.Sweep.Points != 401 {
		t.Errorf("sweep %+v", d.Sweep)
	}
	if d.Match.Pick != 2 || d.Match.End != Short || d.Match.StubZ0 != 50 || d.Match.LineZ0 != 50 {
		t.Errorf("match %+v", d.Match)
	}
}

func TestDecodeDesignSections(t *testing.T) {
	d, err := designDecodeFile(t, "sensor-antenna-sections.toml")
	if err != nil {
		t.Fatal(err)
	}
	want := []Section{
		{Kind: SeriesLine, Z0: 50, LengthDeg: 108}, // 0.3 wl = 108° (exact)
		{Kind: ShuntStub, End: Short, Z0: 60, LengthDeg: 40},
	}
	if d.Match != nil || len(d.Sections) != len(want) {
		t.Fatalf("match %v, sections %+v", d.Match, d.Sections)
	}
	for i := range want {
		if d.Sections[i] != want[i] {
			t.Errorf("section %d: %+v, want %+v", i+1, d.Sections[i], want[i])
		}
	}
	// span 25 % of 2.45 GHz (exact)
	if !designNear(d.Sweep.Start, 1.8375e9) || !designNear(d.Sweep.Stop, 3.0625e9) || d.Sweep.Span != 0.25 || d.Sweep.Points != 101 {
		t.Errorf("sweep %+v", d.Sweep)
	}
	if got, want := d.StackupRef(), filepath.Join(designDir, "stackups/thin-board.toml"); got != want {
		t.Errorf("StackupRef() = %q, want %q", got, want)
	}
}

func TestDecodeDesignTouchstonePath(t *testing.T) {
	d, err := designDecodeFile(t, "touchstone-load.toml")
	if err != nil {
		t.Fatal(err)
	}
	if want := filepath.Join(designDir, "antenna.s1p"); d.Load.Touchstone != want {
		t.Errorf("touchstone %q, want %q", d.Load.Touchstone, want)
	}
}

// The bad example files: one fault each, reported with its line and key.
func TestDecodeDesignBadFiles(t *testing.T) {
	cases := []struct {
		file     string
		line     int
		key      string
		is       error  // nil: not checked
		contains string // in the message
	}{
		{"bad-unknown-key.toml", 11, "layout.feed_lenght", ErrUnknownKey, "feed_length"},
		{"bad-zero-frequency.toml", 4, "frequency", nil, `bad-zero-frequency.toml:4: frequency = "0Hz": the design frequency must be positive`},
		{"bad-negative-resistance.toml", 6, "load.impedance", nil, "negative resistance"},
		{"bad-two-loads.toml", 7, "load.touchstone", nil, "not both"},
		{"bad-section-kind.toml", 11, "section[2].kind", nil, "line or stub"},
		{"bad-topology.toml", 8, "match.topology", nil, "shunt-stub"},
	}
	for _, c := range cases {
		_, err := designDecodeFile(t, c.file)
		checkDesignError(t, c.file, err, c.line, c.key, c.is, c.contains)
	}
}

func checkDesignError(t *testing.T, name string, err error, line int, key string, is error, contains string) {
	t.Helper()
	var de *DesignError
	if !errors.As(err, &de) {
		t.Errorf("%s: error %v is not a *DesignError", name, err)
		return
	}
	if de.Line != line || de.Key != key {
		t.Errorf("%s: %q: at line %d key %q, want line %d key %q", name, err, de.Line, de.Key, line, key)
	}
	if is != nil && !errors.Is(err, is) {
		t.Errorf("%s: %q does not wrap %q", name, err, is)
	}
	if !strings.Contains(err.Error(), contains) {
		t.Errorf("%s: %q does not say %q", name, err, contains)
	}
}

// designBase is a valid design whose lines the table below replaces.
const designBase = `name = "base"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "22-j31"
[match]
topology = "shunt-stub"
stub = "open"
`

// Every missing or invalid key, one per row.
func TestDecodeDesignFaults(t *testing.T) {
	cases := []struct {
		name     string
		text     string
		line     int
		key      string
		is       error
		contains string
	}{
		{"base is valid", designBase, 0, "", nil, ""},
		{"missing name", strings.Replace(designBase, `name = "base"`, "", 1), 0, "name", ErrMissingKey, "name = "},
		{"missing frequency", strings.Replace(designBase, `frequency = "2.45GHz"`, "", 1), 0, "frequency", ErrMissingKey, "2.45GHz"},
		{"missing z0", strings.Replace(designBase, "z0 = 50", "", 1), 0, "z0", ErrMissingKey, "z0 = 50"},
		{"missing stackup", strings.Replace(designBase, `stackup = "fr4-1.6mm"`, "", 1), 0, "stackup", ErrMissingKey, "stackup"},
		{"missing load", strings.Replace(designBase, "[load]\nimpedance = \"22-j31\"\n", "", 1), 0, "load", ErrMissingKey, "impedance"},
		{"empty load", strings.Replace(designBase, "impedance = \"22-j31\"\n", "", 1), 5, "load", ErrMissingKey, "touchstone"},
		{"missing match and sections", strings.Replace(designBase, "[match]\ntopology = \"shunt-stub\"\nstub = \"open\"\n", "", 1), 0, "match", ErrMissingKey, "[[section]]"},
		{"missing topology", strings.Replace(designBase, "topology = \"shunt-stub\"\n", "", 1), 7, "match.topology", ErrMissingKey, "shunt-stub"},
		{"missing stub end", strings.Replace(designBase, "stub = \"open\"\n", "", 1), 7, "match.stub", ErrMissingKey, "open"},
		{"frequency without unit", strings.Replace(designBase, `"2.45GHz"`, `"2.45"`, 1), 2, "frequency", nil, "a unit is needed"},
		{"frequency as a number", strings.Replace(designBase, `"2.45GHz"`, `2.45e9`, 1), 2, "frequency", nil, "with its unit"},
		{"negative frequency", strings.Replace(designBase, `"2.45GHz"`, `"-1GHz"`, 1), 2, "frequency", nil, "positive"},
		{"frequency 1 Hz", strings.Replace(designBase, `"2.45GHz"`, `"1Hz"`, 1), 2, "frequency", ErrOutOfRange, "from 1 MHz to 110 GHz"},
		{"frequency 1 THz", strings.Replace(designBase, `"2.45GHz"`, `"1THz"`, 1), 2, "frequency", ErrOutOfRange, "from 1 MHz to 110 GHz"},
		{"frequency 1e20 Hz", strings.Replace(designBase, `"2.45GHz"`, `"1e20Hz"`, 1), 2, "frequency", ErrOutOfRange, "from 1 MHz to 110 GHz"},
		{"layout feed 1e9 m", designBase + "[layout]\nfeed_length = \"1e9m\"\n", 11, "layout.feed_length", ErrOutOfRange, "at most 500 mm"},
		{"layout max board huge", designBase + "[layout]\nmax_board = [\"60mm\", \"1e6mm\"]\n", 11, "layout.max_board", ErrOutOfRange, "height (second value)"},
		{"sweep stop 1 THz", designBase + "[sweep]\nstart = \"2GHz\"\nstop = \"1THz\"\n", 12, "sweep.stop", ErrOutOfRange, "220 GHz or below"},
		{"z0 too low", strings.Replace(designBase, "z0 = 50", "z0 = 2", 1), 3, "z0", nil, "from 10 to 200 ohm"},
		{"z0 complex", strings.Replace(designBase, "z0 = 50", `z0 = "50+j5"`, 1), 3, "z0", nil, "real"},
		{"z0 a table", strings.Replace(designBase, "z0 = 50", `z0 = [50]`, 1), 3, "z0", nil, "ohms"},
		{"empty stackup", strings.Replace(designBase, `"fr4-1.6mm"`, `""`, 1), 4, "stackup", nil, "empty"},
		{"bad impedance", strings.Replace(designBase, `"22-j31"`, `"22-k31"`, 1), 6, "load.impedance", nil, "impedance"},
		{"matched load", strings.Replace(designBase, `"22-j31"`, `"50"`, 1), 6, "load.impedance", ErrMatched, "already matched"},
		{"unknown stub end", strings.Replace(designBase, `stub = "open"`, `stub = "via"`, 1), 9, "match.stub", nil, "open or short"},
		{"bad pick", designBase + "pick = \"longest\"\n", 10, "match.pick", nil, "shortest"},
		{"pick 3", designBase + "pick = 3\n", 10, "match.pick", nil, "2 solutions"},
		{"pick a float", designBase + "pick = 1.5\n", 10, "match.pick", nil, "shortest"},
		{"stub_z0 out of range", designBase + "stub_z0 = 500\n", 10, "match.stub_z0", nil, "from 10 to 200 ohm"},
		{"line_z0 out of range", designBase + "line_z0 = 5\n", 10, "match.line_z0", nil, "from 10 to 200 ohm"},
		{"line cannot reach", strings.Replace(designBase, `"22-j31"`, `"55"`, 1) + "line_z0 = 100\n", 6, "load.impedance", ErrUnmatchable, "conductance"},
		{"unknown top-level key", designBase + "\n[board]\nlayers = 2\n", 11, "board", ErrUnknownKey, "top level"},
		{"unknown key in match", designBase + "stubs = 2\n", 10, "match.stubs", ErrUnknownKey, "[match] takes topology"},
		{"match and sections", designBase + "[[section]]\nkind = \"line\"\nlength = \"10deg\"\n", 7, "match", nil, "not both"},
		{"TOML syntax", designBase + "feed = \n", 10, "", nil, "TOML syntax"},
		{"table of the wrong kind", strings.Replace(designBase, "[load]\nimpedance = \"22-j31\"", "load = \"22-j31\"", 1), 5, "load", nil, "wrong kind of value"},
		{"layout feed zero", designBase + "[layout]\nfeed_length = \"0mm\"\n", 11, "layout.feed_length", nil, "more than 0 mm and at most 500 mm"},
		{"layout feed bare", designBase + "[layout]\nfeed_length = \"5\"\n", 11, "layout.feed_length", nil, "unit"},
		{"layout stub side", designBase + "[layout]\nstub_side = \"left\"\n", 11, "layout.stub_side", nil, "up or down"},
		{"layout margin", designBase + "[layout]\nmargin = \"-1mm\"\n", 11, "layout.margin", nil, "from 0 mm to 100 mm"},
		{"layout mask", designBase + "[layout]\nmask = \"none\"\n", 11, "layout.mask", nil, "open"},
		{"layout max board one value", designBase + "[layout]\nmax_board = [\"60mm\"]\n", 11, "layout.max_board", nil, "width and a height"},
		{"layout max board zero", designBase + "[layout]\nmax_board = [\"60mm\", \"0mm\"]\n", 11, "layout.max_board", nil, "from 1 mm to 1000 mm"},
		{"layout via pad small", designBase + "[layout]\nvia_drill = \"0.5mm\"\nvia_pad = \"0.4mm\"\n", 12, "layout.via_pad", nil, "larger than the drill"},
		{"layout via drill", designBase + "[layout]\nvia_drill = \"0mm\"\n", 11, "layout.via_drill", nil, "from 0.05 mm to 5 mm"},
		{"layout port", designBase + "[layout]\nport = \"sma\"\n", 11, "layout.port", nil, "edge-launch landing"},
		{"layout launch without edge", designBase + "[layout]\nlaunch_gap = \"0.4mm\"\n", 11, "layout.launch_gap", nil, "port = \"edge\""},
		{"layout launch zero", designBase + "[layout]\nport = \"edge\"\nlaunch_ground_width = \"-1mm\"\n", 12, "layout.launch_ground_width", ErrOutOfRange, "more than 0 mm"},
		{"layout fence offset alone", designBase + "[layout]\nfence_offset = \"2mm\"\n", 11, "layout.fence_offset", nil, "fence_pitch"},
		{"layout fence pitch tight", designBase + "[layout]\nfence_pitch = \"0.7mm\"\n", 11, "layout.fence_pitch", ErrOutOfRange, "via pad plus 0.2 mm"},
		{"layout fence offset on pad", designBase + "[layout]\nfence_pitch = \"2mm\"\nfence_offset = \"0.3mm\"\n", 12, "layout.fence_offset", ErrOutOfRange, "half the via pad"},
		{"layout launch pad past feed", designBase + "[layout]\nport = \"edge\"\nfeed_length = \"1mm\"\n", 12, "layout.feed_length", nil, "launch_pad_length"},
		{"fab min width", designBase + "[fab]\nmin_width = \"0um\"\n", 11, "fab.min_width", nil, "from 0.01 mm to 5 mm"},
		{"sweep span and start", designBase + "[sweep]\nspan = \"20%\"\nstart = \"2GHz\"\nstop = \"3GHz\"\n", 11, "sweep.span", nil, "not both"},
		{"sweep start alone", designBase + "[sweep]\nstart = \"2GHz\"\n", 10, "sweep", ErrMissingKey, "together"},
		{"sweep span 150%", designBase + "[sweep]\nspan = \"150%\"\n", 11, "sweep.span", nil, "less than 100%"},
		{"sweep span no %", designBase + "[sweep]\nspan = 0.3\n", 11, "sweep.span", nil, "percentage"},
		{"sweep misses f0", designBase + "[sweep]\nstart = \"3GHz\"\nstop = \"4GHz\"\n", 11, "sweep.start", nil, "include the design frequency"},
		{"sweep stop below start", designBase + "[sweep]\nstart = \"2GHz\"\nstop = \"1GHz\"\n", 11, "sweep.start", nil, "start < stop"},
		{"sweep one point", designBase + "[sweep]\npoints = 1\n", 11, "sweep.points", nil, "2 to"},
		{"sweep points float", designBase + "[sweep]\npoints = 10.5\n", 11, "sweep.points", nil, "whole number"},
		{"tolerance samples", designBase + "[tolerance]\nsamples = -1\n", 11, "tolerance.samples", nil, "samples"},
		{"tolerance er", designBase + "[tolerance]\ner = \"-5%\"\n", 11, "tolerance.er", nil, "spread"},
		{"tolerance thickness", designBase + "[tolerance]\nthickness = \"100%\"\n", 11, "tolerance.thickness", nil, "spread"},
		{"tolerance copper", designBase + "[tolerance]\ncopper = \"ten%\"\n", 11, "tolerance.copper", nil, "percentage"},
		{"tolerance width", designBase + "[tolerance]\nwidth = \"-2um\"\n", 11, "tolerance.width", nil, "from 0 mm to 1 mm"},
		{"tolerance seed", designBase + "[tolerance]\nseed = \"one\"\n", 11, "tolerance.seed", nil, "whole number"},
		{"unknown key in tolerance", designBase + "[tolerance]\nloss = \"5%\"\n", 11, "tolerance.loss", ErrUnknownKey, "[tolerance] takes samples"},
	}
	for _, c := range cases {
		_, err := DecodeDesign(strings.NewReader(c.text), "demo.toml", "")
		if c.key == "" && c.line == 0 && c.contains == "" {
			if err != nil {
				t.Errorf("%s: %v", c.name, err)
			}
			continue
		}
		if c.key == "" && c.contains == "TOML syntax" {
			var de *DesignError
			if !errors.As(err, &de) || de.Line != c.line || !strings.Contains(err.Error(), c.contains) {
				t.Errorf("%s: %v (line %d wanted)", c.name, err, c.line)
			}
			continue
		}
		checkDesignError(t, c.name, err, c.line, c.key, c.is, c.contains)
	}
}

const sectionsBase = `name = "sections"
frequency = "1GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "22-j31"
[[section]]
kind = "line"
length = "0.3wl"
[[section]]
kind = "stub"
end = "short"
length = "40deg"
`

func TestDecodeDesignSectionFaults(t *testing.T) {
	cases := []struct {
		name     string
		text     string
		line     int
		key      string
		is       error
		contains string
	}{
		{"missing kind", strings.Replace(sectionsBase, "kind = \"stub\"\n", "", 1), 10, "section[2].kind", ErrMissingKey, "kind"},
		{"bad kind", strings.Replace(sectionsBase, `kind = "line"`, `kind = "resistor"`, 1), 8, "section[1].kind", nil, "line or stub"},
		{"kind a number", strings.Replace(sectionsBase, `kind = "line"`, `kind = 1`, 1), 8, "section[1].kind", nil, "line"},
		{"stub without end", strings.Replace(sectionsBase, "end = \"short\"\n", "", 1), 10, "section[2].end", ErrMissingKey, "open"},
		{"line with end", strings.Replace(sectionsBase, "kind = \"line\"\n", "kind = \"line\"\nend = \"open\"\n", 1), 9, "section[1].end", nil, "only a stub"},
		{"missing length", strings.Replace(sectionsBase, "length = \"40deg\"\n", "", 1), 10, "section[2].length", ErrMissingKey, "length"},
		{"zero length", strings.Replace(sectionsBase, `"40deg"`, `"0deg"`, 1), 13, "section[2].length", nil, "positive"},
		{"length without unit", strings.Replace(sectionsBase, `"0.3wl"`, `"0.3"`, 1), 9, "section[1].length", nil, "unit"},
		{"z0 too high", strings.Replace(sectionsBase, "kind = \"stub\"\n", "kind = \"stub\"\nz0 = 250\n", 1), 12, "section[2].z0", nil, "from 10 to 200 ohm"},
		{"unknown key", strings.Replace(sectionsBase, "kind = \"stub\"\n", "kind = \"stub\"\nwidth = \"1mm\"\n", 1), 12, "section[2].width", ErrUnknownKey, "[section] takes kind"},
		{"negative load", strings.Replace(sectionsBase, `"22-j31"`, `"-22-j31"`, 1), 6, "load.impedance", nil, "negative resistance"},
		{"infinite load", strings.Replace(sectionsBase, `"22-j31"`, `"1e400"`, 1), 6, "load.impedance", nil, "impedance"},
		{"section not a table", "section = 3\n" + sectionsBase[:strings.Index(sectionsBase, "[[section]]")], 1, "section", nil, "wrong kind"},
	}
	for _, c := range cases {
		_, err := DecodeDesign(strings.NewReader(c.text), "demo.toml", "")
		checkDesignError(t, c.name, err, c.line, c.key, c.is, c.contains)
	}
}

// The error's text is the documented form (file:line: key = value: reason).
func TestDesignErrorText(t *testing.T) {
	cases := []struct {
		err  DesignError
		want string
	}{
		{DesignError{Source: "demo.toml", Line: 4, Key: "frequency", Value: `"0Hz"`, Err: errors.New("the design frequency must be positive")},
			`demo.toml:4: frequency = "0Hz": the design frequency must be positive`},
		{DesignError{Source: "demo.toml", Key: "name", Err: ErrMissingKey}, `demo.toml: name: a required key is missing`},
		{DesignError{Err: errors.New("x")}, `x`},
	}
	for _, c := range cases {
		if got := c.err.Error(); got != c.want {
			t.Errorf("got %q, want %q", got, c.want)
		}
	}
}

// A design built in code is checked the same way, without lines.
func TestValidateBuiltDesign(t *testing.T) {
	good := Design{
		Name: "code", Freq: 2.45e9, Z0: 50, Stackup: "fr4-1.6mm",
		Load:   LoadSpec{Impedance: complex(22, -31)},
		Match:  &MatchSpec{Topology: "shunt-stub", End: Short, Pick: 1, StubZ0: 50, LineZ0: 50},
		Layout: DefaultLayout(), Fab: DefaultFab(), Sweep: DefaultSweep(2.45e9), Tolerance: DefaultTolerance(),
	}
	if err := good.Validate(); err != nil {
		t.Fatalf("valid design: %v", err)
	}
	bad := good
	bad.Freq = 0
	err := bad.Validate()
	if err == nil || err.Error() != `design: frequency = "0Hz": the design frequency must be positive, for example frequency = "2.45GHz"` {
		t.Errorf("got %v", err)
	}
	bad = good
	bad.Match = nil
	if err := bad.Validate(); !errors.Is(err, ErrMissingKey) {
		t.Errorf("no network: got %v", err)
	}
	bad = good
	bad.Sections = []Section{{Kind: SeriesLine, Z0: 50, LengthDeg: 10}}
	if err := bad.Validate(); err == nil || !strings.Contains(err.Error(), "not both") {
		t.Errorf("match and sections: got %v", err)
	}
}

// Electrical for a [match] design gives the picked solution as [line,
// stub]; the test's own chain matrices (match_test.go, exact line theory)
// confirm it matches the load.
func TestElectricalMatch(t *testing.T) {
	for _, file := range []string{"sensor-antenna.toml", "minimal.toml"} {
		d, err := designDecodeFile(t, file)
		if err != nil {
			t.Fatal(err)
		}
		secs, notes, err := d.Electrical(d.Load.Impedance)
		if err != nil {
			t.Fatal(err)
		}
		if len(secs) != 2 || secs[0].Kind != SeriesLine || secs[1].Kind != ShuntStub || secs[1].End != d.Match.End || len(notes) == 0 {
			t.Fatalf("%s: sections %+v, notes %q", file, secs, notes)
		}
		m := matchShuntY(matchStubY(secs[1].Z0, secs[1].LengthDeg, secs[1].End)).mul(matchTLine(secs[0].Z0, secs[0].LengthDeg))
		if g := matchInputGamma(m, d.Load.Impedance, d.Z0); !(g < 1e-9) {
			t.Errorf("%s: |Γin| = %g", file, g)
		}
	}
	// A load that differs from the file's (read from Touchstone data, say)
	// and is already matched.
	d, err := designDecodeFile(t, "touchstone-load.toml")
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := d.Electrical(50); !errors.Is(err, ErrMatched) {
		t.Errorf("matched load: got %v", err)
	}
	if _, _, err := d.Electrical(complex(0, 20)); !errors.Is(err, ErrUnmatchable) {
		t.Errorf("reactive load: got %v", err)
	}
}

func TestElectricalSections(t *testing.T) {
	d, err := designDecodeFile(t, "sensor-antenna-sections.toml")
	if err != nil {
		t.Fatal(err)
	}
	secs, notes, err := d.Electrical(d.Load.Impedance)
	if err != nil {
		t.Fatal(err)
	}
	if len(secs) != 2 || secs[0] != d.Sections[0] || len(notes) != 2 {
		t.Fatalf("sections %+v, notes %q", secs, notes)
	}
	// scikit-rf 0.15.4, row 1 of sections-skrf.tsv: 9.52459260488+j36.6393297869
	if !strings.Contains(notes[1], "9.52459+j36.6393") {
		t.Errorf("note %q", notes[1])
	}
	if _, _, err := d.Electrical(complex(-5, 3)); !errors.Is(err, ErrBadLoad) {
		t.Errorf("active load: %v", err)
	}
}

// SectionsInput against scikit-rf 0.15.4 (golden table made by
// testdata/designs/sections_skrf.py; the header records the command).
func TestSectionsInputScikitRF(t *testing.T) {
	f, err := os.Open(filepath.Join(designDir, "sections-skrf.tsv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	rows := 0
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.TrimSpace(line) == "" {
			continue
		}
		col := strings.Split(line, "\t")
		if len(col) != 5 {
			t.Fatalf("bad row %q", line)
		}
		num := func(s string) float64 {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("row %q: %v", line, err)
			}
			return v
		}
		zl := complex(num(col[0]), num(col[1]))
		var secs []Section
		for _, spec := range strings.Split(col[2], ",") {
			p := strings.Split(spec, ":")
			s := Section{Z0: num(p[2]), LengthDeg: num(p[3])}
			s.Kind, err = ParseSectionKind(p[0])
			if err != nil {
				t.Fatal(err)
			}
			if s.Kind == ShuntStub {
				if s.End, err = ParseStubEnd(p[1]); err != nil {
					t.Fatal(err)
				}
			}
			secs = append(secs, s)
		}
		want := complex(num(col[3]), num(col[4]))
		got := SectionsInput(secs, zl)
		if cmplx.Abs(got-want) > 1e-8*math.Max(1, cmplx.Abs(want)) {
			t.Errorf("%s into %v: got %v, scikit-rf %v", col[2], zl, got, want)
		}
		rows++
	}
	if rows < 5 {
		t.Fatalf("only %d rows read", rows)
	}
}

// Exact special cases of SectionsInput: an open stub of 90° is a short,
// one of 180° is nothing; a 90° line inverts (Z0²/Z).
func TestSectionsInputSingular(t *testing.T) {
	cases := []struct {
		name string
		secs []Section
		zl   complex128
		want complex128
	}{
		{"open 90° stub shorts", []Section{{Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: 90}}, complex(30, 10), 0},
		{"open 180° stub is absent", []Section{{Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: 180}}, complex(30, 10), complex(30, 10)},
		{"short 90° stub is absent", []Section{{Kind: ShuntStub, End: Short, Z0: 50, LengthDeg: 90}}, complex(30, 10), complex(30, 10)},
		{"quarter-wave inverter", []Section{{Kind: SeriesLine, Z0: 50, LengthDeg: 90}}, 25, 100},
		{"quarter wave of a short is an open, then a 45° line", []Section{{Kind: SeriesLine, Z0: 50, LengthDeg: 90}, {Kind: SeriesLine, Z0: 50, LengthDeg: 45}}, 0, complex(0, -50)},
	}
	for _, c := range cases {
		got := SectionsInput(c.secs, c.zl)
		if cmplx.Abs(got-c.want) > 1e-9 {
			t.Errorf("%s: got %v, want %v", c.name, got, c.want)
		}
	}
}

func BenchmarkDecodeDesign(b *testing.B) {
	text, err := os.ReadFile(filepath.Join(designDir, "sensor-antenna.toml"))
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < b.N; i++ {
		if _, err := DecodeDesign(strings.NewReader(string(text)), "sensor-antenna.toml", designDir); err != nil {
			b.Fatal(err)
		}
	}
}

// Every key the decoder reads is in the schema that refuses unknown keys:
// a design writing each optional key of [layout] decodes.
func TestDesignSchemaTakesEveryLayoutKey(t *testing.T) {
	text := designBase + "[layout]\nfeed_length = \"5mm\"\nstub_side = \"up\"\nmargin = \"5mm\"\nedge_clearance = \"0.3mm\"\n" +
		"port = \"edge\"\nlaunch_pad_width = \"3mm\"\nlaunch_pad_length = \"1.5mm\"\nlaunch_gap = \"0.5mm\"\nlaunch_ground_width = \"1.5mm\"\n" +
		"launch_ground_length = \"2.5mm\"\nlaunch_via_drill = \"0.3mm\"\nlaunch_via_pad = \"0.6mm\"\nlaunch_via_pitch = \"1mm\"\n" +
		"fence_pitch = \"2mm\"\nfence_offset = \"3mm\"\n"
	d, err := DecodeDesign(strings.NewReader(text), "d.toml", "")
	if err != nil {
		t.Fatal(err)
	}
	// The file's quantities in metres (exact SI prefixes).
	want := LaunchSizes{PadWidth: 3e-3, PadLength: 1.5e-3, Gap: 0.5e-3, GroundWidth: 1.5e-3, GroundLength: 2.5e-3, ViaDrill: 0.3e-3, ViaPad: 0.6e-3, ViaPitch: 1e-3}
	if d.Layout.FencePitch != 2e-3 || d.Layout.FenceOffset != 3e-3 {
		t.Errorf("fence pitch %g m, offset %g m; want 2e-3, 3e-3", d.Layout.FencePitch, d.Layout.FenceOffset)
	}
	if d.Layout.Port != PortEdge || d.Layout.Launch != want {
		t.Errorf("port %q, launch %+v; want edge, %+v", d.Layout.Port, d.Layout.Launch, want)
	}
}
