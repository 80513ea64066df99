package synth

import (
	"errors"
	"fmt"
	"math"

	"stubcraft/physical/units"
)

// BandSolution is one network of SolveBand: its sections after the band
// optimisation on lossless lines, and how it did.
type BandSolution struct {
	Candidate
	Sections []Section // from the load toward the source, at f0
	// Note says what was done to solve it: for a double stub whose load
	// lies in the forbidden region, the region and the line put before
	// the first stub. Empty when there is nothing to say.
	Note string
}

// BandSolve is the electrical answer to a match across a band, before any
// board: every candidate network optimised on lossless TEM lines, best
// first, and the Bode-Fano limit of the load.
type BandSolve struct {
	Start, Stop, F0 float64 // Hz; F0 is the band's centre
	// BodeFano is the best worst-case |S11| in the band of any lossless
	// network, and the load fit it rests on.
	BodeFano  BodeFanoLimit
	Solutions []BandSolution
}

// SolveBand matches load to z0 across f1…f2 with each network topology
// asks for (one of Topologies; auto tries them all, and a stub topology
// with end 0 tries both ends): it solves each at the band's centre, then
// lets OptimiseIdeal move its lengths (and a transformer's impedances,
// within MinLineZ0…MaxLineZ0) for the worst |S11| at 41 points across the
// band. Candidates that cannot be solved carry their error.
func SolveBand(load Load, z0, f1, f2 float64, topology string, end StubEnd, sections int, resp Response) (BandSolve, error) {
	if !(f1 > 0 && f2 > f1) || math.IsInf(f2, 0) {
		return BandSolve{}, fmt.Errorf("the band %g–%g Hz needs 0 < start < stop", f1, f2)
	}
	f0 := (f1 + f2) / 2
	out := BandSolve{Start: f1, Stop: f2, F0: f0, BodeFano: BodeFanoOf(load, f1, f2, bandSamples)}
	zl, err := load.Impedance(f0)
	if err != nil {
		return BandSolve{}, fmt.Errorf("the load at the band's centre %s: %w", units.FormatFrequency(f0, 6), err)
	}
	m := DefaultMatch(z0)
	m.Topology, m.Band, m.End = topology, [2]float64{f1, f2}, end
	if sections > 0 {
		m.Sections = sections
	}
	if resp != 0 {
		m.Response = resp
	}
	specs := m.candidateSpecs()
	if topology != TopologyAuto && topology != TopologyQuarterWave && end == 0 {
		specs = nil
		for _, e := range []StubEnd{Open, Short} {
			specs = append(specs, Candidate{Topology: topology, End: e, Sections: m.Sections})
		}
	}
	d := Design{Name: "solve", Freq: f0, Z0: z0, Source: "solve"}
	fs := BandSamples(f1, f2, idealBandSamples)
	for _, c := range specs {
		mc := m
		mc.Sections = c.Sections
		if c.Pick > 0 {
			mc.Pick = Pick(c.Pick)
		}
		if c.Topology == TopologyDoubleStub {
			s, err := bandDoubleStub(d, mc, c, zl, load, fs)
			if err != nil {
				return BandSolve{}, err
			}
			out.Solutions = append(out.Solutions, s)
			continue
		}
		secs, _, err := d.matchSections(mc, c.Topology, c.End, zl, ElectricalOptions{})
		if err != nil {
			c.Err = err.Error()
			out.Solutions = append(out.Solutions, BandSolution{Candidate: c})
			continue
		}
		secs, worst, err := OptimiseIdeal(secs, load, z0, f0, fs, c.Topology == TopologyQuarterWave, MinLineZ0, MaxLineZ0)
		if err != nil {
			return BandSolve{}, fmt.Errorf("%s: %w", c.Name(), err)
		}
		out.Solutions = append(out.Solutions, bandSolution(c, secs, worst, ""))
	}
	cs := make([]Candidate, len(out.Solutions))
	for i, s := range out.Solutions {
		cs[i] = s.Candidate
	}
	// Rank by worst |S11|, then total electrical length (no board yet).
	for i := range cs {
		cs[i].AreaM2 = cs[i].TotalDeg
	}
	rankCandidates(cs)
	sorted := make([]BandSolution, 0, len(cs))
	used := make([]bool, len(out.Solutions))
	for _, c := range cs {
		for i, s := range out.Solutions {
			if !used[i] && s.Candidate.Topology == c.Topology && s.End == c.End && s.Pick == c.Pick && s.Candidate.Sections == c.Sections {
				used[i] = true
				sorted = append(sorted, s)
				break
			}
		}
	}
	out.Solutions = sorted
	return out, nil
}

// bandSolution is candidate c with its optimised sections and their worst
// |Γ| in the band.
func bandSolution(c Candidate, secs []Section, worst float64, note string) BandSolution {
	c.WorstS11DB = 20 * math.Log10(worst)
	for _, s := range secs {
		c.TotalDeg += s.LengthDeg
	}
	return BandSolution{Candidate: c, Sections: secs, Note: note}
}

// MinOpenStubDeg is the electrical length at f0 below which an open stub
// of a band solution counts as gone: its susceptance is then below
// tan 1° ≈ 0.017·Y0 near f0, which moves |Γ| of a matched line by less
// than 0.009 (judgement, no source).
const MinOpenStubDeg = 1.0

// singleStubOf returns what a double stub (line, stub, line, stub from the
// load) is when one of its open stubs is shorter than MinOpenStubDeg: the
// line from the load to the stub that is left, and that stub, and which
// stub (1 or 2) went. The line after the last stub is of z0 and leaves
// |S11| as it is, so it goes too. ok is false unless exactly one stub went.
func singleStubOf(secs []Section) (single []Section, gone int, ok bool) {
	if len(secs) != 4 || secs[1].Kind != ShuntStub || secs[3].Kind != ShuntStub {
		return nil, 0, false
	}
	short1 := secs[1].End == Open && secs[1].LengthDeg < MinOpenStubDeg
	short2 := secs[3].End == Open && secs[3].LengthDeg < MinOpenStubDeg
	switch {
	case short1 == short2:
		return nil, 0, false
	case short2:
		return []Section{secs[0], secs[1]}, 2, true
	}
	line := secs[0]
	line.LengthDeg += secs[2].LengthDeg
	return []Section{line, secs[3]}, 1, true
}

// MinStubSpacingDeg is the electrical length at f0 of the line between the
// two stubs of a band solution below which they stand in parallel at one
// point: a line of z0 that short turns the admittance between them by
// under 2° on the chart, so a reader takes the two for one shunt stub of
// their combined admittance, which is no double stub (judgement, no
// source, as MinOpenStubDeg).
const MinStubSpacingDeg = 1.0

// parallelStubs says whether the two stubs of a double stub (line, stub,
// line, stub from the load) are less than MinStubSpacingDeg apart.
func parallelStubs(secs []Section) bool {
	return len(secs) == 4 && secs[1].Kind == ShuntStub && secs[3].Kind == ShuntStub && secs[2].LengthDeg < MinStubSpacingDeg
}

// bandStart is one double stub optimised across the band from one of its
// solutions at f0.
type bandStart struct {
	pick  Pick // the solution at f0 it started from
	secs  []Section
	worst float64 // |Γ| in the band
	// single is what is left when a stub went (singleStubOf); gone names it.
	single []Section
	gone   int
	// parallel: both stubs are there but in parallel at one point
	// (parallelStubs), one stub of their combined admittance.
	parallel bool
}

// newBandStart classifies the sections one start of a double stub reached.
func newBandStart(pick Pick, secs []Section, worst float64) bandStart {
	b := bandStart{pick: pick, secs: secs, worst: worst}
	b.single, b.gone, _ = singleStubOf(secs)
	b.parallel = b.single == nil && parallelStubs(secs)
	return b
}

// double says whether the start kept a double stub: two stubs, apart.
func (b bandStart) double() bool { return b.single == nil && !b.parallel }

// singleText describes the single stub a start ended as: the stub that is
// left, or the two in parallel.
func (b bandStart) singleText() string {
	if b.parallel {
		return fmt.Sprintf("the band optimisation shrank the spacing to %.2f°, leaving two %s stubs in parallel at one point (%.1f° of line, stubs %.1f° and %.1f°), a single stub of their combined admittance, with a worst |S11| of %.2f dB in the band",
			b.secs[2].LengthDeg, b.secs[1].End, b.secs[0].LengthDeg, b.secs[1].LengthDeg, b.secs[3].LengthDeg, 20*math.Log10(b.worst))
	}
	return fmt.Sprintf("the band optimisation shrank stub %d to %.2f°, leaving a single %s stub (%.1f° of line, stub %.1f°) with a worst |S11| of %.2f dB in the band",
		b.gone, b.secs[2*b.gone-1].LengthDeg, b.single[1].End, b.single[0].LengthDeg, b.single[1].LengthDeg, 20*math.Log10(b.worst))
}

// bandDoubleStub optimises double stub c from each of its two solutions at
// f0 and keeps the best one whose two stubs are both there
// (pickDoubleStub), with a note on the forbidden region when the load lies
// in it. A double stub that cannot be solved at f0 is a candidate that
// carries its error; an optimisation that fails is an error.
func bandDoubleStub(d Design, m MatchSpec, c Candidate, zl complex128, load Load, fs []float64) (BandSolution, error) {
	sols, note, err := d.doubleStubSolutions(m, c.End, zl, ElectricalOptions{})
	if err != nil {
		c.Err = err.Error()
		return BandSolution{Candidate: c}, nil
	}
	starts, err := doubleStubStarts(d, sols, load, fs, ElectricalOptions{})
	if err != nil {
		return BandSolution{}, fmt.Errorf("%s: %w", c.Name(), err)
	}
	s, _ := pickDoubleStub(c, starts, note)
	return s, nil
}

// doubleStubSolutions solves double stub m with end at f0 once, as
// Design.matchSections does: with opt.FeedDeg of line before the first
// stub or, when the load lies in the forbidden region there, with the line
// that takes it out, which note then names. Its error names the design's
// source and wraps SolveDoubleStub's.
func (d Design) doubleStubSolutions(m MatchSpec, end StubEnd, zl complex128, opt ElectricalOptions) (sols []DoubleStubSolution, note string, err error) {
	sols, err = SolveDoubleStub(zl, d.Z0, opt.FeedDeg, m.SpacingDeg, end)
	var fe *ForbiddenRegionError
	if errors.As(err, &fe) {
		note = fe.Error() + " (done)"
		sols, err = SolveDoubleStub(zl, d.Z0, fe.FixLineDeg, m.SpacingDeg, end)
	}
	if err != nil {
		return nil, note, fmt.Errorf("%s: %w", d.Source, err)
	}
	return sols, note, nil
}

// doubleStubPick is solution pick (1 or 2) of sols, or the first for any
// other pick or when there is only one.
func doubleStubPick(sols []DoubleStubSolution, pick Pick) DoubleStubSolution {
	if p := int(pick); p >= 1 && p <= len(sols) {
		return sols[p-1]
	}
	return sols[0]
}

// doubleStubStarts optimises a double stub on lossless lines across fs
// from each of its two solutions at f0, sols (doubleStubSolutions with
// opt). The band optimisation keeps lengths positive, so it can shrink an
// open stub to 0° but not carry it on to 180°, and from one of the two
// starts it often does: what is left is a single stub, which is no double
// stub. It can shrink the spacing to 0° too, leaving the two stubs in
// parallel at one point, which is one stub of their combined admittance
// and no double stub either. SolveBand lists the start pickDoubleStub
// keeps; Simulate builds the board from its solution.
//
// The load-side feed (opt.FeedDeg) is part of the first line but cannot
// get shorter, so the optimisation sees the load through it and moves
// only the rest of that line.
func doubleStubStarts(d Design, sols []DoubleStubSolution, load Load, fs []float64, opt ElectricalOptions) ([]bandStart, error) {
	var starts []bandStart
	seen := load
	if opt.FeedDeg > 0 {
		seen = feedLoad{load: load, z0: d.Z0, deg: opt.FeedDeg, f0: d.Freq}
	}
	for _, p := range []Pick{1, 2} {
		secs := doubleStubPick(sols, p).Sections()
		// The rest of the first line starts a hair above 0°: OptimiseIdeal
		// keeps every length positive.
		secs[0].LengthDeg = math.Max(secs[0].LengthDeg-opt.FeedDeg, 1e-3)
		secs, worst, err := OptimiseIdeal(secs, seen, d.Z0, d.Freq, fs, false, MinLineZ0, MaxLineZ0)
		if err != nil {
			return nil, fmt.Errorf("from solution %d at f0: %w", p, err)
		}
		secs[0].LengthDeg += opt.FeedDeg
		starts = append(starts, newBandStart(p, secs, worst))
	}
	return starts, nil
}

// feedLoad is a load seen through a lossless line of z0 and deg degrees
// at f0.
type feedLoad struct {
	load        Load
	z0, deg, f0 float64
}

// Impedance implements Load.
func (l feedLoad) Impedance(f float64) (complex128, error) {
	z, err := l.load.Impedance(f)
	if err != nil {
		return 0, err
	}
	return SectionsInput([]Section{{Kind: SeriesLine, Z0: l.z0, LengthDeg: l.deg * f / l.f0}}, z), nil
}

// pickDoubleStub makes candidate c of the best start that kept a double
// stub (two stubs, apart), with note, and says which solution at f0 it
// started from; when none did, c carries the best single stub (one left,
// or two in parallel) in Err and the solution is that single stub's. When
// a single stub did better than the double stub kept, the note says so.
func pickDoubleStub(c Candidate, starts []bandStart, note string) (BandSolution, Pick) {
	var double, single *bandStart
	for i := range starts {
		b := &starts[i]
		switch {
		case b.double() && (double == nil || b.worst < double.worst):
			double = b
		case !b.double() && (single == nil || b.worst < single.worst):
			single = b
		}
	}
	if double == nil {
		c.Err = "no double stub: from each solution at f0 " + single.singleText()
		return BandSolution{Candidate: c, Note: note}, single.pick
	}
	if single != nil && 20*math.Log10(single.worst) < 20*math.Log10(double.worst)-candidateTieDB {
		note = joinNotes(note, "from the other solution at f0 "+single.singleText()+", better than this double stub")
	}
	return bandSolution(c, double.secs, double.worst, note), double.pick
}

// idealBandSamples is the number of frequencies across the band at which
// the band optimisation on lossless lines evaluates |S11|.
const idealBandSamples = 41

// bandDoubleStubStart chooses where Simulate starts a band-matched double
// stub: the start SolveBand lists (doubleStubStarts, pickDoubleStub) at
// the lengths its band optimisation on lossless lines left, or, when that
// one's first line is shorter than the load-side feed (opt.FeedDeg) or no
// start kept both stubs, the same choice made again with the feed kept. The
// board's own band optimisation moves each length by at most MaxBandMove,
// often too little to reach them from the solution at f0 (100−j50 Ω on
// 2.4–2.4835 GHz: a spacing 135° → 26°), and from there it kept a stub of
// 0.1 mm. secs is nil, and the board starts from solution pick at f0, when
// no start kept both stubs (a warning names the single stub).
func bandDoubleStubStart(d Design, m MatchSpec, c Candidate, zl complex128, load Load, opt ElectricalOptions) (pick Pick, secs []Section, notes, warnings []string, err error) {
	fs := BandSamples(m.Band[0], m.Band[1], idealBandSamples)
	starts := func(o ElectricalOptions) ([]bandStart, error) {
		sols, _, err := d.doubleStubSolutions(m, c.End, zl, o)
		if err != nil {
			return nil, err
		}
		return doubleStubStarts(d, sols, load, fs, o)
	}
	return chooseDoubleStubStart(c, opt, len(fs), starts)
}

// chooseDoubleStubStart is bandDoubleStubStart's choice among the starts
// that starts gives (doubleStubStarts over nFreqs frequencies): first
// without the feed, as solve --band lists them, then, when needed, with
// opt's feed kept; with the notes and warnings that say which.
func chooseDoubleStubStart(c Candidate, opt ElectricalOptions, nFreqs int, starts func(ElectricalOptions) ([]bandStart, error)) (pick Pick, secs []Section, notes, warnings []string, err error) {
	bs, err := starts(ElectricalOptions{})
	if err != nil {
		return 0, nil, nil, nil, fmt.Errorf("%s: %w", c.Name(), err)
	}
	s, p := pickDoubleStub(c, bs, "")
	what := "as solve --band lists it"
	if opt.FeedDeg > 0 && (s.Err != "" || s.Sections[0].LengthDeg < opt.FeedDeg) {
		// solve --band's double stub has no room for the feed, or none:
		// optimise again with the feed kept.
		if bs, err = starts(opt); err != nil {
			return 0, nil, nil, nil, fmt.Errorf("%s, with the load-side feed kept: %w", c.Name(), err)
		}
		s, p = pickDoubleStub(c, bs, "")
		what = fmt.Sprintf("with the load-side feed (%.2f°) kept in its first line", opt.FeedDeg)
	}
	if s.Err != "" {
		return p, nil, nil, []string{fmt.Sprintf("%s; built from solution %d at f0 all the same: the band optimisation of the board may shorten that stub to nothing too", s.Err, p)}, nil
	}
	notes = []string{fmt.Sprintf("double stub: solution %d at f0, the start whose band optimisation on lossless lines (%s) keeps both stubs with the lower worst |S11| (%.2f dB over %d frequencies); the board starts from those lengths: %.2f° of line, stub %.2f°, %.2f° spacing, stub %.2f°",
		p, what, s.WorstS11DB, nFreqs, s.Sections[0].LengthDeg, s.Sections[1].LengthDeg, s.Sections[2].LengthDeg, s.Sections[3].LengthDeg)}
	if s.Note != "" {
		notes = append(notes, s.Note)
	}
	return p, s.Sections, notes, nil, nil
}

// joinNotes joins two notes, either of which may be empty.
func joinNotes(a, b string) string {
	if a == "" || b == "" {
		return a + b
	}
	return a + "; " + b
}
