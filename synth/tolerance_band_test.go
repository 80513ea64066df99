package synth_test

import (
	"context"
	"math"
	"path/filepath"
	"testing"

	"stubcraft/synth"
)

// The as-built worst |S11| across the band is, board by board, at least
// the board's |S11| at f0 whenever f0 is one of the band's sample points
// (the centre, as here); quantiles keep that order, so its median and 90th
// percentile cannot be better than those at f0 (an exact property of the
// bookkeeping: it fails if the band pass draws other boards or misses f0).
func TestToleranceWorstAcrossBand(t *testing.T) {
	in, err := synth.LoadDesign(filepath.Join("..", "testdata", "designs", "band-auto.toml"), synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.Design.Tolerance.Samples = 200
	res, err := synth.Simulate(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	b, tol := res.Band, res.Tolerance
	if b == nil || tol == nil {
		t.Fatal("no band or no tolerance analysis")
	}
	if c := (b.Start + b.Stop) / 2; math.Abs(res.Design.Freq-c) > 1e-6*c {
		t.Fatalf("f0 %.6g Hz is not the band centre %.6g Hz", res.Design.Freq, c)
	}
	if math.IsNaN(tol.BandP50) || tol.BandP50 < tol.P50-1e-9 || tol.BandP90 < tol.P90-1e-9 || tol.BandP90 < tol.BandP50 {
		t.Errorf("worst across the band: median %.3f dB, p90 %.3f dB; at f0: median %.3f dB, p90 %.3f dB", tol.BandP50, tol.BandP90, tol.P50, tol.P90)
	}
}
