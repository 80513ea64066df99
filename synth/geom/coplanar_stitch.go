package geom

// stitch places the stitching vias of a pour and returns their centres.
//
// Every edge of a pour polygon that does not lie on the board outline
// faces the RF copper (it is an edge of the copper grown by the gap). Its
// via row runs parallel to it, r.setback inside the pour; the rows of two
// such edges that meet at a corner meet at the point r.setback from both
// (the corner of the pour shrunk by r.setback), and that point carries a
// via. Between two such corners (a stub's side, a stub's end) a row's vias
// are spread evenly at the largest spacing not above r.pitch (or, where
// that would put them closer than r.spacing, at the smallest spacing not
// below r.spacing); from one
// corner toward the board edge they step at exactly r.pitch; a row with no
// corner (a plain through line) carries vias at exactly r.pitch, centred
// on its length. So r.pitch is the exact pitch along straight runs and the
// most between corners.
//
// A via is dropped where its centre is closer than r.spacing to the board
// edge, where the square of half-side r.setback round it would reach into
// the gap (a pour narrower than two setbacks), or where its centre is
// closer than r.spacing to a via already placed: the RF vias of shorted
// stubs, then the corner vias, then the rows in polygon and edge order.
// A via whose centre lies inside a rectangle of avoid is dropped too.
func stitch(pour []Polygon, grown, avoid []Rect, board Rect, r stitchRule, existing []Via) []Point {
	lo := Point{board.Min.X + r.spacing, board.Min.Y + r.spacing}
	hi := Point{board.Max.X - r.spacing, board.Max.Y - r.spacing}
	taken := make([]Point, 0, len(existing))
	for _, v := range existing {
		taken = append(taken, v.Center)
	}
	var out []Point
	place := func(c Point) {
		if c.X < lo.X || c.Y < lo.Y || c.X > hi.X || c.Y > hi.Y {
			return
		}
		sq := Rect{Point{c.X - r.setback, c.Y - r.setback}, Point{c.X + r.setback, c.Y + r.setback}}
		for _, g := range grown {
			if !g.Intersect(sq).Empty() {
				return
			}
		}
		for _, a := range avoid {
			if c.X > a.Min.X && c.X < a.Max.X && c.Y > a.Min.Y && c.Y < a.Max.Y {
				return
			}
		}
		for _, t := range taken {
			dx, dy := t.X-c.X, t.Y-c.Y
			if dx*dx+dy*dy < r.spacing*r.spacing {
				return
			}
		}
		taken = append(taken, c)
		out = append(out, c)
	}
	for _, p := range pour {
		n := len(p)
		faces := make([]bool, n) // edge i runs from p[i] to p[i+1]
		for i := range p {
			faces[i] = !onOutline(p[i], p[(i+1)%n], board)
		}
		prev := func(i int) int { return (i + n - 1) % n }
		anchored := func(i int) bool { return faces[prev(i)] && faces[i] }
		// corner is vertex i moved r.setback along the inward normal of
		// each adjoining edge that faces the copper.
		corner := func(i int) Point {
			v := p[i]
			for _, k := range [2]int{prev(i), i} {
				if faces[k] {
					d := dir(p[k], p[(k+1)%n])
					v.X -= d.Y * r.setback // the left normal of (dx, dy) is (−dy, dx)
					v.Y += d.X * r.setback
				}
			}
			return v
		}
		for i := range p {
			if anchored(i) {
				place(corner(i))
			}
		}
		for i := range p {
			if !faces[i] {
				continue
			}
			j := (i + 1) % n
			d := dir(p[i], p[j])
			a, b := corner(i), corner(j)
			at := func(t int64) Point { return Point{a.X + t*d.X, a.Y + t*d.Y} }
			length := (b.X-a.X)*d.X + (b.Y-a.Y)*d.Y
			if length < 0 {
				continue // the pour is narrower than two setbacks here
			}
			switch {
			case anchored(i) && anchored(j):
				steps := (length + r.pitch - 1) / r.pitch
				for steps > 1 && length < steps*r.spacing {
					steps-- // keep the spread vias r.spacing apart
				}
				for k := int64(1); k < steps; k++ {
					place(at((k*length + steps/2) / steps))
				}
			case anchored(i):
				for t := r.pitch; t <= length; t += r.pitch {
					place(at(t))
				}
			case anchored(j):
				for t := length - r.pitch; t >= 0; t -= r.pitch {
					place(at(t))
				}
			default:
				var t0, t1 int64
				if d.Y == 0 {
					t0, t1 = clipRow(a.X, d.X, 0, length, lo.X, hi.X)
				} else {
					t0, t1 = clipRow(a.Y, d.Y, 0, length, lo.Y, hi.Y)
				}
				if t1 < t0 {
					continue
				}
				count := (t1-t0)/r.pitch + 1
				for t := t0 + (t1-t0-(count-1)*r.pitch)/2; t <= t1; t += r.pitch {
					place(at(t))
				}
			}
		}
	}
	return out
}

// clipRow limits the positions a + t·d (d = ±1) with t in [t0, t1] to the
// interval [lo, hi] and returns the new t range (empty when t1 < t0).
func clipRow(a, d, t0, t1, lo, hi int64) (int64, int64) {
	// a + t·d ≥ lo and ≤ hi.
	if d > 0 {
		return maxI(t0, lo-a), minI(t1, hi-a)
	}
	return maxI(t0, a-hi), minI(t1, a-lo)
}

// dir returns the unit axis direction from a to b of a rectilinear edge.
func dir(a, b Point) Point { return Point{sign(b.X - a.X), sign(b.Y - a.Y)} }

// onOutline reports whether the edge a→b lies on a side of the board.
func onOutline(a, b Point, board Rect) bool {
	if a.X == b.X {
		return a.X == board.Min.X || a.X == board.Max.X
	}
	return a.Y == b.Y && (a.Y == board.Min.Y || a.Y == board.Max.Y)
}
