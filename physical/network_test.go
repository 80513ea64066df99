package physical

import (
	"math"
	"math/cmplx"
	"os"
	"testing"
)

// near reports whether |got − want| ≤ tol·max(1, |want|).
func near(got, want complex128, tol float64) bool {
	return cmplx.Abs(got-want) <= tol*math.Max(1, cmplx.Abs(want))
}

// quarterWave returns lossless line parameters at freq and the length that
// is a quarter of a guided wavelength there.
func quarterWave(z0, epsEff, freq float64) (LineParams, float64) {
	p := LineParams{Freq: freq, Z0: z0, EpsEff: epsEff}
	return p, p.GuidedWavelength() / 4
}

func TestLineExact(t *testing.T) {
	inf := cmplx.Inf()
	tests := []struct {
		name   string
		source string
		z0     float64
		eps    float64
		lenWL  float64 // length in guided wavelengths
		zLoad  complex128
		want   complex128
	}{
		// Zin = Z0²/ZL for a lossless λ/4 line (exact; Pozar 4th ed. §2.5).
		{"quarter wave 50 into 100", "exact: Z0²/ZL", 50, 2.9, 0.25, 100, 25},
		{"quarter wave 70.7 into 50", "exact: Z0²/ZL", 70.71, 6.5, 0.25, 50, complex(70.71*70.71/50, 0)},
		{"quarter wave 35 into complex", "exact: Z0²/ZL", 35, 3.3, 0.25, complex(20, -30), complex(35*35, 0) / complex(20, -30)},
		// A λ/2 line repeats its load (exact).
		{"half wave repeats load", "exact: Zin = ZL for l = λ/2", 42, 4.1, 0.5, complex(12, 40), complex(12, 40)},
		// Open stub: Zin = −jZ0·cot βl (exact, lossless). βl = 2π·0.1.
		{"open stub 0.1 wl", "exact: −jZ0·cot βl", 60, 3.0, 0.1, inf, complex(0, -60/math.Tan(2*math.Pi*0.1))},
		// Short stub: Zin = jZ0·tan βl (exact, lossless).
		{"short stub 0.15 wl", "exact: jZ0·tan βl", 80, 2.2, 0.15, 0, complex(0, 80*math.Tan(2*math.Pi*0.15))},
		// λ/8 open stub of 50 Ω: −j50 (exact: cot 45° = 1).
		{"open stub 1/8 wl", "exact: cot(π/4) = 1", 50, 9.8, 0.125, inf, complex(0, -50)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := LineParams{Freq: 2.45e9, Z0: tt.z0, EpsEff: tt.eps}
			l := tt.lenWL * p.GuidedWavelength()
			got := InputImpedanceOfLine(p, l, tt.zLoad)
			if !near(got, tt.want, 1e-9) {
				t.Errorf("Zin = %v, want %v (%s)", got, tt.want, tt.source)
			}
		})
	}
}

func TestHalfWaveIsMinusIdentity(t *testing.T) {
	// A lossless λ/2 line has ABCD = −I (exact: cos π = −1, sin π = 0).
	p, q := quarterWave(73, 5.5, 1e9)
	a := Line(p, 2*q)
	want := ABCD{{-1, 0}, {0, -1}}
	for i := range a {
		for j := range a[i] {
			if !near(a[i][j], want[i][j], 1e-12) {
				t.Fatalf("λ/2 ABCD = %v, want −I (exact)", a)
			}
		}
	}
}

func TestReciprocity(t *testing.T) {
	// AD − BC = 1 for every reciprocal two-port (exact), kept by cascading.
	lossy := LineParams{Freq: 3e9, Z0: 50, EpsEff: 3.2, AlphaConductor: 2.1, AlphaDielectric: 0.7}
	nets := []struct {
		name string
		a    ABCD
	}{
		{"lossy line", Line(lossy, 0.031)},
		{"series", SeriesImpedance(complex(3, 47))},
		{"shunt", ShuntAdmittance(complex(0.01, -0.02))},
		{"transformer", IdealTransformer(1.7)},
		{"cascade", Line(lossy, 0.01).Mul(ShuntAdmittance(complex(0, 0.03))).Mul(SeriesImpedance(complex(5, -9))).Mul(IdealTransformer(0.6)).Mul(Line(lossy, 0.02))},
	}
	for _, n := range nets {
		if d := n.a.Det(); !near(d, 1, 1e-12) {
			t.Errorf("%s: AD − BC = %v, want 1 (exact: reciprocity)", n.name, d)
		}
	}
}

func TestMatchedLossyLine(t *testing.T) {
	// With αc = αd the line meets Heaviside's distortionless condition
	// R/L = G/C, so Zc is exactly the real Z0 and γ = α + jβ (exact). Then
	// in Z0 ports S11 = S22 = 0 and |S21| = exp(−αl).
	tests := []struct {
		alpha, length float64
	}{
		{0.5, 0.1}, {3, 0.05}, {20, 0.02}, {0, 0.3},
	}
	for _, tt := range tests {
		p := LineParams{Freq: 5e9, Z0: 50, EpsEff: 6.7, AlphaConductor: tt.alpha / 2, AlphaDielectric: tt.alpha / 2}
		if zc := CharacteristicImpedance(p); !near(zc, 50, 1e-12) {
			t.Errorf("α = %g: Zc = %v, want 50 (exact: distortionless line)", tt.alpha, zc)
		}
		s := Line(p, tt.length).S(50)
		if cmplx.Abs(s[0][0]) > 1e-12 || cmplx.Abs(s[1][1]) > 1e-12 {
			t.Errorf("α = %g: S11 = %v, S22 = %v, want 0 (exact: matched line)", tt.alpha, s[0][0], s[1][1])
		}
		if got, want := cmplx.Abs(s[1][0]), math.Exp(-tt.alpha*tt.length); math.Abs(got-want) > 1e-12 {
			t.Errorf("α = %g: |S21| = %.15g, want exp(−αl) = %.15g (exact)", tt.alpha, got, want)
		}
		if got, want := cmplx.Phase(s[1][0]), -math.Remainder(p.Beta()*tt.length, 2*math.Pi); math.Abs(math.Remainder(got-want, 2*math.Pi)) > 1e-9 {
			t.Errorf("α = %g: ∠S21 = %g, want −βl = %g (exact)", tt.alpha, got, want)
		}
	}
}

func TestLumpedS(t *testing.T) {
	// Two-ports whose S parameters follow from circuit analysis alone
	// (exact), which Pozar's Table 4.2 ABCD→S conversion must reproduce.
	const z0 = 50.0
	z := complex(10, 35)
	y := complex(0.004, -0.013)
	tests := []struct {
		name   string
		source string
		a      ABCD
		want   [2][2]complex128
	}{
		{"series Z", "exact: S11 = Z/(Z+2Z0), S21 = 2Z0/(Z+2Z0)", SeriesImpedance(z),
			[2][2]complex128{{z / (z + 2*z0), 2 * z0 / (z + 2*z0)}, {2 * z0 / (z + 2*z0), z / (z + 2*z0)}}},
		{"shunt Y", "exact: S11 = −YZ0/(2+YZ0), S21 = 2/(2+YZ0)", ShuntAdmittance(y),
			[2][2]complex128{{-y * z0 / (2 + y*z0), 2 / (2 + y*z0)}, {2 / (2 + y*z0), -y * z0 / (2 + y*z0)}}},
		// Ideal n:1 transformer: port 2 load Z0 seen as n²Z0, so
		// S11 = (n²−1)/(n²+1), S21 = S12 = 2n/(n²+1), S22 = −S11 (exact).
		{"transformer 2:1", "exact: ideal transformer", IdealTransformer(2),
			[2][2]complex128{{3.0 / 5, 4.0 / 5}, {4.0 / 5, -3.0 / 5}}},
		{"through", "exact", Identity(), [2][2]complex128{{0, 1}, {1, 0}}},
	}
	for _, tt := range tests {
		s := tt.a.S(z0)
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				if !near(s[i][j], tt.want[i][j], 1e-12) {
					t.Errorf("%s: S%d%d = %v, want %v (%s)", tt.name, i+1, j+1, s[i][j], tt.want[i][j], tt.source)
				}
			}
		}
	}
}

func TestInputImpedanceMatchesS11(t *testing.T) {
	// Γin from S (Pozar Table 4.2, from memory) must equal Γ of the input
	// impedance with port 2 matched (exact: definition of S11).
	p := LineParams{Freq: 1.8e9, Z0: 33, EpsEff: 2.7, AlphaConductor: 1.2, AlphaDielectric: 0.4}
	a := Line(p, 0.017).Mul(ShuntAdmittance(complex(0, 0.02))).Mul(SeriesImpedance(complex(4, 12)))
	s := a.S(50)
	if g := Reflection(a.InputImpedance(50), 50); !near(g, s[0][0], 1e-12) {
		t.Errorf("Γ(Zin) = %v, S11 = %v, want equal (exact)", g, s[0][0])
	}
}

func TestCascadeAgainstScikitRF(t *testing.T) {
	// Golden table made by scikit-rf 0.15.4 (testdata/touchstone/gen_skrf.py,
	// command in the file header): the same cascade built with its media
	// and ** operator, S referred to 50 Ω.
	f, err := os.Open("../testdata/touchstone/skrf_cascade.s2p")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	gold, err := ReadTouchstone(f, "skrf_cascade.s2p", 2)
	if err != nil {
		t.Fatal(err)
	}
	if len(gold.Freqs) != 36 {
		t.Fatalf("read %d frequencies, want 36", len(gold.Freqs))
	}
	for k, fr := range gold.Freqs {
		line1 := LineParams{Freq: fr, Z0: 35, EpsEff: 2.9}
		stub := LineParams{Freq: fr, Z0: 60, EpsEff: 3.1, AlphaConductor: 0.4, AlphaDielectric: 0.4}
		line5 := LineParams{Freq: fr, Z0: 50, EpsEff: 3.0, AlphaConductor: 0.75, AlphaDielectric: 0.75}
		w := 2 * math.Pi * fr
		yStub := 1 / InputImpedanceOfLine(stub, 9e-3, cmplx.Inf())
		zVia := complex(0.3, w*3e-9)
		a := Line(line1, 12e-3).
			Mul(ShuntAdmittance(yStub)).
			Mul(SeriesImpedance(complex(5, w*1e-9))).
			Mul(ShuntAdmittance(1 / zVia)).
			Mul(Line(line5, 20e-3))
		s := a.S(50)
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				if want := gold.S[k][2*i+j]; !near(s[i][j], want, 1e-9) {
					t.Errorf("%.4g GHz: S%d%d = %v, scikit-rf %v", fr/1e9, i+1, j+1, s[i][j], want)
				}
			}
		}
	}
}

func TestReflectionHelpers(t *testing.T) {
	tests := []struct {
		name     string
		z        complex128
		wantG    complex128
		wantRL   float64
		wantVSWR float64
	}{
		// Γ = (100−50)/(100+50) = 1/3; RL = 20·log10 3; VSWR = 2 (exact).
		{"100 ohm", 100, complex(1.0/3, 0), 20 * math.Log10(3), 2},
		// Γ = (25−50)/(75) = −1/3 (exact).
		{"25 ohm", 25, complex(-1.0/3, 0), 20 * math.Log10(3), 2},
		// Γ = j50/(100+j50) = (0.2+0.4j) (exact), |Γ| = 1/√5.
		{"50+j50", complex(50, 50), complex(0.2, 0.4), 10 * math.Log10(5), (1 + 1/math.Sqrt(5)) / (1 - 1/math.Sqrt(5))},
		{"matched", 50, 0, -MinDB, 1}, // floored: |Γ| = 0 exactly
		{"open", cmplx.Inf(), 1, 0, math.Inf(1)},
		{"short", 0, -1, 0, math.Inf(1)},
	}
	for _, tt := range tests {
		g := Reflection(tt.z, 50)
		if !near(g, tt.wantG, 1e-15) {
			t.Errorf("%s: Γ = %v, want %v (exact)", tt.name, g, tt.wantG)
		}
		if rl := ReturnLossDB(g); !(rl == tt.wantRL || math.Abs(rl-tt.wantRL) < 1e-12) {
			t.Errorf("%s: RL = %g dB, want %g (exact)", tt.name, rl, tt.wantRL)
		}
		if v := VSWR(g); !(v == tt.wantVSWR || math.Abs(v-tt.wantVSWR) < 1e-12) {
			t.Errorf("%s: VSWR = %g, want %g (exact)", tt.name, v, tt.wantVSWR)
		}
	}
	if got := MagDB(complex(0, 0.1)); math.Abs(got+20) > 1e-12 {
		t.Errorf("MagDB(0.1j) = %g, want −20 (exact)", got)
	}
}

func BenchmarkLineCascade(b *testing.B) {
	p := LineParams{Freq: 2.45e9, Z0: 50, EpsEff: 3.3, AlphaConductor: 1, AlphaDielectric: 0.5}
	for i := 0; i < b.N; i++ {
		a := Line(p, 0.01).Mul(ShuntAdmittance(complex(0, 0.02))).Mul(Line(p, 0.02))
		_ = a.S(50)
	}
}

func complexInf() complex128 { return cmplx.Inf() }
