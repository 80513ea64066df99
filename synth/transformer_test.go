package synth

import (
	"math"
	"math/cmplx"
	"testing"
)

// Pozar, Microwave Engineering 4th ed., Example 5.6 (from memory): a
// three-section binomial transformer from a 50 Ω load to a 100 Ω line,
// Γm = 0.05: Z1 = 91.7, Z2 = 70.7, Z3 = 54.5 Ω from the line side, and a
// fractional bandwidth of 70 %. The book rounds to 0.1 Ω and 1 %.
func TestBinomialPozarExample(t *testing.T) {
	tr, err := BinomialTransformer(50, 100, 3)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{54.5, 70.7, 91.7} // from the load, Pozar Example 5.6 (from memory)
	for i, w := range want {
		if math.Abs(tr.Z[i]-w) > 0.05 {
			t.Errorf("Z from the load [%d] = %.3f Ω, want %.1f Ω (Pozar Example 5.6, from memory)", i, tr.Z[i], w)
		}
	}
	if bw := BinomialFracBW(50, 100, 3, 0.05); math.Abs(bw-0.70) > 0.005 {
		t.Errorf("Δf/f0 = %.4f, want 0.70 (Pozar Example 5.6, from memory)", bw)
	}
}

// Pozar, Microwave Engineering 4th ed., Example 5.7 (from memory): a
// three-section Chebyshev transformer from a 100 Ω load to a 50 Ω line
// with Γm = 0.05: secθm = 1.408, θm = 44.7°, Δf/f0 = 101 %, Γ0 = 0.0698,
// Γ1 = 0.1037 (three decimals in the book). The book's table (from exact
// synthesis) gives Z = 57.37, 70.71, 87.15 Ω from the line side; the
// logarithmic small-reflection form differs from exact synthesis at second
// order in the step (Γ0² ≈ 0.5 %), so the table is checked to 0.5 %.
func TestChebyshevPozarExample(t *testing.T) {
	bw := ChebyshevFracBW(100, 50, 3, 0.05)
	if math.Abs(bw-1.01) > 0.005 {
		t.Errorf("Δf/f0 = %.4f, want 1.01 (Pozar Example 5.7, from memory)", bw)
	}
	tr, err := ChebyshevTransformer(100, 50, 3, bw)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(tr.SecThetaM-1.408) > 0.0005 {
		t.Errorf("secθm = %.5f, want 1.408 (Pozar Example 5.7, from memory)", tr.SecThetaM)
	}
	if math.Abs(tr.A-0.05) > 1e-12 {
		t.Errorf("ripple A = %.6f, want the Γm 0.05 asked for (exact: the bandwidth came from it)", tr.A)
	}
	// The book carries secθm rounded to 1.408 (the unrounded value is
	// 1.40755) into Γ0 = A·sec³/2 and Γ1 = 3A(sec³−sec)/2; that rounding
	// moves Γ0 by up to 0.5e-3·3A·sec²/2 ≈ 7e-5 and Γ1 by up to
	// 0.5e-3·3A(3sec²−1)/2 ≈ 1.9e-4, on top of the last-digit rounding.
	for i, w := range []struct{ v, tol float64 }{{0.0698, 0.00013}, {0.1037, 0.00025}} { // Pozar Example 5.7 (from memory)
		if math.Abs(tr.Steps[i]-w.v) > w.tol {
			t.Errorf("Γ%d = %.5f, want %.4f (Pozar Example 5.7, from memory)", i, tr.Steps[i], w.v)
		}
	}
	table := []float64{87.15, 70.71, 57.37} // from the load; Pozar Table 5.2 via Example 5.7 (from memory)
	for i, w := range table {
		if math.Abs(tr.Z[i]-w)/w > 0.005 {
			t.Errorf("Z from the load [%d] = %.3f Ω, want %.2f Ω ± 0.5 %% (Pozar Table 5.2, from memory)", i, tr.Z[i], w)
		}
	}
}

// The step reflections against the closed forms of the small-reflection
// theory written out by hand (Pozar 4th ed. eqs. 5.53 and 5.65, from
// memory; the expansions of T_N(secθm·cosθ) in cos mθ are exact algebra):
//
//	N=1: Γ0 = A·sec/2
//	N=2: Γ0 = A·sec²/2, Γ1 = A·(sec²−1)
//	N=3: Γ0 = A·sec³/2, Γ1 = 3A·(sec³−sec)/2
//	N=4: Γ0 = A·sec⁴/2, Γ1 = 2A·(sec⁴−sec²), Γ2 = A·(3sec⁴−4sec²+1)
//
// and binomial Γn = A·C(N,n).
func TestTransformerStepsClosedForms(t *testing.T) {
	cheb := func(n int, a, s float64) []float64 {
		switch n {
		case 1:
			return []float64{a * s / 2, a * s / 2}
		case 2:
			return []float64{a * s * s / 2, a * (s*s - 1), a * s * s / 2}
		case 3:
			g0, g1 := a*s*s*s/2, 3*a*(s*s*s-s)/2
			return []float64{g0, g1, g1, g0}
		case 4:
			s2, s4 := s*s, s*s*s*s
			g0, g1, g2 := a*s4/2, 2*a*(s4-s2), a*(3*s4-4*s2+1)
			return []float64{g0, g1, g2, g1, g0}
		}
		return nil
	}
	binom := [][]float64{{1, 1}, {1, 2, 1}, {1, 3, 3, 1}, {1, 4, 6, 4, 1}}
	for _, c := range []struct {
		rl, z0, bw float64
	}{{100, 50, 0.6}, {20, 50, 1.2}, {50, 35, 0.3}} {
		for n := 1; n <= 4; n++ {
			tr, err := ChebyshevTransformer(c.rl, c.z0, n, c.bw)
			if err != nil {
				t.Fatal(err)
			}
			want := cheb(n, tr.A, tr.SecThetaM)
			for k := range want {
				if math.Abs(tr.Steps[k]-want[k]) > 1e-12 {
					t.Errorf("Chebyshev N=%d, %g→%g Ω: Γ%d = %.15f, closed form %.15f", n, c.rl, c.z0, k, tr.Steps[k], want[k])
				}
			}
			// The band edge: θm = (π/2)(1 − Δf/2f0) (exact definition).
			if th := math.Acos(1 / tr.SecThetaM); math.Abs(th-math.Pi/2*(1-c.bw/2)) > 1e-12 {
				t.Errorf("Chebyshev N=%d: θm = %.6f, want %.6f", n, th, math.Pi/2*(1-c.bw/2))
			}
			b, err := BinomialTransformer(c.rl, c.z0, n)
			if err != nil {
				t.Fatal(err)
			}
			for k, cnk := range binom[n-1] {
				if want := math.Log(c.rl/c.z0) / math.Pow(2, float64(n+1)) * cnk; math.Abs(b.Steps[k]-want) > 1e-15 {
					t.Errorf("binomial N=%d: Γ%d = %g, want %g", n, k, b.Steps[k], want)
				}
			}
		}
	}
}

// The exact input of the quarter-wave cascade (lossless lines, chain
// matrices in the test's own code) at f0: with the steps in logarithmic
// form, Zin = Z0 exactly whenever the alternating sum of the steps is zero:
// for every binomial transformer ((1−1)^N = 0) and for Chebyshev ones of
// odd N (T_N(0) = 0). For even N, |Γ(f0)| is the ripple, |A|, to second
// order. Exact algebra of quarter-wave lines: Zin = Z1²/Z2²·… (Pozar §5.5).
func TestTransformerExactAtF0(t *testing.T) {
	for _, c := range []struct{ rl, z0 float64 }{{100, 50}, {12.5, 50}, {50, 75}} {
		for n := 1; n <= 4; n++ {
			b, _ := BinomialTransformer(c.rl, c.z0, n)
			ch, _ := ChebyshevTransformer(c.rl, c.z0, n, 0.8)
			for _, tr := range []Transformer{b, ch} {
				zin := SectionsInput(tr.Sections(), complex(c.rl, 0))
				g := cmplx.Abs((zin - complex(c.z0, 0)) / (zin + complex(c.z0, 0)))
				if tr.Response == Binomial || n%2 == 1 {
					if g > 1e-12 {
						t.Errorf("%s N=%d %g→%g Ω: |Γ(f0)| = %.3g, want 0 (exact)", tr.Response, n, c.rl, c.z0, g)
					}
				} else if math.Abs(g-math.Abs(tr.A)) > tr.A*tr.A+1e-3*math.Abs(tr.A) {
					t.Errorf("%s N=%d %g→%g Ω: |Γ(f0)| = %.5f, want the ripple %.5f", tr.Response, n, c.rl, c.z0, g, math.Abs(tr.A))
				}
			}
		}
	}
}

// In band, the exact cascade follows the small-reflection closed forms to
// second order in the step reflections: for a mild ratio (1.2:1) the
// neglected multiple reflections are below (Σ|Γn|)² = (½ ln 1.2)² ≈ 0.0083,
// and the Chebyshev ripple stays within that of |A| (Pozar §5.4–5.7).
func TestTransformerInBandSmallReflection(t *testing.T) {
	rl, z0 := 60.0, 50.0
	tol := math.Pow(0.5*math.Log(rl/z0), 2)
	for n := 1; n <= 4; n++ {
		for _, resp := range []Response{Binomial, Chebyshev} {
			var tr Transformer
			if resp == Binomial {
				tr, _ = BinomialTransformer(rl, z0, n)
			} else {
				tr, _ = ChebyshevTransformer(rl, z0, n, 0.9)
			}
			peak := 0.0
			for i := 0; i <= 200; i++ {
				fr := 0.55 + 0.9*float64(i)/200 // f/f0 over the ripple band
				theta := math.Pi / 2 * fr
				zin, _ := SectionsInputAt(tr.Sections(), ConstantLoad(complex(rl, 0)), 1, fr)
				g := cmplx.Abs((zin - complex(z0, 0)) / (zin + complex(z0, 0)))
				if d := math.Abs(g - tr.SmallReflectionGamma(theta)); d > tol {
					t.Errorf("%s N=%d at f/f0 = %.3f: exact |Γ| %.5f, small-reflection %.5f", resp, n, fr, g, tr.SmallReflectionGamma(theta))
					break
				}
				peak = math.Max(peak, g)
			}
			if resp == Chebyshev && math.Abs(peak-math.Abs(tr.A)) > tol {
				t.Errorf("Chebyshev N=%d: in-band peak %.5f, ripple |A| = %.5f", n, peak, math.Abs(tr.A))
			}
		}
	}
}

// A complex load is brought to a real impedance at the nearer of the two
// real points, and the whole match then holds at f0 (exact lossless
// lines). 25 − j25 Ω on 50 Ω: Γ = (−25−j25)/(75−j25) = −0.2 − j0.4,
// |Γ| = 0.447, VSWR = 2.618; its angle −116.57° gives the voltage maximum
// at 121.7° and the minimum at 31.7° (exact arithmetic), so the minimum
// (50/2.618 = 19.1 Ω) is taken.
func TestQuarterWaveComplexLoad(t *testing.T) {
	zl := complex(25, -25)
	pts, err := RealPoints(zl, 50)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(pts[0].LineDeg-31.717) > 0.01 || math.Abs(pts[0].R-19.098) > 0.01 {
		t.Errorf("nearer real point %.3f° at %.3f Ω, want 31.717° at 19.098 Ω (exact)", pts[0].LineDeg, pts[0].R)
	}
	if math.Abs(pts[1].LineDeg-121.717) > 0.01 || math.Abs(pts[1].R-130.90) > 0.01 {
		t.Errorf("other real point %.3f° at %.3f Ω, want 121.717° at 130.90 Ω (exact)", pts[1].LineDeg, pts[1].R)
	}
	for _, p := range pts {
		z := SectionsInput([]Section{{Kind: SeriesLine, Z0: 50, LengthDeg: p.LineDeg}}, zl)
		if math.Abs(imag(z)) > 1e-9 || math.Abs(real(z)-p.R) > 1e-9 {
			t.Errorf("at %.3f° the line presents %v, want %.4f Ω real", p.LineDeg, z, p.R)
		}
	}
	secs, _, err := QuarterWaveMatch(zl, 50, 2, Binomial, 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(secs) != 3 || secs[0].LengthDeg != pts[0].LineDeg {
		t.Fatalf("sections %+v: want the 31.7° line then two quarter waves", secs)
	}
	if g := cmplx.Abs(physReflection(SectionsInput(secs, zl), 50)); g > 1e-12 {
		t.Errorf("|Γ(f0)| = %.3g, want 0 (binomial: exact at f0)", g)
	}
}

func physReflection(z complex128, z0 float64) complex128 {
	return (z - complex(z0, 0)) / (z + complex(z0, 0))
}
