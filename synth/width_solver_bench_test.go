package synth

import (
	"context"
	"testing"

	"stubcraft/stackups"
)

// BenchmarkWidthMasked is the width search of "stubcraft trace --stackup
// fr4-1.6mm-masked --z0 50 --freq 2.45GHz" on the field solver, with a new
// cache each time (the trace-masked goal of BenchmarkCommands).
func BenchmarkWidthMasked(b *testing.B) {
	st, ok := stackups.Preset("fr4-1.6mm-masked")
	if !ok {
		b.Fatal("no preset fr4-1.6mm-masked")
	}
	sub, _ := SubstrateAt(st, 2.45e9)
	for b.Loop() {
		mk := LineMakerFor(context.Background(), st, NewSolverCache())
		if _, err := WidthWith(mk, sub, 50, 2.45e9); err != nil {
			b.Fatal(err)
		}
	}
}
