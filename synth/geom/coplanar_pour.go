package geom

// complement returns the part of board that no rectangle of cut covers, as
// rectangles: the cut is clipped to the board, the coordinates of the
// board and the cut are compressed into a grid as Union does, and each
// maximal run of uncovered cells along x in one grid row becomes one
// rectangle. The result is exact (every coordinate is a board or cut
// coordinate); Union of it gives the outline of the difference.
func complement(board Rect, cut []Rect) []Rect {
	if board.Empty() {
		return nil
	}
	xs := []int64{board.Min.X, board.Max.X}
	ys := []int64{board.Min.Y, board.Max.Y}
	var in []Rect
	for _, r := range cut {
		r = r.Intersect(board)
		if r.Empty() {
			continue
		}
		in = append(in, r)
		xs = append(xs, r.Min.X, r.Max.X)
		ys = append(ys, r.Min.Y, r.Max.Y)
	}
	xs, ys = uniq(xs), uniq(ys)
	nx, ny := len(xs)-1, len(ys)-1
	covered := make([]bool, nx*ny)
	for _, r := range in {
		i0, i1 := index(xs, r.Min.X), index(xs, r.Max.X)
		j0, j1 := index(ys, r.Min.Y), index(ys, r.Max.Y)
		for j := j0; j < j1; j++ {
			for i := i0; i < i1; i++ {
				covered[j*nx+i] = true
			}
		}
	}
	var out []Rect
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; {
			if covered[j*nx+i] {
				i++
				continue
			}
			k := i
			for k < nx && !covered[j*nx+k] {
				k++
			}
			out = append(out, Rect{Point{xs[i], ys[j]}, Point{xs[k], ys[j+1]}})
			i = k
		}
	}
	return out
}
