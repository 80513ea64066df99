package synth

import (
	"testing"

	"stubcraft/physical"
)

// BenchmarkSynthesize times Width for 50 Ω at 2.45 GHz on 1.6 mm εr 4.4
// with 35 µm copper (goal ≤ 20 µs).
func BenchmarkSynthesize(b *testing.B) {
	sub := physical.Substrate{Er: 4.4, Height: 1.6e-3, CopperThickness: 35e-6, Roughness: 1e-6, LossTangent: 0.02}
	for b.Loop() {
		if _, err := Width(sub, 50, 2.45e9); err != nil {
			b.Fatal(err)
		}
	}
}
