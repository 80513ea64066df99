package geom

import (
	"fmt"
	"math"
	"strings"
)

// Legend (top silkscreen) sizes, nm. Common practice, no source: board
// houses print legend lines of 0.15 mm and up, text of 1 mm and up, and
// keep the ink about 0.15 mm off pads and mask openings.
const (
	LegendLine      = 150000  // stroke width
	LegendHeight    = 1000000 // capital height
	LegendClearance = 150000  // from the ink to a pad or mask opening
)

// Stroke is one polyline of legend ink, drawn with a round pen of
// LegendLine.
type Stroke []Point

// LegendObstacles returns the shapes the legend ink must keep
// LegendClearance from: every mask opening (exposed copper) and every pad,
// via pads included.
func (l Layout) LegendObstacles() []Polygon {
	out := append([]Polygon(nil), l.MaskOpenings...)
	for _, p := range l.Pads {
		h := p.H
		if p.Round {
			h = p.W
		}
		out = append(out, Rect{Point{p.Center.X - p.W/2, p.Center.Y - h/2}, Point{p.Center.X - p.W/2 + p.W, p.Center.Y - h/2 + h}}.Polygon())
	}
	for _, v := range l.Vias {
		out = append(out, Rect{Point{v.Center.X - v.Pad/2, v.Center.Y - v.Pad/2}, Point{v.Center.X - v.Pad/2 + v.Pad, v.Center.Y - v.Pad/2 + v.Pad}}.Polygon())
	}
	return out
}

// rectPolygonDistance returns the distance between a rectangle and a
// polygon's area, 0 where they overlap.
func rectPolygonDistance(r Rect, p Polygon) float64 {
	if len(p) == 0 {
		return math.Inf(1)
	}
	if pointInPolygon(Point{(r.Min.X + r.Max.X) / 2, (r.Min.Y + r.Max.Y) / 2}, p) || inRect(p[0], r) {
		return 0
	}
	best := math.Inf(1)
	corners := []Point{r.Min, {r.Max.X, r.Min.Y}, r.Max, {r.Min.X, r.Max.Y}}
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		for k := range corners {
			c, d := corners[k], corners[(k+1)%4]
			best = math.Min(best, segmentDistance(a, b, c, d))
		}
	}
	return best
}

func inRect(q Point, r Rect) bool {
	return q.X >= r.Min.X && q.X <= r.Max.X && q.Y >= r.Min.Y && q.Y <= r.Max.Y
}

// pointInPolygon is the even-odd rule.
func pointInPolygon(q Point, p Polygon) bool {
	in := false
	x, y := float64(q.X), float64(q.Y)
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		ax, ay, bx, by := float64(a.X), float64(a.Y), float64(b.X), float64(b.Y)
		if (ay > y) != (by > y) && x < ax+(y-ay)*(bx-ax)/(by-ay) {
			in = !in
		}
	}
	return in
}

// segmentDistance returns the distance between segments ab and cd: 0 when
// they cross, else the least distance from an end point to the other
// segment.
func segmentDistance(a, b, c, d Point) float64 {
	cross := func(o, p, q Point) float64 {
		return float64(p.X-o.X)*float64(q.Y-o.Y) - float64(p.Y-o.Y)*float64(q.X-o.X)
	}
	d1, d2, d3, d4 := cross(c, d, a), cross(c, d, b), cross(a, b, c), cross(a, b, d)
	if (d1 > 0) != (d2 > 0) && (d3 > 0) != (d4 > 0) && d1 != 0 && d2 != 0 && d3 != 0 && d4 != 0 {
		return 0
	}
	return math.Min(math.Min(pointToSegment(a, c, d), pointToSegment(b, c, d)), math.Min(pointToSegment(c, a, b), pointToSegment(d, a, b)))
}

func pointToSegment(q, a, b Point) float64 {
	ax, ay := float64(a.X), float64(a.Y)
	dx, dy := float64(b.X)-ax, float64(b.Y)-ay
	t := 0.0
	if l := dx*dx + dy*dy; l > 0 {
		t = math.Max(0, math.Min(1, ((float64(q.X)-ax)*dx+(float64(q.Y)-ay)*dy)/l))
	}
	return math.Hypot(float64(q.X)-ax-t*dx, float64(q.Y)-ay-t*dy)
}

// legendInside returns the board shrunk by the edge band the ink keeps.
func (l Layout) legendInside(edge int64) Rect {
	lo, hi := l.Board.Bounds()
	return Rect{lo, hi}.Inset(-(edge + LegendLine/2))
}

// StrokesBounds returns the bounding box of the strokes' centre lines.
func StrokesBounds(ss []Stroke) Rect {
	var r Rect
	first := true
	for _, s := range ss {
		for _, p := range s {
			if first {
				r, first = Rect{p, p}, false
				continue
			}
			r.Min.X, r.Min.Y = minI(r.Min.X, p.X), minI(r.Min.Y, p.Y)
			r.Max.X, r.Max.Y = maxI(r.Max.X, p.X), maxI(r.Max.Y, p.Y)
		}
	}
	return r
}

// AddLegend adds strokes to the legend when their bounds, grown by half
// the pen, stay inside the board less edge and clear of every obstacle
// (LegendObstacles); it reports whether it added them. Every legend item
// (text, arrows, and later the bench-trim ticks) goes through it.
func (l *Layout) AddLegend(ss []Stroke, edge int64) bool {
	if len(ss) == 0 {
		return false
	}
	b := StrokesBounds(ss).Inset(LegendLine / 2)
	in := l.legendInside(edge).Inset(LegendLine / 2)
	if b.Min.X < in.Min.X || b.Min.Y < in.Min.Y || b.Max.X > in.Max.X || b.Max.Y > in.Max.Y {
		return false
	}
	for _, o := range l.LegendObstacles() {
		if rectPolygonDistance(b, o) < LegendClearance {
			return false
		}
	}
	l.Legend = append(l.Legend, ss...)
	return true
}

// LegendText returns the strokes of s in the legend's stroke font (capital
// letters, digits and a little punctuation; lower case is drawn as
// capitals, anything else as a space), with its lower-left corner at at
// and capitals height tall. The font is our own: each glyph is a few
// polylines on a 4 × 6 grid, advancing 6 units.
func LegendText(s string, at Point, height int64) []Stroke {
	u := height / 6
	var out []Stroke
	x := at.X
	for _, r := range strings.ToUpper(s) {
		for _, pl := range strings.Split(glyph(r), ";") {
			if pl == "" {
				continue
			}
			var st Stroke
			for _, xy := range strings.Fields(pl) {
				var gx, gy int64
				fmt.Sscanf(xy, "%d,%d", &gx, &gy)
				st = append(st, Point{x + gx*u, at.Y + gy*u})
			}
			out = append(out, st)
		}
		x += 6 * u
	}
	return out
}

// LegendTextWidth returns the advance of s in LegendText at that height.
func LegendTextWidth(s string, height int64) int64 {
	return int64(len([]rune(s))) * 6 * (height / 6)
}

// LegendArrow returns an arrow from a to b (a horizontal or any straight
// shaft with a two-stroke head at b), head size h.
func LegendArrow(a, b Point, h int64) []Stroke {
	dx, dy := sign(b.X-a.X), sign(b.Y-a.Y)
	// The head's two barbs go back along the shaft and out to each side.
	back := Point{b.X - dx*h, b.Y - dy*h}
	side := Point{-dy * h / 2, dx * h / 2}
	return []Stroke{
		{a, b},
		{Point{back.X + side.X, back.Y + side.Y}, b, Point{back.X - side.X, back.Y - side.Y}},
	}
}

// glyph returns the polylines of one character: "x,y x,y;x,y x,y", grid
// 0..4 across, 0..6 up.
func glyph(r rune) string {
	switch r {
	case 'A':
		return "0,0 0,4 2,6 4,4 4,0;0,3 4,3"
	case 'B':
		return "0,0 0,6 3,6 4,5 4,4 3,3 0,3;3,3 4,2 4,1 3,0 0,0"
	case 'C':
		return "4,5 3,6 1,6 0,5 0,1 1,0 3,0 4,1"
	case 'D':
		return "0,0 0,6 3,6 4,5 4,1 3,0 0,0"
	case 'E':
		return "4,6 0,6 0,0 4,0;0,3 3,3"
	case 'F':
		return "4,6 0,6 0,0;0,3 3,3"
	case 'G':
		return "4,5 3,6 1,6 0,5 0,1 1,0 3,0 4,1 4,3 2,3"
	case 'H':
		return "0,0 0,6;4,0 4,6;0,3 4,3"
	case 'I':
		return "1,6 3,6;2,6 2,0;1,0 3,0"
	case 'J':
		return "4,6 4,1 3,0 1,0 0,1"
	case 'K':
		return "0,0 0,6;4,6 0,2;1,3 4,0"
	case 'L':
		return "0,6 0,0 4,0"
	case 'M':
		return "0,0 0,6 2,3 4,6 4,0"
	case 'N':
		return "0,0 0,6 4,0 4,6"
	case 'O', '0':
		return "1,0 0,1 0,5 1,6 3,6 4,5 4,1 3,0 1,0"
	case 'P':
		return "0,0 0,6 3,6 4,5 4,4 3,3 0,3"
	case 'Q':
		return "1,0 0,1 0,5 1,6 3,6 4,5 4,1 3,0 1,0;2,2 4,0"
	case 'R':
		return "0,0 0,6 3,6 4,5 4,4 3,3 0,3;2,3 4,0"
	case 'S':
		return "4,5 3,6 1,6 0,5 0,4 1,3 3,3 4,2 4,1 3,0 1,0 0,1"
	case 'T':
		return "0,6 4,6;2,6 2,0"
	case 'U':
		return "0,6 0,1 1,0 3,0 4,1 4,6"
	case 'V':
		return "0,6 2,0 4,6"
	case 'W':
		return "0,6 1,0 2,3 3,0 4,6"
	case 'X':
		return "0,0 4,6;0,6 4,0"
	case 'Y':
		return "0,6 2,3 4,6;2,3 2,0"
	case 'Z':
		return "0,6 4,6 0,0 4,0"
	case '1':
		return "1,5 2,6 2,0;1,0 3,0"
	case '2':
		return "0,5 1,6 3,6 4,5 4,4 0,0 4,0"
	case '3':
		return "0,5 1,6 3,6 4,5 4,4 3,3 4,2 4,1 3,0 1,0 0,1;1,3 3,3"
	case '4':
		return "3,0 3,6 0,2 4,2"
	case '5':
		return "4,6 0,6 0,3 3,3 4,2 4,1 3,0 0,0"
	case '6':
		return "3,6 1,6 0,5 0,1 1,0 3,0 4,1 4,2 3,3 0,3"
	case '7':
		return "0,6 4,6 1,0"
	case '8':
		return "1,3 0,4 0,5 1,6 3,6 4,5 4,4 3,3 1,3 0,2 0,1 1,0 3,0 4,1 4,2 3,3"
	case '9':
		return "4,3 1,3 0,4 0,5 1,6 3,6 4,5 4,1 3,0 1,0"
	case '.':
		return "2,0 2,1"
	case '-':
		return "1,3 3,3"
	case '_':
		return "0,0 4,0"
	case '(':
		return "3,6 2,5 2,1 3,0"
	case ')':
		return "1,6 2,5 2,1 1,0"
	case '/':
		return "0,0 4,6"
	}
	return ""
}
