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
	workers := min(runtime.GOMAXPROCS(0), len(freqs)/sweepChunk)
	if workers < 2 {
		m.sweepInto(freqs, out)
		return dst
	}
	var wg sync.WaitGroup
	per := (len(freqs) + workers - 1) / workers
	for lo := 0; lo < len(freqs); lo += per {
		hi := min(lo+per, len(freqs))
		wg.Add(1)
		go func(f []float64, o []LineParams) {
			defer wg.Done()
			m.sweepInto(f, o)
		}(freqs[lo:hi], out[lo:hi])
	}
	wg.Wait()
	return dst
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
