package geom

import "testing"

// A stub drawn with a trim allowance: the copper runs Length + allowance
// from the through line's edge, and tick 0 sits at the design length.
// Exact geometry in nanometres.
func TestTrimAllowance(t *testing.T) {
	for _, side := range []int{1, -1} {
		s := Spec{
			Name:     "trim",
			Segments: []Segment{{"a", 2e-3, 10e-3}, {"b", 2e-3, 10e-3}},
			Stubs:    []Stub{{ID: "s", At: 0, Width: 1e-3, Length: 6e-3, Side: side, TrimAllowance: 1e-3}},
			Margin:   3e-3,
		}
		l, err := Build(s)
		if err != nil {
			t.Fatal(err)
		}
		if len(l.Marks.Trims) != 1 {
			t.Fatalf("side %d: %d trim marks", side, len(l.Marks.Trims))
		}
		tr := l.Marks.Trims[0]
		tee := l.Marks.Tees[0]
		if tr.Ticks != 4 {
			t.Errorf("side %d: %d ticks for 1 mm at 0.25 mm, want 4", side, tr.Ticks)
		}
		if got, want := tr.End.Y-tee.RefY, int64(side)*7_000_000; got != want {
			t.Errorf("side %d: drawn end %d nm from the reference plane, want %d", side, got, want)
		}
		if got, want := tr.DesignEnd.Y-tee.RefY, int64(side)*6_000_000; got != want {
			t.Errorf("side %d: design end %d nm from the reference plane, want %d", side, got, want)
		}
		if tr.Tick(4) != tr.End || tr.Tick(0) != tr.DesignEnd {
			t.Errorf("side %d: ticks %v..%v, ends %v..%v", side, tr.Tick(0), tr.Tick(4), tr.DesignEnd, tr.End)
		}
	}
	short := Spec{
		Name:     "trim",
		Segments: []Segment{{"a", 2e-3, 10e-3}, {"b", 2e-3, 10e-3}},
		Stubs:    []Stub{{ID: "s", At: 0, Width: 1e-3, Length: 6e-3, Side: 1, TrimAllowance: 1e-3, Via: &ViaSpec{Drill: 0.3e-3, Pad: 0.6e-3}}},
		Margin:   3e-3,
	}
	if _, err := Build(short); err == nil {
		t.Error("a shorted stub with a trim allowance was accepted")
	}
}

// The legend carries a stroke on each side of the stub at every trim tick,
// clear of the stub's copper (off the mask opening by AddLegend's rule).
func TestTrimTicksOnLegend(t *testing.T) {
	l, err := Build(Spec{
		Name:     "trim",
		Segments: []Segment{{"a", 2e-3, 10e-3}, {"b", 2e-3, 10e-3}},
		Stubs:    []Stub{{ID: "s", At: 0, Width: 1e-3, Length: 6e-3, Side: 1, TrimAllowance: 1e-3}},
		Margin:   4e-3,
	})
	if err != nil {
		t.Fatal(err)
	}
	tr := l.Marks.Trims[0]
	for k := 0; k <= tr.Ticks; k++ {
		p := tr.Tick(k)
		sides := 0
		for _, s := range l.Legend {
			if len(s) == 2 && s[0].Y == p.Y && s[1].Y == p.Y {
				if d := min(abs64(s[0].X-p.X), abs64(s[1].X-p.X)); d <= tr.Across/2 {
					t.Errorf("tick %d: stroke %v reaches the stub's copper", k, s)
				}
				sides++
			}
		}
		if sides != 2 {
			t.Errorf("tick %d at y = %d nm: %d legend strokes, want one each side", k, p.Y, sides)
		}
	}
}

func abs64(v int64) int64 {
	if v < 0 {
		return -v
	}
	return v
}
