package geom

import (
	"math"
	"testing"
)

// pointSegment is the Euclidean distance from p to the segment ab, nm.
func pointSegment(p, a, b Point) float64 {
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	px, py := float64(p.X-a.X), float64(p.Y-a.Y)
	u := 0.0
	if l := dx*dx + dy*dy; l > 0 {
		u = math.Max(0, math.Min(1, (px*dx+py*dy)/l))
	}
	return math.Hypot(px-u*dx, py-u*dy)
}

// polygonDistance is the least distance between the boundaries of p and q,
// or 0 when two of their edges meet: for segments that do not meet it is
// reached at an end of one of them (exact geometry).
func polygonDistance(p, q Polygon) float64 {
	d := math.Inf(1)
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		for j := range q {
			c, e := q[j], q[(j+1)%len(q)]
			if segmentsMeet(a, b, c, e) {
				return 0
			}
			d = math.Min(d, math.Min(math.Min(pointSegment(a, c, e), pointSegment(b, c, e)),
				math.Min(pointSegment(c, a, b), pointSegment(e, a, b))))
		}
	}
	return d
}

// With a grounded-coplanar pour the bent stub keeps at least the gap from
// the pour everywhere: the pour is cut around the un-chamfered L, so along
// the miter the clearance is larger. Checked by exact point–segment
// distances between the chamfered RF outline and every pour piece, and
// from each via pad's circle.
func TestBendCoplanarClearance(t *testing.T) {
	s := bentSpec()
	s.CoplanarGap = 0.3e-3
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	if len(l.Marks.Bends) != 1 {
		t.Fatalf("bends %+v", l.Marks.Bends)
	}
	gap := 0.3e6
	rf := l.Copper[0].Outline
	least := math.Inf(1)
	for _, n := range l.Copper[1:] {
		d := polygonDistance(rf, n.Outline)
		least = math.Min(least, d)
		if d < gap-1e-6 {
			t.Errorf("pour piece at %v is %.1f nm from the RF copper, below the %.0f nm gap", n.Outline[0], d, gap)
		}
		for _, v := range l.Vias {
			if v.Net != NetRF {
				continue
			}
			for i := range n.Outline {
				if d := pointSegment(v.Center, n.Outline[i], n.Outline[(i+1)%len(n.Outline)]) - float64(v.Pad)/2; d < gap-1e-6 {
					t.Errorf("via pad at %v is %.1f nm from the pour", v.Center, d)
				}
			}
		}
	}
	// The gap is met exactly along the straight edges.
	if math.Abs(least-gap) > 1e-6 {
		t.Errorf("least clearance %.3f nm, want exactly the %.0f nm gap", least, gap)
	}
	// Along the miter the clearance is more: the chamfer's midpoint lies
	// (2mW)/2 inside both lines of the cut corner's edges, and the pour's
	// edges run the gap beyond those lines, so the midpoint is (2mW)/2 +
	// gap = 0.726955 + 0.3 mm from the pour (by hand), where an exact offset
	// of the chamfered outline would leave only the gap.
	b := l.Marks.Bends[0]
	mid := Point{(b.Chamfer[0].X + b.Chamfer[1].X) / 2, (b.Chamfer[0].Y + b.Chamfer[1].Y) / 2}
	nearest := math.Inf(1)
	for _, n := range l.Copper[1:] {
		for i := range n.Outline {
			nearest = math.Min(nearest, pointSegment(mid, n.Outline[i], n.Outline[(i+1)%len(n.Outline)]))
		}
	}
	if want := float64(miterLeg)/2 + gap; math.Abs(nearest-want) > 1 {
		t.Errorf("miter midpoint %.1f nm from the pour, want %.1f", nearest, want)
	}
}
