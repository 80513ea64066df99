package synth

import (
	"errors"
	"fmt"
	"math"
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
		return BandSolve{}, err
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
	fs := BandSamples(f1, f2, 41)
	for _, c := range specs {
		mc := m
		mc.Sections = c.Sections
		if c.Pick > 0 {
			mc.Pick = Pick(c.Pick)
		}
		secs, _, err := d.matchSections(mc, c.Topology, c.End, zl, ElectricalOptions{})
		if err != nil {
			c.Err = err.Error()
			out.Solutions = append(out.Solutions, BandSolution{Candidate: c})
			continue
		}
		var note string
		var fe *ForbiddenRegionError
		if c.Topology == TopologyDoubleStub {
			if _, err := SolveDoubleStub(zl, z0, 0, mc.SpacingDeg, c.End); errors.As(err, &fe) {
				note = fe.Error() + " (done)"
			}
		}
		secs, worst, err := OptimiseIdeal(secs, load, z0, f0, fs, c.Topology == TopologyQuarterWave, MinLineZ0, MaxLineZ0)
		if err != nil {
			return BandSolve{}, err
		}
		c.WorstS11DB = 20 * math.Log10(worst)
		for _, s := range secs {
			c.TotalDeg += s.LengthDeg
		}
		out.Solutions = append(out.Solutions, BandSolution{Candidate: c, Sections: secs, Note: note})
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
