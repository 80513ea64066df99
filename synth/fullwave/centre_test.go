package fullwave

import (
	"context"
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"stubcraft/physical"
	"stubcraft/physical/fdtd"
	"stubcraft/synth"
)

// demoInput is the embedded demo without its tolerance analysis.
func demoInput(t *testing.T) synth.BuildInput {
	t.Helper()
	in, err := synth.LoadDemo(synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	return in
}

// scaledSolver is a stand-in for the full-wave solve whose truth the test
// knows: the circuit model of the drawn copper with every element's length
// multiplied by scale(call), call counting from 1. A board that is
// electrically longer than the circuit model says (scale > 1) puts its
// best match below f0.
func scaledSolver(scale func(call int) float64) func(context.Context, *synth.Result) (*Report, error) {
	call := 0
	return func(ctx context.Context, res *synth.Result) (*Report, error) {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		call++
		k := scale(call)
		extra := make([]float64, len(res.Physical.Elements))
		for i, e := range res.Physical.Elements {
			extra[i] = k*e.Drawn() - e.ModelLength()
		}
		s, err := res.ModelNetwork(extra, res.Sweep.Freqs)
		if err != nil {
			return nil, err
		}
		return Compare(res, s)
	}
}

// truthBestMatch is the best match of res's drawn copper on the stand-in
// truth (every drawn length times scale), found independently of the code
// under test: the board rebuilt from the drawn lengths, simulated with the
// closed-form microstrip lines (the demo's model) and searched on a 0.01 %
// grid within ±10 % of f0.
func truthBestMatch(t *testing.T, res *synth.Result, zl complex128, scale float64) float64 {
	t.Helper()
	b := physical.Board{Sub: res.Physical.Board.Sub, Via: res.Physical.Board.Via}
	for _, e := range res.Physical.Elements {
		if e.Role == synth.RoleStub {
			b.Stubs = append(b.Stubs, physical.Stub{At: e.At, Width: e.Width, Length: scale * e.Drawn(), Short: e.End == synth.Short})
			continue
		}
		b.Through = append(b.Through, physical.Trace{Width: e.Width, Length: scale * e.Drawn()})
	}
	sim, err := physical.NewSim(b, physical.MicrostripMaker)
	if err != nil {
		t.Fatal(err)
	}
	f0, z0 := res.Design.Freq, res.Design.Z0
	best, bestMag := 0.0, math.Inf(1)
	for i := -1000; i <= 1000; i++ {
		f := f0 * (1 + 1e-4*float64(i))
		if m := cmplx.Abs(sim.InputReflection(f, zl, z0)); m < bestMag {
			best, bestMag = f, m
		}
	}
	return best
}

// TestCentreRecoversKnownScale runs the centring against a stand-in truth
// 3 % longer than the circuit model (exact: the stand-in is the model
// itself with scaled lengths). The plain build's best match on that truth
// is about 3 % low; the centred copper's must be within 0.3 % of f0 on the
// truth, found independently, and the fitted offsets must be the 3 % that
// the truth adds.
func TestCentreRecoversKnownScale(t *testing.T) {
	const scale = 1.03
	in := demoInput(t)
	plain, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	zl := complex(31, -24) // the demo's load (synth/demo/soil-probe.toml)
	f0 := in.Design.Freq
	if off := truthBestMatch(t, plain, zl, scale)/f0 - 1; math.Abs(off) < 0.02 {
		t.Fatalf("the plain build is already within %.2f %% of f0 on the truth: the test would prove nothing", 100*off)
	}
	c, err := Centre(context.Background(), in, CentreOptions{Solver: scaledSolver(func(int) float64 { return scale }), Mesh: "test"})
	if err != nil {
		t.Fatal(err)
	}
	rec := c.Result.FullwaveCentre
	if rec == nil || !rec.Converged {
		t.Fatalf("not converged: %+v", rec)
	}
	if len(rec.Runs) > DefaultCentreRuns {
		t.Errorf("%d runs, at most %d allowed", len(rec.Runs), DefaultCentreRuns)
	}
	got := truthBestMatch(t, c.Result, zl, scale)
	t.Logf("%d runs; truth best match of the plain build %.4f GHz, of the centred copper %.4f GHz (%+.3f %%)",
		len(rec.Runs), truthBestMatch(t, plain, zl, scale)/1e9, got/1e9, 100*(got/f0-1))
	if math.Abs(got/f0-1) > DefaultCentreTolerance {
		t.Errorf("centred copper's best match on the truth %.4f GHz, %+.3f %% from f0; want within ±0.3 %%", got/1e9, 100*(got/f0-1))
	}
	// Each line and stub is 3 % of its drawn length longer in the truth;
	// the first line also carries the load-side feed (the same line).
	kept := rec.Runs[rec.Kept]
	m := c.Result.Physical.Elements
	drawn := map[string]float64{}
	for _, e := range m {
		drawn[e.ID] = kept.Drawn[e.ID]
	}
	want := map[string]float64{
		"line1":       (scale - 1) * (drawn["line1"] + drawn["feed-load"]),
		"stub1":       (scale - 1) * drawn["stub1"],
		"feed-source": (scale - 1) * drawn["feed-source"],
	}
	for id, w := range want {
		// The offsets are fitted on an earlier layout, whose lengths
		// differ from the kept one's by the re-centring (about 3 %).
		if g := kept.Map.Offsets[id]; math.Abs(g-w) > 0.05*math.Abs(w)+2e-6 {
			t.Errorf("%s: fitted offset %.4f mm, the truth adds %.4f mm", id, g*1e3, w*1e3)
		}
	}
	// The copper changed, the model lengths of the re-centred elements
	// did not move far from the plain build's.
	for i, e := range c.Result.Physical.Elements {
		if e.Role == synth.RoleFeed {
			continue
		}
		p := plain.Physical.Elements[i]
		if math.Abs(e.Drawn()-p.Drawn()) < 0.01*p.Drawn() {
			t.Errorf("%s: drawn %.4f mm, the plain build %.4f mm: the centring should have shortened it by about 3 %%", e.ID, e.Drawn()*1e3, p.Drawn()*1e3)
		}
	}
}

// TestCentreNotConvergedSaysSo gives the centring a truth that moves
// between runs (3 % longer, then 3 % shorter, then longer again), which no
// mapping can follow: the result must say it did not converge, keep the
// run nearest f0 and lead the warnings with it.
func TestCentreNotConvergedSaysSo(t *testing.T) {
	in := demoInput(t)
	scales := []float64{1.03, 0.97, 1.03}
	c, err := Centre(context.Background(), in, CentreOptions{Solver: scaledSolver(func(n int) float64 { return scales[(n-1)%3] }), Mesh: "test"})
	if err != nil {
		t.Fatal(err)
	}
	rec := c.Result.FullwaveCentre
	if rec.Converged {
		t.Fatalf("converged on a moving truth: %+v", rec.Runs)
	}
	if len(rec.Runs) != DefaultCentreRuns {
		t.Errorf("%d runs, want %d", len(rec.Runs), DefaultCentreRuns)
	}
	f0 := in.Design.Freq
	for i, r := range rec.Runs {
		if math.Abs(r.Offset(f0)) < math.Abs(rec.Runs[rec.Kept].Offset(f0)) {
			t.Errorf("kept run %d (%+.2f %%), but run %d is nearer f0 (%+.2f %%)", rec.Kept+1, 100*rec.Runs[rec.Kept].Offset(f0), i+1, 100*r.Offset(f0))
		}
	}
	if len(c.Result.Warnings) == 0 || !strings.HasPrefix(c.Result.Warnings[0], "FULL-WAVE CENTRING DID NOT CONVERGE") {
		t.Errorf("first warning %q: want the non-convergence", c.Result.Warnings)
	}
	if c.Report.BestMatchHz != rec.Runs[rec.Kept].BestMatchHz {
		t.Errorf("report of %.6g Hz is not the kept run's %.6g Hz", c.Report.BestMatchHz, rec.Runs[rec.Kept].BestMatchHz)
	}
}

// TestCentreRefusals: a band match, a context cancelled before the start
// or after the first run, and a grid above the memory limit each stop the
// centring with their own error.
func TestCentreRefusals(t *testing.T) {
	band, err := synth.LoadDesign("../../testdata/designs/band-double-stub.toml", synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	band.SkipTolerance = true
	if _, err := Centre(context.Background(), band, CentreOptions{Solver: scaledSolver(func(int) float64 { return 1 })}); !errors.Is(err, synth.ErrFullwaveMapBand) {
		t.Errorf("band design: err = %v, want ErrFullwaveMapBand", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Centre(ctx, demoInput(t), CentreOptions{Solver: scaledSolver(func(int) float64 { return 1 })}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: err = %v, want context.Canceled", err)
	}
	// Cancelled after the first full-wave run: the fit of the mapping
	// stops with the context's error.
	ctx, cancel = context.WithCancel(context.Background())
	defer cancel()
	solve := scaledSolver(func(int) float64 { return 1.03 })
	first := func(ctx context.Context, res *synth.Result) (*Report, error) {
		rep, err := solve(ctx, res)
		cancel()
		return rep, err
	}
	if _, err := Centre(ctx, demoInput(t), CentreOptions{Solver: first}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled after run 1: err = %v, want context.Canceled", err)
	}
	var me *fdtd.MemoryError
	_, err = Centre(context.Background(), demoInput(t), CentreOptions{Solve: fdtd.Options{Mesh: fdtd.Coarse.Params(), MemoryLimit: 1 << 20}})
	if !errors.As(err, &me) {
		t.Errorf("1 MiB limit: err = %v, want *fdtd.MemoryError", err)
	}
}

// TestFullwaveMapMovesModelNotCopper: a mapping lengthens the circuit
// model's elements, not their copper; the re-centring then draws them
// shorter by about the offset, so the model lengths stay where the plain
// build's are.
func TestFullwaveMapMovesModelNotCopper(t *testing.T) {
	in := demoInput(t)
	plain, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	in.FullwaveMap = &synth.FullwaveMapping{Offsets: map[string]float64{"stub1": 0.2e-3, "line1": -0.1e-3}}
	mapped, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	for i, e := range mapped.Physical.Elements {
		p := plain.Physical.Elements[i]
		off := in.FullwaveMap.Offsets[e.ID]
		if e.FullwaveMap != off {
			t.Errorf("%s: FullwaveMap %g, want %g", e.ID, e.FullwaveMap, off)
		}
		// Within 20 µm: the tee's and open end's share of the change is
		// not a pure length (common practice, no source).
		if d := e.ModelLength() - p.ModelLength(); math.Abs(d) > 20e-6 {
			t.Errorf("%s: model length moved %.4f mm (offset %.3f mm), want it kept", e.ID, d*1e3, off*1e3)
		}
	}
	in.FullwaveMap = &synth.FullwaveMapping{Offsets: map[string]float64{"stub9": 1e-4}}
	if _, err := synth.Build(context.Background(), in); err == nil || !strings.Contains(err.Error(), "stub9") {
		t.Errorf("unknown element: err = %v, want one naming stub9", err)
	}
}

// TestCentreCoarseFDTD is the whole procedure on the full-wave solver, on
// the coarse mesh: the demo drawn from a circuit model deliberately 4 %
// too long (a mapping that lengthens every line and stub by 4 % of its
// length, so the copper comes out about 4 % short; the plain demo's
// full-wave best match sits 0.65 % below f0 on this mesh with the
// T-junction fitted to the full-wave sweep, so run 1 lands about 2 % high). The centring must bring the full-wave best match
// within 0.3 % of f0 in at most three runs; the best match is re-read here
// from the raw full-wave network with the load attached independently.
// About 20 s on an idle 2-core machine (two or three coarse solves).
func TestCentreCoarseFDTD(t *testing.T) {
	if testing.Short() {
		t.Skip("three coarse full-wave solves; skipped with -short")
	}
	in := demoInput(t)
	plain, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	wrong := &synth.FullwaveMapping{Offsets: map[string]float64{}}
	for _, e := range plain.Physical.Elements {
		if e.Role != synth.RoleFeed {
			wrong.Offsets[e.ID] = 0.04 * e.Drawn()
		}
	}
	in.FullwaveMap = wrong
	c, err := Centre(context.Background(), in, CentreOptions{Solve: fdtd.Options{Mesh: fdtd.Coarse.Params()}, Mesh: "coarse"})
	if err != nil {
		t.Fatal(err)
	}
	rec := c.Result.FullwaveCentre
	f0 := in.Design.Freq
	for i, r := range rec.Runs {
		t.Logf("run %d: best match %.4f GHz (%+.2f %%), |S11| at f0 %.1f dB, %d cells, %.1f s", i+1, r.BestMatchHz/1e9, 100*r.Offset(f0), r.S11DBF0, r.Cells, r.Seconds)
	}
	// More than three times the tolerance, so that the test proves
	// something, without tying it to today's models (+1.61 % at 4 % on
	// 2026-12-04 06:32Z, after the tee and z-cell fixes).
	if off := rec.Runs[0].Offset(f0); off < 3*DefaultCentreTolerance {
		t.Errorf("run 1 best match %+.2f %% from f0: the deliberate offset did not show", 100*off)
	}
	if !rec.Converged {
		t.Errorf("not converged in %d runs", len(rec.Runs))
	}
	// The best match re-read from the raw network: the load attached by
	// S11 + S12·S21·Γ/(1 − S22·Γ) (Pozar 4th ed., eq. 4.81, from memory),
	// the smallest |S11| on the sweep grid.
	rep := c.Report
	z0 := complex(in.Design.Z0, 0)
	gl := (complex(31, -24) - z0) / (complex(31, -24) + z0)
	best, bestMag := 0.0, math.Inf(1)
	for k, s := range rep.Network {
		if m := cmplx.Abs(s[0][0] + s[0][1]*s[1][0]*gl/(1-s[1][1]*gl)); m < bestMag {
			best, bestMag = rep.Freqs[k], m
		}
	}
	step := rep.Freqs[1] - rep.Freqs[0]
	if math.Abs(best-f0) > DefaultCentreTolerance*f0+step/2 {
		t.Errorf("kept layout's full-wave best match %.4f GHz (%+.2f %%), want within 0.3 %% of f0 (grid step %.2f MHz)", best/1e9, 100*(best/f0-1), step/1e6)
	}
}

// TestCentreRefusesFullwaveMismatch: when the kept layout's full-wave
// |S11| at f0 is above −10 dB the centring refuses it like Build refuses
// a circuit mismatch, unless AcceptMismatch. The stand-in full-wave is a
// network that reflects half the wave at every frequency (−6 dB with any
// load).
func TestCentreRefusesFullwaveMismatch(t *testing.T) {
	half := func(ctx context.Context, res *synth.Result) (*Report, error) {
		s := make([][2][2]complex128, len(res.Sweep.Freqs))
		for k := range s {
			s[k] = [2][2]complex128{{0.5, 0}, {0, 0.5}}
		}
		return Compare(res, s)
	}
	var mm *synth.MismatchError
	_, err := Centre(context.Background(), demoInput(t), CentreOptions{Solver: half})
	if !errors.As(err, &mm) {
		t.Fatalf("err = %v, want a *synth.MismatchError", err)
	}
	if math.Abs(mm.S11DB-20*math.Log10(0.5)) > 0.01 || math.IsNaN(mm.ElectricalGamma) {
		t.Errorf("mismatch %+v: want |S11| −6.02 dB and a figure for the electrical network", mm)
	}
	in := demoInput(t)
	in.AcceptMismatch = true
	c, err := Centre(context.Background(), in, CentreOptions{Solver: half})
	if err != nil {
		t.Fatal(err)
	}
	if c.Result.FullwaveCentre.Converged {
		t.Error("converged on a network that matches nothing")
	}
}
