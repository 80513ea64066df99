package physical

import "testing"

// benchLine is the benchmarked cross-section: 3 mm on 1.6 mm εr 4.4, 35 µm
// copper with 1 µm roughness and tanδ 0.02.
func benchLine() (float64, Substrate) {
	return 3e-3, Substrate{Er: 4.4, Height: 1.6e-3, CopperThickness: 35e-6, Roughness: 1e-6, LossTangent: 0.02}
}

// BenchmarkAnalyze times NewMicrostrip and one At (goal ≤ 1 µs).
func BenchmarkAnalyze(b *testing.B) {
	w, sub := benchLine()
	var sink float64
	for b.Loop() {
		m, err := NewMicrostrip(w, sub)
		if err != nil {
			b.Fatal(err)
		}
		sink += m.At(2.45e9).Z0
	}
	_ = sink
}

// BenchmarkSweep times Z0(f), εeff(f), α and β of one line at 10,001
// frequencies from 0.1 to 20 GHz (goal ≤ 1.3 ms on 2 cores).
func BenchmarkSweep(b *testing.B) {
	w, sub := benchLine()
	m, err := NewMicrostrip(w, sub)
	if err != nil {
		b.Fatal(err)
	}
	const n = 10001
	freqs := make([]float64, n)
	for i := range freqs {
		freqs[i] = 0.1e9 + 19.9e9*float64(i)/(n-1)
	}
	beta := make([]float64, n)
	alpha := make([]float64, n)
	dst := make([]LineParams, 0, n)
	for b.Loop() {
		dst = m.Sweep(freqs, dst[:0])
		for i, p := range dst {
			alpha[i], beta[i] = p.Alpha(), p.Beta()
		}
	}
}
