package geom

import (
	"errors"
	"math"
	"reflect"
	"sort"
	"strings"
	"testing"
)

// cpwSpec is a grounded-coplanar network whose pour is worked out by hand
// in TestCoplanarPourArea: a 1 mm line of two 6 mm segments, a 0.5 mm stub
// 3 mm long up from x = 6 mm shorted by a via with a 1.2 mm pad (wider than
// the stub), 1 × 1.6 mm port pads, 2 mm margin and a 0.4 mm gap.
func cpwSpec() Spec {
	return Spec{
		Name:     "cpw",
		Segments: []Segment{{"a", 1e-3, 6e-3}, {"b", 1e-3, 6e-3}},
		Stubs: []Stub{
			{ID: "s", At: 0, Width: 0.5e-3, Length: 3e-3, Side: 1, Via: &ViaSpec{Drill: 0.3e-3, Pad: 1.2e-3}},
		},
		PortPad:       PadSpec{Width: 1.6e-3, Length: 1e-3},
		Margin:        2e-3,
		Height:        0.5e-3,
		MaskExpansion: 0.05e-3,
		CoplanarGap:   0.4e-3,
		StitchDrill:   0.3e-3,
		StitchPad:     0.6e-3,
		StitchPitch:   1e-3,
	}
}

// cpwGrown is the RF copper of cpwSpec grown by g nm, by hand: the board is
// 12 × 8.3 mm with the centre line at y = 2.8 mm (margin 2 mm + the port
// pad's 0.8 mm half-width below the line); the stub runs x 5.75..6.25 mm
// from the centre line to y = 2.8 + 0.5 + 3 = 6.3 mm; the via pad's square
// is x 5.4..6.6, y 5.1..6.3 mm; the port pads x 0..1 and 11..12 mm,
// y 2.0..3.6 mm. Rectangles reaching past x = 0 or 12 mm are clipped.
func cpwGrown(g int64) []Rect {
	const m = 1000 // nm per µm
	return []Rect{
		r(0, 2300*m-g, 12000*m, 3300*m+g),         // line
		r(5750*m-g, 2800*m-g, 6250*m+g, 6300*m+g), // stub
		r(5400*m-g, 5100*m-g, 6600*m+g, 6300*m+g), // via pad square
		r(0, 2000*m-g, 1000*m+g, 3600*m+g),        // load port pad
		r(11000*m-g, 2000*m-g, 12000*m, 3600*m+g), // source port pad
	}
}

// inclusionExclusion is the exact area of the union of rs by the
// inclusion–exclusion principle over all subsets (an independent check of
// Union and complement, not their grid method).
func inclusionExclusion(rs []Rect) float64 {
	var sum float64
	for mask := 1; mask < 1<<len(rs); mask++ {
		in := Rect{Point{math.MinInt64 / 2, math.MinInt64 / 2}, Point{math.MaxInt64 / 2, math.MaxInt64 / 2}}
		bits := 0
		for i, q := range rs {
			if mask&(1<<i) != 0 {
				in = in.Intersect(q)
				bits++
			}
		}
		if in.Empty() {
			continue
		}
		a := float64(in.Dx()) * float64(in.Dy())
		if bits%2 == 1 {
			sum += a
		} else {
			sum -= a
		}
	}
	return sum
}

// slabs cuts a rectilinear polygon without holes into rectangles, one per
// inside interval of each vertical slab between consecutive vertex x's.
func slabs(p Polygon) []Rect {
	var xs []int64
	for _, q := range p {
		xs = append(xs, q.X)
	}
	xs = uniq(xs)
	var out []Rect
	for k := 0; k+1 < len(xs); k++ {
		c := xs[k]
		var at []int64
		for i := range p {
			a, b := p[i], p[(i+1)%len(p)]
			if a.Y == b.Y && min(a.X, b.X) <= c && c < max(a.X, b.X) {
				at = append(at, a.Y)
			}
		}
		sort.Slice(at, func(i, j int) bool { return at[i] < at[j] })
		for i := 0; i+1 < len(at); i += 2 {
			out = append(out, r(xs[k], at[i], xs[k+1], at[i+1]))
		}
	}
	return out
}

func pourOf(l Layout) []Polygon {
	var p []Polygon
	for _, n := range l.Copper {
		if n.Name == NetGround {
			p = append(p, n.Outline)
		}
	}
	return p
}

func TestCoplanarPourArea(t *testing.T) {
	l, err := Build(cpwSpec())
	if err != nil {
		t.Fatal(err)
	}
	// By hand (mm²): grown line 12 × 1.8 = 21.6, stub 1.3 × 4.3 = 5.59, via
	// square 2 × 2 = 4, port pads 1.4 × 2.4 = 3.36 each; overlaps line–stub
	// 1.3 × 1.3 = 1.69, stub–via 1.3 × 2 = 2.6, line–pad 1.4 × 1.8 = 2.52
	// each; union 37.91 − 9.33 = 28.58; pour = 12 × 8.3 − 28.58 = 71.02,
	// of which 12 × 1.9 − 2 × 1.4 × 0.3 = 21.96 below the line and 49.06
	// above.
	const gap = 400000
	grown := cpwGrown(gap)
	if a := inclusionExclusion(grown); math.Abs(a-28.58e12) > 1 {
		t.Fatalf("hand rectangles: union %v nm², want 28.58e12 (the hand sums disagree)", a)
	}
	if _, max := l.Board.Bounds(); max != (Point{12e6, 8.3e6}) {
		t.Fatalf("board %v, want 12 × 8.3 mm", max)
	}
	want := 12e6*8.3e6 - inclusionExclusion(grown) // exact: board − grown copper
	pour := pourOf(l)
	if len(pour) != 2 {
		t.Fatalf("%d pour pieces, want 2 (below and above the line)", len(pour))
	}
	var got float64
	for _, p := range pour {
		got += p.Area()
	}
	if math.Abs(got-want) > 1 || math.Abs(got-71.02e12) > 1 {
		t.Errorf("pour area %v nm², want %v (71.02 mm²)", got, want)
	}
	// Union sorts loops by their lowest vertex: the piece below first.
	for i, w := range []float64{21.96e12, 49.06e12} {
		if a := pour[i].Area(); math.Abs(a-w) > 1 {
			t.Errorf("piece %d area %v nm², want %v", i, a, w)
		}
	}
	// Edge launch: both pieces reach x = 0 and x = 12 mm.
	for i, p := range pour {
		if lo, hi := p.Bounds(); lo.X != 0 || hi.X != 12e6 {
			t.Errorf("piece %d spans x %d..%d nm, want the full board", i, lo.X, hi.X)
		}
	}
	// The RF net is still first and unchanged by the pour.
	if l.Copper[0].Name != NetRF {
		t.Errorf("first net %q, want %q", l.Copper[0].Name, NetRF)
	}
}

// TestCoplanarNoOverlap checks that RF copper (the outline, the port pads
// and the via pad's square) and the pour share no area: the union's area
// equals the sum of the parts' areas, exactly.
func TestCoplanarNoOverlap(t *testing.T) {
	for _, tt := range []struct {
		name string
		spec Spec
	}{
		{"cpw", cpwSpec()},
		{"reference network", func() Spec { s := refSpec(); s.CoplanarGap = 0.3e-3; return s }()},
	} {
		t.Run(tt.name, func(t *testing.T) {
			l, err := Build(tt.spec)
			if err != nil {
				t.Fatal(err)
			}
			rf := slabs(l.Copper[0].Outline)
			for _, p := range l.Pads {
				if p.Net == NetRF {
					rf = append(rf, r(p.Center.X-p.W/2, p.Center.Y-p.H/2, p.Center.X-p.W/2+p.W, p.Center.Y-p.H/2+p.H))
				}
			}
			var pour []Rect
			var pourArea float64
			for _, p := range pourOf(l) {
				pour = append(pour, slabs(p)...)
				pourArea += p.Area()
			}
			if len(pour) == 0 {
				t.Fatal("no pour")
			}
			if got, want := UnionArea(append(append([]Rect{}, rf...), pour...)), UnionArea(rf)+pourArea; got != want {
				t.Errorf("union of RF and pour %v nm², sum of parts %v: they overlap by %v nm²", got, want, want-got)
			}
		})
	}
}

func TestComplement(t *testing.T) {
	tests := []struct {
		name  string
		board Rect
		cut   []Rect
		area  float64 // exact, board − inclusion–exclusion of the clipped cut
		loops int
	}{
		{"nothing cut", r(0, 0, 4, 3), nil, 12, 1},
		{"all cut", r(0, 0, 4, 3), []Rect{r(-1, -1, 5, 4)}, 0, 0},
		// A bar across: two strips of 4·1.
		{"bar across", r(0, 0, 4, 3), []Rect{r(-1, 1, 5, 2)}, 8, 2},
		// A bar with a stub: 12 − (4 + 1·1) = 7, in two pieces.
		{"bar with stub", r(0, 0, 4, 3), []Rect{r(0, 1, 4, 2), r(1, 2, 2, 3)}, 7, 3},
		// An island in the middle leaves a frame: 12 − 2 = 10, outline and hole.
		{"island", r(0, 0, 4, 3), []Rect{r(1, 1, 3, 2)}, 10, 2},
		{"cut outside", r(0, 0, 4, 3), []Rect{r(5, 5, 6, 6)}, 12, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			rs := complement(tt.board, tt.cut)
			var a float64
			for _, q := range rs {
				a += float64(q.Dx()) * float64(q.Dy())
			}
			if a != tt.area {
				t.Errorf("area %v, want %v", a, tt.area)
			}
			for i, p := range rs {
				for _, q := range rs[i+1:] {
					if !p.Intersect(q).Empty() {
						t.Errorf("rectangles %v and %v overlap", p, q)
					}
				}
			}
			if got := Union(rs); len(got) != tt.loops {
				t.Errorf("%d loops %v, want %d", len(got), got, tt.loops)
			}
		})
	}
}

// stitches returns the centres of the GND vias, sorted by y then x.
func stitches(t *testing.T, l Layout) []Point {
	t.Helper()
	var c []Point
	for _, v := range l.Vias {
		if v.Net == NetGround {
			c = append(c, v.Center)
		}
	}
	var pads int
	for _, p := range l.Pads {
		if p.Net == NetGround && p.Function == ViaPad && p.Round {
			pads++
		}
	}
	if pads != len(c) {
		t.Errorf("%d GND via pads for %d GND vias", pads, len(c))
	}
	sort.Slice(c, func(i, j int) bool {
		if c[i].Y != c[j].Y {
			return c[i].Y < c[j].Y
		}
		return c[i].X < c[j].X
	})
	return c
}

// line20 is a plain 1 mm line 20 mm long (two equal segments), 3 mm
// margin, 0.5 mm gap, 0.3/0.6 mm stitching vias at 2 mm.
func line20() Spec {
	return Spec{
		Name:     "line",
		Segments: []Segment{{"a", 1e-3, 10e-3}, {"b", 1e-3, 10e-3}},
		Margin:   3e-3, CoplanarGap: 0.5e-3,
		StitchPitch: 2e-3, StitchDrill: 0.3e-3, StitchPad: 0.6e-3,
	}
}

func TestCoplanarStitchCount(t *testing.T) {
	const mmNM = 1000000
	pts := func(y int64, xs ...int64) []Point {
		var p []Point
		for _, x := range xs {
			p = append(p, Point{x, y})
		}
		return p
	}
	// Common to both: board 20 mm long; centre line at y = 3.5 mm; the
	// setback is 0.3 + 0.1 = 0.4 mm, the least spacing 0.6 + 0.2 = 0.8 mm.
	//
	// Plain line, by hand: the rows run at y = 3.5 ± (0.5 + 0.5 + 0.4) mm,
	// clipped to x 0.8..19.2 mm (18.4 mm): 18.4/2 → 9 pitches, 10 vias
	// centred at x = 1, 3, …, 19 mm on each side: 20 vias.
	odd := []int64{1, 3, 5, 7, 9, 11, 13, 15, 17, 19}
	for i := range odd {
		odd[i] *= mmNM
	}
	plain := append(pts(2.1e6, odd...), pts(4.9e6, odd...)...)

	// With a 1 mm open stub 4 mm long up at x = 10 mm (board 11 mm high):
	// below, the same 10 vias at y = 2.1 mm. Above, the pour's edges facing
	// the copper run y = 4.5 (x 0..9), x = 9 (y 4.5..8.5), y = 8.5
	// (x 9..11), x = 11, y = 4.5 (x 11..20) mm; the rows 0.4 mm inside
	// meet at the corners (8.6, 4.9), (8.6, 8.9), (11.4, 8.9), (11.4, 4.9)
	// mm, one via each. The stub's sides (4 mm) get one via between
	// corners at 2 mm, its end (2.8 mm) one at 1.4 mm; from the corners
	// toward the ports the rows step at 2 mm: x = 6.6, 4.6, 2.6 (0.6 is
	// within 0.8 mm of the edge) and 13.4, 15.4, 17.4 (19.4 likewise):
	// 10 + 4 + 3 + 6 = 23 vias.
	stub := line20()
	stub.Stubs = []Stub{{ID: "s", At: 0, Width: 1e-3, Length: 4e-3, Side: 1}}
	var withStub []Point
	withStub = append(withStub, pts(2.1e6, odd...)...)
	withStub = append(withStub, pts(4.9e6, 2.6e6, 4.6e6, 6.6e6, 8.6e6, 11.4e6, 13.4e6, 15.4e6, 17.4e6)...)
	withStub = append(withStub, pts(6.9e6, 8.6e6, 11.4e6)...)
	withStub = append(withStub, pts(8.9e6, 8.6e6, 10e6, 11.4e6)...)

	for _, tt := range []struct {
		name string
		spec Spec
		want []Point // by hand, sorted by y then x
	}{
		{"plain line", line20(), plain},
		{"open stub", stub, withStub},
	} {
		t.Run(tt.name, func(t *testing.T) {
			l, err := Build(tt.spec)
			if err != nil {
				t.Fatal(err)
			}
			got := stitches(t, l)
			if !reflect.DeepEqual(got, tt.want) {
				t.Errorf("%d vias %v,\nwant %d %v", len(got), got, len(tt.want), tt.want)
			}
			for _, v := range l.Vias {
				if v.Net == NetGround && (v.Drill != 0.3e6 || v.Pad != 0.6e6) {
					t.Errorf("via %+v, want 0.3/0.6 mm", v)
				}
			}
		})
	}
}

// TestCoplanarStitchRules checks the placement rules on networks with
// corners, width steps and a shorted stub: every via's pad lies on the pour
// with the setback to spare (not in the gap), no two vias (the RF via
// included) are closer than pad + 0.2 mm, none is closer than that to the
// board edge, and along the straight rows the pitch is the one asked.
func TestCoplanarStitchRules(t *testing.T) {
	ref := refSpec()
	ref.CoplanarGap, ref.StitchPitch = 0.3e-3, 1.5e-3
	for _, tt := range []struct {
		name string
		spec Spec
	}{
		{"cpw", cpwSpec()},
		{"reference network", ref},
		{"open stub", func() Spec {
			s := line20()
			s.Stubs = []Stub{{ID: "s", At: 0, Width: 1e-3, Length: 4e-3, Side: 1}}
			return s
		}()},
	} {
		t.Run(tt.name, func(t *testing.T) {
			l, err := Build(tt.spec)
			if err != nil {
				t.Fatal(err)
			}
			var pour []Rect
			var pourArea float64
			for _, p := range pourOf(l) {
				pour = append(pour, slabs(p)...)
				pourArea += p.Area()
			}
			_, board := l.Board.Bounds()
			c := stitches(t, l)
			if len(c) == 0 {
				t.Fatal("no stitching vias")
			}
			pad := Nanometres(tt.spec.StitchPad)
			if pad == 0 {
				pad = 0.6e6
			}
			half := pad/2 + 0.1e6 // the setback, 0.1 mm beyond the pad's edge
			spacing := pad + 0.2e6
			for _, p := range c {
				sq := r(p.X-half, p.Y-half, p.X+half, p.Y+half)
				if UnionArea(append(append([]Rect{}, pour...), sq)) != pourArea {
					t.Errorf("via at %v: its pad plus 0.1 mm leaves the pour", p)
				}
				if min(p.X, p.Y, board.X-p.X, board.Y-p.Y) < spacing {
					t.Errorf("via at %v is closer than %d nm to the board edge", p, spacing)
				}
			}
			for i, a := range l.Vias {
				for _, b := range l.Vias[i+1:] {
					dx, dy := float64(a.Center.X-b.Center.X), float64(a.Center.Y-b.Center.Y)
					if math.Hypot(dx, dy) < float64(spacing) {
						t.Errorf("vias at %v and %v are closer than %d nm", a.Center, b.Center, spacing)
					}
				}
			}
			// Coverage: every point of a pour edge facing the RF copper, at
			// least the spacing from the board edge, has a stitching via
			// within one pitch along the row and the setback across it.
			pitch := Nanometres(tt.spec.StitchPitch)
			reach := math.Hypot(float64(pitch), float64(half))
			worst := 0.0
			for _, p := range pourOf(l) {
				for i := range p {
					a, b := p[i], p[(i+1)%len(p)]
					if (a.X == b.X && (a.X == 0 || a.X == board.X)) || (a.Y == b.Y && (a.Y == 0 || a.Y == board.Y)) {
						continue // on the board outline
					}
					dx, dy := sign(b.X-a.X), sign(b.Y-a.Y)
					for s := int64(0); s <= (b.X-a.X)*dx+(b.Y-a.Y)*dy; s += 50000 {
						q := Point{a.X + s*dx, a.Y + s*dy}
						if min(q.X, q.Y, board.X-q.X, board.Y-q.Y) < spacing {
							continue
						}
						near := math.Inf(1)
						for _, v := range c {
							near = min(near, math.Hypot(float64(v.X-q.X), float64(v.Y-q.Y)))
						}
						worst = max(worst, near)
						if near > reach {
							t.Errorf("pour edge point %v: nearest stitching via %.0f nm away, want ≤ %.0f", q, near, reach)
						}
					}
				}
			}
			t.Logf("%d stitching vias; farthest pour edge point from a via: %.0f nm (bound %.0f)", len(c), worst, reach)
		})
	}
}

func TestCoplanarRefuses(t *testing.T) {
	tests := []struct {
		name  string
		edit  func(*Spec)
		field string
		err   error
	}{
		// Gap 5 mm: line grown to ±5.5 mm covers the 8.3 mm board (the
		// message says "no ground pour remains", checked below).
		{"gap too large", func(s *Spec) { s.CoplanarGap = 5e-3 }, "CoplanarGap", ErrGap},
		// Gap 2.1 mm > the 2 mm margin beyond the stub's end.
		{"stub end within the gap", func(s *Spec) { s.CoplanarGap = 2.1e-3 }, "Stubs[0]", ErrGap},
		// Gap equal to the margin: the grown stub touches the edge.
		{"stub end at the gap", func(s *Spec) { s.CoplanarGap = 2e-3 }, "Stubs[0]", ErrGap},
		// No stub; the port pad is 2 mm from the bottom edge.
		{"line within the gap", func(s *Spec) { s.Stubs = nil; s.CoplanarGap = 2e-3 }, "CoplanarGap", ErrGap},
		{"infinite gap", func(s *Spec) { s.CoplanarGap = math.Inf(1) }, "CoplanarGap", ErrSize},
		{"sub-nanometre gap", func(s *Spec) { s.CoplanarGap = 1e-10 }, "CoplanarGap", ErrSize},
		{"negative pitch", func(s *Spec) { s.StitchPitch = -1e-3 }, "StitchPitch", ErrSize},
		{"NaN pad", func(s *Spec) { s.StitchPad = math.NaN() }, "StitchPad", ErrSize},
		{"pitch below pad + 0.2 mm", func(s *Spec) { s.StitchPitch = 0.79e-3 }, "StitchPitch", ErrRange},
		{"pad not wider than drill", func(s *Spec) { s.StitchPad = 0.3e-3 }, "StitchPad", ErrVia},
		// Defaults from the shorted stub: drill 0.3, pad 1.2 mm, so a 1 mm
		// pitch is below 1.4 mm.
		{"default pad from the stub's via", func(s *Spec) { s.StitchPad, s.StitchDrill = 0, 0 }, "StitchPitch", ErrRange},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := cpwSpec()
			tt.edit(&s)
			l, err := Build(s)
			if err == nil {
				t.Fatalf("no error; %d nets", len(l.Copper))
			}
			var se *SpecError
			if !errors.As(err, &se) || se.Field != tt.field || !errors.Is(err, tt.err) {
				t.Errorf("error %v, want field %s reason %v", err, tt.field, tt.err)
			}
			if tt.name == "gap too large" && !strings.Contains(err.Error(), "no ground pour remains") {
				t.Errorf("error %v, want it to say that no pour remains", err)
			}
		})
	}
}

// TestCoplanarOff checks that a Spec asking for no pour lays out exactly
// what it did before the pour existed, whatever its stitching fields say.
func TestCoplanarOff(t *testing.T) {
	base, err := Build(refSpec())
	if err != nil {
		t.Fatal(err)
	}
	for _, gap := range []float64{0, -1e-3, math.NaN()} {
		s := refSpec()
		s.CoplanarGap, s.StitchPitch, s.StitchDrill, s.StitchPad = gap, 1e-3, 0.2e-3, 0.5e-3
		l, err := Build(s)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(l, base) {
			t.Errorf("gap %g: layout differs from the one without a pour", gap)
		}
	}
	if len(base.Copper) != 1 || len(base.Vias) != 1 {
		t.Errorf("reference: %d nets, %d vias, want 1 and 1", len(base.Copper), len(base.Vias))
	}
}

func TestCoplanarDefaults(t *testing.T) {
	s := line20()
	s.StitchPitch, s.StitchDrill, s.StitchPad = 0, 0, 0
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	// Without a shorted stub: 0.3/0.6 mm at 2 mm (the defaults), the same
	// 20 vias as TestCoplanarStitchCount's plain line.
	if c := stitches(t, l); len(c) != 20 || l.Vias[0].Drill != 0.3e6 || l.Vias[0].Pad != 0.6e6 {
		t.Errorf("%d vias, first %+v; want 20 of 0.3/0.6 mm", len(c), l.Vias[0])
	}
	// With one: its sizes.
	s = refSpec()
	s.CoplanarGap = 0.3e-3
	l, err = Build(s)
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range l.Vias[1:] {
		if v.Net != NetGround || v.Drill != 0.4e6 || v.Pad != 0.8e6 {
			t.Fatalf("via %+v, want GND 0.4/0.8 mm like the stub's", v)
		}
	}
}

func TestCoplanarMask(t *testing.T) {
	// Open: one window over the RF copper grown by gap + expansion =
	// 0.45 mm, clipped to the board; its area by inclusion–exclusion of
	// the hand rectangles (pads and via square included).
	l, err := Build(cpwSpec())
	if err != nil {
		t.Fatal(err)
	}
	var a float64
	for _, p := range l.MaskOpenings {
		a += p.Area()
	}
	if want := inclusionExclusion(cpwGrown(450000)); len(l.MaskOpenings) != 1 || a != want {
		t.Errorf("%d openings of %v nm², want one of %v", len(l.MaskOpenings), a, want)
	}
	// Cover: only the port pads open, grown by the expansion alone: 1.05 ×
	// 1.7 mm each (clipped at the board edge), as without a pour.
	s := cpwSpec()
	s.Mask = "cover"
	if l, err = Build(s); err != nil {
		t.Fatal(err)
	}
	if len(l.MaskOpenings) != 2 || l.MaskOpenings[0].Area() != 1.05e6*1.7e6 || l.MaskOpenings[1].Area() != 1.05e6*1.7e6 {
		t.Errorf("cover: openings %v, want two of 1.05 × 1.7 mm", l.MaskOpenings)
	}
}

func TestStitchMaxPitch(t *testing.T) {
	tests := []struct {
		epsEff, freq, want float64
	}{
		// Exact: c0 / (1.5 GHz · √4) / 20 = 299792458 / 3e9 / 20 m.
		{4, 1.5e9, 299792458.0 / 3e9 / 20},
		// Exact: εeff = 1 at 10 GHz: λ0/20 = 1.49896229 mm.
		{1, 10e9, 1.49896229e-3},
		{0, 1e9, 0},
		{4, -1, 0},
		{math.NaN(), 1e9, 0},
		{4, math.Inf(1), 0},
	}
	for _, tt := range tests {
		if got := StitchMaxPitch(tt.epsEff, tt.freq); math.Abs(got-tt.want) > 1e-15 {
			t.Errorf("StitchMaxPitch(%g, %g) = %g, want %g", tt.epsEff, tt.freq, got, tt.want)
		}
	}
}

func BenchmarkBuildCoplanar(b *testing.B) {
	s := refSpec()
	s.CoplanarGap, s.StitchPitch = 0.3e-3, 1.5e-3
	for b.Loop() {
		if _, err := Build(s); err != nil {
			b.Fatal(err)
		}
	}
}
