package geom

import "math"

// Point is a position on the board in nanometres, origin at the lower-left
// corner of the board outline.
type Point struct{ X, Y int64 }

// Polygon is a simple polygon, counter-clockwise for an outline, not
// closed: the last vertex is not a repeat of the first.
type Polygon []Point

// Area returns the signed area by the shoelace formula, in nm²: positive
// for a counter-clockwise polygon. It is DoubleArea()/2, exact while the
// area stays below 2⁵³ nm² (a 90 mm square).
func (p Polygon) Area() float64 { return float64(p.DoubleArea()) / 2 }

// DoubleArea returns twice the signed shoelace area in nm², exactly, in
// int64 arithmetic on coordinates relative to the first vertex (exact for
// boards up to about two metres across).
func (p Polygon) DoubleArea() int64 {
	if len(p) < 3 {
		return 0
	}
	o := p[0]
	var sum int64
	for i := 1; i+1 < len(p); i++ {
		ax, ay := p[i].X-o.X, p[i].Y-o.Y
		bx, by := p[i+1].X-o.X, p[i+1].Y-o.Y
		sum += ax*by - ay*bx
	}
	return sum
}

// Bounds returns the lower-left and upper-right corners of the polygon's
// bounding box. An empty polygon has zero bounds.
func (p Polygon) Bounds() (min, max Point) {
	if len(p) == 0 {
		return Point{}, Point{}
	}
	min, max = p[0], p[0]
	for _, q := range p[1:] {
		min.X, min.Y = minI(min.X, q.X), minI(min.Y, q.Y)
		max.X, max.Y = maxI(max.X, q.X), maxI(max.Y, q.Y)
	}
	return min, max
}

// Rect is an axis-aligned rectangle [Min.X, Max.X] × [Min.Y, Max.Y] in
// nanometres.
type Rect struct{ Min, Max Point }

// Empty reports whether the rectangle has no area.
func (r Rect) Empty() bool { return r.Max.X <= r.Min.X || r.Max.Y <= r.Min.Y }

// Dx is the rectangle's width along x, nm.
func (r Rect) Dx() int64 { return r.Max.X - r.Min.X }

// Dy is the rectangle's height along y, nm.
func (r Rect) Dy() int64 { return r.Max.Y - r.Min.Y }

// Polygon returns the rectangle as a counter-clockwise polygon starting at
// its lower-left corner.
func (r Rect) Polygon() Polygon {
	return Polygon{r.Min, {r.Max.X, r.Min.Y}, r.Max, {r.Min.X, r.Max.Y}}
}

// Inset returns the rectangle grown by d on every side (shrunk for d < 0).
func (r Rect) Inset(d int64) Rect {
	return Rect{Point{r.Min.X - d, r.Min.Y - d}, Point{r.Max.X + d, r.Max.Y + d}}
}

// Intersect returns the common part of r and s; it is Empty when they do
// not overlap with positive area.
func (r Rect) Intersect(s Rect) Rect {
	return Rect{
		Point{maxI(r.Min.X, s.Min.X), maxI(r.Min.Y, s.Min.Y)},
		Point{minI(r.Max.X, s.Max.X), minI(r.Max.Y, s.Max.Y)},
	}
}

// Nanometres converts a length in metres to integer nanometres, rounding to
// the nearest.
func Nanometres(m float64) int64 { return int64(math.Round(m * 1e9)) }

func minI(a, b int64) int64 {
	if a < b {
		return a
	}
	return b
}

func maxI(a, b int64) int64 {
	if a > b {
		return a
	}
	return b
}
