package geom

import (
	"errors"
	"testing"
)

// TestBuildViaRow checks a 3 mm shorted stub ending in four vias at
// 0.8 mm: the count, the spacing, every pad inside the stub's end (exact
// nanometre arithmetic on the given sizes).
func TestBuildViaRow(t *testing.T) {
	s := refSpec()
	s.Stubs[0].Width = 3e-3
	s.Stubs[0].Via = &ViaSpec{Drill: 0.3e-3, Pad: 0.6e-3, Count: 4, Spacing: 0.8e-3}
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	if len(l.Vias) != 4 {
		t.Fatalf("%d vias, want 4", len(l.Vias))
	}
	var stub Rect
	for _, e := range l.Marks.Elements {
		if e.ID == "s1" {
			stub = e.Rect
		}
	}
	// The tee is at x 8.2 mm (refSpec: feed-load 5 + line1 3.2, as in
	// TestBuildReference); pads flush with the stub sides at 8.2 ± 1.2 mm.
	wantX := []int64{7.0e6, 7.8e6, 8.6e6, 9.4e6}
	for i, v := range l.Vias {
		if v.Center.X != wantX[i] {
			t.Errorf("via %d at x %d nm, want %d", i, v.Center.X, wantX[i])
		}
		if v.Center.Y != stub.Max.Y-0.3e6 {
			t.Errorf("via %d at y %d nm, want the stub end %d less half a pad", i, v.Center.Y, stub.Max.Y)
		}
		if v.Center.X-v.Pad/2 < stub.Min.X || v.Center.X+v.Pad/2 > stub.Max.X || v.Center.Y+v.Pad/2 > stub.Max.Y {
			t.Errorf("via %d pad at %v (Ø%d) leaves the stub %v", i, v.Center, v.Pad, stub)
		}
		if v.Drill != 0.3e6 || v.Net != NetRF {
			t.Errorf("via %d: drill %d net %q", i, v.Drill, v.Net)
		}
	}
	if len(l.Pads) < 4 {
		t.Errorf("%d pads, want a pad per via", len(l.Pads))
	}
}

func TestBuildViaRowRefuses(t *testing.T) {
	for _, tc := range []struct {
		name string
		v    ViaSpec
	}{
		{"row wider than the stub", ViaSpec{Drill: 0.3e-3, Pad: 0.6e-3, Count: 5, Spacing: 0.8e-3}},
		{"holes touch", ViaSpec{Drill: 0.3e-3, Pad: 0.6e-3, Count: 2, Spacing: 0.3e-3}},
	} {
		s := refSpec()
		s.Stubs[0].Width = 3e-3
		v := tc.v
		s.Stubs[0].Via = &v
		if _, err := Build(s); !errors.Is(err, ErrVia) {
			t.Errorf("%s: err %v, want ErrVia", tc.name, err)
		}
	}
}
