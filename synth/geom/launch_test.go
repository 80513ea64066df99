package geom

import (
	"errors"
	"testing"
)

// launchSpec is refSpec with an edge-launch landing and a 0.3 mm pull-back.
func launchSpec() Spec {
	s := refSpec()
	s.EdgeClearance = 0.3e-3
	s.Launch = &LaunchSpec{PadWidth: 1.8e-3, PadLength: 1.5e-3, Gap: 0.5e-3, GroundWidth: 1.5e-3, GroundLength: 2e-3,
		ViaDrill: 0.3e-3, ViaPad: 0.6e-3, ViaPitch: 1.2e-3}
	return s
}

// TestLaunchGeometry checks the landing against positions worked by hand
// from launchSpec: board 17.2 × 13.8 mm as refSpec's (the landing reaches
// 0.9 + 0.5 + 1.5 = 2.9 mm from the centre line, inside the stubs'
// extent), centre line y = 5.9 mm. Ground pads x 0.3..2.3 mm (load port)
// and 14.9..16.9 mm (source port), y 7.3..8.8 mm (pin 2) and 3.0..4.5 mm
// (pin 3). Vias: 2 mm pad, 0.6 mm via pads: 1.4 mm between the outer
// centres, more than the 1.2 mm pitch, so three vias 0.7 mm apart, at
// x = 0.6, 1.3, 2.0 mm on the pads' centre lines y = 8.05 and 3.75 mm.
func TestLaunchGeometry(t *testing.T) {
	l, err := Build(launchSpec())
	if err != nil {
		t.Fatal(err)
	}
	if _, max := l.Board.Bounds(); max != (Point{17.2e6, 13.8e6}) {
		t.Errorf("board corner %v, want 17.2×13.8 mm", max)
	}
	type padWant struct {
		pin    string
		center Point
		w, h   int64
	}
	want := []padWant{
		{"J2,1", Point{0.75e6, 5.9e6}, 1.5e6, 1.8e6},
		{"J1,1", Point{16.45e6, 5.9e6}, 1.5e6, 1.8e6},
		{"J2,2", Point{1.3e6, 8.05e6}, 2e6, 1.5e6},
		{"J2,3", Point{1.3e6, 3.75e6}, 2e6, 1.5e6},
		{"J1,2", Point{15.9e6, 8.05e6}, 2e6, 1.5e6},
		{"J1,3", Point{15.9e6, 3.75e6}, 2e6, 1.5e6},
	}
	got := map[string]Pad{}
	for _, p := range l.Pads {
		if p.Pin != "" {
			got[p.Pin] = p
		}
	}
	if len(got) != len(want) {
		t.Errorf("%d pads with pins, want %d", len(got), len(want))
	}
	for _, w := range want {
		p, ok := got[w.pin]
		switch {
		case !ok:
			t.Errorf("no pad for pin %s", w.pin)
		case p.Center != w.center || p.W != w.w || p.H != w.h || p.Function != SMDPad:
			t.Errorf("pin %s: %+v, want centre %v, %d × %d nm, %s", w.pin, p, w.center, w.w, w.h, SMDPad)
		case w.pin[3] == '1' && p.Net != NetRF, w.pin[3] != '1' && p.Net != NetGround:
			t.Errorf("pin %s on net %s", w.pin, p.Net)
		}
	}
	var vias []Point
	for _, v := range l.Vias {
		if v.Net == NetGround {
			vias = append(vias, v.Center)
			if v.Drill != 0.3e6 || v.Pad != 0.6e6 {
				t.Errorf("ground via at %v: drill %d, pad %d nm", v.Center, v.Drill, v.Pad)
			}
		}
	}
	wantVias := []Point{}
	for _, cx := range []int64{1.3e6, 15.9e6} {
		for _, cy := range []int64{8.05e6, 3.75e6} {
			for _, o := range []int64{-0.7e6, 0, 0.7e6} {
				wantVias = append(wantVias, Point{cx + o, cy})
			}
		}
	}
	if len(vias) != len(wantVias) {
		t.Fatalf("ground vias %v, want %v", vias, wantVias)
	}
	for i := range vias {
		if vias[i] != wantVias[i] {
			t.Errorf("ground via %d at %v, want %v", i, vias[i], wantVias[i])
		}
	}
	// The signal line still runs to both board edges; the ground pads
	// keep the clearance; every landing pad is open in the mask, also
	// with the line covered.
	rmin, rmax := l.Copper[0].Outline.Bounds()
	if rmin.X != 0 || rmax.X != 17.2e6 {
		t.Errorf("RF copper x %d..%d, want 0..17.2 mm", rmin.X, rmax.X)
	}
	s := launchSpec()
	s.Mask = "cover"
	c, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range c.Pads {
		if p.Function != SMDPad {
			continue
		}
		if p.Center.X-p.W/2 < 0.3e6 && p.Net == NetGround {
			t.Errorf("ground pad %s within the 0.3 mm clearance", p.Pin)
		}
		open := false
		for _, m := range c.MaskOpenings {
			if pointInPolygon(p.Center, m) {
				open = true
			}
		}
		if !open {
			t.Errorf("pad %s (%v) under mask", p.Pin, p.Center)
		}
	}
}

// A landing that would come within its gap of other copper is refused: a
// signal pad narrower than the 1.8 mm feed puts the ground pads 0.1 mm
// from the feed's edge; a stub inside the landing's 2.8 mm (0.3 + 2 + 0.5)
// from the edge overlaps it; a via row whose holes touch is refused.
func TestLaunchRefused(t *testing.T) {
	narrow := launchSpec()
	narrow.Launch.PadWidth = 1e-3
	near := launchSpec()
	near.Stubs[1].At, near.Segments[0].Length = 0, 2.9e-3 // s2 at x 2.4..3.4 mm
	touching := launchSpec()
	touching.Launch.ViaPitch = 0.3e-3
	unequal := launchSpec()
	unequal.Segments[3].Width = 1.5e-3 // the source's feed narrower than the load's
	for _, tt := range []struct {
		name string
		s    Spec
		want error
	}{
		{"pad narrower than the feed", narrow, ErrOverlap},
		{"stub in the landing", near, ErrOverlap},
		{"holes touch", touching, ErrVia},
		{"port lines of two widths", unequal, ErrRange},
	} {
		if _, err := Build(tt.s); !errors.Is(err, tt.want) {
			t.Errorf("%s: err %v, want %v", tt.name, err, tt.want)
		}
	}
}
