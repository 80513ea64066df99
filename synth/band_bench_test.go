package synth

import (
	"bytes"
	"context"
	"strings"
	"testing"
)

// BenchmarkBuildDemoBandAuto is the whole build of the demo with a band
// (2.4–2.4835 GHz) and topology auto, Monte Carlo and geometry included:
// goal ≤ 2 s.
func BenchmarkBuildDemoBandAuto(b *testing.B) {
	text := strings.Replace(string(DemoTOML()), `topology = "shunt-stub"`, `topology = "auto"
band = ["2.4GHz", "2.4835GHz"]
goal = "-15dB"`, 1)
	in, err := ReadDesign(bytes.NewReader([]byte(text)), "bench.toml", "", LoadOptions{})
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < b.N; i++ {
		r, err := Build(context.Background(), in)
		if err != nil {
			b.Fatal(err)
		}
		if r.Band == nil || len(r.Band.Candidates) != 10 {
			b.Fatalf("band %+v", r.Band)
		}
	}
}
