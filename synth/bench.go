package synth

import (
	"context"
	"fmt"

	"stubcraft/synth/tune"
)

// BenchModel returns the drawn board as a tune.Model: what the bench loop
// (sensitivities, the fit of a measured S11, trims) works on. Its line
// maker is the tolerance analysis's, so perturbed boards cost no new field
// solves.
func (r *Result) BenchModel() tune.Model {
	m := tune.Model{
		Board: r.Physical.Board,
		Lines: r.benchLines,
		Load:  r.load.Impedance,
		Z0:    r.Design.Z0,
		F0:    r.Design.Freq,
	}
	for _, e := range r.Physical.Elements {
		if e.Role == RoleStub {
			m.StubIDs = append(m.StubIDs, e.ID)
		} else {
			m.ThroughIDs = append(m.ThroughIDs, e.ID)
		}
	}
	return m
}

// SweepBand returns the first and last frequency of the build's sweep, Hz.
func (r *Result) SweepBand() (lo, hi float64) {
	f := r.Sweep.Freqs
	if len(f) == 0 {
		return r.Design.Freq, r.Design.Freq
	}
	return f[0], f[len(f)-1]
}

// sensitivities fills r.Sensitivity; a layout whose best match lies outside
// the sweep has none, with a note.
func (r *Result) sensitivities(ctx context.Context) error {
	lo, hi := r.SweepBand()
	s, err := r.BenchModel().Sensitivities(ctx, lo, hi)
	if err != nil {
		if ctx.Err() != nil {
			return fmt.Errorf("sensitivities: %w", ctx.Err())
		}
		r.Notes = append(r.Notes, fmt.Sprintf("no sensitivities: %v", err))
		return nil
	}
	r.Sensitivity = s
	return nil
}
