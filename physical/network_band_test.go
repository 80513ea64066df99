package physical

import (
	"math"
	"math/cmplx"
	"testing"
)

// sweep samples a return-loss curve given in dB, with an arbitrary phase,
// at n points from f1 to f2.
func sweep(f1, f2 float64, n int, db func(f float64) float64) ([]float64, []complex128) {
	fs := make([]float64, n)
	s := make([]complex128, n)
	for i := range fs {
		f := f1 + (f2-f1)*float64(i)/float64(n-1)
		fs[i] = f
		s[i] = cmplx.Rect(math.Pow(10, db(f)/20), 0.3*float64(i))
	}
	return fs, s
}

// vee is |S11| in dB falling linearly to bottom at f0 with slopes sl and sr
// (dB per GHz) on the two sides. Linear interpolation of a straight line is
// exact, so the −10 dB crossings are known exactly away from the vertex.
func vee(f0, bottom, sl, sr float64) func(float64) float64 {
	return func(f float64) float64 {
		if f < f0 {
			return bottom + sl*(f0-f)/1e9
		}
		return bottom + sr*(f-f0)/1e9
	}
}

func TestBandwidth(t *testing.T) {
	tests := []struct {
		name   string
		f1, f2 float64
		n      int
		db     func(float64) float64
		thr    float64
		f0     float64
		lo, hi float64
		ok     bool
	}{
		// −25 dB at 2.4 GHz, 30 dB/GHz below and 20 dB/GHz above: −10 dB at
		// 2.4 − 0.5 and 2.4 + 0.75 GHz (exact for a straight line).
		{"asymmetric vee", 1e9, 4e9, 44, vee(2.4e9, -25, 30, 20), -10, 2.4e9, 1.9e9, 3.15e9, true},
		// The same curve asked at a point of the band other than the dip.
		{"f0 off the dip", 1e9, 4e9, 44, vee(2.4e9, -25, 30, 20), -10, 2.0e9, 1.9e9, 3.15e9, true},
		// −15 dB threshold: 2.4 − 10/30 and 2.4 + 0.5 GHz (exact).
		{"deeper threshold", 1e9, 4e9, 61, vee(2.4e9, -25, 30, 20), -15, 2.4e9, 2.4e9 - 1e9/3, 2.9e9, true},
		// Band runs past the start of the sweep: lo clipped to 2.0 GHz.
		{"clipped low edge", 2e9, 4e9, 30, vee(2.4e9, -25, 30, 20), -10, 2.4e9, 2e9, 3.15e9, true},
		// f0 not inside the band: no band.
		{"f0 not matched", 1e9, 4e9, 44, vee(2.4e9, -25, 30, 20), -10, 3.5e9, 0, 0, false},
		// f0 outside the sweep.
		{"f0 outside", 1e9, 4e9, 44, vee(2.4e9, -25, 30, 20), -10, 4.5e9, 0, 0, false},
		// Two dips below −10 dB; the band is the one containing f0 only:
		// second vee −20 dB at 3.4 GHz, 40 dB/GHz both sides: 3.15 to 3.65 GHz.
		{"two bands", 1e9, 4e9, 47, func(f float64) float64 {
			return math.Min(vee(1.8e9, -20, 40, 40)(f), vee(3.4e9, -20, 40, 40)(f))
		}, -10, 3.4e9, 3.15e9, 3.65e9, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			fs, s := sweep(tt.f1, tt.f2, tt.n, tt.db)
			lo, hi, ok := Bandwidth(fs, s, tt.thr, tt.f0)
			if ok != tt.ok {
				t.Fatalf("ok = %v, want %v", ok, tt.ok)
			}
			if !ok {
				return
			}
			if math.Abs(lo-tt.lo) > 1 || math.Abs(hi-tt.hi) > 1 {
				t.Errorf("band = %.9g to %.9g Hz, want %.9g to %.9g (exact: linear crossing)", lo, hi, tt.lo, tt.hi)
			}
		})
	}
}

func TestBandwidthRejectsBadInput(t *testing.T) {
	s := []complex128{0.1, 0.1, 0.1}
	for _, fs := range [][]float64{{1, 2}, {1, 3, 2}, {1, 1, 2}, nil} {
		if _, _, ok := Bandwidth(fs, s, -10, 1.5); ok {
			t.Errorf("Bandwidth(%v) ok, want rejected", fs)
		}
	}
}
