package fullwave

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"gonum.org/v1/gonum/optimize"

	"stubcraft/physical"
	"stubcraft/physical/fdtd"
	"stubcraft/synth"
)

// DefaultCentreRuns is the most full-wave runs Centre makes (issue 11:
// "up to three").
const DefaultCentreRuns = 3

// DefaultCentreTolerance is how near f0 the full-wave best match must come
// for Centre to stop: 0.3 % (issue 11).
const DefaultCentreTolerance = 0.003

// fitWindow is the span, each side of f0, of the frequencies at which the
// mapping is fitted (common practice, no source: wide enough that the
// phase slope pins each length down, narrow enough that a constant length
// offset can stand for a discontinuity's frequency-dependent error near
// f0). A sweep with fewer than fitMinPoints points in it is fitted whole.
const (
	fitWindow    = 0.1
	fitMinPoints = 5
	fitMaxPoints = 41
)

// CentreOptions steer Centre. The zero value solves on the coarse mesh
// with up to three runs and a 0.3 % tolerance.
type CentreOptions struct {
	// Solve are the options of each full-wave solve (mesh, memory limit);
	// its Progress is replaced by Progress below.
	Solve fdtd.Options
	// Mesh names Solve.Mesh for the record ("coarse", "normal", "fine").
	Mesh string
	// MaxRuns is the most full-wave runs; 0 means DefaultCentreRuns.
	MaxRuns int
	// Tolerance is the allowed |best match / f0 − 1|; 0 means
	// DefaultCentreTolerance.
	Tolerance float64
	// Progress, when set, is called from the solving goroutine with the
	// centring run and the solve's own progress.
	Progress func(CentreProgress)
	// Solver replaces the full-wave solve of a drawn layout (nil: Verify
	// with Solve). Tests give it a model whose truth they know.
	Solver func(ctx context.Context, res *synth.Result) (*Report, error)
}

// CentreProgress is the progress of one full-wave run of the centring.
type CentreProgress struct {
	Run, MaxRuns int // the centring run (1-based) and the most there may be
	fdtd.Progress
}

// Centring is what Centre returns: the build drawn with the kept mapping
// (its FullwaveCentre field is the record, its notes and warnings say what
// happened) and the full-wave check of that layout.
type Centring struct {
	Result *synth.Result
	Report *Report
}

// Centre builds in and re-centres its drawn lengths on full-wave solves,
// mapped onto the circuit model (input space mapping: J. W. Bandler et
// al., "Space mapping technique for electromagnetic optimization", IEEE
// Trans. MTT 42(12), 1994). Each round solves the drawn copper full-wave;
// if its best match is not within the tolerance of f0, it fits to the
// full-wave two-port a length offset per line and stub (and the
// source-side feed) that the circuit model then carries
// (synth.BuildInput.FullwaveMap), and builds again: the circuit optimiser
// re-centres the drawn lengths in the mapped model, and the new copper is
// solved again. It stops when a run's best match is within the tolerance
// or after MaxRuns runs, and keeps the layout of the converged run or, if
// none converged, of the run nearest f0, saying so in a warning.
//
// Every check of synth.Build applies to every layout but one: a mapped
// model is aimed off by the residual, so its own |S11| at f0 is not
// checked; instead the kept layout is refused with a *synth.MismatchError
// when its full-wave |S11| at f0 is above synth.MismatchLimitDB (unless
// in.AcceptMismatch). A band match is
// refused (synth.ErrFullwaveMapBand). The tolerance analysis runs once, on
// the kept layout.
func Centre(ctx context.Context, in synth.BuildInput, o CentreOptions) (*Centring, error) {
	if err := CanCentre(in); err != nil {
		return nil, err
	}
	if o.MaxRuns <= 0 {
		o.MaxRuns = DefaultCentreRuns
	}
	if o.Tolerance <= 0 {
		o.Tolerance = DefaultCentreTolerance
	}
	solve := o.Solver
	if solve == nil {
		solve = func(ctx context.Context, res *synth.Result) (*Report, error) { return Verify(ctx, res, o.Solve) }
	}
	f0 := in.Design.Freq
	rec := &synth.FullwaveCentring{Mesh: o.Mesh, Tolerance: o.Tolerance, MaxRuns: o.MaxRuns}
	var reports []*Report
	mapping := in.FullwaveMap
	skip, accept := in.SkipTolerance, in.AcceptMismatch
	in.SkipTolerance = true
	for run := 1; run <= o.MaxRuns; run++ {
		// A mapped model is aimed off by the residual, so its own |S11|
		// at f0 is no test of the copper: the full-wave one is, below.
		in.FullwaveMap, in.AcceptMismatch = mapping, accept || mapping != nil
		res, err := synth.Build(ctx, in)
		if err != nil {
			if run > 1 {
				return nil, fmt.Errorf("full-wave centring, the build of run %d: %w", run, err)
			}
			return nil, err
		}
		if o.Progress != nil {
			run, progress := run, o.Progress
			o.Solve.Progress = func(p fdtd.Progress) { progress(CentreProgress{Run: run, MaxRuns: o.MaxRuns, Progress: p}) }
		}
		rep, err := solve(ctx, res)
		if err != nil {
			return nil, fmt.Errorf("full-wave centring, run %d: %w", run, err)
		}
		reports = append(reports, rep)
		fr := synth.FullwaveRun{Map: mapping, Drawn: map[string]float64{},
			BestMatchHz: rep.BestMatchHz, S11DBF0: rep.S11DBF0,
			CircuitBestMatchHz: rep.CircuitBestMatchHz, CircuitS11DBF0: rep.CircuitS11DBF0,
			MaxSDifference: rep.MaxSDifference, Cells: rep.Cells, Steps: rep.Steps, Seconds: rep.Seconds}
		for _, e := range res.Physical.Elements {
			fr.Drawn[e.ID] = e.Drawn()
		}
		if math.Abs(fr.Offset(f0)) <= o.Tolerance {
			rec.Converged, rec.Kept = true, run-1
			rec.Runs = append(rec.Runs, fr)
			break
		}
		if run < o.MaxRuns {
			fit, err := FitMap(ctx, res, rep)
			if err != nil {
				return nil, fmt.Errorf("full-wave centring, the mapping after run %d: %w", run, err)
			}
			fr.NextMap, fr.FitRMSBefore, fr.FitRMSAfter = fit.Mapping, fit.RMSBefore, fit.RMSAfter
			mapping = fit.Mapping
		}
		rec.Runs = append(rec.Runs, fr)
	}
	if !rec.Converged {
		for i, r := range rec.Runs {
			if math.Abs(r.Offset(f0)) < math.Abs(rec.Runs[rec.Kept].Offset(f0)) {
				rec.Kept = i
			}
		}
	}
	kept := rec.Runs[rec.Kept]
	in.FullwaveMap, in.SkipTolerance, in.AcceptMismatch = kept.Map, skip, accept || kept.Map != nil
	res, err := synth.Build(ctx, in)
	if err != nil {
		return nil, fmt.Errorf("full-wave centring, the final build: %w", err)
	}
	for _, e := range res.Physical.Elements {
		if d, ok := kept.Drawn[e.ID]; !ok || math.Abs(d-e.Drawn()) > 1e-12 {
			return nil, fmt.Errorf("full-wave centring: the final build drew %s at %.6f mm, not the %.6f mm that run %d solved", e.ID, e.Drawn()*1e3, d*1e3, rec.Kept+1)
		}
	}
	rep := reports[rec.Kept]
	if rep.S11DBF0 > synth.MismatchLimitDB && !accept {
		return nil, in.Design.KeyError("", fmt.Errorf("full-wave centring, run %d (%s mesh): %w", rec.Kept+1, o.Mesh,
			&synth.MismatchError{FreqHz: f0, S11DB: rep.S11DBF0, LossDB: res.LossF0DB,
				ElectricalGamma: cmplx.Abs(physical.Reflection(synth.SectionsInput(res.Sections, res.LoadF0), res.Design.Z0))}))
	}
	res.FullwaveCentre = rec
	res.Notes = append(res.Notes, centreNotes(res, rec)...)
	if !rec.Converged {
		res.Warnings = append([]string{nonConverged(f0, rec)}, res.Warnings...)
	}
	return &Centring{Result: res, Report: rep}, nil
}

// ErrCentreTrim refuses full-wave centring of a design drawn with a trim
// allowance.
var ErrCentreTrim = errors.New("full-wave centring brings the drawn copper's best match to f0, but a trim allowance draws the open stubs longer on purpose, so that the etched board's best match lies below f0 until it is trimmed: centre the design without [layout] trim")

// CanCentre returns Centre's refusal of in's design before any work: a
// band match (synth.ErrFullwaveMapBand, naming match.band) and a trim
// allowance (ErrCentreTrim, naming layout.trim).
func CanCentre(in synth.BuildInput) error {
	if in.Design.Match != nil && in.Design.Match.HasBand() {
		return in.Design.KeyError("match.band", synth.ErrFullwaveMapBand)
	}
	if in.Design.Layout.Trim > 0 {
		return in.Design.KeyError("layout.trim", ErrCentreTrim)
	}
	return nil
}

// nonConverged is the warning of a centring that did not reach the
// tolerance.
func nonConverged(f0 float64, rec *synth.FullwaveCentring) string {
	var offs []string
	for _, r := range rec.Runs {
		offs = append(offs, fmt.Sprintf("%+.2f %%", 100*r.Offset(f0)))
	}
	k := rec.Runs[rec.Kept]
	return fmt.Sprintf("FULL-WAVE CENTRING DID NOT CONVERGE: after %d full-wave runs (best match %s from f0) none came within ±%.2g %% of f0; the copper drawn is run %d's, whose full-wave best match is %.4f GHz (%+.2f %%) and |S11| at f0 %.1f dB; this layout is not centred on the full-wave model",
		len(rec.Runs), strings.Join(offs, ", "), 100*rec.Tolerance, rec.Kept+1, k.BestMatchHz/1e9, 100*k.Offset(f0), k.S11DBF0)
}

// centreNotes says what each run found and what was done after it.
func centreNotes(res *synth.Result, rec *synth.FullwaveCentring) []string {
	f0 := res.Design.Freq
	var notes []string
	for i, r := range rec.Runs {
		s := fmt.Sprintf("full-wave centring run %d of at most %d (%s mesh): best match %.4f GHz (%+.2f %% from f0), |S11| at f0 %.1f dB; the mapped circuit model (its offsets; the residual it is aimed off by acts at f0 only) gave %.4f GHz and %.1f dB",
			i+1, rec.MaxRuns, rec.Mesh, r.BestMatchHz/1e9, 100*r.Offset(f0), r.S11DBF0, r.CircuitBestMatchHz/1e9, r.CircuitS11DBF0)
		if r.NextMap != nil {
			s += fmt.Sprintf("; mapped the circuit model onto it by %s (RMS |ΔS| of the network within ±%.0f %% of f0 %.4f → %.4f), re-centred and redrawn",
				formatMap(r.NextMap), 100*fitWindow, r.FitRMSBefore, r.FitRMSAfter)
		}
		notes = append(notes, s)
	}
	k := rec.Runs[rec.Kept]
	if rec.Converged {
		notes = append(notes, fmt.Sprintf("full-wave centring converged: run %d's best match is within ±%.2g %% of f0; the copper drawn is that run's, the circuit model in this report carries its mapping (%s; element fullwave_map_mm) and fullwave.s2p is its full-wave solve",
			rec.Kept+1, 100*rec.Tolerance, formatMap(k.Map)))
	} else {
		notes = append(notes, fmt.Sprintf("full-wave centring did not converge; the copper drawn is run %d's, the circuit model in this report carries its mapping (%s) and fullwave.s2p is its full-wave solve",
			rec.Kept+1, formatMap(k.Map)))
	}
	return notes
}

// formatMap lists a mapping's offsets in mm, by element ID, and its
// residual.
func formatMap(m *synth.FullwaveMapping) string {
	if m == nil {
		return "no mapping"
	}
	ids := make([]string, 0, len(m.Offsets))
	for id := range m.Offsets {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	var parts []string
	for _, id := range ids {
		parts = append(parts, fmt.Sprintf("%s %+.3f mm", id, m.Offsets[id]*1e3))
	}
	parts = append(parts, fmt.Sprintf("S11 residual at f0 %.4f∠%.1f°", cmplx.Abs(m.Residual), cmplx.Phase(m.Residual)*180/math.Pi))
	return strings.Join(parts, ", ")
}

// Fit is a fitted full-wave mapping and how well it fits.
type Fit struct {
	Mapping *synth.FullwaveMapping
	// RMSBefore and RMSAfter are the RMS |S_fullwave − S_circuit| of the
	// network at the fit's frequencies before and after the offsets.
	RMSBefore, RMSAfter float64
}

// FitMap fits the full-wave mapping of res's circuit model to rep, the
// full-wave check of res's drawn copper. The input mapping: the length
// offset of every line and stub, and of the source-side feed, that brings
// the circuit model's two-port closest (least squares on all four
// S-parameters, Nelder-Mead from gonum/optimize) to the full-wave one at
// the sweep frequencies within fitWindow of f0, added to res's own
// offsets. The load-side feed gets none: it is the same line as the first
// section, whose offset stands for both. The output mapping: what the
// offsets leave of the difference between the full-wave and the mapped
// model's S11 at f0 with the load (the residual), so that the mapped model
// agrees with the full-wave at f0 on this layout.
func FitMap(ctx context.Context, res *synth.Result, rep *Report) (*Fit, error) {
	els := res.Physical.Elements
	through := res.Physical.ThroughIndex()
	var idx []int
	for i, e := range els {
		if e.Role != synth.RoleFeed || (i == through[len(through)-1] && e.Drawn() > 0) {
			idx = append(idx, i)
		}
	}
	f0 := res.Design.Freq
	var ks []int
	for k, f := range rep.Freqs {
		if math.Abs(f/f0-1) <= fitWindow {
			ks = append(ks, k)
		}
	}
	if len(ks) < fitMinPoints {
		ks = ks[:0]
		for k := range rep.Freqs {
			ks = append(ks, k)
		}
	}
	if step := (len(ks) + fitMaxPoints - 1) / fitMaxPoints; step > 1 {
		var sub []int
		for i := 0; i < len(ks); i += step {
			sub = append(sub, ks[i])
		}
		ks = sub
	}
	freqs := make([]float64, len(ks))
	for i, k := range ks {
		freqs[i] = rep.Freqs[k]
	}
	// The offsets are optimised in guided wavelengths, so the simplex is
	// well scaled, and bounded like the re-centring.
	lg := els[idx[0]].Params.GuidedWavelength()
	extraFor := func(x []float64) []float64 {
		extra := make([]float64, len(els))
		for j, i := range idx {
			extra[i] = x[j] * lg
		}
		return extra
	}
	objective := func(x []float64) float64 {
		for _, v := range x {
			if math.Abs(v) > synth.MaxRecentre {
				return 10
			}
		}
		s, err := res.ModelNetwork(extraFor(x), freqs)
		if err != nil {
			return 10
		}
		sum := 0.0
		for n, k := range ks {
			for i := 0; i < 2; i++ {
				for j := 0; j < 2; j++ {
					d := cmplx.Abs(s[n][i][j] - rep.Network[k][i][j])
					sum += d * d
				}
			}
		}
		return sum / float64(4*len(ks))
	}
	x0 := make([]float64, len(idx))
	fx0 := objective(x0)
	r, err := optimize.Minimize(optimize.Problem{Func: objective}, x0,
		&optimize.Settings{FuncEvaluations: 4000, Converger: synth.CancelConverger(ctx, &optimize.FunctionConverge{Absolute: 1e-12, Relative: 1e-9, Iterations: 100})},
		&optimize.NelderMead{SimplexSize: 0.002})
	if cerr := ctx.Err(); cerr != nil {
		return nil, fmt.Errorf("fitting the mapping: %w", cerr)
	}
	if err != nil && r == nil {
		return nil, fmt.Errorf("fitting the mapping: %w", err)
	}
	x, fx := r.X, r.F
	if fx >= fx0 {
		x, fx = x0, fx0
	}
	m := &synth.FullwaveMapping{Offsets: map[string]float64{}}
	for _, e := range els {
		if e.FullwaveMap != 0 {
			m.Offsets[e.ID] = e.FullwaveMap
		}
	}
	for j, i := range idx {
		m.Offsets[els[i].ID] = els[i].FullwaveMap + x[j]*lg
	}
	s, err := res.ModelNetwork(extraFor(x), []float64{f0})
	if err != nil {
		return nil, fmt.Errorf("fitting the mapping: %w", err)
	}
	m.Residual = rep.MatchedF0 - terminate(s[0], loadGamma(res.LoadF0, res.Design.Z0))
	return &Fit{Mapping: m, RMSBefore: math.Sqrt(fx0), RMSAfter: math.Sqrt(fx)}, nil
}
