package synth

import (
	"context"
	"errors"
	"fmt"
	"math/cmplx"

	"stubcraft/physical"
	"stubcraft/synth/geom"
	"stubcraft/synth/tune"
)

// BenchModel returns the etched board as a tune.Model (open stubs with their
// trim allowance): what the bench loop
// (sensitivities, the fit of a measured S11, trims) works on. Its line
// maker is the tolerance analysis's, so perturbed boards cost no new field
// solves.
func (r *Result) BenchModel() tune.Model {
	m := r.designModel()
	// The etched board's open stubs carry the trim allowance.
	m.Board.Stubs = append([]physical.Stub(nil), m.Board.Stubs...)
	for k := range m.Board.Stubs {
		if !m.Board.Stubs[k].Short {
			m.Board.Stubs[k].Length += r.Design.Layout.Trim
		}
	}
	return m
}

// designModel is BenchModel at the design lengths (no trim allowance):
// what the sensitivities describe.
func (r *Result) designModel() tune.Model {
	m := tune.Model{
		Board: r.Physical.Board,
		Lines: r.benchLines,
		Load:  r.load.Impedance,
		Z0:    r.Design.Z0,
		F0:    r.Design.Freq,
	}
	if r.Band != nil {
		m.Band = [2]float64{r.Band.Start, r.Band.Stop}
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
	s, err := r.designModel().Sensitivities(ctx, lo, hi)
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

// TuneOptions choose what Tune fits.
type TuneOptions struct {
	// FitLoad also fits a real scale of the load impedance.
	FitLoad bool
}

// TuneResult is the bench loop's answer for one measured board.
type TuneResult struct {
	Fit tune.FitResult
	// MeasuredBestMatch is the frequency of the least measured |S11|, Hz.
	MeasuredBestMatch float64
	Trims             tune.TrimResult
}

// Tune fits the board state (εr, etch, optionally the load) that explains
// a measured S11 of this build's etched board, and finds the cuts of its
// open stubs that bring the best match back to f0. A measurement that
// misses f0 is a *tune.CoverageError, one no board state explains a
// *tune.ResidualError; neither gives trims.
func (r *Result) Tune(ctx context.Context, meas tune.Measurement, opt TuneOptions) (*TuneResult, error) {
	m := r.BenchModel()
	fit, err := m.Fit(ctx, meas, tune.FitOptions{FitLoad: opt.FitLoad})
	if err != nil {
		return nil, err
	}
	out := &TuneResult{Fit: fit}
	best := 0
	for i, g := range meas.S11 {
		if cmplx.Abs(g) < cmplx.Abs(meas.S11[best]) {
			best = i
		}
	}
	out.MeasuredBestMatch = meas.Freqs[best]
	lo, hi := meas.Freqs[0], meas.Freqs[len(meas.Freqs)-1]
	out.Trims, err = m.Trims(ctx, fit.State, lo, hi)
	if err != nil && !errors.Is(err, tune.ErrNoSolution) {
		return nil, err
	}
	if err != nil {
		out.Trims.Notes = append(out.Trims.Notes, err.Error())
	}
	return out, nil
}

// Trimmed returns a copy of the build with its open stubs cut as trims
// say (cuts from the etched end, trim allowance included), its geometry
// laid out again without trim ticks: the drawing of the trimmed board.
func (r *Result) Trimmed(trims []tune.Trim) (*Result, error) {
	q := *r
	q.Physical.Elements = append([]Element(nil), r.Physical.Elements...)
	q.Notes = append([]string(nil), r.Notes...)
	allowance := r.Design.Layout.Trim
	q.Design.Layout.Trim = 0
	for i := range q.Physical.Elements {
		if e := &q.Physical.Elements[i]; e.Role == RoleStub && e.End == Open {
			e.Trim += allowance
		}
	}
	for _, t := range trims {
		found := false
		for i := range q.Physical.Elements {
			e := &q.Physical.Elements[i]
			if e.ID != t.ID || e.Role != RoleStub {
				continue
			}
			found = true
			if e.Drawn()-t.Cut <= 0 {
				return nil, fmt.Errorf("trim of %s: cutting %.3f mm leaves nothing of its %.3f mm", t.ID, t.Cut*1e3, e.Drawn()*1e3)
			}
			e.Trim -= t.Cut
			q.Notes = append(q.Notes, fmt.Sprintf("%s cut by %.3f mm from its etched end at the bench (trim_mm is the change from the design length)", t.ID, t.Cut*1e3))
		}
		if !found {
			return nil, fmt.Errorf("trim of %s: no such stub", t.ID)
		}
	}
	q.Physical.Board = q.Physical.board(r.Physical.Board.Sub, r.Physical.Board.Via)
	lay, err := geom.Build(q.GeomSpec())
	if err != nil {
		return nil, fmt.Errorf("trimmed layout: %w", err)
	}
	q.Layout = lay
	return &q, nil
}
