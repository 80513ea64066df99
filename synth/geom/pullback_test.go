package geom

import (
	"errors"
	"testing"
)

// The ground plane is the board pulled back by EdgeClearance on all four
// sides (worked by hand from the board), the RF copper still reaches both
// port edges, and a margin below the clearance is refused.
func TestEdgeClearance(t *testing.T) {
	s := refSpec()
	s.EdgeClearance = 0.3e-3
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	bmin, bmax := l.Board.Bounds()
	gmin, gmax := l.Ground.Bounds()
	if gmin.X != bmin.X+300000 || gmin.Y != bmin.Y+300000 || gmax.X != bmax.X-300000 || gmax.Y != bmax.Y-300000 {
		t.Errorf("plane %v..%v, board %v..%v: want 0.3 mm inside on every side", gmin, gmax, bmin, bmax)
	}
	rmin, rmax := l.Copper[0].Outline.Bounds()
	if rmin.X != bmin.X || rmax.X != bmax.X {
		t.Errorf("RF copper x %d..%d, want the port edges %d..%d", rmin.X, rmax.X, bmin.X, bmax.X)
	}
	s.Margin = 0.2e-3
	if _, err := Build(s); !errors.Is(err, ErrRange) {
		t.Errorf("margin 0.2 mm under a 0.3 mm clearance: err %v, want ErrRange", err)
	}
}

// The coplanar pour and its stitching vias keep the clearance too.
func TestEdgeClearanceCoplanar(t *testing.T) {
	s := cpwSpec()
	s.EdgeClearance = 0.3e-3
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	bmin, bmax := l.Board.Bounds()
	for _, n := range l.Copper[1:] {
		for _, p := range n.Outline {
			if p.X < bmin.X+300000 || p.Y < bmin.Y+300000 || p.X > bmax.X-300000 || p.Y > bmax.Y-300000 {
				t.Errorf("pour vertex %v within 0.3 mm of the edge", p)
			}
		}
	}
	for _, v := range l.Vias {
		if v.Center.X-v.Pad/2 < bmin.X+300000 || v.Center.Y-v.Pad/2 < bmin.Y+300000 ||
			v.Center.X+v.Pad/2 > bmax.X-300000 || v.Center.Y+v.Pad/2 > bmax.Y-300000 {
			t.Errorf("via pad at %v within 0.3 mm of the edge", v.Center)
		}
	}
}
