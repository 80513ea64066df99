package synth

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sort"
	"sync"

	"stubcraft/physical"
	"stubcraft/synth/tune"
)

// YieldThresholdDB is the |S11| at f0 below which a board counts as good
// in the tolerance analysis (common practice, no source: 15 dB return loss).
const YieldThresholdDB = -15

// Tolerance is the outcome of the Monte Carlo analysis.
type Tolerance struct {
	Spec     ToleranceSpec
	S11DB    []float64 // |S11| at f0 of each sample, dB, in sample order
	P50, P90 float64   // median and 90th percentile of S11DB
	// BandP50 and BandP90 are, for a design with a band, the median and
	// 90th percentile over the same boards of the worst |S11| across the
	// band, dB (BandPoints frequencies, edges included); NaN without one.
	BandP50, BandP90 float64
	Yield            float64 // fraction of samples below YieldThresholdDB
}

// Analyse draws spec.Samples boards whose εr, dielectric thickness, etched
// width and copper thickness are spread uniformly within the given limits
// (a uniform spread inside the laminate's quoted tolerance: common
// practice, no source), and simulates |S11| at f0 for each with the full
// model. One etch offset applies to every line of a board, since etching
// moves all edges of one panel alike. The draw is reproducible: sample i
// uses its own generator seeded from (spec.Seed, i), so the result does
// not depend on how the samples are spread over the processors.
// It stops between samples once ctx is done, returning an error that wraps
// ctx.Err().
func Analyse(ctx context.Context, b physical.Board, sub physical.Substrate, mk physical.LineMaker, zl complex128, f0, z0 float64, spec ToleranceSpec) (Tolerance, error) {
	n := spec.Samples
	if n <= 0 {
		return Tolerance{}, fmt.Errorf("tolerance: %d samples", n)
	}
	t := Tolerance{Spec: spec, S11DB: make([]float64, n)}
	workers := runtime.GOMAXPROCS(0)
	if workers > n {
		workers = n
	}
	errs := make([]error, workers)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			for i := w; i < n; i += workers {
				if err := ctx.Err(); err != nil {
					errs[w] = fmt.Errorf("tolerance: %w", err)
					return
				}
				v, err := sample(b, sub, mk, zl, f0, z0, spec, i)
				if err != nil {
					errs[w] = fmt.Errorf("tolerance sample %d: %w", i, err)
					return
				}
				t.S11DB[i] = v
			}
		}(w)
	}
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return Tolerance{}, err
		}
	}
	sorted := append([]float64(nil), t.S11DB...)
	sort.Float64s(sorted)
	t.P50 = quantile(sorted, 0.5)
	t.P90 = quantile(sorted, 0.9)
	good := 0
	for _, v := range sorted {
		if v < YieldThresholdDB {
			good++
		}
	}
	t.Yield = float64(good) / float64(n)
	return t, nil
}

// sample simulates board i of the analysis.
func sample(b physical.Board, sub physical.Substrate, mk physical.LineMaker, zl complex128, f0, z0 float64, spec ToleranceSpec, i int) (float64, error) {
	sim, err := physical.NewSim(perturbBoard(b, sub, spec, i), mk)
	if err != nil {
		return 0, err
	}
	return physical.MagDB(sim.InputReflection(f0, zl, z0)), nil
}

// perturbBoard returns board i of a tolerance analysis: b on sub with εr,
// thickness and copper spread and one etch offset on every line.
func perturbBoard(b physical.Board, sub physical.Substrate, spec ToleranceSpec, i int) physical.Board {
	rng := rand.New(rand.NewPCG(uint64(spec.Seed), uint64(i)))
	spread := func(limit float64) float64 { return limit * (2*rng.Float64() - 1) }
	s := sub
	s.Er = max(sub.Er*(1+spread(spec.Er)), 1)
	s.Height = sub.Height * (1 + spread(spec.Thickness))
	s.CopperThickness = sub.CopperThickness * (1 + spread(spec.Copper))
	etch := spread(spec.Width)
	q := b
	q.Sub = s
	q.Through = append([]physical.Trace(nil), b.Through...)
	q.Stubs = append([]physical.Stub(nil), b.Stubs...)
	for k := range q.Through {
		q.Through[k].Width = max(q.Through[k].Width+etch, 1e-6)
	}
	for k := range q.Stubs {
		q.Stubs[k].Width = max(q.Stubs[k].Width+etch, 1e-6)
	}
	return q
}

// quantile returns the q-quantile of sorted data by linear interpolation
// between order statistics (Hyndman and Fan 1996, definition 7).
func quantile(sorted []float64, q float64) float64 {
	if len(sorted) == 0 {
		return 0
	}
	h := q * float64(len(sorted)-1)
	lo := int(h)
	if lo+1 >= len(sorted) {
		return sorted[len(sorted)-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

// bandWorst sets t.BandP50 and t.BandP90: for each board of the analysis
// (the same draw as Analyse), its worst |S11| across [lo, hi] with the load
// at each frequency.
func (t *Tolerance) bandWorst(ctx context.Context, b physical.Board, sub physical.Substrate, mk physical.LineMaker, load Load, lo, hi, z0 float64) error {
	n := t.Spec.Samples
	worst := make([]float64, n)
	zl := make([]complex128, tune.BandPoints)
	fs := make([]float64, tune.BandPoints)
	for k := range fs {
		fs[k] = lo + (hi-lo)*float64(k)/float64(tune.BandPoints-1)
		z, err := load.Impedance(fs[k])
		if err != nil {
			return err
		}
		zl[k] = z
	}
	for i := 0; i < n; i++ {
		if err := ctx.Err(); err != nil {
			return fmt.Errorf("tolerance across the band: %w", err)
		}
		sim, err := physical.NewSim(perturbBoard(b, sub, t.Spec, i), mk)
		if err != nil {
			return fmt.Errorf("tolerance sample %d: %w", i, err)
		}
		worst[i] = math.Inf(-1)
		for k, f := range fs {
			worst[i] = max(worst[i], physical.MagDB(sim.InputReflection(f, zl[k], z0)))
		}
	}
	sort.Float64s(worst)
	t.BandP50, t.BandP90 = quantile(worst, 0.5), quantile(worst, 0.9)
	return nil
}
