package synth

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// cascadeWorstDB is the worst |S11| in dB of lossless sections (from the
// load toward the source) with a constant load at the frequencies fs,
// cascaded by the test's own chain matrices (exact line theory; every
// length scales with frequency).
func cascadeWorstDB(secs []Section, zl complex128, z0, f0 float64, fs []float64) float64 {
	worst := 0.0
	for _, f := range fs {
		m := matchABCD{{1, 0}, {0, 1}}
		for i := len(secs) - 1; i >= 0; i-- {
			s := secs[i]
			deg := s.LengthDeg * f / f0
			if s.Kind == ShuntStub {
				m = m.mul(matchShuntY(matchStubY(s.Z0, deg, s.End)))
			} else {
				m = m.mul(matchTLine(s.Z0, deg))
			}
		}
		worst = math.Max(worst, matchInputGamma(m, zl, z0))
	}
	return 20 * math.Log10(worst)
}

// A double stub whose open stub has shrunk to nothing is a single stub: the
// stub that went is an open circuit (an open stub of 0°, exact) and a z0
// line on the source side of the last stub leaves |Γ| as it is (exact), so
// the single stub reflects what the double stub did at every frequency. A
// short stub of under 1° is a short circuit, not a missing stub.
func TestSingleStubOf(t *testing.T) {
	const z0, f0 = 50.0, 2.44e9
	zl := complex(100, -50)
	fs := BandSamples(2.3e9, 2.6e9, 7)
	line := func(deg float64) Section { return Section{Kind: SeriesLine, Z0: z0, LengthDeg: deg} }
	stub := func(end StubEnd, deg float64) Section {
		return Section{Kind: ShuntStub, End: end, Z0: z0, LengthDeg: deg}
	}
	cases := []struct {
		name string
		secs []Section
		want []Section // nil: both stubs are there
		gone int
	}{
		{"second open stub at 1e-9°", []Section{line(45), stub(Open, 135), line(121), stub(Open, 1e-9)},
			[]Section{line(45), stub(Open, 135)}, 2},
		{"first open stub at 1e-9°", []Section{line(30), stub(Open, 1e-9), line(100), stub(Open, 40)},
			[]Section{line(130), stub(Open, 40)}, 1},
		{"second open stub at 0.5° (under 1°)", []Section{line(45), stub(Open, 135), line(121), stub(Open, 0.5)},
			[]Section{line(45), stub(Open, 135)}, 2},
		{"both stubs there", []Section{line(52.6), stub(Open, 139), line(54.7), stub(Open, 199.2)}, nil, 0},
		{"open stub of 1.5° stays", []Section{line(45), stub(Open, 135), line(121), stub(Open, 1.5)}, nil, 0},
		{"short stub at 0.5° is a short, not gone", []Section{line(45), stub(Short, 40), line(121), stub(Short, 0.5)}, nil, 0},
		{"both open stubs gone", []Section{line(45), stub(Open, 0.1), line(121), stub(Open, 0.1)}, nil, 0},
	}
	for _, c := range cases {
		got, gone, ok := singleStubOf(c.secs)
		if ok != (c.want != nil) || gone != c.gone {
			t.Errorf("%s: ok %v, stub %d gone; want ok %v, stub %d", c.name, ok, gone, c.want != nil, c.gone)
			continue
		}
		if !ok {
			continue
		}
		if len(got) != len(c.want) {
			t.Errorf("%s: %+v, want %+v", c.name, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("%s: section %d is %+v, want %+v", c.name, i+1, got[i], c.want[i])
			}
		}
		if c.secs[2*gone-1].LengthDeg < 1e-6 {
			// Exact: nothing of the response changes.
			if a, b := cascadeWorstDB(c.secs, zl, z0, f0, fs), cascadeWorstDB(got, zl, z0, f0, fs); math.Abs(a-b) > 1e-6 {
				t.Errorf("%s: worst |S11| %.6f dB as a double stub, %.6f dB as the single stub", c.name, a, b)
			}
		}
	}
}

// solve --band's double stubs are double stubs: from the shortest solution
// at f0 the band optimisation shrank the second open stub of these loads
// to 0°, listing a single stub (with a z0 line behind it) as a double
// stub. Every double stub listed has both stubs at least MinOpenStubDeg
// long, and its worst |S11| is what the test's own cascade gives for its
// sections. On the 2–3 GHz band, a single stub left from the other start
// beats the double stub, and the note says so.
func TestSolveBandDoubleStubHasTwoStubs(t *testing.T) {
	cases := []struct {
		zl       complex128
		f1, f2   float64
		wantNote string // in the open double stub's note, "" for none
	}{
		{complex(100, -50), 2.4e9, 2.4835e9, ""},
		{complex(80, -60), 2.4e9, 2.4835e9, ""},
		{complex(90, -20), 2.4e9, 2.4835e9, ""},
		{complex(50, 15), 2e9, 3e9, "shrank stub 2 to"},
	}
	for _, c := range cases {
		res, err := SolveBand(ConstantLoad(c.zl), 50, c.f1, c.f2, TopologyDoubleStub, 0, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range res.Solutions {
			if s.Err != "" {
				t.Errorf("%v %s: %s", c.zl, s.Name(), s.Err)
				continue
			}
			if _, gone, ok := singleStubOf(s.Sections); ok {
				t.Errorf("%v %s: stub %d is %.3g°: %+v", c.zl, s.Name(), gone, s.Sections[2*gone-1].LengthDeg, s.Sections)
			}
			want := cascadeWorstDB(s.Sections, c.zl, 50, res.F0, BandSamples(c.f1, c.f2, 41))
			if math.Abs(s.WorstS11DB-want) > 0.01 {
				t.Errorf("%v %s: worst |S11| %.3f dB, the cascade gives %.3f dB", c.zl, s.Name(), s.WorstS11DB, want)
			}
			if s.End == Open && !strings.Contains(s.Note, c.wantNote) || c.wantNote == "" && strings.Contains(s.Note, "shrank") {
				t.Errorf("%v %s: note %q, want one with %q", c.zl, s.Name(), s.Note, c.wantNote)
			}
		}
	}
}

// Which start of a double stub is listed, and what is said: the best one
// that kept both stubs; a single stub that did better is named in the
// note; with no start that kept both, the candidate names the best single
// stub in its error. The figures are the rows' own (|Γ| 0.01 is −40 dB,
// 0.005 is −46.02 dB, 0.05 is −26.02 dB).
func TestPickDoubleStub(t *testing.T) {
	line := func(deg float64) Section { return Section{Kind: SeriesLine, Z0: 50, LengthDeg: deg} }
	open := func(deg float64) Section { return Section{Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: deg} }
	start := func(worst float64, secs ...Section) bandStart { return newBandStart(0, secs, worst) }
	double := []Section{line(52.6), open(139), line(54.7), open(199.2)}
	other := []Section{line(57), open(119.9), line(127.7), open(145.7)}
	single := []Section{line(45), open(135), line(121), open(1e-9)}
	parallel := []Section{line(56.5), open(149), line(1e-9), open(149)}
	cases := []struct {
		name      string
		starts    []bandStart
		wantSecs  []Section // nil: no double stub, Err set
		wantDB    float64
		wantNote  string // in the note ("" for none)
		wantInErr string
		wantPick  Pick // the solution at f0 of the start kept (starts are solutions 1, 2 in order)
	}{
		{"both kept two stubs: the better", []bandStart{start(0.02, other...), start(0.01, double...)}, double, -40, "", "", 2},
		{"the first start the better", []bandStart{start(0.01, double...), start(0.02, other...)}, double, -40, "", "", 1},
		{"a single stub did worse: no note", []bandStart{start(0.05, single...), start(0.01, double...)}, double, -40, "", "", 2},
		{"a single stub did better: the note says so", []bandStart{start(0.005, single...), start(0.01, double...)}, double, -40,
			"from the other solution at f0 the band optimisation shrank stub 2 to 0.00°, leaving a single open stub (45.0° of line, stub 135.0°) with a worst |S11| of -46.02 dB in the band, better than this double stub", "", 2},
		{"every start lost a stub", []bandStart{start(0.05, single...), start(0.1, line(40), open(0.2), line(100), open(30))}, nil, 0, "",
			"no double stub: from each solution at f0 the band optimisation shrank stub 2 to 0.00°, leaving a single open stub (45.0° of line, stub 135.0°) with a worst |S11| of -26.02 dB in the band", 1},
		{"stubs in parallel that did better are no double stub: the note names them", []bandStart{start(0.005, parallel...), start(0.01, double...)}, double, -40,
			"from the other solution at f0 the band optimisation shrank the spacing to 0.00°, leaving two open stubs in parallel at one point (56.5° of line, stubs 149.0° and 149.0°), a single stub of their combined admittance, with a worst |S11| of -46.02 dB in the band, better than this double stub", "", 2},
		{"stubs in parallel or a stub gone: no double stub", []bandStart{start(0.05, single...), start(0.01, parallel...)}, nil, 0, "",
			"no double stub: from each solution at f0 the band optimisation shrank the spacing to 0.00°, leaving two open stubs in parallel at one point (56.5° of line, stubs 149.0° and 149.0°), a single stub of their combined admittance, with a worst |S11| of -40.00 dB in the band", 2},
	}
	for _, c := range cases {
		for i := range c.starts {
			c.starts[i].pick = Pick(i + 1)
		}
		got, pick := pickDoubleStub(Candidate{Topology: TopologyDoubleStub, End: Open}, c.starts, "")
		if pick != c.wantPick {
			t.Errorf("%s: started from solution %d, want %d", c.name, pick, c.wantPick)
		}
		if c.wantSecs == nil {
			if got.Err != c.wantInErr || got.Sections != nil {
				t.Errorf("%s: err %q, sections %+v; want err %q and no sections", c.name, got.Err, got.Sections, c.wantInErr)
			}
			continue
		}
		if got.Err != "" || len(got.Sections) != len(c.wantSecs) || got.Sections[1] != c.wantSecs[1] || math.Abs(got.WorstS11DB-c.wantDB) > 1e-9 {
			t.Errorf("%s: %+v, want the sections %+v at %g dB", c.name, got, c.wantSecs, c.wantDB)
		}
		if got.Note != c.wantNote {
			t.Errorf("%s: note %q, want %q", c.name, got.Note, c.wantNote)
		}
	}
}

// build starts a band-matched double stub where solve --band's listed one
// is: from the solution at f0 whose band optimisation on lossless lines
// keeps both stubs, at the lengths it reached (was: from the shortest
// solution at f0, from which the board's own optimisation shrank open
// stub 2 of 100−j50 Ω to 0.091 mm, −26.7 dB across the band). Each stub's
// electrical length on the built board is its design length plus the
// band optimisation's change over its guided wavelength; the test cascades
// the built lines and stubs as lossless TEM lines of their target
// impedances (chain matrices, Pozar, Microwave Engineering, 4th ed., table
// 4.1) and takes the worst |S11| at 41 frequencies across the band.
func TestBuildBandDoubleStubHasTwoStubs(t *testing.T) {
	// Judgement, no source: solve --band lists these double stubs at −52
	// to −61 dB on lossless lines; the built board's full model must come
	// within a few dB of that, and the test's cascade, which leaves out the
	// junctions and open ends the band optimisation compensated, within
	// −35 dB (the start the old build kept reached −23 to −33 dB by the
	// cascade, −27 to −47 dB by the full model).
	const maxCascadeDB, maxBuildDB = -35.0, -50.0
	cases := []struct {
		zl, end string
		wantIn  string // in a note
		// asSolve: the board starts from the double stub solve --band
		// lists, whose first line has room for the 5 mm feed (26.73°)
		asSolve bool
	}{
		{"100-j50", "open", "double stub: solution 1 at f0, the start whose band optimisation on lossless lines (as solve --band lists it)", true},
		{"80-j60", "open", "double stub: solution", true},
		{"90-j20", "open", "double stub: solution", true},
		{"100-j50", "short", "double stub: solution", true},
		{"40-j10", "open", "with the load-side feed (26.73°) kept in its first line", false},
	}
	for _, c := range cases {
		d := decodeTestDesign(t, fmt.Sprintf(`name = "b"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = %q
[match]
topology = "double-stub"
stub = %q
band = ["2.4GHz", "2.4835GHz"]
`, c.zl, c.end))
		r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true, SkipSensitivity: true})
		if err != nil {
			t.Fatal(err)
		}
		deg := func(e Element) float64 { return e.ElectricalDeg + 360*e.Recentre/e.Params.GuidedWavelength() }
		var secs []Section
		stubs := 0
		for i, e := range r.Physical.Elements {
			if e.Role == RoleStub {
				continue
			}
			secs = append(secs, Section{Kind: SeriesLine, Z0: e.Z0, LengthDeg: deg(e)})
			for _, s := range r.Physical.Elements {
				if s.Role == RoleStub && s.At == i {
					stubs++
					if drawn := 360 * s.Drawn() / s.Params.GuidedWavelength(); deg(s) < MinOpenStubDeg || drawn < MinOpenStubDeg {
						t.Errorf("%s %s: %s is %.3f°, drawn %.3f mm (%.3f°)", c.zl, c.end, s.ID, deg(s), s.Drawn()*1e3, drawn)
					}
					secs = append(secs, Section{Kind: ShuntStub, End: s.End, Z0: s.Z0, LengthDeg: deg(s)})
				}
			}
		}
		if stubs != 2 {
			t.Errorf("%s %s: %d stubs", c.zl, c.end, stubs)
		}
		zl, _ := ConstantLoad(d.Load.Impedance).Impedance(0)
		got := cascadeWorstDB(secs, zl, 50, d.Freq, BandSamples(2.4e9, 2.4835e9, 41))
		if got > maxCascadeDB || r.Band.WorstS11DB > maxBuildDB {
			t.Errorf("%s %s: worst |S11| in the band %.2f dB by the test's cascade, %.2f dB by the build; want below %g and %g dB", c.zl, c.end, got, r.Band.WorstS11DB, maxCascadeDB, maxBuildDB)
		}
		if !strings.Contains(strings.Join(r.Notes, "\n"), c.wantIn) {
			t.Errorf("%s %s: no note with %q in %q", c.zl, c.end, c.wantIn, r.Notes)
		}
		end, _ := ParseStubEnd(c.end)
		sb, err := SolveBand(ConstantLoad(zl), 50, 2.4e9, 2.4835e9, TopologyDoubleStub, end, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		if listed := sb.Solutions[0].Sections; c.asSolve && !sameSections(r.Sections, listed) {
			t.Errorf("%s %s: the board starts from %+v, solve --band lists %+v", c.zl, c.end, r.Sections, listed)
		}
	}
}

// sameSections says whether a and b are the same sections, lengths within
// 1e-9°.
func sameSections(a, b []Section) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		x, y := a[i], b[i]
		if x.Kind != y.Kind || x.End != y.End || x.Z0 != y.Z0 || math.Abs(x.LengthDeg-y.LengthDeg) > 1e-9 {
			return false
		}
	}
	return true
}

// build's choice of a band double stub's start, and what it says: the
// double stub solve --band lists when its first line has room for the
// load-side feed; the choice made again with the feed kept when it has
// not, or when no start keeps two stubs; and, when even then no start
// keeps two stubs, a warning that names the single stub and says the
// board is built from that solution at f0 all the same. The starts are
// the rows' own (|Γ| 0.01 is −40 dB, 0.05 is −26.02 dB).
func TestChooseDoubleStubStart(t *testing.T) {
	line := func(deg float64) Section { return Section{Kind: SeriesLine, Z0: 50, LengthDeg: deg} }
	open := func(deg float64) Section { return Section{Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: deg} }
	starts := func(worsts []float64, secs ...[]Section) []bandStart {
		var out []bandStart
		for i, s := range secs {
			out = append(out, newBandStart(Pick(i+1), s, worsts[i]))
		}
		return out
	}
	double := []Section{line(52.6), open(139), line(54.7), open(199.2)}
	shortLine := []Section{line(10), open(139), line(54.7), open(199.2)}
	single := []Section{line(45), open(135), line(121), open(1e-9)}
	single1 := []Section{line(40), open(0.2), line(100), open(30)}
	const feed = 26.73
	cases := []struct {
		name               string
		bare, fed          []bandStart // the starts without and with the feed kept
		wantPick           Pick
		wantSecs           []Section // nil: none, the board starts from the solution at f0
		wantNote, wantWarn string    // in the first note and the warning ("" for none)
		wantStartsWithFeed bool      // the choice was made again with the feed kept
	}{
		{"as solve --band lists it", starts([]float64{0.05, 0.01}, single, double), nil, 2, double,
			"double stub: solution 2 at f0, the start whose band optimisation on lossless lines (as solve --band lists it) keeps both stubs with the lower worst |S11| (-40.00 dB over 41 frequencies); the board starts from those lengths: 52.60° of line, stub 139.00°, 54.70° spacing, stub 199.20°", "", false},
		{"first line shorter than the feed: again with the feed kept", starts([]float64{0.01, 0.05}, shortLine, single), starts([]float64{0.05, 0.01}, single, double), 2, double,
			"(with the load-side feed (26.73°) kept in its first line)", "", true},
		{"no start keeps two stubs: again with the feed kept", starts([]float64{0.05, 0.1}, single, single1), starts([]float64{0.01, 0.05}, double, single), 1, double,
			"(with the load-side feed (26.73°) kept in its first line)", "", true},
		{"no start keeps two stubs even with the feed kept: a warning", starts([]float64{0.05, 0.1}, single, single1), starts([]float64{0.1, 0.05}, single1, single), 2, nil,
			"", "no double stub: from each solution at f0 the band optimisation shrank stub 2 to 0.00°, leaving a single open stub (45.0° of line, stub 135.0°) with a worst |S11| of -26.02 dB in the band; built from solution 2 at f0 all the same: the band optimisation of the board may shorten that stub to nothing too", true},
	}
	for _, c := range cases {
		withFeed := false
		get := func(o ElectricalOptions) ([]bandStart, error) {
			switch o.FeedDeg {
			case 0:
				return c.bare, nil
			case feed:
				withFeed = true
				return c.fed, nil
			}
			return nil, fmt.Errorf("starts asked for a feed of %g°, want 0 or %g°", o.FeedDeg, feed)
		}
		pick, secs, notes, warnings, err := chooseDoubleStubStart(Candidate{Topology: TopologyDoubleStub, End: Open}, ElectricalOptions{FeedDeg: feed}, 41, get)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if pick != c.wantPick || !sameSections(secs, c.wantSecs) || withFeed != c.wantStartsWithFeed {
			t.Errorf("%s: solution %d, sections %+v, again with the feed %v; want %d, %+v, %v", c.name, pick, secs, withFeed, c.wantPick, c.wantSecs, c.wantStartsWithFeed)
		}
		if c.wantWarn == "" {
			if len(warnings) != 0 || len(notes) == 0 || !strings.Contains(notes[0], c.wantNote) {
				t.Errorf("%s: notes %q, warnings %q; want a note with %q and no warning", c.name, notes, warnings, c.wantNote)
			}
			continue
		}
		if len(warnings) != 1 || warnings[0] != c.wantWarn || len(notes) != 0 {
			t.Errorf("%s: warnings %q, notes %q; want the one warning %q and no note", c.name, warnings, notes, c.wantWarn)
		}
	}
}

// Two stubs with (almost) no line between them stand in parallel at one
// point: one shunt stub of their combined admittance, which a reader does
// not take for a double stub. Exact: with a 0° line between them the pair
// reflects what one shunt element of the summed admittance does; a stub
// that went is named as such first.
func TestParallelStubs(t *testing.T) {
	line := func(deg float64) Section { return Section{Kind: SeriesLine, Z0: 50, LengthDeg: deg} }
	stub := func(end StubEnd, deg float64) Section {
		return Section{Kind: ShuntStub, End: end, Z0: 50, LengthDeg: deg}
	}
	cases := []struct {
		name          string
		secs          []Section
		parallel, dbl bool
	}{
		{"spacing 1e-9°", []Section{line(56.5), stub(Open, 149), line(1e-9), stub(Open, 149)}, true, false},
		{"spacing 0.5° (under 1°)", []Section{line(56.5), stub(Short, 60), line(0.5), stub(Short, 58)}, true, false},
		{"spacing 1.5° stays a double stub", []Section{line(56.5), stub(Short, 60), line(1.5), stub(Short, 58)}, false, true},
		{"a stub gone as well: a single stub, not two in parallel", []Section{line(56.5), stub(Open, 149), line(1e-9), stub(Open, 1e-9)}, false, false},
		{"a double stub", []Section{line(52.6), stub(Open, 139), line(54.7), stub(Open, 199.2)}, false, true},
	}
	for _, c := range cases {
		b := newBandStart(1, c.secs, 0.1)
		if b.parallel != c.parallel || b.double() != c.dbl {
			t.Errorf("%s: in parallel %v, double stub %v; want %v, %v", c.name, b.parallel, b.double(), c.parallel, c.dbl)
		}
	}
	// The pair at 0° reflects as the one shunt element of both
	// admittances: Y = jY0·(tan θ1 + tan θ2) for open stubs (Pozar,
	// Microwave Engineering, 4th ed., eq. 2.44), here folded into one open
	// stub of that susceptance at f0 only, where it is exact.
	secs := []Section{line(56.5), stub(Open, 149), line(0), stub(Open, 140)}
	one := []Section{line(56.5), stub(Open, 180+math.Atan(math.Tan(149*math.Pi/180)+math.Tan(140*math.Pi/180))*180/math.Pi)}
	zl := complex(150, -30)
	if a, b := cascadeWorstDB(secs, zl, 50, 2.44e9, []float64{2.44e9}), cascadeWorstDB(one, zl, 50, 2.44e9, []float64{2.44e9}); math.Abs(a-b) > 1e-9 {
		t.Errorf("two open stubs at one point reflect %.9f dB, the one stub of their admittance %.9f dB", a, b)
	}
}

// solve --band lists no stubs in parallel as a double stub: from solution
// 1 at f0 the band optimisation of 150+j100 Ω, short, 2.4–2.4835 GHz
// shrank the spacing to under 0.001° (−23.7 dB), and that was listed as
// the double stub; now the double stub from solution 2 is listed (−14.6
// dB) with a note naming the stubs in parallel. 150−j30 Ω, open, keeps
// its double stub (solution 1, −51.9 dB), and its stubs in parallel
// (−22.5 dB) are worse and not named.
func TestSolveBandParallelStubsAreNoDoubleStub(t *testing.T) {
	cases := []struct {
		zl       complex128
		end      StubEnd
		wantNote string // "" for none
	}{
		{complex(150, 100), Short, "from the other solution at f0 the band optimisation shrank the spacing to 0.00°, leaving two short stubs in parallel at one point"},
		{complex(150, -30), Open, ""},
	}
	for _, c := range cases {
		res, err := SolveBand(ConstantLoad(c.zl), 50, 2.4e9, 2.4835e9, TopologyDoubleStub, c.end, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		s := res.Solutions[0]
		if s.Err != "" {
			t.Errorf("%v %s: %s", c.zl, s.Name(), s.Err)
			continue
		}
		if parallelStubs(s.Sections) {
			t.Errorf("%v %s: stubs %.3g° apart listed as a double stub: %+v", c.zl, s.Name(), s.Sections[2].LengthDeg, s.Sections)
		}
		if c.wantNote == "" && s.Note != "" || !strings.Contains(s.Note, c.wantNote) {
			t.Errorf("%v %s: note %q, want one with %q", c.zl, s.Name(), s.Note, c.wantNote)
		}
	}
}

// failingLoad is a load whose impedance cannot be had.
type failingLoad struct{ err error }

func (l failingLoad) Impedance(float64) (complex128, error) { return 0, l.err }

// The band solve's errors wrap what went wrong (errors.Is finds it) and
// say where: the load at the band's centre, the double stub at f0 (the
// design's source, the sentinel of SolveDoubleStub), the starts of
// build's choice (the candidate, and whether the feed was kept).
func TestBandSolveErrorsWrap(t *testing.T) {
	errLoad := errors.New("no data")
	d := Design{Name: "solve", Freq: 2.44e9, Z0: 50, Source: "solve"}
	m := DefaultMatch(50)
	c := Candidate{Topology: TopologyDoubleStub, End: Open}
	_, _, errMatched := d.doubleStubSolutions(m, Open, complex(50, 0), ElectricalOptions{})
	_, _, errReactive := d.doubleStubSolutions(m, Open, complex(0, 30), ElectricalOptions{})
	_, errSolve := SolveBand(failingLoad{errLoad}, 50, 2.4e9, 2.4835e9, TopologyDoubleStub, Open, 0, 0)
	fails := func(fail ElectricalOptions) func(ElectricalOptions) ([]bandStart, error) {
		return func(o ElectricalOptions) ([]bandStart, error) {
			if o == fail {
				return nil, errLoad
			}
			return []bandStart{newBandStart(1, []Section{{Kind: SeriesLine, Z0: 50, LengthDeg: 10}, {Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: 40}, {Kind: SeriesLine, Z0: 50, LengthDeg: 50}, {Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: 60}}, 0.01)}, nil
		}
	}
	_, _, _, _, errBare := chooseDoubleStubStart(c, ElectricalOptions{FeedDeg: 26.73}, 41, fails(ElectricalOptions{}))
	_, _, _, _, errFed := chooseDoubleStubStart(c, ElectricalOptions{FeedDeg: 26.73}, 41, fails(ElectricalOptions{FeedDeg: 26.73}))
	cases := []struct {
		name   string
		err    error
		target error
		want   string // the message
	}{
		{"matched load at f0", errMatched, ErrMatched, "solve: load 50+j0 ohm on 50 ohm: the load is already matched (|Γ| = 0), no stub is needed"},
		{"purely reactive load at f0", errReactive, ErrUnmatchable, "solve: load 0+j30 ohm: the load cannot be matched by a single shunt stub: it is purely reactive (|Γ| = 1)"},
		{"the load at the band's centre", errSolve, errLoad, "the load at the band's centre 2.44175 GHz: no data"},
		{"build's starts without the feed", errBare, errLoad, "double-stub (open): no data"},
		{"build's starts with the feed kept", errFed, errLoad, "double-stub (open), with the load-side feed kept: no data"},
	}
	for _, c := range cases {
		if !errors.Is(c.err, c.target) || c.err.Error() != c.want {
			t.Errorf("%s: %v; want %q wrapping %v", c.name, c.err, c.want, c.target)
		}
	}
}

// A band double stub with no start that keeps two stubs, even with the
// feed kept, is built from its solution at f0 with a warning that names
// the single stub: 200+j30 Ω, open, 2.4–2.4835 GHz on fr4-1.6mm with the
// default 5 mm feed (26.73°), where the band optimisation of both starts
// shrinks open stub 2 to 0° (or leaves the stubs in parallel), as
// TestChooseDoubleStubStart's last row does with starts of its own.
func TestBuildBandDoubleStubWarnsWithoutTwoStubs(t *testing.T) {
	d := decodeTestDesign(t, `name = "b"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "200+j30"
[match]
topology = "double-stub"
stub = "open"
band = ["2.4GHz", "2.4835GHz"]
`)
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true, SkipSensitivity: true})
	if err != nil {
		t.Fatal(err)
	}
	warned := false
	for _, w := range r.Warnings {
		warned = warned || strings.HasPrefix(w, "no double stub: from each solution at f0 the band optimisation shrank") && strings.Contains(w, "at f0 all the same")
	}
	if !warned {
		t.Errorf("no warning that no start keeps two stubs among %q", r.Warnings)
	}
}
