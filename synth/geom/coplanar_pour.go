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
	var in []Rect
	for _, r := range cut {
		if r = r.Intersect(board); !r.Empty() {
			in = append(in, r)
		}
	}
	xs, ys, covered := coverGrid(in, []int64{board.Min.X, board.Max.X}, []int64{board.Min.Y, board.Max.Y})
	nx, ny := len(xs)-1, len(ys)-1
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
