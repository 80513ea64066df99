package physical

import (
	"math"
	"math/cmplx"
	"testing"
)

// tee50 is a tee of 50 Ω lines on 0.635 mm, εr 9.8 (εeff 6.6 for both arms,
// a typical value, from memory), with the stub impedance set by r = Z1/Z2.
func tee50(r, h float64) Tee {
	return Tee{ThroughZ0: 50, ThroughEpsEff: 6.6, StubZ0: 50 / r, StubEpsEff: 6.6, H: h, Er: 9.8}
}

func TestTeeStatic(t *testing.T) {
	// At zero frequency the model gives n = 1 and B = 0 exactly, while the
	// shifts keep their static values: d1 = max(D2 − 2h, 0)·(0.097 +
	// 0.0385·(r − 1)) (fit to the full-wave sweep, testdata/tee) and d2/D1 =
	// 0.5 − r·(0.05 + 0.7·e^(−1.6r) − 0.17·ln r) (Hammerstad 1981, from
	// memory) + 0.026 − 0.022·r (fit). Here h = 0.635 mm and
	// D2 = η0·h/(Z2·√6.6) = 1.862366 mm·(50 Ω/Z2).
	tests := []struct {
		r          float64
		d1D2, d2D1 float64 // by hand: e^(−1.6) = 0.2018965, e^(−3.2) = 0.0407622, ln 2 = 0.6931472
	}{
		{1, (1 - 1.27/1.862366) * 0.097, 0.5 - 0.05 - 0.7*0.2018965 + 0.026 - 0.022},                   // 0.0308525, 0.3126724
		{2, (1 - 1.27/3.724732) * 0.1355, 0.5 - 2*(0.05+0.7*0.0407622-0.17*0.6931472) + 0.026 - 0.044}, // 0.0893036, 0.5606030
		{0.5, 0, 0.5 - 0.5*(0.05+0.7*0.4493290+0.17*0.6931472) + 0.026 - 0.011},                        // D2 < 2h: no shift; e^(−0.8) = 0.4493290
	}
	for _, tt := range tests {
		p := tee50(tt.r, 0.635e-3).At(0)
		if p.N != 1 || p.B != 0 {
			t.Errorf("r %g: at 0 Hz n = %g, B = %g, want 1 and 0 (exact in the model)", tt.r, p.N, p.B)
		}
		if got := p.ThroughShift / p.D2; math.Abs(got-tt.d1D2) > 1e-6 {
			t.Errorf("r %g: d1/D2 = %.7f, want %.7f (static, by hand)", tt.r, got, tt.d1D2)
		}
		if got := p.StubShift / p.D1; math.Abs(got-tt.d2D1) > 1e-6 {
			t.Errorf("r %g: d2/D1 = %.7f, want %.7f (static, by hand)", tt.r, got, tt.d2D1)
		}
		if len(p.Warnings) != 0 {
			t.Errorf("r %g: warnings %v", tt.r, p.Warnings)
		}
	}
}

func TestTeeWidthsAndCutoff(t *testing.T) {
	// D = η0·h/(Z·√εeff) is the width of a parallel-plate guide of the same
	// Z and εeff (exact: Z = η0·h/(D·√εeff) for a parallel-plate line), and
	// the first higher-order mode of that guide is cut off where it is half
	// a wavelength wide, fc = c0/(2·D·√εeff) (exact). Hammerstad's
	// 0.4·Z/h GHz·mm rounds 0.3979 and must be within 0.6 %.
	tee := tee50(1, 0.635e-3)
	p := tee.At(1e9)
	if want := Eta0 * 0.635e-3 / (50 * math.Sqrt(6.6)); math.Abs(p.D1-want) > 1e-15 {
		t.Errorf("D1 = %g, want %g (exact)", p.D1, want)
	}
	fc := C0 / (2 * p.D1 * math.Sqrt(6.6))
	if d := math.Abs(p.Fp1-fc) / fc; d > 0.006 {
		t.Errorf("fp1 = %.5g Hz, parallel-plate cut-off %.5g Hz, differ %.2f %% (exact: TE1 cut-off)", p.Fp1, fc, 100*d)
	}
}

func TestTeeShiftsAreFractionsOfWidths(t *testing.T) {
	// The shifts are fractions of the arm widths: 0 ≤ d1 < D2/2 and
	// 0 < d2 < D1 for impedance ratios 0.5 to 2 below half the cut-off
	// (Hammerstad 1981 describes them so, from memory; the full-wave sweep
	// of testdata/tee agrees). d1 is 0 when D2 < 2h (a stub narrower than
	// about W/h = 0.3 here).
	for _, r := range []float64{0.5, 0.8, 1, 1.5, 2} {
		tee := tee50(r, 0.635e-3)
		fp := tee.At(0).Fp1
		for _, f := range []float64{0, fp / 20, fp / 8, fp / 4} {
			p := tee.At(f)
			if !(p.ThroughShift >= 0 && p.ThroughShift < p.D2/2) {
				t.Errorf("r %g f %.3g GHz: d1 = %.3g mm, D2 = %.3g mm", r, f/1e9, p.ThroughShift*1e3, p.D2*1e3)
			}
			if !(p.StubShift > 0 && p.StubShift < p.D1) {
				t.Errorf("r %g f %.3g GHz: d2 = %.3g mm, D1 = %.3g mm", r, f/1e9, p.StubShift*1e3, p.D1*1e3)
			}
			if !(p.N > 0 && p.N <= 1) {
				t.Errorf("r %g f %.3g GHz: n = %g, want in (0, 1]", r, f/1e9, p.N)
			}
		}
	}
}

func TestTeeIdealLimit(t *testing.T) {
	// The junction becomes an ideal tee when both equivalent widths go to
	// zero. Two ways to get there at a fixed 10 GHz, each exact in the
	// model: h → 0 at fixed impedances (D ∝ h, fp1 ∝ 1/h), and both
	// impedances → ∞ at a fixed ratio (D ∝ 1/Z, fp1 ∝ Z). In both the
	// shifts and B vanish and n → 1.
	const f = 10e9
	tests := []struct {
		name string
		tee  func(s float64) Tee // s → 0 is the limit
	}{
		{"h to zero", func(s float64) Tee { return tee50(1.3, 0.635e-3*s) }},
		{"impedances to infinity", func(s float64) Tee {
			t := tee50(1.3, 0.635e-3)
			t.ThroughZ0 /= s
			t.StubZ0 /= s
			return t
		}},
	}
	for _, tt := range tests {
		first := tt.tee(1).At(f)
		static := tt.tee(1).At(0)
		for _, sc := range []float64{1e-2, 1e-4, 1e-6} {
			p := tt.tee(sc).At(f)
			// D scales with s (exact), the shifts as D times their static
			// fraction (the frequency terms go as φ² ∝ s²), 1 − n as s²,
			// and B at least as s.
			if d := math.Abs(p.D1/first.D1 - sc); d > 1e-12 {
				t.Errorf("%s s=%g: D1 ratio %g, want %g", tt.name, sc, p.D1/first.D1, sc)
			}
			// d1 goes with D2 − 2h: a fixed fraction of D2 when h → 0, and
			// exactly 0 once D2 < 2h when the impedances grow.
			wantD1 := static.ThroughShift / static.D2
			if p.D2 < 2*tt.tee(sc).H {
				wantD1 = 0
			}
			for _, c := range []struct{ got, want float64 }{
				{p.ThroughShift / p.D2, wantD1},
				{p.StubShift / p.D1, static.StubShift / static.D1},
			} {
				if math.Abs(c.got-c.want) > 10*sc*sc*math.Abs(c.want) {
					t.Errorf("%s s=%g: shift/D = %.9g, want the static %.9g", tt.name, sc, c.got, c.want)
				}
			}
			if 1-p.N > 10*sc*sc*(1-first.N) {
				t.Errorf("%s s=%g: 1 − n = %g, want ≤ s²·%g", tt.name, sc, 1-p.N, 1-first.N)
			}
			if math.Abs(p.B) > 2*sc*math.Abs(first.B) {
				t.Errorf("%s s=%g: B = %g, want ≤ s·%g", tt.name, sc, p.B, first.B)
			}
		}
	}
}

func TestTeeSusceptanceSize(t *testing.T) {
	// Common practice, no source: the excess capacitance B/ω of a 50 Ω
	// tee on a 0.635 mm ceramic substrate is some femtofarads to some tens
	// of femtofarads, and positive (capacitive) well below the cut-off.
	p := tee50(1, 0.635e-3).At(2e9)
	c := p.B / (2 * math.Pi * 2e9)
	if c < 1e-15 || c > 100e-15 {
		t.Errorf("junction capacitance %.3g fF, want 1 to 100 fF (common practice, no source)", c*1e15)
	}
}

func TestTeeWarnings(t *testing.T) {
	tee := tee50(1, 0.635e-3)
	fp := tee.At(0).Fp1
	if w := tee.At(0.6 * fp).Warnings; len(w) == 0 {
		t.Errorf("no warning at 0.6 fp1")
	}
	if w := tee50(5, 0.635e-3).At(1e9).Warnings; len(w) == 0 {
		t.Errorf("no warning at Z1/Z2 = 5")
	}
	if p := tee.At(2 * fp); p.N != 0 || len(p.Warnings) < 2 {
		t.Errorf("at 2 fp1: n = %g, warnings %v, want 0 and a failure warning", p.N, p.Warnings)
	}
}

func TestTeeThroughWithStub(t *testing.T) {
	// An ideal junction (n = 1, B = 0) with an open stub λ/8 long of
	// 50 Ω hung on it is a shunt of the stub's own admittance,
	// j·tan(βl)/Z0 = j/50 S (exact, lossless).
	stub := LineParams{Freq: 3e9, Z0: 50, EpsEff: 6.6}
	y := 1 / InputImpedanceOfLine(stub, stub.GuidedWavelength()/8, complexInf())
	a := TeeParams{N: 1}.ThroughWithStub(y)
	s := a.S(50)
	// Shunt Y = j/50 in 50 Ω: S21 = 2/(2 + j) (exact).
	if want := 2 / complex(2, 1); !near(s[1][0], want, 1e-12) {
		t.Errorf("S21 = %v, want %v (exact)", s[1][0], want)
	}
	// With n < 1 the stub is seen at the node as n²·y, weaker (the
	// transformer convention of TeeParams; every tee of the full-wave
	// sweep, testdata/tee, sees its stub weaker): n = 0.5 makes the same
	// stub look like j0.25/50 S, plus jB.
	a = TeeParams{N: 0.5, B: 0.01}.ThroughWithStub(y)
	if want := complex(0, 0.25/50+0.01); !near(a[1][0], want, 1e-12) {
		t.Errorf("shunt admittance %v, want %v", a[1][0], want)
	}
}

func TestTeeCascadeNotch(t *testing.T) {
	// Through line, tee and open stub cascaded as TeeParams describes. A
	// stub whose length beyond its reference plane is a quarter wave
	// presents a short at the node, so S21 = 0 whatever n and B are (exact
	// consequence of the equivalent circuit).
	const f = 5e9
	line := LineParams{Freq: f, Z0: 50, EpsEff: 6.6}
	stub := LineParams{Freq: f, Z0: 40, EpsEff: 6.7}
	p := Tee{ThroughZ0: 50, ThroughEpsEff: 6.6, StubZ0: 40, StubEpsEff: 6.7, H: 0.635e-3, Er: 9.8}.At(f)
	if p.N == 1 || p.B == 0 {
		t.Fatalf("junction ideal at 5 GHz: %+v", p)
	}
	drawn := p.StubShift + stub.GuidedWavelength()/4 // from the through centre line
	for _, extra := range []float64{0, 0.3e-3} {
		yStub := 1 / InputImpedanceOfLine(stub, drawn+extra-p.StubShift, complexInf())
		a := Line(line, 5e-3-p.ThroughShift).Mul(p.ThroughWithStub(yStub)).Mul(Line(line, 7e-3-p.ThroughShift))
		s21 := cmplx.Abs(a.S(50)[1][0])
		if extra == 0 && s21 > 1e-9 {
			t.Errorf("quarter-wave stub beyond its reference plane: |S21| = %g, want 0 (exact)", s21)
		}
		if extra > 0 && s21 < 1e-2 {
			t.Errorf("stub 0.3 mm off the notch: |S21| = %g, want clearly above 0", s21)
		}
	}
}

func BenchmarkTeeAt(b *testing.B) {
	tee := tee50(1.2, 0.635e-3)
	for i := 0; i < b.N; i++ {
		_ = tee.At(2.45e9 + float64(i&7))
	}
}
