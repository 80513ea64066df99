package tune_test

import (
	"context"
	"errors"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"

	"stubcraft/physical"
	"stubcraft/stackups"
	"stubcraft/synth"
	"stubcraft/synth/tune"
)

// buildModel builds a design given as TOML and returns its tune model and
// its sweep band.
func buildModel(t *testing.T, design string) (tune.Model, float64, float64) {
	t.Helper()
	d, err := synth.DecodeDesign(strings.NewReader(design), "test.toml", "")
	if err != nil {
		t.Fatal(err)
	}
	st, err := stackups.Load(d.StackupRef())
	if err != nil {
		t.Fatal(err)
	}
	load := synth.ConstantLoad(d.Load.Impedance)
	res, err := synth.Simulate(context.Background(), synth.BuildInput{Design: d, Stackup: st, Load: load, SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	m := tune.Model{
		Board: res.Physical.Board,
		Lines: physical.MicrostripMaker,
		Load:  load.Impedance,
		Z0:    d.Z0,
		F0:    d.Freq,
	}
	for _, e := range res.Physical.Elements {
		if e.Role == synth.RoleStub {
			m.StubIDs = append(m.StubIDs, e.ID)
		} else {
			m.ThroughIDs = append(m.ThroughIDs, e.ID)
		}
	}
	return m, res.Sweep.Freqs[0], res.Sweep.Freqs[len(res.Sweep.Freqs)-1]
}

// An invented scenario: a 2.45 GHz sensor radio's antenna at 31−j24 Ω on
// 1.6 mm FR-4, one open stub.
const openStubDesign = `
name = "bench-check"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "31-j24"
[match]
topology = "shunt-stub"
stub = "open"
pick = "shortest"
`

// bestMatchByScan finds the best match of a board by a dense scan and a
// parabola through the three lowest points: an independent check of
// Response.BestMatch.
func bestMatchByScan(t *testing.T, b physical.Board, m tune.Model, lo, hi float64) float64 {
	t.Helper()
	sim, err := physical.NewSim(b, m.Lines)
	if err != nil {
		t.Fatal(err)
	}
	const n = 4001
	ys := make([]float64, n)
	best := 0
	for i := range ys {
		f := lo + (hi-lo)*float64(i)/(n-1)
		zl, _ := m.Load(f)
		ys[i] = cmplx.Abs(sim.InputReflection(f, zl, m.Z0))
		if ys[i] < ys[best] {
			best = i
		}
	}
	if best == 0 || best == n-1 {
		t.Fatalf("best match at the band edge")
	}
	// |S11| has a V-shaped minimum near a deep match: fit the parabola to
	// |S11|², which is smooth.
	y0, y1, y2 := ys[best-1]*ys[best-1], ys[best]*ys[best], ys[best+1]*ys[best+1]
	h := (hi - lo) / (n - 1)
	off := 0.5 * (y0 - y2) / (y0 - 2*y1 + y2)
	return lo + h*(float64(best)+off)
}

func TestBestMatchAgreesWithScan(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	for _, s := range []tune.State{tune.Nominal(), {ErRatio: 1.04, LoadScale: 1}, {ErRatio: 0.97, Etch: 20e-6, LoadScale: 1}} {
		r, err := m.Simulate(s)
		if err != nil {
			t.Fatal(err)
		}
		got, _, err := r.BestMatch(lo, hi)
		if err != nil {
			t.Fatal(err)
		}
		want := bestMatchByScan(t, r.Board(), m, lo, hi)
		// Independent dense scan (exact sampling of the same model); the
		// parabola is good to a small part of the 0.125 MHz step.
		if math.Abs(got-want) > 0.05e6 {
			t.Errorf("state %+v: best match %.6f GHz, scan gives %.6f GHz", s, got/1e9, want/1e9)
		}
	}
}

// The sensitivities (a derivative at a tenth of the step) must predict the
// simulated effect of one whole step within 2 %: a check of the
// linearisation against finite differences of the full simulation.
func TestSensitivitiesAgreeWithFiniteDifferences(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	sens, err := m.Sensitivities(context.Background(), lo, hi)
	if err != nil {
		t.Fatal(err)
	}
	if want := 2*(len(m.ThroughIDs)+len(m.StubIDs)) + 2; len(sens) != want {
		t.Fatalf("%d sensitivities, want %d", len(sens), want)
	}
	zl, _ := m.Load(m.F0)
	nomSim, err := physical.NewSim(m.Board, m.Lines)
	if err != nil {
		t.Fatal(err)
	}
	g0 := nomSim.InputReflection(m.F0, zl, m.Z0)
	// stepped returns the board moved by sign whole steps of s's quantity.
	stepped := func(s tune.Sensitivity, sign float64) physical.Board {
		b := m.Board
		b.Through = append([]physical.Trace(nil), b.Through...)
		b.Stubs = append([]physical.Stub(nil), b.Stubs...)
		idx := func(ids []string) int {
			for i, id := range ids {
				if id == s.ID {
					return i
				}
			}
			return -1
		}
		i, k := idx(m.ThroughIDs), idx(m.StubIDs)
		switch s.Quantity {
		case tune.Length:
			if i >= 0 {
				b.Through[i].Length += sign * tune.LengthStep
			} else {
				b.Stubs[k].Length += sign * tune.LengthStep
			}
		case tune.Width:
			if i >= 0 {
				b.Through[i].Width += sign * tune.WidthStep
			} else {
				b.Stubs[k].Width += sign * tune.WidthStep
			}
		case tune.Er:
			b.Sub.Er *= 1 + sign*tune.ErStep
		case tune.Etch:
			for j := range b.Through {
				b.Through[j].Width -= sign * 2 * tune.EtchStep
			}
			for j := range b.Stubs {
				b.Stubs[j].Width -= sign * 2 * tune.EtchStep
			}
		}
		return b
	}
	for _, s := range sens {
		// Central finite difference of the full simulation over ± one
		// whole step (ten times the derivative's own step).
		up, down := stepped(s, 1), stepped(s, -1)
		shift := (bestMatchByScan(t, up, m, lo, hi) - bestMatchByScan(t, down, m, lo, hi)) / 2
		if math.Abs(s.BestMatchShift-shift) > 0.02*math.Abs(shift)+0.02e6 {
			t.Errorf("%s %s: predicted best-match shift %+.3f MHz per step, simulated %+.3f MHz", s.ID, s.Quantity, s.BestMatchShift/1e6, shift/1e6)
		}
		simUp, err := physical.NewSim(up, m.Lines)
		if err != nil {
			t.Fatal(err)
		}
		simDown, err := physical.NewSim(down, m.Lines)
		if err != nil {
			t.Fatal(err)
		}
		gUp, gDown := simUp.InputReflection(m.F0, zl, m.Z0), simDown.InputReflection(m.F0, zl, m.Z0)
		// S11(f0) + step·dS11/dp, with the derivative from the central
		// difference of the simulation.
		want := cmplx.Abs(g0 + (gUp-gDown)/2)
		if pred := cmplx.Abs(s.S11F0); math.Abs(pred-want) > 0.02*want+1e-5 {
			t.Errorf("%s %s: predicted |S11| at f0 after a step %.5f, finite difference %.5f", s.ID, s.Quantity, pred, want)
		}
	}
}

// Synthetic measurements: the model of a perturbed board, with 0.3 dB of
// noise on |S11|. The fit must recover εr within 1 % and the etch within
// 5 µm, and the trims must bring the true board's best match within 0.3 %
// of f0.
func TestFitRecoversPerturbedBoards(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	rng := rand.New(rand.NewPCG(1, 2))
	for _, truth := range []tune.State{
		{ErRatio: 1.05, Etch: 25e-6, LoadScale: 1},
		{ErRatio: 0.95, Etch: -25e-6, LoadScale: 1},
		{ErRatio: 1.05, Etch: -25e-6, LoadScale: 1},
		{ErRatio: 0.95, Etch: 25e-6, LoadScale: 1},
		{ErRatio: 1.02, Etch: 0, LoadScale: 1},
	} {
		r, err := m.Simulate(truth)
		if err != nil {
			t.Fatal(err)
		}
		meas := tune.Measurement{Source: "synthetic.s1p"}
		for i := 0; i < 201; i++ {
			f := lo + (hi-lo)*float64(i)/200
			g, err := r.S11(f)
			if err != nil {
				t.Fatal(err)
			}
			noiseDB := 0.3 * (2*rng.Float64() - 1)
			meas.Freqs = append(meas.Freqs, f)
			meas.S11 = append(meas.S11, g*complex(math.Pow(10, noiseDB/20), 0))
		}
		fit, err := m.Fit(context.Background(), meas, tune.FitOptions{})
		if err != nil {
			t.Fatalf("truth %+v: %v", truth, err)
		}
		if d := math.Abs(fit.State.ErRatio - truth.ErRatio); d > 0.01 {
			t.Errorf("truth %+v: fitted εr ratio %.4f ± %.4f", truth, fit.State.ErRatio, fit.Sigma.ErRatio)
		}
		if d := math.Abs(fit.State.Etch - truth.Etch); d > 5e-6 {
			t.Errorf("truth %+v: fitted etch %.2f ± %.2f µm", truth, fit.State.Etch*1e6, fit.Sigma.Etch*1e6)
		}
		tr, err := m.Trims(context.Background(), fit.State, lo, hi)
		if err != nil {
			t.Fatalf("truth %+v: %v", truth, err)
		}
		// Apply the trims to the true board and find its best match.
		stubs := make([]float64, len(r.Board().Stubs))
		for k, st := range r.Board().Stubs {
			stubs[k] = st.Length
		}
		for _, c := range tr.Trims {
			for k, id := range m.StubIDs {
				if id == c.ID {
					stubs[k] -= c.Cut
				}
			}
		}
		through := make([]float64, len(r.Board().Through))
		for j, tl := range r.Board().Through {
			through[j] = tl.Length
		}
		trimmed, err := r.WithLengths(through, stubs)
		if err != nil {
			t.Fatal(err)
		}
		got := bestMatchByScan(t, trimmed.Board(), tune.Model{Lines: m.Lines, Load: m.Load, Z0: m.Z0}, lo, hi)
		if math.Abs(got/m.F0-1) > 0.003 {
			t.Errorf("truth %+v: after the trims %v the best match is %.4f GHz", truth, tr.Trims, got/1e9)
		}
	}
}

// A measurement of another design, or one that misses f0, gives no trims.
func TestFitRefusesForeignAndShortMeasurements(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	other, _, _ := buildModel(t, strings.Replace(strings.Replace(openStubDesign, "31-j24", "12+j30", 1), `"open"`, `"short"`, 1))
	r, err := other.Simulate(tune.Nominal())
	if err != nil {
		t.Fatal(err)
	}
	var foreign, short tune.Measurement
	foreign.Source, short.Source = "other-board.s1p", "low-band.s1p"
	for i := 0; i < 101; i++ {
		f := lo + (hi-lo)*float64(i)/100
		g, err := r.S11(f)
		if err != nil {
			t.Fatal(err)
		}
		foreign.Freqs, foreign.S11 = append(foreign.Freqs, f), append(foreign.S11, g)
		if f < 0.98*m.F0 {
			short.Freqs, short.S11 = append(short.Freqs, f), append(short.S11, g)
		}
	}
	_, err = m.Fit(context.Background(), foreign, tune.FitOptions{})
	var re *tune.ResidualError
	if !errors.As(err, &re) || !strings.Contains(err.Error(), "other-board.s1p") {
		t.Errorf("a measurement of another design: got %v, want a ResidualError naming the file", err)
	}
	_, err = m.Fit(context.Background(), short, tune.FitOptions{})
	var ce *tune.CoverageError
	if !errors.As(err, &ce) || !strings.Contains(err.Error(), "low-band.s1p") {
		t.Errorf("a measurement below f0: got %v, want a CoverageError naming the file", err)
	}
}

// With FitLoad the fit also recovers a load that is not what was
// measured: a load impedance 12 % higher, on a board with εr +3 % and
// 10 µm of over-etch, with 0.2 dB of noise on |S11|; each fitted value
// carries an uncertainty (zero only for noise-free data).
func TestFitRecoversLoadScale(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	truth := tune.State{ErRatio: 1.03, Etch: 10e-6, LoadScale: 1.12}
	r, err := m.Simulate(truth)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	meas := tune.Measurement{Source: "load-scaled.s1p"}
	for i := 0; i <= 150; i++ {
		f := lo + (hi-lo)*float64(i)/150
		g, err := r.S11(f)
		if err != nil {
			t.Fatal(err)
		}
		noise := complex(math.Pow(10, 0.2*(2*rng.Float64()-1)/20), 0)
		meas.Freqs, meas.S11 = append(meas.Freqs, f), append(meas.S11, g*noise)
	}
	fit, err := m.Fit(context.Background(), meas, tune.FitOptions{FitLoad: true})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(fit.State.LoadScale-truth.LoadScale) > 0.02 || math.Abs(fit.State.ErRatio-truth.ErRatio) > 0.01 || math.Abs(fit.State.Etch-truth.Etch) > 5e-6 {
		t.Errorf("fitted %+v, truth %+v", fit.State, truth)
	}
	if !(fit.Sigma.LoadScale > 0 && fit.Sigma.ErRatio > 0 && fit.Sigma.Etch > 0) {
		t.Errorf("no uncertainty for the load scale: %+v", fit.Sigma)
	}
}

// For a band match the sensitivities state the worst |S11| across the band
// after one whole step; an independent dense scan (801 points) of the
// stepped board agrees within 0.05 dB, and no best-match shift is given.
func TestBandSensitivities(t *testing.T) {
	m, lo, hi := buildModel(t, openStubDesign)
	m.Band = [2]float64{2.4e9, 2.5e9}
	sens, err := m.Sensitivities(context.Background(), lo, hi)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range sens {
		if !math.IsNaN(s.BestMatchShift) {
			t.Errorf("%s %s: best-match shift %g given for a band match", s.ID, s.Quantity, s.BestMatchShift)
		}
		if s.Quantity != tune.Er {
			continue
		}
		b := m.Board
		b.Sub.Er *= 1 + tune.ErStep
		sim, err := physical.NewSim(b, m.Lines)
		if err != nil {
			t.Fatal(err)
		}
		worst := 0.0
		for i := 0; i <= 800; i++ {
			f := m.Band[0] + (m.Band[1]-m.Band[0])*float64(i)/800
			zl, _ := m.Load(f)
			worst = math.Max(worst, cmplx.Abs(sim.InputReflection(f, zl, m.Z0)))
		}
		if d := 20 * math.Log10(s.WorstInBand/worst); math.Abs(d) > 0.05 {
			t.Errorf("worst in band after +1 %% εr: %.3f dB, dense scan %.3f dB", 20*math.Log10(s.WorstInBand), 20*math.Log10(worst))
		}
	}
}
