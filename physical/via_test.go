package physical

import (
	"math"
	"math/cmplx"
	"testing"
)

func TestViaInductanceValues(t *testing.T) {
	tests := []struct {
		name   string
		h, r   float64
		want   float64
		source string
	}{
		// Goldfarb-Pucel 1991 by hand: √(0.15² + 0.635²) = 0.6524761 mm,
		// ln((0.635 + 0.6524761)/0.15) = ln 8.583174 = 2.149804,
		// 0.635·2.149804 = 1.365125, 1.5·(0.15 − 0.6524761) = −0.7537141,
		// sum 0.6114113 mm; × μ0/2π = 2e-7 H/m → 122.2823 pH.
		{"h 0.635 mm r 0.15 mm", 0.635e-3, 0.15e-3, 122.2823e-12, "Goldfarb-Pucel 1991 formula by hand"},
		// √(0.2² + 1.6²) = 1.612452 mm, ln(3.212452/0.2) = ln 16.06226 = 2.776472,
		// 1.6·2.776472 = 4.442356, 1.5·(0.2 − 1.612452) = −2.118677,
		// sum 2.323678 mm → 464.7357 pH.
		{"h 1.6 mm r 0.2 mm", 1.6e-3, 0.2e-3, 464.7357e-12, "Goldfarb-Pucel 1991 formula by hand"},
	}
	for _, tt := range tests {
		if got := ViaInductance(tt.h, tt.r); math.Abs(got-tt.want) > 1e-6*tt.want {
			t.Errorf("%s: L = %.7g pH, want %.7g pH (%s)", tt.name, got*1e12, tt.want*1e12, tt.source)
		}
	}
}

func TestViaInductanceTrends(t *testing.T) {
	// L grows with h and falls with r (Goldfarb-Pucel 1991; also plain
	// magnetics: a longer, thinner conductor links more flux).
	prev := 0.0
	for _, h := range []float64{0.1e-3, 0.2e-3, 0.5e-3, 1e-3, 1.6e-3, 3.2e-3} {
		l := ViaInductance(h, 0.15e-3)
		if !(l > prev) {
			t.Errorf("h %g mm: L = %g not above %g", h*1e3, l, prev)
		}
		prev = l
	}
	prev = math.Inf(1)
	for _, r := range []float64{0.05e-3, 0.1e-3, 0.2e-3, 0.4e-3, 0.8e-3} {
		l := ViaInductance(0.8e-3, r)
		if !(l < prev && l > 0) {
			t.Errorf("r %g mm: L = %g not below %g", r*1e3, l, prev)
		}
		prev = l
	}
	// For h ≫ r the formula tends to (μ0/2π)·h·(ln(2h/r) − 1.5) (exact
	// limit of the published expression, error O(r/h)).
	h, r := 1e-3, 1e-7
	want := Mu0 / (2 * math.Pi) * h * (math.Log(2*h/r) - 1.5)
	if got := ViaInductance(h, r); math.Abs(got-want) > 2e-4*want {
		t.Errorf("h/r = 1e4: L = %g, want the asymptote %g", got, want)
	}
}

func TestViaResistanceLimits(t *testing.T) {
	// Both limits are exact: DC resistance of a solid rod h/(σπr²), and the
	// skin-effect resistance of its surface h·Rs/(2πr), Rs = √(πfμ0/σ).
	const h, r, sigma = 0.8e-3, 0.2e-3, CopperConductivity
	rdc := h / (sigma * math.Pi * r * r)
	if got := ViaResistance(h, r, sigma, 0); math.Abs(got-rdc) > 1e-12*rdc {
		t.Errorf("R(0) = %g, want %g (exact)", got, rdc)
	}
	f := 1e12 // skin depth 66 nm ≪ r
	rs := math.Sqrt(math.Pi * f * Mu0 / sigma)
	want := h * rs / (2 * math.Pi * r)
	if got := ViaResistance(h, r, sigma, f); math.Abs(got-want) > 1e-3*want {
		t.Errorf("R(1 THz) = %g, want %g (exact skin-effect limit)", got, want)
	}
	z := ViaImpedance(h, r, sigma, 5e9)
	if im := imag(z); math.Abs(im-2*math.Pi*5e9*ViaInductance(h, r)) > 1e-12 {
		t.Errorf("Im Z = %g, want ωL", im)
	}
}

func TestViaPad(t *testing.T) {
	// Parallel-plate annulus ε0·εr·π·(rp² − rh²)/h (exact for the ideal
	// plates): 8.8541878128e-12·9.8·π·(0.16 − 0.0225)e-6/0.635e-3 = 59.02740 fF.
	if got := ViaPadCapacitance(0.4e-3, 0.15e-3, 0.635e-3, 9.8); math.Abs(got-59.02740e-15) > 1e-5*59.0274e-15 {
		t.Errorf("C = %.7g fF, want 59.02740 fF (parallel-plate formula by hand)", got*1e15)
	}
	// Pad capacitance in parallel with R + jωL: at ω0 = 1/√(LC) the
	// parallel resonance gives Z = L/(RC) − j·√(L/C) (exact circuit
	// algebra).
	const rr, l, c = 0.05, 0.3e-9, 0.2e-12
	w0 := 1 / math.Sqrt(l*c)
	f0 := w0 / (2 * math.Pi)
	want := complex(l/(rr*c), -math.Sqrt(l/c))
	if got := ViaToGround(complex(rr, w0*l), c, f0); cmplx.Abs(got-want) > 1e-9*cmplx.Abs(want) {
		t.Errorf("Z(ω0) = %v, want %v (exact)", got, want)
	}
	if got := ViaToGround(complex(rr, 3), 0, 1e9); got != complex(rr, 3) {
		t.Errorf("no pad: Z = %v, want the via alone", got)
	}
}

func BenchmarkViaImpedance(b *testing.B) {
	for i := 0; i < b.N; i++ {
		_ = ViaImpedance(0.8e-3, 0.15e-3, CopperConductivity, 2.45e9)
	}
}

func TestViaRow(t *testing.T) {
	tests := []struct {
		name          string
		w, pad, pitch float64
		wantN         int
		wantSpacing   float64
	}{
		{"narrow stub keeps one via", 0.8e-3, 0.6e-3, 1e-3, 1, 0},
		{"exactly 1.5 pads keeps one via", 0.9e-3, 0.6e-3, 1e-3, 1, 0},
		{"no pitch keeps one via", 3e-3, 0.6e-3, 0, 1, 0},
		// span 3 − 0.6 = 2.4 mm; 2.4/1.0 → 3 gaps → 4 vias at 0.8 mm.
		{"3 mm stub, 1 mm pitch", 3e-3, 0.6e-3, 1e-3, 4, 0.8e-3},
		// span 1.0 − 0.6 = 0.4 mm within one pitch → 2 vias at 0.4 mm.
		{"just over 1.5 pads", 1.0e-3, 0.6e-3, 1e-3, 2, 0.4e-3},
		// span 2.4 mm at exactly 1.2 mm → 2 gaps → 3 vias.
		{"span a whole number of pitches", 3e-3, 0.6e-3, 1.2e-3, 3, 1.2e-3},
		// span 0.92 − 0.6 = 0.32 mm over the 0.3 mm drill: two vias;
		// 0.4 mm pads on a 0.65 mm stub (over 1.5 pads): span 0.25 mm,
		// under the drill, so the holes would touch: one.
		{"outer holes just clear", 0.92e-3, 0.6e-3, 1e-3, 2, 0.32e-3},
		{"outer holes would touch", 0.65e-3, 0.4e-3, 1e-3, 1, 0},
		// span 0.95 − 0.4 = 0.55 mm at pitch 0.4 mm → 3 vias at 0.275 mm,
		// closer than the 0.3 mm drill: 2 at 0.55 mm instead.
		{"pitch below the drill spacing", 0.95e-3, 0.4e-3, 0.4e-3, 2, 0.55e-3},
	}
	for _, tt := range tests {
		n, sp := ViaRow(tt.w, 0.3e-3, tt.pad, tt.pitch)
		if n != tt.wantN || math.Abs(sp-tt.wantSpacing) > 1e-12 {
			t.Errorf("%s: %d vias at %g mm, want %d at %g mm", tt.name, n, sp*1e3, tt.wantN, tt.wantSpacing*1e3)
		}
		if n > 1 && sp > tt.pitch*(1+1e-12) && tt.name != "pitch below the drill spacing" {
			t.Errorf("%s: spacing %g mm exceeds the pitch %g mm", tt.name, sp*1e3, tt.pitch*1e3)
		}
	}
}

func TestFilamentMutualInductance(t *testing.T) {
	// Against Neumann's formula itself, M = μ0/4π ∬ dz1 dz2 / √(d² + (z1 − z2)²)
	// (exact for filaments), the inner integral in closed form
	// (asinh((h − z1)/d) + asinh(z1/d)) and the outer by the midpoint rule.
	neumann := func(h, d float64) float64 {
		const n = 20000
		dz, s := h/n, 0.0
		for i := 0; i < n; i++ {
			z := (float64(i) + 0.5) * dz
			s += math.Asinh((h-z)/d) + math.Asinh(z/d)
		}
		return 1e-7 * s * dz
	}
	for _, c := range []struct{ h, d float64 }{{1.6e-3, 1e-3}, {0.5e-3, 0.2e-3}, {1.6e-3, 5e-3}} {
		got, want := FilamentMutualInductance(c.h, c.d), neumann(c.h, c.d)
		if math.Abs(got-want) > 1e-5*want {
			t.Errorf("h %g mm d %g mm: M = %.6g pH, Neumann integral %.6g pH", c.h*1e3, c.d*1e3, got*1e12, want*1e12)
		}
	}
	// By hand: h 1.6 mm, d 1 mm: asinh 1.6 = 1.2489, 1.6·1.2489 − 1.8868 + 1
	// = 1.1116 mm; × 2e-7 H/m = 222.3 pH.
	if got := FilamentMutualInductance(1.6e-3, 1e-3); math.Abs(got-222.3e-12) > 0.1e-12 {
		t.Errorf("h 1.6 mm d 1 mm: M = %.5g pH, want 222.3 pH (formula by hand)", got*1e12)
	}
	// The close-spacing limit Grover quotes (from memory),
	// (μ0·h/2π)·[ln(2h/d) − 1 + d/h], agrees to O((d/h)²).
	h, d := 10e-3, 0.1e-3
	approx := 2e-7 * h * (math.Log(2*h/d) - 1 + d/h)
	if got := FilamentMutualInductance(h, d); math.Abs(got-approx) > 1e-4*approx {
		t.Errorf("d ≪ h: M = %.6g pH, close-spacing form %.6g pH", got*1e12, approx*1e12)
	}
}

func TestViaRowImpedanceLimits(t *testing.T) {
	const h, r, sigma, f = 1.6e-3, 0.15e-3, 5.8e7, 2.45e9
	z1 := ViaImpedance(h, r, sigma, f)
	// One via: unchanged.
	if got := ViaRowImpedance(1, 0, h, r, sigma, f); got != z1 {
		t.Errorf("one via: %v, want ViaImpedance %v", got, z1)
	}
	// N vias 10 km apart (M/L about 1e-7): uncoupled, so exactly Z1/N in the limit.
	for _, n := range []int{2, 3, 5} {
		got := ViaRowImpedance(n, 1e4, h, r, sigma, f)
		want := z1 / complex(float64(n), 0)
		if cmplx.Abs(got-want) > 1e-5*cmplx.Abs(want) {
			t.Errorf("%d vias 10 km apart: %v, want Z1/N = %v", n, got, want)
		}
	}
	// Two vias: by symmetry each carries half the current, so exactly
	// (Z1 + jωM)/2 — more than Z1/2, the mutual inductance's cost.
	sp := 0.8e-3
	got := ViaRowImpedance(2, sp, h, r, sigma, f)
	want := (z1 + complex(0, 2*math.Pi*f*FilamentMutualInductance(h, sp))) / 2
	if cmplx.Abs(got-want) > 1e-9*cmplx.Abs(want) {
		t.Errorf("two vias 0.8 mm apart: %v, want (Z1 + jωM)/2 = %v", got, want)
	}
	// Closely spaced rows are worse than L/N but better than one via.
	for _, n := range []int{2, 4, 6} {
		x := imag(ViaRowImpedance(n, sp, h, r, sigma, f))
		if !(x > imag(z1)/float64(n)) || !(x < imag(z1)) {
			t.Errorf("%d vias at 0.8 mm: X = %g Ω, want between X1/N = %g and X1 = %g", n, x, imag(z1)/float64(n), imag(z1))
		}
	}
}

func TestBoardViaToGroundRow(t *testing.T) {
	sub := Substrate{Height: 1.6e-3, Er: 4.4, CopperThickness: 35e-6}
	one := Board{Sub: sub, Via: Via{Drill: 0.3e-3, Pad: 0.6e-3}}
	row := one
	row.Via.Pitch = 1e-3
	// A narrow stub ignores the pitch.
	if a, b := one.ViaToGround(2.45e9, 0.8e-3), row.ViaToGround(2.45e9, 0.8e-3); a != b {
		t.Errorf("0.8 mm stub: %v with a pitch, %v without; want equal", b, a)
	}
	// A 3 mm stub ends in 4 vias at 0.8 mm: below one via's reactance,
	// above a quarter of it (coupling).
	a, b := one.ViaToGround(2.45e9, 3e-3), row.ViaToGround(2.45e9, 3e-3)
	want := ViaRowImpedance(4, 0.8e-3, sub.Height, 0.15e-3, sub.conductivity(), 2.45e9)
	if b != want || !(imag(b) < imag(a)) || !(imag(b) > imag(a)/4) {
		t.Errorf("3 mm stub: row %v (want %v), one via %v", b, want, a)
	}
}

// TestViaRangeWarning checks the edge of the range the full-wave via study
// checked (h/r ≥ 4, TestViaColumnConverges).
func TestViaRangeWarning(t *testing.T) {
	for _, c := range []struct {
		h, drill float64
		warn     bool
	}{
		{0.8e-3, 0.4e-3, false}, // h/r 4: the study's case 0
		{1.6e-3, 0.3e-3, false}, // h/r 10.7: the default drill on a 1.6 mm board
		{0.8e-3, 0.8e-3, true},  // h/r 2: the study's fat via
		{0.79e-3, 0.5e-3, true}, // h/r 3.2
		{0.2e-3, 0.3e-3, true},  // a thin prepreg
	} {
		got := ViaRangeWarning(c.h, c.drill/2) != ""
		if got != c.warn {
			t.Errorf("h %.2f mm drill %.2f mm: warning %v, want %v", c.h*1e3, c.drill*1e3, got, c.warn)
		}
	}
}
