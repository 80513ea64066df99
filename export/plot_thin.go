package export

import (
	"math"

	"gonum.org/v1/plot/plotter"
)

// maxPlotPoints is the most points a curve is drawn with. A plot is at
// most about 17 cm wide on a page, so 2000 points is one every 0.1 mm, finer
// than the curves are thick; a longer sweep only costs drawing time and
// file size. Curves with fewer points are drawn exactly as they are.
const maxPlotPoints = 2000

// thinEnvelope returns a curve whose X increases with no more than about
// maxPlotPoints points that draws the same at page resolution: the points
// are split into maxPlotPoints/2 runs of consecutive points and each run
// keeps its lowest and its highest point, in order, so no peak or notch is
// lost; the first and last points are always kept. A curve that is short
// enough is returned unchanged.
func thinEnvelope(pts plotter.XYs) plotter.XYs {
	n := len(pts)
	if n <= maxPlotPoints {
		return pts
	}
	runs := maxPlotPoints / 2
	out := make(plotter.XYs, 0, maxPlotPoints+2)
	out = append(out, pts[0])
	last := 0
	for r := 0; r < runs; r++ {
		lo, hi := r*n/runs, (r+1)*n/runs
		iMin, iMax := lo, lo
		for i := lo; i < hi; i++ {
			if pts[i].Y < pts[iMin].Y {
				iMin = i
			}
			if pts[i].Y > pts[iMax].Y {
				iMax = i
			}
		}
		a, b := min(iMin, iMax), max(iMin, iMax)
		for _, i := range []int{a, b} {
			if i > last {
				out = append(out, pts[i])
				last = i
			}
		}
	}
	if last < n-1 {
		out = append(out, pts[n-1])
	}
	return out
}

// thinPath returns a curve in the plane (a Smith chart trajectory) with no
// more points than needed at page resolution: a point is kept when it lies
// more than tol (in data units) from the last kept one; the first and last
// points are always kept. A curve of at most maxPlotPoints points is
// returned unchanged.
func thinPath(pts plotter.XYs, tol float64) plotter.XYs {
	n := len(pts)
	if n <= maxPlotPoints {
		return pts
	}
	out := plotter.XYs{pts[0]}
	for i := 1; i < n-1; i++ {
		q := out[len(out)-1]
		if math.Hypot(pts[i].X-q.X, pts[i].Y-q.Y) > tol {
			out = append(out, pts[i])
		}
	}
	return append(out, pts[n-1])
}
