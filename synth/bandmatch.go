package synth

import (
	"fmt"
	"math"
	"math/cmplx"

	"gonum.org/v1/gonum/optimize"
)

// SectionsInputAt returns the impedance looking into lossless TEM sections
// (from the load toward the source, lengths given at f0) ending in load, at
// freq: every electrical length scales with freq/f0.
func SectionsInputAt(secs []Section, load Load, f0, freq float64) (complex128, error) {
	zl, err := load.Impedance(freq)
	if err != nil {
		return 0, err
	}
	scaled := make([]Section, len(secs))
	for i, s := range secs {
		s.LengthDeg *= freq / f0
		scaled[i] = s
	}
	return SectionsInput(scaled, zl), nil
}

// BandSamples returns n frequencies evenly spread over f1…f2, ends
// included.
func BandSamples(f1, f2 float64, n int) []float64 {
	if n < 2 {
		return []float64{(f1 + f2) / 2}
	}
	fs := make([]float64, n)
	for i := range fs {
		fs[i] = f1 + (f2-f1)*float64(i)/float64(n-1)
	}
	return fs
}

// WorstGammaIdeal returns the largest |Γ| against z0 of lossless sections
// with load at the frequencies fs.
func WorstGammaIdeal(secs []Section, load Load, z0, f0 float64, fs []float64) (float64, error) {
	worst := 0.0
	for _, f := range fs {
		zin, err := SectionsInputAt(secs, load, f0, f)
		if err != nil {
			return 0, err
		}
		g := 1.0
		if !cmplx.IsInf(zin) {
			g = cmplx.Abs((zin - complex(z0, 0)) / (zin + complex(z0, 0)))
		}
		worst = math.Max(worst, g)
	}
	return worst, nil
}

// OptimiseIdeal adjusts the electrical lengths of secs (and, when
// impedances is true, the impedances of the series lines, kept within
// zMin…zMax ohm) with Nelder-Mead (gonum/optimize) to make the worst |Γ|
// of the lossless network least over fs. Lengths stay within (0, 360]°.
// It returns the improved sections and their worst |Γ|; the input is kept
// when nothing better is found.
func OptimiseIdeal(secs []Section, load Load, z0, f0 float64, fs []float64, impedances bool, zMin, zMax float64) ([]Section, float64, error) {
	start, err := WorstGammaIdeal(secs, load, z0, f0, fs)
	if err != nil {
		return nil, 0, err
	}
	n := len(secs)
	x0 := make([]float64, 0, 2*n)
	for _, s := range secs {
		x0 = append(x0, s.LengthDeg/90)
	}
	if impedances {
		for _, s := range secs {
			if s.Kind == SeriesLine {
				x0 = append(x0, math.Log(s.Z0))
			}
		}
	}
	build := func(x []float64) ([]Section, bool) {
		out := append([]Section(nil), secs...)
		k := n
		for i := range out {
			out[i].LengthDeg = x[i] * 90
			if !(out[i].LengthDeg > 0 && out[i].LengthDeg <= 360) {
				return nil, false
			}
			if impedances && out[i].Kind == SeriesLine {
				out[i].Z0 = math.Exp(x[k])
				k++
				if out[i].Z0 < zMin || out[i].Z0 > zMax {
					return nil, false
				}
			}
		}
		return out, true
	}
	var evalErr error
	obj := func(x []float64) float64 {
		s, ok := build(x)
		if !ok {
			return 2
		}
		w, err := WorstGammaIdeal(s, load, z0, f0, fs)
		if err != nil {
			evalErr = err
			return 2
		}
		return w
	}
	best, bestX := start, x0
	x := x0
	// Nelder-Mead stalls on a minimax objective; restarting from its own
	// optimum with a fresh simplex lets it go on.
	for round := 0; round < 4; round++ {
		res, err := optimize.Minimize(optimize.Problem{Func: obj}, x,
			&optimize.Settings{FuncEvaluations: 3000, Converger: &optimize.FunctionConverge{Absolute: 1e-9, Iterations: 200}},
			&optimize.NelderMead{SimplexSize: 0.05})
		if res == nil {
			return nil, 0, fmt.Errorf("band optimisation: %w", err)
		}
		if res.F < best {
			best, bestX = res.F, res.X
		}
		x = bestX
	}
	if evalErr != nil {
		return nil, 0, evalErr
	}
	out, ok := build(bestX)
	if !ok || best >= start {
		return append([]Section(nil), secs...), start, nil
	}
	return out, best, nil
}
