package geom

import "testing"

// AddLegend, the one door for legend ink, refuses strokes over a pad or a
// mask opening or past the edge band, and accepts them in free board; the
// stroke font draws "J1" as the strokes of J and 1 one advance apart.
func TestAddLegend(t *testing.T) {
	s := refSpec()
	s.EdgeClearance = 0.3e-3
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	pad := l.Pads[0].Center // a port pad
	tests := []struct {
		name string
		at   Point
		want bool
	}{
		{"over a port pad", Point{pad.X, pad.Y}, false},
		{"past the board edge", Point{-1000000, 500000}, false},
		{"free corner of the board", Point{800000, 600000}, true},
	}
	for _, tt := range tests {
		c := l
		c.Legend = nil
		if got := c.AddLegend(LegendText("J1", tt.at, LegendHeight), 300000); got != tt.want {
			t.Errorf("%s: AddLegend = %v, want %v", tt.name, got, tt.want)
		}
	}
	ss := LegendText("J1", Point{0, 0}, 600000)
	// J is one polyline, 1 two; the 1 starts one advance (6 units of
	// 0.1 mm) to the right.
	if len(ss) != 3 || ss[1][0].X != 600000+100000 || LegendTextWidth("J1", 600000) != 1200000 {
		t.Errorf("strokes %v", ss)
	}
}
