package synth

import (
	"context"
	"strings"
	"testing"
)

// BenchmarkBuildDemo is the whole path for a demo-class design without the
// Monte Carlo: goal ≤ 20 ms.
func BenchmarkBuildDemo(b *testing.B) {
	d, err := DecodeDesign(strings.NewReader(strings.Replace(fr4Open, "%s", "open", 1)), "bench.toml", "")
	if err != nil {
		b.Fatal(err)
	}
	st := preset(&testing.T{}, "fr4-1.6mm")
	for i := 0; i < b.N; i++ {
		if _, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: st, Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMonteCarlo1000 is the 1000-sample tolerance analysis of the
// demo-class board: goal ≤ 1 s on 2 cores.
func BenchmarkMonteCarlo1000(b *testing.B) {
	d, err := DecodeDesign(strings.NewReader(strings.Replace(fr4Open, "%s", "open", 1)), "bench.toml", "")
	if err != nil {
		b.Fatal(err)
	}
	st := preset(&testing.T{}, "fr4-1.6mm")
	r, err := Simulate(context.Background(), BuildInput{Design: d, Stackup: st, Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		b.Fatal(err)
	}
	spec := d.Tolerance
	spec.Samples = 1000
	sub := st.Substrate()
	mk := LineMakerFor(context.Background(), st, NewSolverCache())
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Analyse(context.Background(), r.Physical.Board, sub, mk, r.LoadF0, d.Freq, d.Z0, spec); err != nil {
			b.Fatal(err)
		}
	}
}
