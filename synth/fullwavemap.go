package synth

import (
	"errors"
	"fmt"
	"sort"
	"strings"
)

// FullwaveMapping maps the circuit model onto a full-wave solve of the
// drawn copper (build --fullwave-centre; fitted by synth/fullwave.FitMap),
// with an input and an output mapping (space mapping, J. W. Bandler et
// al., IEEE Trans. MTT 52(1), 2004, from memory).
type FullwaveMapping struct {
	// Offsets holds, per element ID, the length added to that element in
	// the circuit model but not to its copper, m (Element.FullwaveMap).
	Offsets map[string]float64
	// Residual is the full-wave S11 at f0 (with the load) less the mapped
	// model's, of the layout last solved. The re-centring aims the mapped
	// model at its target less Residual, so that the full-wave S11 lands
	// on the target.
	Residual complex128
}

// ErrFullwaveMapBand refuses a full-wave mapping on a band match: its
// lengths are optimised for the worst |S11| across the band, so there is no
// single best match to bring to f0.
var ErrFullwaveMapBand = errors.New("full-wave centring brings the best match to f0; a band match is optimised for the worst |S11| across the band instead, so it is not centred (build it without --fullwave-centre, and check it with verify)")

// applyFullwaveMap sets each element's FullwaveMap from m (element ID →
// m) and redraws the model board. An ID that names no element is an
// error, so that a mapping fitted on another network is not taken for this
// one.
func (p *Physical) applyFullwaveMap(m map[string]float64) error {
	seen := map[string]bool{}
	for i := range p.Elements {
		e := &p.Elements[i]
		if v, ok := m[e.ID]; ok {
			e.FullwaveMap = v
			seen[e.ID] = true
		}
	}
	var unknown []string
	for id := range m {
		if !seen[id] {
			unknown = append(unknown, id)
		}
	}
	if len(unknown) > 0 {
		sort.Strings(unknown)
		return fmt.Errorf("full-wave mapping: no element %s in this network", strings.Join(unknown, ", "))
	}
	p.Board = p.board(p.Board.Sub, p.Board.Via)
	return nil
}

// ModelNetwork returns the circuit model's two-port S-matrix of r's
// network (port 1 the source side, port 2 the load port, referred to the
// design's z0) at freqs, with each element's model length moved by
// extra[i] (m, in Elements order; nil for none). It uses the line models
// the build swept with, so with extra nil it reproduces r.Sweep.Network.
// It needs a result of Simulate or Build.
func (r *Result) ModelNetwork(extra []float64, freqs []float64) ([][2][2]complex128, error) {
	if r.sim == nil {
		return nil, fmt.Errorf("model network: the result holds no simulation")
	}
	if extra != nil && len(extra) != len(r.Physical.Elements) {
		return nil, fmt.Errorf("model network: %d length changes for %d elements", len(extra), len(r.Physical.Elements))
	}
	sim := r.sim
	if extra != nil {
		var through, stubs []float64
		for i, e := range r.Physical.Elements {
			l := e.ModelLength() + extra[i]
			if e.Role == RoleStub {
				stubs = append(stubs, l)
			} else {
				through = append(through, l)
			}
		}
		var err error
		if sim, err = r.sim.Relength(through, stubs); err != nil {
			return nil, fmt.Errorf("model network: %w", err)
		}
	}
	z0 := r.Design.Z0
	out := make([][2][2]complex128, len(freqs))
	for i, a := range sim.ABCDSweep(freqs, nil) {
		out[i] = a.S(z0)
	}
	return out, nil
}

// LoadImpedance returns the load's impedance at freq, ohm.
func (r *Result) LoadImpedance(freq float64) (complex128, error) {
	if r.load == nil {
		return 0, fmt.Errorf("the result holds no load")
	}
	return r.load.Impedance(freq)
}

// FullwaveCentring is the record of build --fullwave-centre: each
// full-wave run of a drawn layout, the mapping of the circuit model fitted
// after it, and whether the full-wave best match came within Tolerance of
// f0.
type FullwaveCentring struct {
	Mesh      string  // the full-wave mesh level
	Tolerance float64 // the allowed |best match / f0 − 1|
	MaxRuns   int     // the most full-wave runs allowed
	Converged bool    // a run's best match lay within Tolerance of f0
	Kept      int     // index into Runs of the layout drawn
	Runs      []FullwaveRun
}

// FullwaveRun is one full-wave solve of the centring.
type FullwaveRun struct {
	// Map is the mapping the layout was drawn with (nil for none); Drawn
	// the drawn lengths it gave, m, by element ID.
	Map   *FullwaveMapping
	Drawn map[string]float64
	// The full-wave figures of the drawn layout (with the load attached).
	BestMatchHz float64
	S11DBF0     float64
	// The mapped circuit model's figures of the same layout.
	CircuitBestMatchHz float64
	CircuitS11DBF0     float64
	MaxSDifference     float64 // the largest |S_fullwave − S_circuit| of the network over the sweep
	// FitRMSBefore and FitRMSAfter are the RMS |S_fullwave − S_circuit|
	// of the network over the fit's frequencies before and after fitting
	// the next mapping; NextMap is that mapping. All zero or nil when no
	// fit followed the run.
	FitRMSBefore, FitRMSAfter float64
	NextMap                   *FullwaveMapping
	Cells, Steps              int
	Seconds                   float64
}

// Offset returns the run's full-wave best match relative to f0: best/f0 − 1.
func (r FullwaveRun) Offset(f0 float64) float64 { return r.BestMatchHz/f0 - 1 }
