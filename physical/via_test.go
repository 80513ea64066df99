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
