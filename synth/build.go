package synth

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"stubcraft/physical/units"

	"gonum.org/v1/gonum/optimize"

	"stubcraft/physical"
	"stubcraft/stackups"
	"stubcraft/synth/geom"
	"stubcraft/synth/tune"
)

// Load is the impedance to be matched, as a function of frequency.
type Load interface {
	// Impedance returns the load impedance at freq (Hz), in ohms.
	Impedance(freq float64) (complex128, error)
}

// ConstantLoad is a load whose impedance does not change with frequency.
type ConstantLoad complex128

// Impedance returns z.
func (z ConstantLoad) Impedance(float64) (complex128, error) { return complex128(z), nil }

// TouchstoneLoad is a one-port load measured or simulated into a
// Touchstone file; between its points the reflection is interpolated.
type TouchstoneLoad struct {
	File *physical.Touchstone
	Path string // the file it came from, for messages
}

// Impedance returns the interpolated load impedance at freq.
func (t TouchstoneLoad) Impedance(freq float64) (complex128, error) {
	z, err := t.File.LoadImpedance(freq)
	if err != nil {
		return 0, fmt.Errorf("%s: %w", t.Path, err)
	}
	return z, nil
}

// BuildInput is everything Build needs, already decoded.
type BuildInput struct {
	Design  Design
	Stackup stackups.Stackup
	Load    Load
	// Lines makes line models; nil means LineMakerFor(ctx, Stackup, a new cache).
	Lines physical.LineMaker
	// SkipTolerance turns the Monte Carlo analysis off.
	SkipTolerance bool
	// SkipSensitivity leaves Result.Sensitivity empty, for a caller that
	// prints no bench figures (compare): the sensitivities cost a
	// best-match search per quantity, more than the tolerance analysis.
	// A Build needs them (the trim note) and ignores this.
	SkipSensitivity bool
	// AcceptMismatch lets Build return a layout whose |S11| at f0 is above
	// MismatchLimitDB instead of refusing it with a *MismatchError.
	AcceptMismatch bool
	// AcceptLoss builds a load that the loss rule refuses (see
	// MaxLoadGamma and MaxNetworkLossDB): one that a matched network can
	// only absorb by dissipating the power.
	AcceptLoss bool
	// FullwaveMap maps the circuit model onto a full-wave solve (build
	// --fullwave-centre, package synth/fullwave); the re-centring then
	// draws the lengths that match at f0 in the mapped model. Nil in a
	// plain build; a band match refuses it.
	FullwaveMap *FullwaveMapping
}

// Result is a built design: the corrected physical network and the proof
// that it matches.
type Result struct {
	Design   Design
	Stackup  stackups.Stackup
	Model    string // the line model used
	LoadF0   complex128
	Physical Physical
	Sections []Section // the electrical network, from the load
	Notes    []string
	Warnings []string
	Recentre Recentring
	S11F0    complex128 // the drawn layout at f0, full model
	Uncorr   complex128 // at f0, without the discontinuity corrections
	Sweep    Sweep
	BW10     Band
	BW20     Band
	LossF0DB float64 // the network's own dissipation at f0, dB
	// Band is the match across match.band; nil without a band.
	Band *BandMatch
	// candidate is the [match] candidate this result built.
	candidate Candidate
	Tolerance *Tolerance
	// Layout is the board geometry; Build fills it, Simulate does not.
	Layout geom.Layout
	// Sensitivity says how the best match and S11 at f0 move per step of
	// each element's length and width and of the board's εr and etch.
	Sensitivity []tune.Sensitivity
	// Structures are the calibration and test structures of [panel]
	// structures, each with its own layout; Build fills them.
	Structures []Structure

	// FullwaveCentre is the record of build --fullwave-centre; nil in a
	// plain build.
	FullwaveCentre *FullwaveCentring

	load       Load               // the load, for the bench model
	benchLines physical.LineMaker // line models of perturbed boards
	sim        *physical.Sim      // the circuit model of the board kept, as swept
	// fullwaveResidual is FullwaveMapping.Residual of the build's input.
	fullwaveResidual complex128
}

// Band is a contiguous frequency range around f0.
type Band struct {
	Lo, Hi float64 // Hz
	OK     bool    // false when |S11| is above the threshold at f0
}

// Width returns the band's width in Hz.
func (b Band) Width() float64 {
	if !b.OK {
		return 0
	}
	return b.Hi - b.Lo
}

// Sweep is the response of the drawn layout across a band.
type Sweep struct {
	Freqs []float64    // Hz
	S11   []complex128 // input reflection with the load, referred to z0
	Zin   []complex128 // input impedance, ohm
	ZLoad []complex128 // load impedance, ohm
	// Network is the two-port S-matrix of the matching network alone
	// (port 1 the source side, port 2 the load port), referred to z0.
	Network [][2][2]complex128
}

// Recentring records the optimiser's adjustment of the drawn lengths.
type Recentring struct {
	Before, After complex128 // S11 at f0
	// Target is the S11 at f0 the re-centring aimed at: the electrical
	// network's own (zero for a solved match).
	Target      complex128
	Changes     []float64 // per adjustable element, m, in Elements order
	IDs         []string
	Evaluations int
}

// drawBoard draws r's layout; a board larger than MaxBoardSize either way
// is a *BoardSizeError.
func (r *Result) drawBoard() (geom.Layout, error) {
	lay, err := geom.Build(r.GeomSpec())
	if err != nil {
		var se *geom.SpecError
		if errors.As(err, &se) && layoutKey(se.Field) != "" {
			return geom.Layout{}, &DesignKeyError{Key: layoutKey(se.Field), Err: se}
		}
		return geom.Layout{}, fmt.Errorf("layout: %w", err)
	}
	if w, h := boardSize(lay); w > MaxBoardSize || h > MaxBoardSize {
		return geom.Layout{}, fmt.Errorf("layout: %w", &BoardSizeError{Width: w, Height: h, Max: MaxBoardSize})
	}
	return lay, nil
}

// candidateArea returns the area of r's drawn board (its outline's
// bounding box, m²), or the refusal Build would give for its tracks (below
// the fab minimum) or its board.
func (r *Result) candidateArea() (float64, error) {
	if f := fabMinimum(r.Physical, r.Design.Fab.MinWidth); f != nil {
		return 0, r.Design.KeyError("fab.min_width", f)
	}
	lay, err := r.drawBoard()
	if err != nil {
		return 0, r.Design.KeyError("", err)
	}
	w, h := boardSize(lay)
	return w * h, nil
}

// boardSize returns the width and height of the board outline's bounding
// box, m.
func boardSize(lay geom.Layout) (w, h float64) {
	lo, hi := lay.Board.Bounds()
	return float64(hi.X-lo.X) * 1e-9, float64(hi.Y-lo.Y) * 1e-9
}

// Build runs the whole path for one design on one stackup: electrical
// solution, widths and lengths, discontinuity corrections, re-centring,
// band sweep, tolerance analysis, board geometry and its notes, and the
// checks that refuse a design: an already matched load (*MatchedError), a
// layout that does not match (*MismatchError, unless in.AcceptMismatch), a
// track below the fab minimum (*FabMinimumError) and a board larger than
// MaxBoardSize (*BoardSizeError). Refusals come wrapped in a *DesignError
// naming the design file; find them with errors.As. The result is what the
// writers of package export take.
func Build(ctx context.Context, in BuildInput) (*Result, error) {
	in.SkipSensitivity = false
	r, err := Simulate(ctx, in)
	if err != nil {
		return nil, err
	}
	d := r.Design
	if m := r.mismatch(); m != nil && !in.AcceptMismatch {
		return nil, d.KeyError("", m)
	}
	if f := fabMinimum(r.Physical, d.Fab.MinWidth); f != nil {
		return nil, d.KeyError("fab.min_width", f)
	}
	lay, err := r.drawCompensated()
	if err != nil {
		return nil, d.KeyError("", err)
	}
	r.Layout = lay
	r.Notes = append(r.Notes, r.LayoutNotes(lay)...)
	if _, w := r.LaunchNote(); w != "" {
		r.Warnings = append(r.Warnings, w)
	}
	if _, ws := r.FenceNote(lay); len(ws) > 0 {
		r.Warnings = append(r.Warnings, ws...)
	}
	if r.Structures, err = r.structures(); err != nil {
		return nil, d.KeyError("panel.structures", err)
	}
	for _, s := range r.Structures {
		r.Notes = append(r.Notes, fmt.Sprintf("%s: %s", s.Layout.Name, s.Note))
	}
	return r, nil
}

// Simulate runs the electrical and physical part of Build: electrical
// solution, widths and lengths, discontinuity corrections, re-centring,
// band sweep and tolerance analysis. It draws no geometry (but the board
// of each candidate of topology auto, to rank them by area) and refuses
// only an already matched load, a frequency outside the stackup's range
// and, unless in.AcceptLoss, a load the loss rule refuses (*LossError:
// |Γ_load| above MaxLoadGamma or more than MaxNetworkLossDB dissipated at
// f0); CheckFabMinimum and S11F0 say what Build would refuse.
func Simulate(ctx context.Context, in BuildInput) (*Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("build: %w", err)
	}
	d := in.Design
	spreadNotes := applyStackupSpread(&d, in.Stackup)
	f0, z0 := d.Freq, d.Z0
	sizing, maskNotes, maskWarnings := MaskRule(&d, in.Stackup)
	sub, subNote := SubstrateAt(sizing, f0)
	mk := in.Lines
	if mk == nil || sizing.Mask != in.Stackup.Mask {
		mk = LineMakerFor(ctx, sizing, NewSolverCache())
	}
	if err := checkLoadCoversBand(d, in.Load); err != nil {
		return nil, err
	}
	zl, err := in.Load.Impedance(f0)
	if err != nil {
		return nil, d.KeyError(loadKey(d), fmt.Errorf("the load at %.6g GHz: %w", f0/1e9, err))
	}
	if err := CheckFrequencyOn(f0, sub); err != nil {
		return nil, d.KeyError("frequency", err)
	}
	sim := simContext{in: in, d: d, sub: sub, sizing: sizing, mk: mk, zl: zl,
		preNotes: subNote, postNotes: append(spreadNotes, maskNotes...), warnings: maskWarnings}
	if d.Match != nil && d.Match.HasBand() && d.Match.Resolved().Objective == ObjectiveYield {
		if sim.tmk, err = ToleranceMaker(physical.Board{Sub: sub}, mk, UsesFieldSolver(sizing), f0); err != nil {
			return nil, err
		}
	}
	var r *Result
	if d.Match == nil {
		if r, err = sim.run(ctx, nil); err != nil {
			return nil, err
		}
	} else {
		specs := d.Match.Resolved().candidateSpecs()
		var results []*Result
		var firstErr error
		for i := range specs {
			c := &specs[i]
			cr, err := sim.run(ctx, c)
			if err != nil {
				if len(specs) == 1 || ctx.Err() != nil {
					return nil, err
				}
				c.Err = err.Error()
				if firstErr == nil {
					firstErr = err
				}
				continue
			}
			if len(specs) > 1 {
				// Rank by the drawn board: its outline's bounding box. A
				// candidate Build would refuse for its tracks or its board
				// is out.
				area, err := cr.candidateArea()
				if err != nil {
					c.Err = err.Error()
					if firstErr == nil {
						firstErr = err
					}
					continue
				}
				c.AreaM2 = area
			}
			c.WorstS11DB = physical.MagDB(cr.S11F0)
			if cr.Band != nil {
				c.WorstS11DB = cr.Band.WorstS11DB
			}
			c.LossDB = cr.LossF0DB
			for _, s := range cr.Sections {
				c.TotalDeg += s.LengthDeg
			}
			cr.candidate = *c
			results = append(results, cr)
		}
		if len(results) == 0 {
			return nil, firstErr
		}
		rankCandidates(specs)
		for _, cr := range results {
			if cr.candidate == specs[0] {
				r = cr
			}
		}
		if r.Band != nil {
			r.Band.Candidates = specs
		}
		if len(specs) > 1 {
			r.Notes = append(r.Notes, fmt.Sprintf("topology auto: %s built, the best of %d candidates by worst |S11| in the band, then board area, then loss", specs[0].Name(), len(specs)))
		}
	}
	tmk, err := ToleranceMaker(r.Physical.Board, mk, UsesFieldSolver(sizing), f0)
	if err != nil {
		return nil, err
	}
	r.load, r.benchLines = in.Load, tmk
	if !in.SkipSensitivity {
		if err := r.sensitivities(ctx); err != nil {
			return nil, err
		}
	}
	if !in.SkipTolerance && d.Tolerance.Samples > 0 {
		t, err := Analyse(ctx, r.Physical.Board, sub, tmk, zl, f0, z0, d.Tolerance)
		if err != nil {
			return nil, err
		}
		t.BandP50, t.BandP90 = math.NaN(), math.NaN()
		if r.Band != nil {
			if err := t.bandWorst(ctx, r.Physical.Board, sub, tmk, in.Load, r.Band.Start, r.Band.Stop, z0); err != nil {
				return nil, err
			}
		}
		r.Tolerance = &t
	}
	return r, nil
}

// simContext is what every candidate of one Simulate shares.
type simContext struct {
	in      BuildInput
	d       Design
	sub     physical.Substrate
	sizing  stackups.Stackup
	mk, tmk physical.LineMaker
	zl      complex128 // the load at f0
	// preNotes go before the solution's notes, postNotes after them.
	preNotes, postNotes []string
	warnings            []string
}

// run builds one network: the design's sections (c == nil) or the
// candidate c of its [match] table, through widths, corrections, the
// re-centring or band optimisation and the sweep.
func (s simContext) run(ctx context.Context, c *Candidate) (*Result, error) {
	d, in, sub, mk, zl := s.d, s.in, s.sub, s.mk, s.zl
	f0, z0 := d.Freq, d.Z0
	var sections []Section
	var notes []string
	var err error
	if c == nil {
		sections, notes, err = d.Electrical(zl)
	} else {
		m := d.Match.Resolved()
		m.Sections = c.Sections
		if c.Pick > 0 {
			m.Pick = Pick(c.Pick)
		}
		var opt ElectricalOptions
		if c.Topology == TopologyDoubleStub {
			w, werr := WidthWith(mk, sub, z0, f0)
			if werr != nil {
				return nil, d.KeyError("z0", werr)
			}
			opt.FeedDeg = ElectricalDegrees(w.Params, d.Layout.FeedLength)
		}
		notes = []string{d.loadNote(zl)}
		var more, warnings []string
		var bandSecs []Section
		if c.Topology == TopologyDoubleStub && m.HasBand() && m.Pick == PickShortest {
			// An error here is matchSections' own (it reports it below,
			// through the loss rule) or the load's in the band
			// (bandOptimise reports it with its key).
			if pick, secs, n, w, perr := bandDoubleStubStart(d, m, *c, zl, in.Load, opt); perr == nil {
				m.Pick, bandSecs, more, warnings = pick, secs, n, w
				s.warnings = append(warnings, s.warnings...)
			}
		}
		var f0Notes []string
		sections, f0Notes, err = d.matchSections(m, c.Topology, c.End, zl, opt)
		notes = append(append(notes, f0Notes...), more...)
		if err == nil && bandSecs != nil {
			sections = bandSecs
		}
	}
	if err != nil {
		if gamma := LoadGamma(zl, z0); gamma > MaxLoadGamma && !in.AcceptLoss {
			return nil, d.KeyError(loadKey(d), &LossError{Gamma: gamma, LossDB: math.Inf(1), FreqHz: f0})
		}
		return nil, err
	}
	ph, err := ToPhysical(sections, f0, z0, sub, mk, PhysicalOptions{
		FeedLength: d.Layout.FeedLength,
		Via:        physical.Via{Drill: d.Layout.ViaDrill, Pad: d.Layout.ViaPad, Pitch: d.Layout.ViaRowPitch()},
	})
	if err != nil {
		return nil, d.KeyError("", fmt.Errorf("on stackup %s at %.6g GHz: %w", in.Stackup.Name, f0/1e9, err))
	}
	if in.FullwaveMap != nil {
		if d.Match != nil && d.Match.HasBand() {
			return nil, d.KeyError("match.band", ErrFullwaveMapBand)
		}
		if err := ph.applyFullwaveMap(in.FullwaveMap.Offsets); err != nil {
			return nil, err
		}
	}
	r := &Result{Design: d, Stackup: in.Stackup, LoadF0: zl, Sections: sections, Physical: ph}
	if in.FullwaveMap != nil {
		r.fullwaveResidual = in.FullwaveMap.Residual
	}
	r.Notes = append(append(append(append(r.Notes, s.preNotes...), notes...), ph.Notes...), s.postNotes...)
	r.Warnings = append(append(r.Warnings, ph.Warnings...), s.warnings...)
	if len(ph.Elements) > 0 {
		r.Model = ph.Elements[0].Model
	}
	if UsesFieldSolver(s.sizing) {
		r.Notes = append(r.Notes, "line widths from the 2-D field solver (solder mask or grounded coplanar lines); the tee, open-end and via corrections use the closed-form microstrip models")
	}
	if len(ph.Board.Stubs) > 0 {
		r.Notes = append(r.Notes, "the T-junction model is checked against the project's full-wave (FDTD) tee sweep (testdata/tee: impedance ratios 0.54–1.92, εr 2.2–10.2, f·h up to 5 GHz·mm, coarse mesh): Hammerstad's (1981, from memory) reference planes with the transformer, the susceptance and the through-arm shift fitted to it, it draws each stub within 1.0° and places each through arm within 0.3° of the full-wave junction's on all 10 tees swept; the demo's drawn copper has its full-wave best match 0.70 % below f0 at −29.6 dB (normal mesh), within the 1 % aimed at, of which the full-wave's zero-thickness copper accounts for 0.34 % and the mesh for most of the rest (0.28 % below f0 on a mesh 2.7 times the coarse one; DEVELOPERS.md); the corrections it drives are listed per element (tee_mm)")
	}
	for _, e := range ph.Elements {
		if e.Step != 0 {
			r.Notes = append(r.Notes, "width steps are modelled and compensated with the closed forms of Gupta, Garg, Bahl and Bhartia (1996), written from memory, with two factors fitted to full-wave (FDTD) simulations of seven steps (ratio up to 4, narrow W/h 0.9–3, εr 2.2–10.2): the model's step inductance agrees with them within 15 % and its capacitance within 18–24 % (DEVELOPERS.md, \"Width step\"); the corrections are listed per element (step_mm)")
			break
		}
	}
	for _, e := range ph.Elements {
		if e.Via != 0 {
			r.Notes = append(r.Notes, viaNote)
			break
		}
	}
	if in.Stackup.Line == stackups.GCPW {
		r.Warnings = append(r.Warnings, "grounded coplanar lines: the T-junction, open-end and via models are microstrip models and only approximate the coplanar discontinuities; measure before trusting the last dB")
	}

	uncorr, err := physical.NewSim(ph.Uncorrected(), mk)
	if err != nil {
		return nil, err
	}
	r.Uncorr = uncorr.InputReflection(f0, zl, z0)

	var sim *physical.Sim
	band := d.Match != nil && d.Match.HasBand()
	if band {
		widths := c != nil && c.Topology == TopologyQuarterWave && !UsesFieldSolver(s.sizing)
		sim, err = r.bandOptimise(ctx, mk, s.tmk, in.Load, widths)
	} else {
		sim, err = r.recentre(ctx, mk, zl)
	}
	if err != nil {
		return nil, err
	}
	r.sim = sim
	r.S11F0 = sim.InputReflection(f0, zl, z0)
	r.LossF0DB = sim.Loss(f0, zl, z0)
	// The rule weighs what the network burns of the source's power: for a
	// matching network its own loss, for a hand-entered one that reflects
	// by design (a notch) far less.
	if err := checkLoss(LoadGamma(zl, z0), availableLossDB(r.S11F0, r.LossF0DB), f0); err != nil && !in.AcceptLoss {
		return nil, d.KeyError(loadKey(d), err)
	}
	if err := r.sweep(sim, in.Load); err != nil {
		return nil, err
	}
	if band {
		r.bandResult(in.Load, c.Topology)
	}
	return r, nil
}

// loadKey names the design key that gives the load.
func loadKey(d Design) string {
	if d.Load.Touchstone != "" {
		return "load.touchstone"
	}
	return "load.impedance"
}

// applyStackupSpread takes the laminate's own εr and thickness spread from
// the stackup's [spread] table where the design's [tolerance] table does not
// give one, and says so.
func applyStackupSpread(d *Design, st stackups.Stackup) []string {
	var notes []string
	if st.Spread.ErRel > 0 && !d.Written("tolerance.er") {
		d.Tolerance.Er = st.Spread.ErRel
		notes = append(notes, fmt.Sprintf("tolerance: εr spread ±%.3g %% from the stackup %s", 100*st.Spread.ErRel, st.Name))
	}
	if st.Spread.ThicknessRel > 0 && !d.Written("tolerance.thickness") {
		d.Tolerance.Thickness = st.Spread.ThicknessRel
		notes = append(notes, fmt.Sprintf("tolerance: thickness spread ±%.3g %% from the stackup %s", 100*st.Spread.ThicknessRel, st.Name))
	}
	return notes
}

// MaxRecentre bounds each length change of the re-centring, in guided
// wavelengths: it takes out the residual of the corrections, it does not
// redesign a network that does not match.
const MaxRecentre = 0.05

// RecentreWarn is the length change, in guided wavelengths, beyond which
// the re-centring is reported as more than a touch-up (common practice, no
// source: 1 % of λg is about 3.6° of phase).
const RecentreWarn = 0.01

// recentre lets Nelder-Mead (gonum/optimize) adjust the drawn lengths of
// the lines and stubs of the solution so that the full model's S11 at f0
// comes as near as it can to the electrical network's own: zero for a
// solved match, and for hand-entered sections whatever they do (a notch
// stays a notch). The corrections put the layout close already; this takes
// out what they cannot: loss, and the small asymmetries of the tee model.
// It returns the simulation of the layout it keeps.
func (r *Result) recentre(ctx context.Context, mk physical.LineMaker, zl complex128) (*physical.Sim, error) {
	f0, z0 := r.Design.Freq, r.Design.Z0
	ph := &r.Physical
	var idx []int
	for i, e := range ph.Elements {
		if e.Role != RoleFeed {
			idx = append(idx, i)
		}
	}
	start := make([]float64, len(idx))
	for k, i := range idx {
		start[k] = ph.Elements[i].Drawn()
	}
	// The lengths are optimised in units of a guided wavelength so the
	// simplex is well scaled.
	lg := ph.Elements[idx[0]].Params.GuidedWavelength()
	minLen := ph.minLengths()
	base, err := physical.NewSim(ph.Board, mk)
	if err != nil {
		return nil, err
	}
	r.Recentre.Before = base.InputReflection(f0, zl, z0)
	var target complex128
	if r.Design.Match == nil {
		// The electrical network seen from the source port: its sections,
		// then the source-side feed of z0 between them and the port.
		// The feed enters the model from the tee's reference plane when a
		// stub hangs at its load end.
		secs := r.Sections
		through := ph.ThroughIndex()
		if k := len(through) - 1; k >= 0 && ph.Elements[through[k]].Role == RoleFeed {
			feed := ph.Elements[through[k]]
			l := feed.ModelLength()
			for _, st := range ph.Elements {
				if st.Role == RoleStub && st.At == k-1 {
					arm := ph.Elements[through[k-1]]
					l -= physical.Tee{ThroughZ0: arm.Params.Z0, ThroughEpsEff: arm.Params.EpsEff,
						StubZ0: st.Params.Z0, StubEpsEff: st.Params.EpsEff, H: ph.Board.Sub.Height, Er: ph.Board.Sub.Er}.At(f0).ThroughShift
				}
			}
			secs = append(append([]Section(nil), secs...), Section{Kind: SeriesLine, Z0: z0, LengthDeg: ElectricalDegrees(feed.Params, l)})
		}
		zin := SectionsInput(secs, zl)
		target = physical.Reflection(zin, z0)
	}
	// A full-wave mapping's output residual: aim the mapped model where
	// the full-wave result will be at the target.
	target -= r.fullwaveResidual
	r.Recentre.Target = target
	// simFor is the layout with the adjustable lengths moved by x; the
	// line models are made once, in base.
	simFor := func(x []float64) (*physical.Sim, bool) {
		var through, stubs []float64
		k := 0
		for i, e := range ph.Elements {
			l := e.ModelLength()
			if k < len(idx) && idx[k] == i {
				drawn := start[k] + x[k]*lg
				if drawn < minLen[i] || math.Abs(x[k]) > MaxRecentre {
					return nil, false
				}
				l = drawn - e.Bend + e.FullwaveMap
				k++
			}
			if e.Role == RoleStub {
				stubs = append(stubs, l)
			} else {
				through = append(through, l)
			}
		}
		sim, err := base.Relength(through, stubs)
		return sim, err == nil
	}
	objective := func(x []float64) float64 {
		sim, ok := simFor(x)
		if !ok {
			return 10
		}
		g := sim.InputReflection(f0, zl, z0) - target
		// A faint pull toward the corrected lengths picks, among the
		// layouts that match equally well (a network with more lengths
		// than the two conditions of a match), the one nearest to it.
		pull := 0.0
		for _, v := range x {
			pull += v * v
		}
		return real(g)*real(g) + imag(g)*imag(g) + 1e-10*pull
	}
	x0 := make([]float64, len(idx))
	res, err := optimize.Minimize(optimize.Problem{Func: objective}, x0,
		&optimize.Settings{FuncEvaluations: 2000, Converger: contextConverger{ctx, &optimize.FunctionConverge{Absolute: 1e-14, Iterations: 50}}},
		&optimize.NelderMead{InitialVertices: nil, SimplexSize: 0.01})
	if cerr := ctx.Err(); cerr != nil {
		return nil, fmt.Errorf("re-centring: %w", cerr)
	}
	if err != nil && res == nil {
		return nil, fmt.Errorf("re-centring: %w", err)
	}
	r.Recentre.Evaluations = res.FuncEvaluations
	if res.F >= objective(x0) {
		// Nothing better was found: keep the corrected layout.
		r.Recentre.After = r.Recentre.Before
		for _, i := range idx {
			r.Recentre.IDs = append(r.Recentre.IDs, ph.Elements[i].ID)
			r.Recentre.Changes = append(r.Recentre.Changes, 0)
		}
		return base, nil
	}
	for k, i := range idx {
		e := &ph.Elements[i]
		dl := res.X[k] * lg
		e.Recentre = dl
		r.Recentre.IDs = append(r.Recentre.IDs, e.ID)
		r.Recentre.Changes = append(r.Recentre.Changes, dl)
	}
	ph.Board = ph.board(ph.Board.Sub, ph.Board.Via)
	// What the re-centring aims at: a match, or, for hand-entered sections
	// that do not match (a notch), the electrical network's own response.
	aim := "the match at f0"
	if g := cmplx.Abs(target); g > 0.1 {
		aim = fmt.Sprintf("the response at f0 (|Γ| = %.3f, the electrical network's own)", g)
	}
	for k, i := range idx {
		if e := ph.Elements[i]; math.Abs(res.X[k]) > RecentreWarn {
			r.Warnings = append(r.Warnings, fmt.Sprintf("re-centring moved %s by %+.3f mm (%.2f %% of a guided wavelength): the corrections left more than the usual residual (loss, or models outside their range); %s rests on the optimiser there",
				e.ID, e.Recentre*1e3, 100*math.Abs(res.X[k]), aim))
		}
	}
	after, ok := simFor(res.X)
	if !ok {
		return nil, fmt.Errorf("re-centring: the optimum %v left the allowed lengths", res.X)
	}
	r.Recentre.After = after.InputReflection(f0, zl, z0)
	return after, nil
}

// contextConverger stops an optimisation once ctx is done (the caller then
// reports ctx.Err()); until then it defers to its inner converger.
type contextConverger struct {
	ctx   context.Context
	inner optimize.Converger
}

// CancelConverger returns a converger that stops an optimisation once ctx
// is done (the caller then reports ctx.Err()) and until then defers to
// inner.
func CancelConverger(ctx context.Context, inner optimize.Converger) optimize.Converger {
	return contextConverger{ctx, inner}
}

func (c contextConverger) Init(dim int) { c.inner.Init(dim) }

func (c contextConverger) Converged(loc *optimize.Location) optimize.Status {
	if c.ctx.Err() != nil {
		return optimize.Failure
	}
	return c.inner.Converged(loc)
}

// sweep fills r.Sweep and the bandwidths.
func (r *Result) sweep(sim *physical.Sim, load Load) error {
	sw := r.Design.Sweep
	n := sw.Points
	if n < 2 {
		n = 2
	}
	z0 := r.Design.Z0
	freqs := make([]float64, 0, n+2)
	for i := 0; i < n; i++ {
		freqs = append(freqs, sw.Start+(sw.Stop-sw.Start)*float64(i)/float64(n-1))
	}
	if m := r.Design.Match; m != nil && m.HasBand() {
		// The band edges are sweep points, so that the worst |S11| in the
		// band can be read from the swept data alone.
		for _, e := range m.Band {
			k := sort.SearchFloat64s(freqs, e)
			if k < len(freqs) && freqs[k] == e {
				continue
			}
			freqs = append(freqs[:k], append([]float64{e}, freqs[k:]...)...)
		}
	}
	n = len(freqs)
	s := Sweep{Freqs: freqs, ZLoad: make([]complex128, n), Zin: make([]complex128, n),
		S11: make([]complex128, n), Network: make([][2][2]complex128, n)}
	// The board's chain matrices a block of frequencies at a time, each
	// line evaluated with its batched sweep.
	abcd := sim.ABCDSweep(freqs, nil)
	for i, f := range freqs {
		zl, err := load.Impedance(f)
		if err != nil {
			return r.Design.KeyError(loadKey(r.Design), fmt.Errorf("the load at %.6g GHz, in the sweep: %w", f/1e9, err))
		}
		a := abcd[i]
		zin := a.InputImpedance(zl)
		s.ZLoad[i] = zl
		s.Zin[i] = zin
		s.S11[i] = physical.Reflection(zin, z0)
		s.Network[i] = a.S(z0)
	}
	r.Sweep = s
	f0 := r.Design.Freq
	for _, b := range []struct {
		db  float64
		dst *Band
	}{{-10, &r.BW10}, {-20, &r.BW20}} {
		lo, hi, ok := physical.Bandwidth(s.Freqs, s.S11, b.db, f0)
		*b.dst = Band{Lo: lo, Hi: hi, OK: ok}
	}
	for _, b := range []struct {
		name string
		band Band
	}{{"−10 dB", r.BW10}, {"−20 dB", r.BW20}} {
		if b.band.OK && (b.band.Lo <= s.Freqs[0] || b.band.Hi >= s.Freqs[len(s.Freqs)-1]) {
			r.Warnings = append(r.Warnings, fmt.Sprintf("the %s band reaches the edge of the sweep (%s): it is at least that wide; widen [sweep] to see all of it",
				b.name, units.FormatFrequencyRange(s.Freqs[0], s.Freqs[len(s.Freqs)-1], 6)))
		}
	}
	if !r.BW10.OK {
		r.Warnings = append(r.Warnings, fmt.Sprintf("|S11| at %s is above −10 dB: the layout does not match", units.FormatFrequency(f0, 6)))
	}
	return nil
}

// viaNote is the build note of a design with a via to ground: what the
// via model is and how far the project's full-wave via study confirms it
// (DEVELOPERS.md, "Via").
const viaNote = "the via to ground is Goldfarb and Pucel's (1991) per via, a row of vias with its mutual inductance and the pad's overhang as a capacitance; " +
	"the project's full-wave (FDTD) via study (testdata/discontinuities/via-column.tsv: h 0.635–1.6 mm, εr 3.66–10.2, the via column refined until it converges) " +
	"confirms one via with h/r 4–5.3 within 0.2° of the strip at f·h ≈ 4 GHz·mm (full-wave/model 0.96–1.05) and finds the model overstating a via row's and a fatter via's inductance, " +
	"which the build warns about; the corrections are listed per element (via_mm)"
