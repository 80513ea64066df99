package fieldsolve

import (
	"math"
	"sort"
)

// gradedAxis places grid lines on [keys[0], keys[last]] (keys need not be
// sorted) so that every key is a line and the local cell size is about
// (d + distance to the nearest singular point)/n: cells of size d/n at a
// copper edge growing geometrically by about 1+1/n per cell away from it.
// For a fixed d the lines are the images of a uniform grid of step 1/n under
// one fixed mapping, which is what Richardson extrapolation needs.
func gradedAxis(keys, sing []float64, d, n float64) []float64 {
	ks := uniqueSorted(keys, d*1e-6)
	lo, hi := ks[0], ks[len(ks)-1]
	var sp []float64
	for _, p := range sing {
		if p >= lo && p <= hi {
			sp = append(sp, p)
		}
	}
	density := func(x float64) float64 {
		best := 1 / (d + (hi - lo))
		for _, p := range sp {
			best = math.Max(best, 1/(d+math.Abs(x-p)))
		}
		return best
	}
	out := []float64{lo}
	for s := 0; s+1 < len(ks); s++ {
		u, v := ks[s], ks[s+1]
		xs, cum := cumulative(u, v, sp, d, density)
		total := cum[len(cum)-1] * n
		cells := int(math.Ceil(total - 1e-9))
		if cells < 1 {
			cells = 1
		}
		for c := 1; c < cells; c++ {
			target := cum[len(cum)-1] * float64(c) / float64(cells)
			j := sort.SearchFloat64s(cum, target)
			if j == 0 {
				j = 1
			}
			f := (target - cum[j-1]) / (cum[j] - cum[j-1])
			out = append(out, xs[j-1]+f*(xs[j]-xs[j-1]))
		}
		out = append(out, v)
	}
	return out
}

// cumulative samples the integral of density over [u, v] finely enough
// (sample spacing a tenth of the distance to a singular point) that linear
// interpolation of it is smooth.
func cumulative(u, v float64, sp []float64, d float64, density func(float64) float64) (xs, cum []float64) {
	xs = []float64{u, v}
	for _, p := range sp {
		for step := d / 4; step < 2*(v-u)+d; step *= 1.1 {
			for _, x := range [2]float64{p - step, p + step} {
				if x > u && x < v {
					xs = append(xs, x)
				}
			}
		}
		if p > u && p < v {
			xs = append(xs, p)
		}
	}
	if len(sp) == 0 {
		for i := 1; i < 64; i++ {
			xs = append(xs, u+(v-u)*float64(i)/64)
		}
	}
	xs = uniqueSorted(xs, 0)
	cum = make([]float64, len(xs))
	for i := 1; i < len(xs); i++ {
		cum[i] = cum[i-1] + 0.5*(density(xs[i-1])+density(xs[i]))*(xs[i]-xs[i-1])
	}
	return xs, cum
}

// uniqueSorted returns the values sorted, merging those closer than tol.
func uniqueSorted(v []float64, tol float64) []float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	out := s[:0]
	for _, x := range s {
		if len(out) == 0 || x-out[len(out)-1] > tol {
			out = append(out, x)
		}
	}
	return out
}

// nodes returns the node count of the grid newGrid makes with density n.
func (l *layout) nodes(n float64) int {
	kx, ky, sx, sy := l.keys()
	d := coreFraction * l.lmin
	return len(gradedAxis(kx, sx, d, n)) * len(gradedAxis(ky, sy, d, n))
}
