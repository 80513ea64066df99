package fieldsolve

import "testing"

// BenchmarkSolveMicrostrip solves a 50 Ω FR-4 microstrip with 35 µm copper
// and solder mask to the default 0.5 % (goal: ≤ 200 ms on 2 cores).
func BenchmarkSolveMicrostrip(b *testing.B) {
	cs := CrossSection{Geometry: Microstrip, Width: 3e-3, Height: 1.6e-3, Er: 4.4, Thickness: 35e-6,
		MaskThickness: 25e-6, MaskEr: 3.5}
	for b.Loop() {
		if _, err := Solve(cs, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSolveStripline solves an offset stripline with 17 µm copper to
// the default 0.5 % (goal: ≤ 200 ms on 2 cores).
func BenchmarkSolveStripline(b *testing.B) {
	cs := CrossSection{Geometry: Stripline, Width: 0.4e-3, Spacing: 1e-3, Er: 3.5, Thickness: 17e-6, Offset: 0.1e-3}
	for b.Loop() {
		if _, err := Solve(cs, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSolveGCPW solves a GCPW with finite side grounds to 0.5 %.
func BenchmarkSolveGCPW(b *testing.B) {
	cs := CrossSection{Geometry: GCPW, Width: 1e-3, Height: 0.5e-3, Er: 3.5, Thickness: 35e-6, Gap: 0.2e-3, GroundWidth: 1.5e-3}
	for b.Loop() {
		if _, err := Solve(cs, Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSynthesizeWidth finds the 50 Ω width of the masked FR-4
// microstrip, no cache (goal: ≤ 2 s).
func BenchmarkSynthesizeWidth(b *testing.B) {
	cs := CrossSection{Geometry: Microstrip, Width: 1e-3, Height: 1.6e-3, Er: 4.4, Thickness: 35e-6,
		MaskThickness: 25e-6, MaskEr: 3.5}
	for b.Loop() {
		if _, _, err := SynthesizeWidth(cs, 50, Options{}, nil); err != nil {
			b.Fatal(err)
		}
	}
}
