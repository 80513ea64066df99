package geom

import "sort"

// Union returns the boundary of the union of axis-aligned rectangles as
// rectilinear polygons: outlines counter-clockwise (positive Area), holes
// clockwise (negative Area). Empty rectangles are ignored. The result is
// exact: every vertex is a rectangle coordinate.
//
// The method compresses the rectangle coordinates into a grid, marks the
// covered cells, emits every cell side that separates a covered cell from an
// uncovered one as a directed edge with the copper on its left, and chains
// the edges into loops, turning left first where two loops touch at a
// corner (so touching regions stay separate polygons). Collinear vertices
// are removed and each loop starts at its lowest, then leftmost, vertex, so
// the output does not depend on the order of the input.
func Union(rects []Rect) []Polygon {
	var in []Rect
	for _, r := range rects {
		if !r.Empty() {
			in = append(in, r)
		}
	}
	if len(in) == 0 {
		return nil
	}
	xs, ys, covered := coverGrid(in, nil, nil)
	nx, ny := len(xs)-1, len(ys)-1
	cov := func(i, j int) bool {
		return i >= 0 && j >= 0 && i < nx && j < ny && covered[j*nx+i]
	}

	// Directed edges between grid vertices (i, j), copper on the left.
	type vtx struct{ i, j int }
	type edge struct{ from, to vtx }
	var edges []edge
	out := map[vtx][]int{} // vertex → indices of edges leaving it
	add := func(a, b vtx) {
		out[a] = append(out[a], len(edges))
		edges = append(edges, edge{a, b})
	}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			if !cov(i, j) {
				continue
			}
			if !cov(i, j-1) {
				add(vtx{i, j}, vtx{i + 1, j})
			}
			if !cov(i+1, j) {
				add(vtx{i + 1, j}, vtx{i + 1, j + 1})
			}
			if !cov(i, j+1) {
				add(vtx{i + 1, j + 1}, vtx{i, j + 1})
			}
			if !cov(i-1, j) {
				add(vtx{i, j + 1}, vtx{i, j})
			}
		}
	}

	used := make([]bool, len(edges))
	var polys []Polygon
	for start := range edges {
		if used[start] {
			continue
		}
		var loop []vtx
		e := start
		for !used[e] {
			used[e] = true
			loop = append(loop, edges[e].from)
			dx := edges[e].to.i - edges[e].from.i
			dy := edges[e].to.j - edges[e].from.j
			best, bestTurn := -1, -2
			for _, k := range out[edges[e].to] {
				if used[k] && k != start {
					continue
				}
				ex := edges[k].to.i - edges[k].from.i
				ey := edges[k].to.j - edges[k].from.j
				turn := sign(dx*ey - dy*ex) // +1 left, 0 straight, -1 right
				if turn > bestTurn {
					best, bestTurn = k, turn
				}
			}
			if best < 0 {
				break
			}
			e = best
		}
		p := make(Polygon, 0, len(loop))
		for _, v := range loop {
			p = append(p, Point{xs[v.i], ys[v.j]})
		}
		polys = append(polys, normalise(simplify(p)))
	}
	sort.Slice(polys, func(a, b int) bool {
		pa, pb := polys[a][0], polys[b][0]
		if pa.Y != pb.Y {
			return pa.Y < pb.Y
		}
		return pa.X < pb.X
	})
	return polys
}

// UnionArea returns the exact area of the union of rectangles, nm², as
// twice the area (an int64) divided by two.
func UnionArea(rects []Rect) float64 {
	var a int64
	for _, p := range Union(rects) {
		a += p.DoubleArea()
	}
	return float64(a) / 2
}

// simplify removes vertices where the boundary goes straight on.
func simplify(p Polygon) Polygon {
	for changed := true; changed && len(p) > 3; {
		changed = false
		for i := 0; i < len(p); i++ {
			a, b, c := p[(i+len(p)-1)%len(p)], p[i], p[(i+1)%len(p)]
			if (b.X-a.X)*(c.Y-b.Y)-(b.Y-a.Y)*(c.X-b.X) == 0 {
				p = append(p[:i:i], p[i+1:]...)
				changed = true
				break
			}
		}
	}
	return p
}

// normalise rotates the polygon to start at its lowest, then leftmost,
// vertex.
func normalise(p Polygon) Polygon {
	k := 0
	for i, q := range p {
		if q.Y < p[k].Y || (q.Y == p[k].Y && q.X < p[k].X) {
			k = i
		}
	}
	return append(append(Polygon{}, p[k:]...), p[:k]...)
}

func uniq(v []int64) []int64 {
	sort.Slice(v, func(a, b int) bool { return v[a] < v[b] })
	out := v[:0]
	for i, x := range v {
		if i == 0 || x != v[i-1] {
			out = append(out, x)
		}
	}
	return out
}

func index(v []int64, x int64) int {
	return sort.Search(len(v), func(i int) bool { return v[i] >= x })
}

// sign returns −1, 0 or +1 with the sign of v.
func sign[T int | int64](v T) T {
	switch {
	case v > 0:
		return 1
	case v < 0:
		return -1
	}
	return 0
}

// coverGrid compresses the coordinates of rects, and the extra coordinates
// given, into a grid and marks the cells the rectangles cover: cell (i, j)
// spans xs[i]..xs[i+1] by ys[j]..ys[j+1] and is covered[j*(len(xs)-1)+i].
// Every rectangle must be non-empty.
func coverGrid(rects []Rect, xs, ys []int64) ([]int64, []int64, []bool) {
	for _, r := range rects {
		xs = append(xs, r.Min.X, r.Max.X)
		ys = append(ys, r.Min.Y, r.Max.Y)
	}
	xs, ys = uniq(xs), uniq(ys)
	nx, ny := len(xs)-1, len(ys)-1
	covered := make([]bool, nx*ny)
	for _, r := range rects {
		i0, i1 := index(xs, r.Min.X), index(xs, r.Max.X)
		j0, j1 := index(ys, r.Min.Y), index(ys, r.Max.Y)
		for j := j0; j < j1; j++ {
			for i := i0; i < i1; i++ {
				covered[j*nx+i] = true
			}
		}
	}
	return xs, ys, covered
}
