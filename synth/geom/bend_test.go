package geom

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestMiterFraction(t *testing.T) {
	tests := []struct {
		name string
		w, h float64
		want float64
		tol  float64
	}{
		// Douville and James 1978: m = 0.52 + 0.65·exp(−1.35·W/h).
		// W/h = 1: e^−1.35 = 0.2592403; 0.52 + 0.65 × 0.2592403 = 0.6885062
		// (python3: 0.52+0.65*math.exp(-1.35)).
		{"W/h = 1", 1e-3, 1e-3, 0.6885062, 1e-7},
		// W/h = 1.5: e^−2.025 = 0.1319938; 0.52 + 0.0857960 = 0.6057960.
		{"W/h = 1.5", 1.2e-3, 0.8e-3, 0.6057960, 1e-7},
		// The lower end of the measurements, W/h = 0.25: e^−0.3375 =
		// 0.7135519; 0.52 + 0.4638088 = 0.9838088.
		{"W/h = 0.25", 0.25e-3, 1e-3, 0.9838088, 1e-7},
		// W/h → ∞: the exponential vanishes and m tends to 0.52 (exact
		// limit of the formula); at W/h = 100 it is 0.52 + 0.65·e^−135.
		{"W/h large", 100e-3, 1e-3, 0.52, 1e-15},
		// Scale free: only the ratio counts (exact property of the formula).
		{"same ratio in µm", 1.2, 0.8, 0.6057960, 1e-7},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := MiterFraction(tt.w, tt.h); math.Abs(got-tt.want) > tt.tol {
				t.Errorf("MiterFraction(%g, %g) = %.9f, want %.7f", tt.w, tt.h, got, tt.want)
			}
		})
	}
	for _, bad := range [][2]float64{{0, 1}, {1, 0}, {-1, 1}, {math.Inf(1), 1}, {math.NaN(), 1}} {
		if got := MiterFraction(bad[0], bad[1]); !math.IsNaN(got) {
			t.Errorf("MiterFraction(%g, %g) = %g, want NaN", bad[0], bad[1], got)
		}
	}
}

// bentSpec is refSpec on a 12.6 mm board limit: s1 (1.2 mm wide, 6 mm to
// its via pad's far edge, up) no longer fits straight and bends toward the
// source port. By hand: 12.6 − 2 × 1 mm margin leaves 10.6 mm; the down
// side keeps s2 straight (0.9 + 4 = 4.9 mm), so s1 may reach 5.7 mm above
// the centre line: its second leg's outer edge at 5.7 mm, its centre line
// at 5.7 − 0.6 = 5.1 mm. First leg from the through line's edge (0.9 mm)
// to the bend centre: 4.2 mm; second leg 6 − 4.2 = 1.8 mm, from x = 8.2 to
// 10.0 mm. With the board's centre line at y = 1 + 4.9 = 5.9 mm: bend
// centre (8.2, 11.0), end (10.0, 11.0), via centre 0.4 mm before the end
// (9.6, 11.0), outer corner (7.6, 11.6) mm.
func bentSpec() Spec {
	s := refSpec()
	s.MaxBoard = [2]float64{0, 12.6e-3}
	return s
}

// miterLeg is 2·m·W for s1 of refSpec, nm: m = 0.6057960 at W/h =
// 1.2/0.8 (see TestMiterFraction), 2 × 0.6057960 × 1.2 mm = 1.453910 mm.
const miterLeg = 1453910

func TestBendGeometry(t *testing.T) {
	l, err := Build(bentSpec())
	if err != nil {
		t.Fatal(err)
	}
	if len(l.Marks.Bends) != 1 {
		t.Fatalf("%d bends, want 1 (s1)", len(l.Marks.Bends))
	}
	b := l.Marks.Bends[0]
	want := Bend{
		StubID: "s1", Toward: 1,
		Center: Point{8.2e6, 11.0e6}, End: Point{10.0e6, 11.0e6},
		Corner:     Point{7.6e6, 11.6e6},
		Chamfer:    [2]Point{{7.6e6, 11.6e6 - miterLeg}, {7.6e6 + miterLeg, 11.6e6}},
		ChamferLeg: miterLeg,
		Leg1:       4.2e6, Leg2: 1.8e6,
	}
	got := b
	got.Miter = 0
	if got != want {
		t.Errorf("bend\n %+v, want\n %+v", got, want)
	}
	if math.Abs(b.Miter-0.6057960) > 1e-7 {
		t.Errorf("miter fraction %.7f, want 0.6057960 (Douville and James at W/h = 1.5)", b.Miter)
	}
	// The centre-line length is the Spec's length, within 1 nm.
	if d := b.Leg1 + b.Leg2 - Nanometres(bentSpec().Stubs[0].Length); d < -1 || d > 1 {
		t.Errorf("legs %d + %d nm differ from the stub length by %d nm", b.Leg1, b.Leg2, d)
	}
	// Board: 17.2 × 12.6 mm.
	if _, max := l.Board.Bounds(); max != (Point{17.2e6, 12.6e6}) {
		t.Errorf("board corner %v, want 17.2 × 12.6 mm", max)
	}
	// The via sits on the second leg's centre line, its pad's far edge at
	// the end.
	if len(l.Vias) != 1 || l.Vias[0].Center != (Point{9.6e6, 11.0e6}) {
		t.Errorf("vias %+v, want one at (9.6, 11.0) mm", l.Vias)
	}
	if tee := l.Marks.Tees[0]; tee.RefY != 6.8e6 || tee.EndY != 11.0e6 {
		t.Errorf("tee %+v, want RefY 6.8 mm, EndY 11.0 mm", tee)
	}
	// Exact by hand: the L union has the area of the straight layout,
	// 39.2 mm² (TestBuildReference): s1's first leg adds 0.6 × (5.7 − 0.9)
	// + 0.6 × (5.7 − 0.5) = 6.0 mm² over line1 and line2, its second leg
	// 1.2 × 1.2 = 1.44 mm² beyond the first. The miter removes a right
	// triangle of legs 2mW: twice the area drops by (2mW)².
	p := l.Copper[0].Outline
	if got, want := p.DoubleArea(), int64(2*39.2e12)-int64(miterLeg)*miterLeg; got != want {
		t.Errorf("twice the copper area %d nm², want 2 × 39.2 mm² − (2mW)² = %d", got, want)
	}
	// The chamfer's two points are on the outline, the corner is not.
	var seen [2]bool
	for _, q := range p {
		if q == b.Corner {
			t.Errorf("the outer corner %v is still a vertex", q)
		}
		for i, c := range b.Chamfer {
			seen[i] = seen[i] || q == c
		}
	}
	if !seen[0] || !seen[1] {
		t.Errorf("chamfer points %v on the outline: %v", b.Chamfer, seen)
	}
	if err := simple(p); err != nil {
		t.Error(err)
	}
}

// simple checks that p has no repeated vertex and that no two of its edges
// meet except neighbours at their shared vertex (exact integer orientation
// tests).
func simple(p Polygon) error {
	n := len(p)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if p[i] == p[j] {
				return errors.New("repeated vertex " + FormatMM(p[i].X) + ", " + FormatMM(p[i].Y))
			}
			if j == i+1 || (i == 0 && j == n-1) {
				continue
			}
			if segmentsMeet(p[i], p[(i+1)%n], p[j], p[(j+1)%n]) {
				return errors.New("edges cross at " + FormatMM(p[i].X) + ", " + FormatMM(p[i].Y))
			}
		}
	}
	return nil
}

func orient(a, b, c Point) int64 {
	v := (b.X-a.X)*(c.Y-a.Y) - (b.Y-a.Y)*(c.X-a.X)
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}

func onSeg(a, b, c Point) bool {
	return min(a.X, b.X) <= c.X && c.X <= max(a.X, b.X) && min(a.Y, b.Y) <= c.Y && c.Y <= max(a.Y, b.Y)
}

func segmentsMeet(a, b, c, d Point) bool {
	o1, o2, o3, o4 := orient(a, b, c), orient(a, b, d), orient(c, d, a), orient(c, d, b)
	if o1 != o2 && o3 != o4 {
		return true
	}
	return (o1 == 0 && onSeg(a, b, c)) || (o2 == 0 && onSeg(a, b, d)) || (o3 == 0 && onSeg(c, d, a)) || (o4 == 0 && onSeg(c, d, b))
}

// TestBendDirections bends toward the load port when the source side has
// no room, and bends down-going stubs; the expected points are by hand.
func TestBendDirections(t *testing.T) {
	// A 1 mm line: feed 5 mm, line 6 mm, feed 2 mm; an open 1 mm stub 8 mm
	// long at x = 11 mm; no port pads; 1 mm margin, h = 0.5 mm; limit 7 mm.
	// 7 − 2 leaves 5 mm, 0.5 below the line, so the stub may reach 4.5 mm:
	// second leg centre line at 4.0 mm, first leg 4.0 − 0.5 = 3.5 mm,
	// second leg 4.5 mm. Toward +x it would end at 15.5 mm, past the
	// 13 mm board: it turns toward the load and ends at 11 − 4.5 = 6.5 mm.
	// m = 0.52 + 0.65·e^−2.7 = 0.5636836 (python3), 2mW = 1.127367 mm.
	// Centre line of the board at 1 + 0.5 = 1.5 mm (up) or 1 + 4.5 =
	// 5.5 mm (down).
	spec := func(side int) Spec {
		return Spec{
			Name:     "dir",
			Segments: []Segment{{"f1", 1e-3, 5e-3}, {"l", 1e-3, 6e-3}, {"f2", 1e-3, 2e-3}},
			Stubs:    []Stub{{ID: "s", At: 1, Width: 1e-3, Length: 8e-3, Side: side}},
			Margin:   1e-3, Height: 0.5e-3, MaxBoard: [2]float64{0, 7e-3},
		}
	}
	const a = 1127367
	tests := []struct {
		name string
		side int
		want Bend
	}{
		{"up, toward the load", 1, Bend{StubID: "s", Toward: -1,
			Center: Point{11e6, 5.5e6}, End: Point{6.5e6, 5.5e6}, Corner: Point{11.5e6, 6e6},
			Chamfer: [2]Point{{11.5e6, 6e6 - a}, {11.5e6 - a, 6e6}}, ChamferLeg: a, Leg1: 3.5e6, Leg2: 4.5e6}},
		{"down, toward the load", -1, Bend{StubID: "s", Toward: -1,
			Center: Point{11e6, 1.5e6}, End: Point{6.5e6, 1.5e6}, Corner: Point{11.5e6, 1e6},
			Chamfer: [2]Point{{11.5e6, 1e6 + a}, {11.5e6 - a, 1e6}}, ChamferLeg: a, Leg1: 3.5e6, Leg2: 4.5e6}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			l, err := Build(spec(tt.side))
			if err != nil {
				t.Fatal(err)
			}
			if len(l.Marks.Bends) != 1 {
				t.Fatalf("bends %+v", l.Marks.Bends)
			}
			got := l.Marks.Bends[0]
			if math.Abs(got.Miter-0.5636836) > 1e-7 {
				t.Errorf("miter %.7f, want 0.5636836", got.Miter)
			}
			got.Miter = 0
			if got != tt.want {
				t.Errorf("bend\n %+v, want\n %+v", got, tt.want)
			}
			// Exact: line 13 × 1 = 13 mm²; stub w·L = 1 × 8 = 8 mm² (first
			// leg 1 × 4.0 from the edge, second 1 × 4.0 beyond it); the
			// miter takes (2mW)²/2.
			p := l.Copper[0].Outline
			if got, want := p.DoubleArea(), int64(2*21e12)-int64(a)*a; got != want {
				t.Errorf("twice the area %d nm², want %d", got, want)
			}
			if err := simple(p); err != nil {
				t.Error(err)
			}
			if _, max := l.Board.Bounds(); max.Y != 7e6 {
				t.Errorf("board height %d nm, want the 7 mm limit", max.Y)
			}
		})
	}
}

// A stub that fits stays straight: no bend, the layout of TestBuildReference.
func TestBendOnlyWhenNeeded(t *testing.T) {
	for _, lim := range []float64{0, 13.8e-3, 20e-3} {
		s := refSpec()
		s.MaxBoard[1] = lim
		l, err := Build(s)
		if err != nil {
			t.Fatal(err)
		}
		if len(l.Marks.Bends) != 0 || l.Copper[0].Outline.Area() != 39.2e12 {
			t.Errorf("limit %g m: bends %+v, area %v", lim, l.Marks.Bends, l.Copper[0].Outline.Area())
		}
	}
}

func TestBendRefuses(t *testing.T) {
	with := func(edit func(*Spec)) func() Spec {
		return func() Spec { s := bentSpec(); edit(&s); return s }
	}
	tests := []struct {
		name string
		spec func() Spec
		say  string // a phrase the error must contain
	}{
		// h = 5 mm: W/h = 0.24 < 0.25.
		{"stub narrower than the miter's range", with(func(s *Spec) { s.Height = 5e-3 }), "below the 0.25"},
		{"no height to size the miter", with(func(s *Spec) { s.Height = 0 }), "Height"},
		// The 7 mm board of TestBendDirections with a 16 mm stub: its
		// second leg would be 12.5 mm, past the board's ends at 0 and 13 mm
		// whichever way it turns.
		{"no room in x", func() Spec {
			return Spec{
				Name:     "long",
				Segments: []Segment{{"f1", 1e-3, 5e-3}, {"l", 1e-3, 6e-3}, {"f2", 1e-3, 2e-3}},
				Stubs:    []Stub{{ID: "s", At: 1, Width: 1e-3, Length: 16e-3, Side: 1}},
				Margin:   1e-3, Height: 0.5e-3, MaxBoard: [2]float64{0, 7e-3},
			}
		}, "not lengthened in x"},
		// Three up stubs at x = 5, 8.2 and 12.2 mm on an 8.6 mm board (each
		// may reach 8.6 − 2 − 1.0 (the port pads' half width) = 5.6 mm, so
		// first legs of 4.1 mm and second legs of 1.9 mm): the first turns
		// toward the load (x 3.1..5.6 mm); the second's second leg would
		// come within 3h = 2.4 mm of the third's first leg (x 11.6 mm)
		// toward the source, of the first's L toward the load.
		{"other stubs in the way", with(func(s *Spec) {
			s.MaxBoard[1] = 8.6e-3
			s.Stubs = []Stub{
				{ID: "left", At: 0, Width: 1.2e-3, Length: 6e-3, Side: 1},
				{ID: "middle", At: 1, Width: 1.2e-3, Length: 6e-3, Side: 1},
				{ID: "right", At: 2, Width: 1.2e-3, Length: 6e-3, Side: 1},
			}
		}), `within 2.400000 mm of stub "left"`},
		// 9 mm: the second legs would run closer than 3h to the line.
		{"too close to the through line", with(func(s *Spec) { s.MaxBoard[1] = 9e-3 }), "closer than 3 × the height"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			l, err := Build(tt.spec())
			if err == nil {
				t.Fatalf("no error; bends %+v", l.Marks.Bends)
			}
			var se *SpecError
			if !errors.As(err, &se) || se.Field != "MaxBoard[1]" || !errors.Is(err, ErrNoFit) {
				t.Errorf("error %v, want MaxBoard[1] ErrNoFit", err)
			}
			if !strings.Contains(err.Error(), tt.say) || !strings.Contains(err.Error(), "cannot bend") {
				t.Errorf("error %q does not say %q", err, tt.say)
			}
		})
	}
}

func TestBendWarnsAboveErRange(t *testing.T) {
	s := bentSpec()
	s.Er = 30
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	if w := l.Marks.Bends[0].Warning; !strings.Contains(w, "above the 25") {
		t.Errorf("warning %q", w)
	}
	s.Er = 10
	if l, _ = Build(s); l.Marks.Bends[0].Warning != "" {
		t.Errorf("warning %q at εr = 10", l.Marks.Bends[0].Warning)
	}
}

func BenchmarkBuildBent(b *testing.B) {
	s := bentSpec()
	for b.Loop() {
		if _, err := Build(s); err != nil {
			b.Fatal(err)
		}
	}
}
