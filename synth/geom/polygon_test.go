package geom

import "testing"

func TestPolygonAreaBounds(t *testing.T) {
	tests := []struct {
		name     string
		p        Polygon
		area     float64 // exact analytical area, nm²
		min, max Point
	}{
		// Exact: a w×h rectangle has area w·h.
		{"rectangle 3×2 mm", Rect{Point{0, 0}, Point{3e6, 2e6}}.Polygon(), 6e12, Point{0, 0}, Point{3e6, 2e6}},
		// Exact: an L of a 4×1 bar and a 1×3 bar (4 + 3 = 7 unit squares).
		{"L shape", Polygon{{0, 0}, {4, 0}, {4, 1}, {1, 1}, {1, 4}, {0, 4}}, 7, Point{0, 0}, Point{4, 4}},
		// Exact: the clockwise rectangle has the negated area.
		{"clockwise", Polygon{{0, 0}, {0, 5}, {2, 5}, {2, 0}}, -10, Point{0, 0}, Point{2, 5}},
		// Exact: a right triangle with legs 6 and 4 has area 12.
		{"triangle", Polygon{{-3, -1}, {3, -1}, {-3, 3}}, 12, Point{-3, -1}, Point{3, 3}},
		// Exact: an 80 mm square is 6.4e15 nm², still below 2^53.
		{"80 mm square", Rect{Point{0, 0}, Point{80e6, 80e6}}.Polygon(), 6.4e15, Point{0, 0}, Point{80e6, 80e6}},
		{"degenerate", Polygon{{1, 1}, {2, 2}}, 0, Point{1, 1}, Point{2, 2}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := tt.p.Area(); got != tt.area {
				t.Errorf("Area = %v, want %v", got, tt.area)
			}
			min, max := tt.p.Bounds()
			if min != tt.min || max != tt.max {
				t.Errorf("Bounds = %v %v, want %v %v", min, max, tt.min, tt.max)
			}
		})
	}
}

func TestFormatMM(t *testing.T) {
	tests := []struct {
		nm   int64
		want string // exact decimal: 1 nm = 0.000001 mm
	}{
		{0, "0.000000"},
		{1, "0.000001"},
		{1800000, "1.800000"},
		{-250, "-0.000250"},
		{123456789012, "123456.789012"},
		{-9223372036854775808, "-9223372036854.775808"},
	}
	for _, tt := range tests {
		if got := FormatMM(tt.nm); got != tt.want {
			t.Errorf("FormatMM(%d) = %q, want %q", tt.nm, got, tt.want)
		}
	}
}

func TestNanometres(t *testing.T) {
	tests := []struct {
		m    float64
		want int64
	}{
		{1.8e-3, 1800000}, // exact: 1.8 mm
		{0.1e-9 * 4, 0},   // rounds down below half a nanometre
		{25.4e-6, 25400},  // exact: one mil is 25.4 µm
		{-0.6e-9, -1},     // rounds to nearest, away from zero at .6
		{0.3e-3 + 1e-12, 300000},
	}
	for _, tt := range tests {
		if got := Nanometres(tt.m); got != tt.want {
			t.Errorf("Nanometres(%g) = %d, want %d", tt.m, got, tt.want)
		}
	}
}
