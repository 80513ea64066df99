package geom

import "testing"

func r(x0, y0, x1, y1 int64) Rect { return Rect{Point{x0, y0}, Point{x1, y1}} }

func TestUnion(t *testing.T) {
	tests := []struct {
		name     string
		rects    []Rect
		areas    []float64 // exact, by inclusion–exclusion, one per loop in output order
		vertices []int     // per loop
	}{
		{"single", []Rect{r(0, 0, 4, 2)}, []float64{8}, []int{4}},
		// 4·2 + 2·6 − overlap 2·2 = 16; the overlap leaves a tee of 8 vertices.
		{"tee", []Rect{r(0, 0, 4, 2), r(1, 0, 3, 6)}, []float64{16}, []int{8}},
		// A stub across a width step: 3·2 + 3·1 + 2·5 − 1·2 − 1·1 = 16.
		{"stub at width step", []Rect{r(0, 0, 3, 2), r(3, 0, 6, 1), r(2, 0, 4, 5)}, []float64{16}, []int{8}},
		// Two overlapping equal rectangles are one.
		{"duplicate", []Rect{r(0, 0, 2, 2), r(0, 0, 2, 2)}, []float64{4}, []int{4}},
		// Abutting rectangles merge with no seam: 2 + 2 = 4, 4 vertices.
		{"abutting", []Rect{r(0, 0, 1, 2), r(1, 0, 2, 2)}, []float64{4}, []int{4}},
		// A frame: 5×5 − 3×3 hole = 16 as outline 25 and hole −9.
		{"frame", []Rect{r(0, 0, 5, 1), r(0, 4, 5, 5), r(0, 0, 1, 5), r(4, 0, 5, 5)}, []float64{25, -9}, []int{4, 4}},
		// Corner-touching squares stay two polygons.
		{"corner touch", []Rect{r(0, 0, 1, 1), r(1, 1, 2, 2)}, []float64{1, 1}, []int{4, 4}},
		// Cross of two bars: 5 + 5 − 1 = 9, 12 vertices.
		{"cross", []Rect{r(0, 2, 5, 3), r(2, 0, 3, 5)}, []float64{9}, []int{12}},
		{"empty ignored", []Rect{r(0, 0, 0, 5), r(0, 0, 1, 1)}, []float64{1}, []int{4}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := Union(tt.rects)
			if len(got) != len(tt.areas) {
				t.Fatalf("%d loops %v, want %d", len(got), got, len(tt.areas))
			}
			for i, p := range got {
				if a := p.Area(); a != tt.areas[i] {
					t.Errorf("loop %d area %v, want %v", i, a, tt.areas[i])
				}
				if len(p) != tt.vertices[i] {
					t.Errorf("loop %d has %d vertices %v, want %d", i, len(p), p, tt.vertices[i])
				}
				for k := range p {
					a, b := p[k], p[(k+1)%len(p)]
					if a.X != b.X && a.Y != b.Y {
						t.Errorf("loop %d edge %v→%v is not axis-aligned", i, a, b)
					}
				}
			}
		})
	}
}

func TestUnionOrderIndependent(t *testing.T) {
	a := []Rect{r(0, 0, 3, 2), r(3, 0, 6, 1), r(2, 0, 4, 5), r(1, -4, 2, 0)}
	b := []Rect{a[3], a[1], a[2], a[0]}
	ua, ub := Union(a), Union(b)
	if len(ua) != 1 || len(ub) != 1 || len(ua[0]) != len(ub[0]) {
		t.Fatalf("unions differ: %v vs %v", ua, ub)
	}
	for i := range ua[0] {
		if ua[0][i] != ub[0][i] {
			t.Fatalf("unions differ: %v vs %v", ua, ub)
		}
	}
}

func BenchmarkUnion(b *testing.B) {
	// A through line of 9 segments with 8 stubs: the size of a large design.
	var rs []Rect
	for i := int64(0); i < 9; i++ {
		rs = append(rs, r(i*1000, -100-10*i, (i+1)*1000, 100+10*i))
		if i > 0 {
			s := int64(1 - 2*(i%2))
			rs = append(rs, r(i*1000-50, min(0, s*3000), i*1000+50, max(0, s*3000)))
		}
	}
	for b.Loop() {
		Union(rs)
	}
}
