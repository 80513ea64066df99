package geom

import "testing"

// A reflect standard: the middle segment's copper is gone, the halves are
// two nets with their own port pads; exact in nanometres.
func TestOpenAt(t *testing.T) {
	l, err := Build(Spec{
		Name:     "reflect",
		Segments: []Segment{{"a", 3e-3, 8e-3}, {"gap", 3e-3, 4e-3}, {"b", 3e-3, 8e-3}},
		PortPad:  PadSpec{Width: 3e-3, Length: 1.5e-3},
		Margin:   3e-3,
	})
	if err != nil {
		t.Fatal(err)
	}
	r, err := OpenAt(l, "gap")
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Copper) != 2 || r.Copper[0].Name != "RF_A" || r.Copper[1].Name != "RF_B" {
		t.Fatalf("nets %+v", r.Copper)
	}
	_, maxA := r.Copper[0].Outline.Bounds()
	minB, _ := r.Copper[1].Outline.Bounds()
	if maxA.X != 8_000_000 || minB.X != 12_000_000 {
		t.Errorf("open ends at x = %d and %d nm, want 8e6 and 12e6", maxA.X, minB.X)
	}
	for _, p := range r.Pads {
		if want := map[bool]string{true: "RF_A", false: "RF_B"}[p.Center.X < 10_000_000]; p.Net != want {
			t.Errorf("pad at x = %d on net %s, want %s", p.Center.X, p.Net, want)
		}
	}
	if _, err := OpenAt(l, "a"); err == nil {
		t.Error("opening the first segment was accepted")
	}
}
