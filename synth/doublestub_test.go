package synth

import (
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// Pozar, Microwave Engineering 4th ed., Example 5.4 (from memory): ZL =
// 60 − j80 Ω on 50 Ω, open stubs λ/8 apart, the first at the load. The
// book's two solutions: l1 = 0.146 λ, l2 = 0.204 λ and l1 = 0.482 λ,
// l2 = 0.350 λ (three decimals of a wavelength).
func TestDoubleStubPozarExample(t *testing.T) {
	sols, err := SolveDoubleStub(complex(60, -80), 50, 0, 45, Open)
	if err != nil {
		t.Fatal(err)
	}
	want := [][2]float64{{0.146, 0.204}, {0.482, 0.350}} // Pozar Example 5.4 (from memory)
	if len(sols) != 2 {
		t.Fatalf("%d solutions, want 2: %+v", len(sols), sols)
	}
	for i, w := range want {
		got := [2]float64{sols[i].Stub1Deg / 360, sols[i].Stub2Deg / 360}
		if math.Abs(got[0]-w[0]) > 0.0006 || math.Abs(got[1]-w[1]) > 0.0006 {
			t.Errorf("solution %d: l1 = %.4f λ, l2 = %.4f λ; want %.3f λ, %.3f λ", i+1, got[0], got[1], w[0], w[1])
		}
	}
}

// Every solution, over loads, spacings and ends, matches exactly in the
// test's own chain-matrix cascade (matchTLine; exact lossless lines).
func TestDoubleStubMatchesExactly(t *testing.T) {
	loads := []complex128{complex(60, -80), complex(15, 10), complex(100, 50), complex(30, -5), complex(80, 0)}
	for _, zl := range loads {
		for _, sp := range []float64{45, 135, 60, 100} {
			for _, end := range []StubEnd{Open, Short} {
				for _, line := range []float64{0, 20} {
					sols, err := SolveDoubleStub(zl, 50, line, sp, end)
					var fe *ForbiddenRegionError
					if errors.As(err, &fe) {
						continue
					}
					if err != nil {
						t.Fatalf("%v, %g°, %v: %v", zl, sp, end, err)
					}
					for _, s := range sols {
						zin := SectionsInput(s.Sections(), zl)
						if g := cmplx.Abs(physReflection(zin, 50)); g > 1e-9 {
							t.Errorf("%v spacing %g° %v line %g°: %+v leaves |Γ| = %.3g", zl, sp, end, line, s, g)
						}
					}
				}
			}
		}
	}
}

// A load in the forbidden region: 10 Ω (yL = 5) with stubs 3λ/8 apart and
// the first at the load. 1/sin²(135°) = 2 < 5 (Pozar §5.3, from memory: the
// region g > 1/sin²βd), so it is refused, and the fix line it names brings
// the conductance below 2, after which the match exists and is exact.
func TestDoubleStubForbiddenRegion(t *testing.T) {
	zl := complex(10, 0)
	_, err := SolveDoubleStub(zl, 50, 0, DefaultStubSpacingDeg, Open)
	var fe *ForbiddenRegionError
	if !errors.As(err, &fe) || !errors.Is(err, ErrForbiddenRegion) {
		t.Fatalf("err = %v, want a *ForbiddenRegionError", err)
	}
	if math.Abs(fe.G-5) > 1e-12 || math.Abs(fe.GMax-2) > 1e-12 {
		t.Errorf("g = %g, limit %g; want 5 and 2 (exact)", fe.G, fe.GMax)
	}
	if !(fe.FixLineDeg > 0 && fe.FixLineDeg < 90) {
		t.Fatalf("fix line %g°: want a line shorter than a quarter wave (the conductance falls from 5 to 0.2 over 90°)", fe.FixLineDeg)
	}
	if g := real(doubleStubAdmittance(zl, 50, fe.FixLineDeg)); g >= 2 {
		t.Errorf("after the fix line the conductance is %g, not below 2", g)
	}
	sols, err := SolveDoubleStub(zl, 50, fe.FixLineDeg, DefaultStubSpacingDeg, Open)
	if err != nil {
		t.Fatalf("with the fix line: %v", err)
	}
	for _, s := range sols {
		if g := cmplx.Abs(physReflection(SectionsInput(s.Sections(), zl), 50)); g > 1e-9 {
			t.Errorf("with the fix line %+v leaves |Γ| = %.3g", s, g)
		}
	}
	if s := fe.Error(); !strings.Contains(s, "fix: put") || !strings.Contains(s, "forbidden region") {
		t.Errorf("message %q does not name the region and the fix", s)
	}
}
