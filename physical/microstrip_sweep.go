package physical

import (
	"runtime"
	"sync"
)

// sweepChunk is the least number of frequencies worth a goroutine of its
// own in Sweep.
const sweepChunk = 2048

// Sweep appends the line's properties at each of freqs to dst and returns
// the extended slice, in the manner of strconv.AppendFloat: pass dst[:0] to
// reuse its storage. Element len(dst)+i of the result is At(freqs[i]).
// Long sweeps are split over up to GOMAXPROCS goroutines.
func (m *MicrostripModel) Sweep(freqs []float64, dst []LineParams) []LineParams {
	n0 := len(dst)
	dst = growParams(dst, len(freqs))
	out := dst[n0:]
	inRanges(len(freqs), func(lo, hi int) { m.sweepInto(freqs[lo:hi], out[lo:hi]) })
	return dst
}

// inRanges calls f on consecutive ranges [lo, hi) covering 0..n: one
// range when n is short, else one per processor (at most), each at least
// sweepChunk long, at once.
func inRanges(n int, f func(lo, hi int)) {
	workers := min(runtime.GOMAXPROCS(0), n/sweepChunk)
	if workers < 2 {
		f(0, n)
		return
	}
	var wg sync.WaitGroup
	per := (n + workers - 1) / workers
	for lo := 0; lo < n; lo += per {
		wg.Go(func() { f(lo, min(lo+per, n)) })
	}
	wg.Wait()
}

// sweepInto writes At(freqs[i]) into out[i], a block at a time.
func (m *MicrostripModel) sweepInto(freqs []float64, out []LineParams) {
	for lo := 0; lo < len(freqs); lo += blockLen {
		hi := min(lo+blockLen, len(freqs))
		m.evaluateBlock(freqs[lo:hi], out[lo:hi])
	}
}

// growParams extends dst by n elements, reallocating when needed.
func growParams(dst []LineParams, n int) []LineParams {
	if cap(dst)-len(dst) >= n {
		return dst[:len(dst)+n]
	}
	g := make([]LineParams, len(dst)+n)
	copy(g, dst)
	return g
}
