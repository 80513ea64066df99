package physical

import "sort"

// Bandwidth returns the contiguous band around f0 (Hz) in which
// 20·log10|s11| stays below thresholdDB (for example −10). freqs must be
// increasing and as long as s11. Each band edge is where the straight line
// between the two samples that straddle the threshold, in dB against
// frequency, crosses it. An edge that the sweep does not reach is clipped
// to the first or last frequency, so lo == freqs[0] or hi ==
// freqs[len(freqs)-1] means the band may go on beyond the sweep.
//
// ok is false when f0 lies outside the sweep, when the response at f0
// (interpolated the same way) is not below the threshold, or when the
// inputs are unusable (fewer than one sample, lengths that differ,
// frequencies not increasing).
func Bandwidth(freqs []float64, s11 []complex128, thresholdDB, f0 float64) (lo, hi float64, ok bool) {
	n := len(freqs)
	if n == 0 || n != len(s11) || f0 < freqs[0] || f0 > freqs[n-1] {
		return 0, 0, false
	}
	for i := 1; i < n; i++ {
		if !(freqs[i] > freqs[i-1]) {
			return 0, 0, false
		}
	}
	db := make([]float64, n)
	for i, s := range s11 {
		db[i] = MagDB(s)
	}
	// k is the last sample at or below f0.
	k := sort.Search(n, func(i int) bool { return freqs[i] > f0 }) - 1
	d0 := db[k]
	if k+1 < n && f0 > freqs[k] {
		d0 = lerp(f0, freqs[k], db[k], freqs[k+1], db[k+1])
	}
	if !(d0 < thresholdDB) {
		return 0, 0, false
	}
	lo, hi = freqs[0], freqs[n-1]
	// Walk down from f0: (fIn, dIn) is the nearest point known to be inside.
	fIn, dIn := f0, d0
	for i := k; i >= 0; i-- {
		if freqs[i] == f0 {
			continue
		}
		if db[i] >= thresholdDB {
			lo = crossing(thresholdDB, freqs[i], db[i], fIn, dIn)
			break
		}
		fIn, dIn = freqs[i], db[i]
	}
	fIn, dIn = f0, d0
	for i := k + 1; i < n; i++ {
		if db[i] >= thresholdDB {
			hi = crossing(thresholdDB, fIn, dIn, freqs[i], db[i])
			break
		}
		fIn, dIn = freqs[i], db[i]
	}
	return lo, hi, true
}

// lerp returns the value at x on the line through (x0, y0) and (x1, y1).
func lerp(x, x0, y0, x1, y1 float64) float64 {
	return y0 + (y1-y0)*(x-x0)/(x1-x0)
}

// crossing returns the x at which the line through (x0, y0) and (x1, y1)
// takes the value y. The caller guarantees y0 ≠ y1 on opposite sides of y
// (one of them may equal y).
func crossing(y, x0, y0, x1, y1 float64) float64 {
	return x0 + (y-y0)*(x1-x0)/(y1-y0)
}
