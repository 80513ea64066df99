package physical

import (
	"math"
	"math/cmplx"
	"testing"
)

// The via pad's overhang beyond a stub: exact limits (a pad no wider than
// the stub adds nothing; a stub of vanishing width leaves the whole disc)
// and the area of a disc outside a band against a plain numerical
// integration of the chord lengths (midpoint rule).
func TestViaPadOverhang(t *testing.T) {
	sub := Substrate{Er: 4.4, Height: 1.6e-3, CopperThickness: 35e-6}
	b := Board{Sub: sub, Via: Via{Drill: 0.3e-3, Pad: 0.8e-3}}
	const f = 2.45e9
	zv := ViaImpedance(sub.Height, 0.15e-3, CopperConductivity, f)
	r := 0.4e-3
	cases := []struct {
		name  string
		width float64
		area  float64 // m², the pad's copper outside the stub
	}{
		{"pad inside the stub (exact: nothing)", 1e-3, 0},
		{"pad as wide as the stub (exact: nothing)", 0.8e-3, 0},
		{"vanishing stub (exact: the whole disc)", 1e-12, math.Pi * r * r},
		{"0.3 mm stub (numerical integration)", 0.3e-3, discOutsideBand(r, 0.15e-3)},
	}
	for _, c := range cases {
		want := ViaToGround(zv, Eps0*sub.Er*c.area/sub.Height, f)
		got := b.ViaToGround(f, c.width)
		if cmplx.Abs(got-want) > 1e-6*cmplx.Abs(want) {
			t.Errorf("%s: %v, want %v", c.name, got, want)
		}
	}
}

// discOutsideBand integrates the chords of a disc of radius r over a < |x| < r.
func discOutsideBand(r, a float64) float64 {
	const n = 200000
	h := (r - a) / n
	sum := 0.0
	for i := 0; i < n; i++ {
		x := a + (float64(i)+0.5)*h
		sum += 2 * math.Sqrt(r*r-x*x) * h
	}
	return 2 * sum
}
