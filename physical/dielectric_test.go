package physical

import (
	"math"
	"testing"
)

// The wideband Debye model (Djordjevic-Sarkar 2001): exact properties of
// its form. It returns the fitted pair at the reference frequency; ε′ falls
// monotonically with frequency (Kramers-Kronig: loss implies dispersion);
// between the corners tanδ is nearly flat (ε″ tends to the constant
// Δε·π/(2·ln10·(m2 − m1)) far from both corners); without loss εr is constant.
func TestWidebandDebye(t *testing.T) {
	cases := []struct {
		name        string
		er, tanD, f float64
	}{
		{"FR-4 class at 1 GHz", 4.4, 0.02, 1e9},
		{"hydrocarbon-ceramic class at 10 GHz", 3.5, 0.004, 10e9},
		{"PTFE class at 10 GHz", 2.2, 0.0009, 10e9},
	}
	for _, c := range cases {
		m := FitWidebandDebye(c.er, c.tanD, c.f)
		er, tanD := m.At(c.f)
		if math.Abs(er-c.er) > 1e-12 || math.Abs(tanD-c.tanD) > 1e-14 {
			t.Errorf("%s: at the reference %.6g, %.6g; want %.6g, %.6g", c.name, er, tanD, c.er, c.tanD)
		}
		prev := math.Inf(1)
		for f := 1e6; f <= 1e11; f *= 1.2 {
			e, td := m.At(f)
			if e >= prev {
				t.Errorf("%s: ε′ does not fall at %.3g Hz", c.name, f)
			}
			prev = e
			if f >= 1e7 && f <= 1e10 && math.Abs(td/c.tanD-1) > 0.15 {
				t.Errorf("%s: tanδ %.4g at %.3g Hz, not flat about %.4g", c.name, td, f, c.tanD)
			}
		}
		// Far from both corners ε″ = Δε·π/(2·ln10·(m2−m1)) (exact limit).
		e, td := m.At(1e8)
		want := m.DeltaEps * math.Pi / (2 * math.Ln10 * (m.M2 - m.M1))
		if math.Abs(e*td-want) > 1e-3*want {
			t.Errorf("%s: ε″ %.6g at 100 MHz, limit %.6g", c.name, e*td, want)
		}
	}
	if m := FitWidebandDebye(2.2, 0, 10e9); m.DeltaEps != 0 {
		t.Errorf("loss-free fit has Δε = %g", m.DeltaEps)
	}
	s := Substrate{Er: 4.4, LossTangent: 0.02}
	if got := s.At(0, 2.45e9); got != s {
		t.Errorf("no reference frequency changed the substrate: %+v", got)
	}
	if got := s.At(1e9, 2.45e9); !(got.Er < 4.4 && got.Er > 4.3) {
		t.Errorf("FR-4 class εr 4.4 at 1 GHz moved to %.4f at 2.45 GHz", got.Er)
	}
}
