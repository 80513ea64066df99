package synth

import (
	"context"
	"math"
	"math/cmplx"
	"os"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"stubcraft/physical"
	"stubcraft/stackups"
)

func decodeTestDesign(t *testing.T, text string) Design {
	t.Helper()
	d, err := DecodeDesign(strings.NewReader(text), "test.toml", "")
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func preset(t *testing.T, name string) stackups.Stackup {
	t.Helper()
	st, ok := stackups.Preset(name)
	if !ok {
		t.Fatalf("no preset %s", name)
	}
	return st
}

const fr4Open = `
name = "t"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "31-j24"
[match]
topology = "shunt-stub"
stub = "%s"
pick = "shortest"
[tolerance]
samples = 200
seed = 3
`

func build(t *testing.T, design, stackup string, skipTol bool) *Result {
	t.Helper()
	d := decodeTestDesign(t, design)
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, stackup), Load: ConstantLoad(d.Load.Impedance), SkipTolerance: skipTol})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// Consistency of the corrections with the simulation: correctStub inverts
// the tee, open-end and via models in closed form, while Sim cascades the
// same models as networks from the drawn geometry. On a lossless board the
// two must agree to rounding (exact result: a lossless matched network has
// Γ = 0), so the corrections alone, before the optimiser touches anything,
// close the match. This checks the bookkeeping (reference planes, where
// lengths are measured from), not the models themselves, which have their
// own tests against their sources.
func TestCorrectionsConsistentWithSimulation(t *testing.T) {
	for _, end := range []string{"open", "short"} {
		t.Run(end, func(t *testing.T) {
			d := decodeTestDesign(t, strings.Replace(fr4Open, "%s", end, 1))
			st := preset(t, "ptfe-glass-0.79mm")
			st.Dielectric.LossTangent = 0
			st.Copper.Conductivity = 1e15 // effectively lossless copper
			sub := st.Substrate()
			zl := d.Load.Impedance
			sections, _, err := d.Electrical(zl)
			if err != nil {
				t.Fatal(err)
			}
			ph, err := ToPhysical(sections, d.Freq, d.Z0, sub, physical.MicrostripMaker,
				PhysicalOptions{FeedLength: 5e-3, Via: physical.Via{Drill: 0.3e-3, Pad: 0.6e-3}})
			if err != nil {
				t.Fatal(err)
			}
			sim, err := physical.NewSim(ph.Board, physical.MicrostripMaker)
			if err != nil {
				t.Fatal(err)
			}
			g := sim.InputReflection(d.Freq, zl, d.Z0)
			t.Logf("%s: corrected lossless layout |S11| = %.1f dB", end, physical.MagDB(g))
			if db := physical.MagDB(g); db > -100 {
				t.Errorf("corrected lossless layout |S11| = %.1f dB at f0, want below -100 dB", db)
			}
			unc, err := physical.NewSim(ph.Uncorrected(), physical.MicrostripMaker)
			if err != nil {
				t.Fatal(err)
			}
			if db := physical.MagDB(unc.InputReflection(d.Freq, zl, d.Z0)); db < -40 {
				t.Errorf("uncorrected layout |S11| = %.1f dB: the corrections should matter", db)
			}
		})
	}
}

// The board that is simulated carries, for every element, its line length
// plus the listed corrections (the report's own identity, which the PDF and
// the fab check rely on), after the re-centring changed them.
func TestDrawnLengthIdentity(t *testing.T) {
	for _, end := range []string{"open", "short"} {
		r := build(t, strings.Replace(fr4Open, "%s", end, 1), "fr4-1.6mm", true)
		b := r.Physical.Board
		nt, ns := 0, 0
		for _, e := range r.Physical.Elements {
			sum := e.LineLength + e.OpenEnd + e.Tee + e.Via + e.Step + e.Recentre + e.Trim
			var board float64
			if e.Role == RoleStub {
				board = b.Stubs[ns].Length
				ns++
			} else {
				board = b.Through[nt].Length
				nt++
			}
			if math.Abs(sum-board) > 1e-12 {
				t.Errorf("%s %s: drawn on the board %.6g m, parts sum to %.6g m", end, e.ID, board, sum)
			}
			if e.Drawn() <= 0 {
				t.Errorf("%s %s: drawn length %.3g m", end, e.ID, e.Drawn())
			}
		}
		switch end {
		case "open":
			// Kirschning-Jansen-Koster: the open end shortens the stub.
			if s := r.Physical.Elements[len(r.Physical.Elements)-1]; !(s.OpenEnd < 0) || s.Via != 0 {
				t.Errorf("open stub: open end %.3g m, via %.3g m", s.OpenEnd, s.Via)
			}
		case "short":
			// Goldfarb-Pucel: the via's inductance acts as extra length.
			if s := r.Physical.Elements[len(r.Physical.Elements)-1]; !(s.Via < 0) || s.OpenEnd != 0 {
				t.Errorf("short stub: via %.3g m, open end %.3g m", s.Via, s.OpenEnd)
			}
		}
	}
}

// The design requirement: the corrected layout reaches −25 dB at f0 in the
// full lossy model, and is measurably better than the uncorrected one.
func TestBuildMatchesAtF0(t *testing.T) {
	for _, end := range []string{"open", "short"} {
		for _, st := range []string{"fr4-1.6mm", "hydrocarbon-ceramic-0.51mm", "alumina-0.635mm"} {
			r := build(t, strings.Replace(fr4Open, "%s", end, 1), st, true)
			if db := physical.MagDB(r.Recentre.Before); db > -25 {
				t.Errorf("%s/%s: corrected |S11| %.1f dB before re-centring, want ≤ −25", end, st, db)
			}
			if db := physical.MagDB(r.S11F0); db > -40 {
				t.Errorf("%s/%s: re-centred |S11| %.1f dB", end, st, db)
			}
			// The re-centring is a touch-up, not the match itself.
			for k, dl := range r.Recentre.Changes {
				if lg := r.Physical.Elements[0].Params.GuidedWavelength(); math.Abs(dl) > RecentreWarn*lg {
					t.Errorf("%s/%s: re-centring moved %s by %.3f mm", end, st, r.Recentre.IDs[k], dl*1e3)
				}
			}
			if physical.MagDB(r.Uncorr) < physical.MagDB(r.Recentre.Before)+3 {
				t.Errorf("%s/%s: uncorrected %.1f dB is not measurably worse than corrected %.1f dB", end, st, physical.MagDB(r.Uncorr), physical.MagDB(r.Recentre.Before))
			}
			if !r.BW10.OK || !(r.BW10.Lo < r.Design.Freq && r.Design.Freq < r.BW10.Hi) {
				t.Errorf("%s/%s: −10 dB band %+v does not hold f0", end, st, r.BW10)
			}
			if len(r.Sweep.Freqs) < 401 {
				t.Errorf("sweep has %d points", len(r.Sweep.Freqs))
			}
		}
	}
}

// lineStubDesign is a matched 50 Ω load behind a 50 Ω line of the given
// electrical length and a quarter-wave open stub (which, ideal, is a
// short: the network is for geometry, not for matching). The re-centring
// keeps it a short, so building it needs AcceptLoss.
func lineStubDesign(lineLength string) string {
	return `
name = "t"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "50"
[[section]]
kind = "line"
z0 = 50
length = "` + lineLength + `"
[[section]]
kind = "stub"
end = "open"
z0 = 50
length = "0.25wl"
`
}

// A line made negative by the feed carve moves to the next solution,
// half a guided wavelength longer, and says so.
func TestNegativeLengthMovesHalfWave(t *testing.T) {
	d := decodeTestDesign(t, lineStubDesign("10deg"))
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(50), SkipTolerance: true, AcceptLoss: true})
	if err != nil {
		t.Fatal(err)
	}
	var line, feed Element
	for _, e := range r.Physical.Elements {
		switch e.ID {
		case "line1":
			line = e
		case "feed-load":
			feed = e
		}
	}
	// The 5 mm feed is longer than 10°; the rest of the line is negative
	// until half a wavelength is added.
	if want := 10 - feed.ElectricalDeg + 180; math.Abs(line.ElectricalDeg-want) > 1e-9 || line.Drawn() <= 0 {
		t.Errorf("line1: %.4f°, drawn %.3g m; want %.4f°", line.ElectricalDeg, line.Drawn(), want)
	}
	if !strings.Contains(strings.Join(r.Notes, "\n"), "next solution") {
		t.Errorf("no note about the move in %q", r.Notes)
	}
}

// The Monte Carlo is reproducible and does not depend on the number of
// processors; another seed gives other boards.
func TestToleranceReproducible(t *testing.T) {
	design := strings.Replace(fr4Open, "%s", "open", 1)
	a := build(t, design, "fr4-1.6mm", false)
	old := runtime.GOMAXPROCS(1)
	b := build(t, design, "fr4-1.6mm", false)
	runtime.GOMAXPROCS(old)
	for i := range a.Tolerance.S11DB {
		if a.Tolerance.S11DB[i] != b.Tolerance.S11DB[i] {
			t.Fatalf("sample %d differs: %v vs %v", i, a.Tolerance.S11DB[i], b.Tolerance.S11DB[i])
		}
	}
	c := build(t, strings.Replace(design, "seed = 3", "seed = 4", 1), "fr4-1.6mm", false)
	if c.Tolerance.P50 == a.Tolerance.P50 {
		t.Error("another seed gave the same median")
	}
	tol := a.Tolerance
	if !(tol.P50 <= tol.P90) || tol.Yield < 0 || tol.Yield > 1 {
		t.Errorf("p50 %.2f, p90 %.2f, yield %.3f", tol.P50, tol.P90, tol.Yield)
	}
	// The nominal board is the best one can hope for only in expectation:
	// the spread must actually move |S11| (a tolerance run that changes
	// nothing is broken).
	if tol.P90 <= physical.MagDB(a.S11F0)+1 {
		t.Errorf("p90 %.1f dB hardly differs from nominal %.1f dB", tol.P90, physical.MagDB(a.S11F0))
	}
}

// A Touchstone load is interpolated across the band; a constant file gives
// the same build as the constant load.
func TestTouchstoneLoadBuild(t *testing.T) {
	z := complex(31, -24)
	g := physical.Reflection(z, 50)
	text := "! constant load\n# GHz S RI R 50\n1.0 " + ftoa(real(g)) + " " + ftoa(imag(g)) + "\n4.0 " + ftoa(real(g)) + " " + ftoa(imag(g)) + "\n"
	ts, err := physical.ReadTouchstone(strings.NewReader(text), "c.s1p", 1)
	if err != nil {
		t.Fatal(err)
	}
	d := decodeTestDesign(t, strings.Replace(fr4Open, "%s", "open", 1))
	a, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(z), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	b, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: TouchstoneLoad{File: ts, Path: "c.s1p"}, SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	for i := range a.Sweep.S11 {
		if cmplx.Abs(a.Sweep.S11[i]-b.Sweep.S11[i]) > 1e-9 {
			t.Fatalf("point %d: %v vs %v", i, a.Sweep.S11[i], b.Sweep.S11[i])
		}
	}
}

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', 17, 64) }

// The stackup's own spread feeds the tolerance analysis unless the design
// gives one.
func TestStackupSpreadDefaults(t *testing.T) {
	st := preset(t, "fr4-1.6mm")
	if st.Spread.ErRel <= 0 {
		t.Skip("the preset carries no εr spread")
	}
	d := decodeTestDesign(t, strings.Replace(fr4Open, "%s", "open", 1))
	applyStackupSpread(&d, st)
	if d.Tolerance.Er != st.Spread.ErRel {
		t.Errorf("εr spread %g, want the stackup's %g", d.Tolerance.Er, st.Spread.ErRel)
	}
	d = decodeTestDesign(t, strings.Replace(fr4Open, "%s", "open", 1)+"er = \"3%\"\n")
	applyStackupSpread(&d, st)
	if d.Tolerance.Er != 0.03 {
		t.Errorf("εr spread %g, want the design's 0.03", d.Tolerance.Er)
	}
}

// A hand-worked double-stub network (two tees, a line between them with a
// reference-plane shift at each end, a 70 Ω shorted stub). Its electrical
// solution was found independently by a bisection in plain complex
// arithmetic (lossless lines), so the electrical network itself presents
// |Γ| < 1e-4. On a lossless board the corrections alone close the match
// (exact result: Γ = 0); on lossy FR-4 the re-centring takes out the loss.
func TestDoubleStubSections(t *testing.T) {
	data, err := os.ReadFile("../testdata/designs/double-stub-sections.toml")
	if err != nil {
		t.Fatal(err)
	}
	d := decodeTestDesign(t, string(data))
	lossless := preset(t, "fr4-1.6mm")
	lossless.Dielectric.LossTangent = 0
	lossless.Copper.Conductivity = 1e15
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: lossless, Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	if g := cmplx.Abs(physical.Reflection(SectionsInput(r.Sections, d.Load.Impedance), d.Z0)); g > 1e-4 {
		t.Fatalf("the electrical network presents |Γ| = %.2g", g)
	}
	if db := physical.MagDB(r.Recentre.Before); db > -50 {
		t.Errorf("lossless: corrected |S11| %.1f dB before re-centring, want below −50 dB", db)
	}
	if physical.MagDB(r.Uncorr) < physical.MagDB(r.Recentre.Before)+10 {
		t.Errorf("lossless: uncorrected %.1f dB vs corrected %.1f dB", physical.MagDB(r.Uncorr), physical.MagDB(r.Recentre.Before))
	}
	var line2 Element
	stubs := 0
	for _, e := range r.Physical.Elements {
		if e.ID == "line2" {
			line2 = e
		}
		if e.Role == RoleStub {
			stubs++
		}
	}
	if stubs != 2 {
		t.Fatalf("%d stubs", stubs)
	}
	// line2 sits between two tees: it carries a shift at each end.
	tee := physical.Tee{ThroughZ0: line2.Params.Z0, ThroughEpsEff: line2.Params.EpsEff, StubZ0: line2.Params.Z0,
		StubEpsEff: line2.Params.EpsEff, H: 1.6e-3, Er: 4.4}.At(d.Freq)
	if line2.Tee <= tee.ThroughShift {
		t.Errorf("line2 tee correction %.4g m, want more than one shift (%.4g m)", line2.Tee, tee.ThroughShift)
	}
	lossy, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	if db := physical.MagDB(lossy.S11F0); db > -40 {
		t.Errorf("FR-4: re-centred |S11| %.1f dB", db)
	}
}

// A line too short to hold its stub borrows length from the load-side
// feed, which is the same line: the electrical total is unchanged.
func TestFirstLineBorrowsFromFeed(t *testing.T) {
	d := decodeTestDesign(t, lineStubDesign("28deg"))
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(50), SkipTolerance: true, AcceptLoss: true})
	if err != nil {
		t.Fatal(err)
	}
	var feed, line, stub Element
	for _, e := range r.Physical.Elements {
		switch e.ID {
		case "feed-load":
			feed = e
		case "line1":
			line = e
		case "stub1":
			stub = e
		}
	}
	if math.Abs(feed.ElectricalDeg+line.ElectricalDeg-28) > 1e-9 {
		t.Errorf("feed %.4f° + line %.4f° ≠ 28°", feed.ElectricalDeg, line.ElectricalDeg)
	}
	if feed.Drawn() >= 5e-3 || line.Drawn()-line.Recentre < stub.Width/2-1e-12 {
		t.Errorf("feed %.4g m, line %.4g m, stub width %.4g m", feed.Drawn(), line.Drawn(), stub.Width)
	}
	if !strings.Contains(strings.Join(r.Notes, "\n"), "taken from the load-side feed") {
		t.Errorf("no note in %q", r.Notes)
	}
}

// With no spread, a tolerance sample on a field-solver stackup is the
// nominal line at f0: the scaled closed form reproduces the solver model's
// Z0, εeff and attenuations there (to rounding).
func TestToleranceMakerNominal(t *testing.T) {
	st := preset(t, "fr4-1.6mm-masked")
	sub := st.Substrate()
	mk := LineMakerFor(context.Background(), st, NewSolverCache())
	const f0, w = 2.45e9, 2.99e-3
	b := physical.Board{Sub: sub, Through: []physical.Trace{{Width: w, Length: 1e-2}, {Width: w, Length: 1e-2}}}
	tmk, err := ToleranceMaker(b, mk, true, f0)
	if err != nil {
		t.Fatal(err)
	}
	m, err := mk(w, sub)
	if err != nil {
		t.Fatal(err)
	}
	s, err := tmk(w, sub)
	if err != nil {
		t.Fatal(err)
	}
	pm, ps := m.At(f0), s.At(f0)
	for _, c := range []struct {
		name string
		a, b float64
	}{{"Z0", pm.Z0, ps.Z0}, {"εeff", pm.EpsEff, ps.EpsEff}, {"αc", pm.AlphaConductor, ps.AlphaConductor}, {"αd", pm.AlphaDielectric, ps.AlphaDielectric}} {
		if math.Abs(c.a-c.b) > 1e-12*math.Abs(c.a) {
			t.Errorf("%s: solver %.12g, scaled closed form %.12g", c.name, c.a, c.b)
		}
	}
}

// A stackup's εr given at another frequency is moved to f0 by the
// wideband Debye model and the build says so; without er_frequency, or at
// that frequency, nothing moves.
func TestSubstrateAtDesignFrequency(t *testing.T) {
	st := preset(t, "fr4-1.6mm")
	if st.Dielectric.ErFrequency != 1e9 {
		t.Skipf("the preset gives εr at %g Hz", st.Dielectric.ErFrequency)
	}
	sub, notes := SubstrateAt(st, 2.45e9)
	want, _ := physical.FitWidebandDebye(st.Dielectric.Er, st.Dielectric.LossTangent, 1e9).At(2.45e9)
	if sub.Er != want || len(notes) != 1 || !strings.Contains(notes[0], "wideband Debye") {
		t.Errorf("εr %.4f (want %.4f), notes %q", sub.Er, want, notes)
	}
	if same, notes := SubstrateAt(st, 1e9); same.Er != st.Dielectric.Er || notes != nil {
		t.Errorf("at the reference frequency: εr %.4f, notes %q", same.Er, notes)
	}
	st.Dielectric.ErFrequency = 0
	if same, _ := SubstrateAt(st, 2.45e9); same.Er != st.Dielectric.Er {
		t.Errorf("without er_frequency: εr %.4f", same.Er)
	}
	r := build(t, strings.Replace(fr4Open, "%s", "open", 1), "fr4-1.6mm", true)
	if r.Physical.Board.Sub.Er != want {
		t.Errorf("the build used εr %.4f, want %.4f", r.Physical.Board.Sub.Er, want)
	}
}

// A feed of many wavelengths moves the line by a whole number of half
// wavelengths in one step (modular arithmetic, no loop per half wave): the
// drawn line ends up in [0, λg/2) and the electrical length changes by a
// multiple of 180° (exact: a lossless line repeats every half wavelength).
func TestLongFeedMovesManyHalfWaves(t *testing.T) {
	d := decodeTestDesign(t, lineStubDesign("10deg"))
	st := preset(t, "fr4-1.6mm")
	sub, _ := SubstrateAt(st, d.Freq)
	mk := LineMakerFor(context.Background(), st, NewSolverCache())
	secs := []Section{{Kind: SeriesLine, Z0: 50, LengthDeg: 10}, {Kind: ShuntStub, End: Open, Z0: 50, LengthDeg: 90}}
	for _, feed := range []float64{0.005, 3, 1e3, 1e9} {
		p, err := ToPhysical(secs, d.Freq, 50, sub, mk, PhysicalOptions{FeedLength: feed, Via: physical.Via{Drill: 0.3e-3, Pad: 0.6e-3}})
		if err != nil {
			t.Fatalf("feed %g m: %v", feed, err)
		}
		line := p.Elements[1]
		half := line.Params.GuidedWavelength() / 2
		if line.ID != "line1" || line.LineLength < 0 || line.LineLength >= half+1e-9 {
			t.Errorf("feed %g m: %s is %g m, want [0, %g)", feed, line.ID, line.LineLength, half)
		}
		total := line.ElectricalDeg + p.Elements[0].ElectricalDeg
		if k := (total - 10) / 180; math.Abs(k-math.Round(k)) > 1e-6*math.Max(1, k) {
			t.Errorf("feed %g m: feed + line = %g°, not 10° plus whole half waves", feed, total)
		}
	}
}

// SkipSensitivity (compare) drops the sensitivities and nothing else;
// Build ignores it, since the trim note needs them.
func TestSkipSensitivity(t *testing.T) {
	in, err := LoadDemo(LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.Design.Tolerance.Samples = 100
	full, err := Simulate(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	in.SkipSensitivity = true
	skip, err := Simulate(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	if len(full.Sensitivity) == 0 || len(skip.Sensitivity) != 0 {
		t.Fatalf("%d sensitivities in full, %d with SkipSensitivity; want some and none", len(full.Sensitivity), len(skip.Sensitivity))
	}
	if skip.S11F0 != full.S11F0 || skip.Tolerance.P50 != full.Tolerance.P50 || skip.Tolerance.P90 != full.Tolerance.P90 || skip.LossF0DB != full.LossF0DB {
		t.Errorf("skipping the sensitivities changed the figures: S11 %v/%v, p50 %v/%v, p90 %v/%v",
			skip.S11F0, full.S11F0, skip.Tolerance.P50, full.Tolerance.P50, skip.Tolerance.P90, full.Tolerance.P90)
	}
	built, err := Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	if len(built.Sensitivity) != len(full.Sensitivity) {
		t.Errorf("Build with SkipSensitivity: %d sensitivities, want %d", len(built.Sensitivity), len(full.Sensitivity))
	}
}
