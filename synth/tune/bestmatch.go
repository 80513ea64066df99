package tune

import (
	"fmt"
	"math"
)

// bestMatchScan is the number of points of the coarse scan that brackets
// the best match before the golden-section refinement.
const bestMatchScan = 241

// BestMatch returns the frequency in [lo, hi] where |S11| is least, and
// that |S11| (complex), found by a scan of the band followed by a
// golden-section search (Kiefer 1953) of the bracketing interval to a
// relative precision of 1e-9. A minimum at an end of the band is
// ErrNoSolution: the best match lies outside it.
func (r Response) BestMatch(lo, hi float64) (float64, complex128, error) {
	if !(lo > 0 && hi > lo) {
		return 0, 0, fmt.Errorf("best match: band %.6g–%.6g Hz", lo, hi)
	}
	step := (hi - lo) / (bestMatchScan - 1)
	best, bestV := 0, math.Inf(1)
	for i := 0; i < bestMatchScan; i++ {
		if v := r.mag2(lo + step*float64(i)); v < bestV {
			best, bestV = i, v
		}
	}
	if math.IsInf(bestV, 1) {
		return 0, 0, fmt.Errorf("best match: the model gives no finite S11 in %.6g–%.6g GHz", lo/1e9, hi/1e9)
	}
	if best == 0 || best == bestMatchScan-1 {
		edge := "upper"
		if best == 0 {
			edge = "lower"
		}
		return 0, 0, fmt.Errorf("best match in %.6g–%.6g GHz: %w (|S11| falls toward the %s edge)", lo/1e9, hi/1e9, ErrNoSolution, edge)
	}
	f := goldenMin(r.mag2, lo+step*float64(best-1), lo+step*float64(best+1), 1e-9)
	g, err := r.S11(f)
	if err != nil {
		return 0, 0, err
	}
	return f, g, nil
}

// goldenMin returns the minimiser of a unimodal fn on [a, b] by golden-
// section search, to a bracket of rel·(a+b)/2.
func goldenMin(fn func(float64) float64, a, b, rel float64) float64 {
	const invPhi = 0.6180339887498949 // (√5 − 1)/2
	c := b - invPhi*(b-a)
	d := a + invPhi*(b-a)
	fc, fd := fn(c), fn(d)
	tol := rel * math.Abs(a+b) / 2
	for b-a > tol {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = fn(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = fn(d)
		}
	}
	return (a + b) / 2
}
