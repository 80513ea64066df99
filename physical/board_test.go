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

// Relength gives the same network as a Sim made afresh from the relengthed
// board, and refuses a wrong number of lengths.
func TestSimRelength(t *testing.T) {
	sub := Substrate{Er: 3.5, Height: 0.51e-3, CopperThickness: 35e-6, LossTangent: 0.004}
	b := Board{Sub: sub, Through: []Trace{{1.1e-3, 5e-3}, {1.1e-3, 7e-3}}, Stubs: []Stub{{At: 0, Width: 1.1e-3, Length: 6e-3}}}
	s, err := NewSim(b, MicrostripMaker)
	if err != nil {
		t.Fatal(err)
	}
	r, err := s.Relength([]float64{4e-3, 8e-3}, []float64{5.5e-3})
	if err != nil {
		t.Fatal(err)
	}
	b.Through[0].Length, b.Through[1].Length, b.Stubs[0].Length = 4e-3, 8e-3, 5.5e-3
	fresh, err := NewSim(b, MicrostripMaker)
	if err != nil {
		t.Fatal(err)
	}
	if r.ABCD(2.45e9) != fresh.ABCD(2.45e9) {
		t.Errorf("relengthed %v, fresh %v", r.ABCD(2.45e9), fresh.ABCD(2.45e9))
	}
	if s.Board().Through[0].Length != 5e-3 {
		t.Error("Relength changed the original")
	}
	if _, err := s.Relength([]float64{1e-3}, nil); err == nil {
		t.Error("wrong counts accepted")
	}
}

// atOnly hides a model's batched sweep, so that ABCDSweep takes its
// one-frequency path.
type atOnly struct{ LineModel }

func TestABCDSweepEqualsABCD(t *testing.T) {
	// Exact: the batched sweep computes the same chain matrix as ABCD at
	// each frequency, bit for bit, through and past a block boundary and,
	// with two or more processors, across the split between workers.
	sub := Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um, LossTangent: 0.02, Roughness: 1 * um}
	b := Board{Sub: sub, Via: Via{Drill: 0.3 * mm, Pad: 0.6 * mm},
		Through: []Trace{{Width: 3 * mm, Length: 10 * mm}, {Width: 3 * mm, Length: 4 * mm}, {Width: 1.5 * mm, Length: 6 * mm}, {Width: 3 * mm, Length: 5 * mm}},
		Stubs:   []Stub{{At: 0, Width: 2 * mm, Length: 8 * mm}, {At: 2, Width: 1 * mm, Length: 5 * mm, Short: true}}}
	freqs := make([]float64, 2*sweepChunk+sweepBlock+37)
	for i := range freqs {
		freqs[i] = 1*GHz + 3*GHz*float64(i)/float64(len(freqs)-1)
	}
	for _, mk := range []struct {
		name string
		mk   LineMaker
	}{
		{"batched", MicrostripMaker},
		{"one frequency at a time", func(w float64, sub Substrate) (LineModel, error) {
			m, err := MicrostripMaker(w, sub)
			return atOnly{m}, err
		}},
	} {
		sim, err := NewSim(b, mk.mk)
		if err != nil {
			t.Fatal(err)
		}
		head := []ABCD{Identity()}
		got := sim.ABCDSweep(freqs, head)
		if len(got) != len(freqs)+1 || got[0] != Identity() {
			t.Fatalf("%s: %d matrices, want %d after the existing one", mk.name, len(got), len(freqs)+1)
		}
		for i, f := range freqs {
			if want := sim.ABCD(f); got[i+1] != want {
				t.Fatalf("%s: at %g Hz ABCDSweep %v, ABCD %v", mk.name, f, got[i+1], want)
			}
		}
	}
}
