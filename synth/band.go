package synth

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/optimize"

	"stubcraft/physical"
)

// BandMatch is the outcome of a match across a band.
type BandMatch struct {
	Start, Stop float64 // Hz
	GoalDB      float64 // the worst |S11| asked for, dB; 0 when none
	// WorstS11DB is the worst |S11| of the drawn layout over the sweep
	// points inside the band (the band edges are sweep points).
	WorstS11DB float64
	// BodeFano is the best worst-case |S11| any lossless network can hold
	// over the band with the fitted load model, and the fit it rests on.
	BodeFano  BodeFanoLimit
	Topology  string // the topology built (the one auto chose)
	Objective string
	// Candidates lists every network tried by topology auto, best first;
	// the built one is the first.
	Candidates []Candidate
}

// Candidate is one network tried by topology auto, and how it did.
type Candidate struct {
	Topology   string
	End        StubEnd // stub topologies
	Pick       int     // shunt stub: solution 1 or 2
	Sections   int     // quarter wave
	WorstS11DB float64 // in the band (at f0 alone without a band), dB
	// AreaM2 is the drawn board's area, the bounding box of its outline
	// (m²); zero for a single topology, which is not ranked.
	AreaM2   float64
	LossDB   float64 // the network's own dissipation at f0, dB
	TotalDeg float64 // electrical length of every section added, degrees at f0
	Err      string  // why it could not be built; the other fields are then zero
}

// Name describes the candidate in a line.
func (c Candidate) Name() string {
	switch c.Topology {
	case TopologyShuntStub:
		if c.Pick == 0 {
			return fmt.Sprintf("%s (%s)", c.Topology, c.End)
		}
		return fmt.Sprintf("%s (%s, solution %d)", c.Topology, c.End, c.Pick)
	case TopologyDoubleStub:
		return fmt.Sprintf("%s (%s)", c.Topology, c.End)
	case TopologyQuarterWave:
		return fmt.Sprintf("%s (%d section%s)", c.Topology, c.Sections, map[bool]string{true: "s"}[c.Sections > 1])
	}
	return c.Topology
}

// candidateTieDB is the difference in worst |S11| below which two
// candidates count as equal and board area decides (common practice, no
// source: below what a bench measurement resolves).
const candidateTieDB = 0.01

// rankCandidates sorts built candidates by worst |S11|, then area (the
// drawn board's, or for SolveBand the total electrical length), then loss;
// failed ones go last.
func rankCandidates(cs []Candidate) {
	sort.SliceStable(cs, func(i, j int) bool {
		a, b := cs[i], cs[j]
		if (a.Err == "") != (b.Err == "") {
			return a.Err == ""
		}
		if math.Abs(a.WorstS11DB-b.WorstS11DB) > candidateTieDB {
			return a.WorstS11DB < b.WorstS11DB
		}
		if a.AreaM2 != b.AreaM2 {
			return a.AreaM2 < b.AreaM2
		}
		return a.LossDB < b.LossDB
	})
}

// candidateSpecs returns the networks a [match] table asks to be tried:
// one, or every one for topology auto.
func (m MatchSpec) candidateSpecs() []Candidate {
	if m.Topology != TopologyAuto {
		c := Candidate{Topology: m.Topology, End: m.End, Sections: m.Sections}
		if m.Topology == TopologyQuarterWave {
			c.End = 0
		}
		return []Candidate{c}
	}
	var cs []Candidate
	for _, end := range []StubEnd{Open, Short} {
		for _, p := range []int{1, 2} {
			cs = append(cs, Candidate{Topology: TopologyShuntStub, End: end, Pick: p})
		}
	}
	for _, end := range []StubEnd{Open, Short} {
		cs = append(cs, Candidate{Topology: TopologyDoubleStub, End: end})
	}
	for n := 1; n <= MaxTransformerSections; n++ {
		cs = append(cs, Candidate{Topology: TopologyQuarterWave, Sections: n})
	}
	return cs
}

// bandSamples is the number of frequencies across the band at which the
// band optimisation evaluates |S11| (common practice, no source: enough to
// see the ripple of a four-section transformer).
const bandSamples = 13

// yieldSamples is the number of boards the yield objective draws.
const yieldSamples = 16

// bandOptimise adjusts the drawn lengths of every line and stub (and, when
// widths is true, the widths of the transformer sections, within the fab
// minimum and the printable impedances) with Nelder-Mead (gonum/optimize)
// so that the worst |S11| across the band on the full model is least, or,
// for the yield objective, its 90th percentile over boards drawn within
// the tolerance spreads. It records the changes as the element's
// re-centring and returns the simulation of the layout it keeps.
func (r *Result) bandOptimise(ctx context.Context, mk, tmk physical.LineMaker, load Load, widths bool) (*physical.Sim, error) {
	d := r.Design
	m := d.Match.Resolved()
	f0, z0 := d.Freq, d.Z0
	ph := &r.Physical
	fs := BandSamples(m.Band[0], m.Band[1], bandSamples)
	zls := make([]complex128, len(fs))
	for i, f := range fs {
		z, err := load.Impedance(f)
		if err != nil {
			return nil, d.KeyError(loadKey(d), fmt.Errorf("the load at %.6g GHz, in the band: %w", f/1e9, err))
		}
		zls[i] = z
	}
	zl0, _ := load.Impedance(f0)
	var lenIdx, widIdx []int
	for i, e := range ph.Elements {
		if e.Role != RoleFeed {
			lenIdx = append(lenIdx, i)
		}
		if widths && e.Role == RoleLine && e.Z0 != z0 {
			widIdx = append(widIdx, i)
		}
	}
	start := make([]float64, len(ph.Elements))
	startW := make([]float64, len(ph.Elements))
	for i, e := range ph.Elements {
		start[i], startW[i] = e.Drawn(), e.Width
	}
	lg := ph.Elements[lenIdx[0]].Params.GuidedWavelength()
	minLen := ph.minLengths()
	base, err := physical.NewSim(ph.Board, mk)
	if err != nil {
		return nil, err
	}
	r.Recentre.Before = base.InputReflection(f0, zl0, z0)
	through := ph.ThroughIndex()
	// boardFor is the layout moved by x: lengths in guided wavelengths,
	// then widths as logarithms of their ratio to the start.
	boardFor := func(x []float64) (physical.Board, bool) {
		b := ph.Board
		b.Through = append([]physical.Trace(nil), b.Through...)
		b.Stubs = append([]physical.Stub(nil), b.Stubs...)
		lens := append([]float64(nil), start...)
		ws := append([]float64(nil), startW...)
		for k, i := range lenIdx {
			if math.Abs(x[k]) > MaxBandMove {
				return b, false
			}
			lens[i] = start[i] + x[k]*lg
			if lens[i] < minLen[i] {
				return b, false
			}
		}
		for k, i := range widIdx {
			v := x[len(lenIdx)+k]
			if math.Abs(v) > math.Log(2) {
				return b, false
			}
			ws[i] = startW[i] * math.Exp(v)
			if ws[i] < d.Fab.MinWidth {
				return b, false
			}
			// The load-side feed is cut from the first line: same width.
			if len(through) > 1 && i == through[1] && ph.Elements[through[0]].Role == RoleFeed && startW[through[0]] == startW[i] {
				ws[through[0]] = ws[i]
			}
		}
		ns := 0
		for i, e := range ph.Elements {
			if e.Role == RoleStub {
				b.Stubs[ns].Length, b.Stubs[ns].Width = lens[i], ws[i]
				ns++
			}
		}
		for k, i := range through {
			b.Through[k].Length, b.Through[k].Width = lens[i], ws[i]
		}
		return b, true
	}
	simFor := func(x []float64) (*physical.Sim, bool) {
		b, ok := boardFor(x)
		if !ok {
			return nil, false
		}
		if len(widIdx) == 0 {
			var tl, sl []float64
			for _, t := range b.Through {
				tl = append(tl, t.Length)
			}
			for _, s := range b.Stubs {
				sl = append(sl, s.Length)
			}
			sim, err := base.Relength(tl, sl)
			return sim, err == nil
		}
		sim, err := physical.NewSim(b, mk)
		if err != nil {
			return nil, false
		}
		for _, i := range widIdx {
			z, _ := sim.ThroughModel(indexOf(through, i)).Static()
			if z < MinLineZ0 || z > MaxLineZ0 {
				return nil, false
			}
		}
		return sim, true
	}
	worst := func(sim *physical.Sim) float64 {
		w := 0.0
		for i, f := range fs {
			w = math.Max(w, cmplx.Abs(sim.InputReflection(f, zls[i], z0)))
		}
		return w
	}
	worstObjective := func(x []float64) float64 {
		sim, ok := simFor(x)
		if !ok {
			return 10
		}
		return worst(sim)
	}
	yieldObjective := func(x []float64) float64 {
		b, ok := boardFor(x)
		if !ok {
			return 10
		}
		if _, ok := simFor(x); !ok {
			return 10
		}
		ws := make([]float64, yieldSamples)
		for i := range ws {
			q := perturbBoard(b, b.Sub, d.Tolerance, i)
			sim, err := physical.NewSim(q, tmk)
			if err != nil {
				return 10
			}
			ws[i] = worst(sim)
		}
		sort.Float64s(ws)
		return quantile(ws, 0.9)
	}
	total := 0
	// minimise runs Nelder-Mead from x0 and returns the best point seen,
	// x0 included. Nelder-Mead stalls on a minimax objective; restarting
	// from its own optimum with a fresh, smaller simplex lets it go on.
	minimise := func(objective func([]float64) float64, x0 []float64, evals int) ([]float64, float64, error) {
		bestX, bestF := x0, objective(x0)
		for round, size := 0, 0.02; round < 3; round, size = round+1, size/2 {
			if err := ctx.Err(); err != nil {
				return nil, 0, fmt.Errorf("band optimisation: %w", err)
			}
			res, err := optimize.Minimize(optimize.Problem{Func: objective}, bestX,
				&optimize.Settings{FuncEvaluations: evals / 3, Converger: &optimize.FunctionConverge{Absolute: 1e-7, Iterations: 100}},
				&optimize.NelderMead{SimplexSize: size})
			if res == nil {
				return nil, 0, fmt.Errorf("band optimisation: %w", err)
			}
			total += res.FuncEvaluations
			if res.F < bestF {
				bestF, bestX = res.F, res.X
			}
		}
		return bestX, bestF, nil
	}
	x0 := make([]float64, len(lenIdx)+len(widIdx))
	startF := worstObjective(x0)
	bestX, bestF, err := minimise(worstObjective, x0, 1500)
	if err != nil {
		return nil, err
	}
	if m.Objective == ObjectiveYield {
		// The yield run starts from the worst-case optimum, not from the
		// f0 solution: from there its 90th percentile over a few boards,
		// a rough objective, stalled (on a double stub 5 dB above the
		// worst-case optimum's own 90th percentile). The f0 solution
		// stays a candidate.
		startF = yieldObjective(x0)
		var yf float64
		if bestX, yf, err = minimise(yieldObjective, bestX, 600); err != nil {
			return nil, err
		}
		bestF = yf
		if startF < bestF {
			bestX, bestF = x0, startF
		}
	}
	r.Recentre.Evaluations = total
	b, _ := boardFor(bestX)
	sim, err := physical.NewSim(b, mk)
	if err != nil {
		return nil, err
	}
	for k, i := range lenIdx {
		e := &ph.Elements[i]
		e.Recentre = bestX[k] * lg
		r.Recentre.IDs = append(r.Recentre.IDs, e.ID)
		r.Recentre.Changes = append(r.Recentre.Changes, e.Recentre)
	}
	for _, i := range through {
		e := &ph.Elements[i]
		if w := b.Through[indexOf(through, i)].Width; w != e.Width {
			old, oldW := e.Z0, e.Width
			e.Width = w
			model, err := mk(w, b.Sub)
			if err != nil {
				return nil, err
			}
			e.Params = model.At(f0)
			e.Z0 = e.Params.Z0
			r.Notes = append(r.Notes, fmt.Sprintf("band optimisation: %s %.4f mm wide, was %.4f mm (%.4g ohm at f0, was %.4g ohm)", e.ID, w*1e3, oldW*1e3, e.Z0, old))
		}
	}
	ph.Board = b
	r.Recentre.After = sim.InputReflection(f0, zl0, z0)
	what := "worst |S11| across the band"
	if m.Objective == ObjectiveYield {
		what = "90th percentile of the worst |S11| across the band over the tolerance spreads"
	}
	r.Notes = append(r.Notes, fmt.Sprintf("band optimisation (Nelder-Mead, %d evaluations at %d frequencies, full model): %s %.2f dB → %.2f dB",
		total, len(fs), what, 20*math.Log10(startF), 20*math.Log10(bestF)))
	return sim, nil
}

// MaxBandMove bounds each length change of the band optimisation, in
// guided wavelengths: enough to reshape the response, not to jump to
// another solution.
const MaxBandMove = 0.25

func indexOf(xs []int, v int) int {
	for k, x := range xs {
		if x == v {
			return k
		}
	}
	return -1
}

// bandResult fills r.Band from the sweep: the worst |S11| over the sweep
// points inside the band, the load fit and its Bode-Fano limit, and the
// warnings on the goal.
func (r *Result) bandResult(load Load, topology string) {
	m := r.Design.Match.Resolved()
	b := &BandMatch{Start: m.Band[0], Stop: m.Band[1], GoalDB: m.GoalDB, Topology: topology, Objective: m.Objective}
	b.WorstS11DB = math.Inf(-1)
	for i, f := range r.Sweep.Freqs {
		if f >= b.Start && f <= b.Stop {
			b.WorstS11DB = math.Max(b.WorstS11DB, physical.MagDB(r.Sweep.S11[i]))
		}
	}
	bf := BodeFanoOf(load, b.Start, b.Stop, bandSamples)
	b.BodeFano = bf
	r.Notes = append(r.Notes, fmt.Sprintf("the load across %.6g–%.6g GHz fits %s; Bode-Fano limit (Fano 1950) for a lossless network: %s",
		b.Start/1e9, b.Stop/1e9, bf.FitText(), bf))
	if b.GoalDB != 0 && bf.Beyond(b.GoalDB) {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the goal %.1f dB across the band lies beyond the Bode-Fano limit (%s) of the fitted load: no lossless network can meet it", b.GoalDB, bf.Figure()))
	}
	if b.GoalDB != 0 && b.WorstS11DB > b.GoalDB {
		r.Warnings = append(r.Warnings, fmt.Sprintf("the goal is not met: the worst |S11| across %.6g–%.6g GHz is %.2f dB, the goal %.1f dB", b.Start/1e9, b.Stop/1e9, b.WorstS11DB, b.GoalDB))
	}
	r.Band = b
}

// checkLoadCoversBand refuses a Touchstone load whose data does not cover
// the band, naming both ranges.
func checkLoadCoversBand(d Design, load Load) error {
	t, ok := load.(TouchstoneLoad)
	if !ok || d.Match == nil || !d.Match.HasBand() || len(t.File.Freqs) == 0 {
		return nil
	}
	lo, hi := t.File.Freqs[0], t.File.Freqs[len(t.File.Freqs)-1]
	b := d.Match.Band
	if b[0] < lo || b[1] > hi {
		return d.KeyError("match.band", fmt.Errorf("the band %.6g–%.6g GHz is not covered by the load's data in %s, which spans %.6g–%.6g GHz", b[0]/1e9, b[1]/1e9, t.Path, lo/1e9, hi/1e9))
	}
	return nil
}
