package tune

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"stubcraft/physical"

	"gonum.org/v1/gonum/mat"
)

// Measurement is a measured input reflection of the etched board at its
// source port, referred to the model's Z0.
type Measurement struct {
	Freqs []float64    // Hz, increasing
	S11   []complex128 // referred to the model's Z0
	// Source names where it came from, for messages.
	Source string
}

// FitOptions chooses what Fit varies.
type FitOptions struct {
	// FitLoad also fits a real scale of the load impedance.
	FitLoad bool
}

// MaxResidualDB is the RMS |S11| residual, dB, above which no board state
// explains a measurement: well above the 0.1–0.5 dB a calibrated analyser
// leaves on a one-port (common practice, no source), well below what a
// different network gives.
const MaxResidualDB = 1.5

// The plausible board states a fit may reach: beyond them a board is not
// "this design, etched a little off" but something else (common practice,
// no source: laminate εr stays within a few per cent of its class value,
// etch within tens of micrometres).
const (
	MaxErDeviation = 0.2    // relative εr
	MaxEtch        = 100e-6 // m per edge; also at most a quarter of the narrowest line
	MaxLoadScale   = 2      // load impedance scale, and its inverse
)

// maxEtch is the largest plausible etch of the board, m per edge.
func (m Model) maxEtch() float64 {
	e := MaxEtch
	for _, t := range m.Board.Through {
		e = min(e, t.Width/4)
	}
	for _, s := range m.Board.Stubs {
		e = min(e, s.Width/4)
	}
	return e
}

// FitResult is the board state that best explains a measurement.
type FitResult struct {
	State State
	// Sigma holds the one-standard-deviation uncertainty of each fitted
	// field of State (zero for a field not fitted), from the covariance
	// s²(JᵀJ)⁻¹ of the linearised least-squares problem.
	Sigma State
	// ResidualDB is the RMS difference of |S11| in dB between the fitted
	// model and the measurement.
	ResidualDB float64
	Points     int
}

// ErrUnexplained is returned (wrapped in a *ResidualError) when no board
// state explains a measurement.
var ErrUnexplained = errors.New("no board state explains the measurement")

// ResidualError is a fit whose residual is above MaxResidualDB.
type ResidualError struct {
	Source     string
	ResidualDB float64
	Fit        FitResult
}

func (e *ResidualError) Error() string {
	return fmt.Sprintf("%s: %v: the best fit leaves %.2f dB RMS of |S11| unexplained (limit %.2g dB); is it a measurement of this design, calibrated at the source port?",
		e.Source, ErrUnexplained, e.ResidualDB, MaxResidualDB)
}

func (e *ResidualError) Unwrap() error { return ErrUnexplained }

// CoverageError is a measurement whose band does not include f0.
type CoverageError struct {
	Source     string
	Lo, Hi, F0 float64 // Hz
}

func (e *CoverageError) Error() string {
	return fmt.Sprintf("%s: the measurement covers %.6g–%.6g GHz, which does not include f0 = %.6g GHz; measure across f0", e.Source, e.Lo/1e9, e.Hi/1e9, e.F0/1e9)
}

// The fit works in scaled parameters of similar size: εr in per cent,
// etch in micrometres, load scale in per cent.
func fromParams(p []float64) State {
	s := State{ErRatio: 1 + p[0]/100, Etch: p[1] * 1e-6, LoadScale: 1}
	if len(p) > 2 {
		s.LoadScale = 1 + p[2]/100
	}
	return s
}

// Fit finds the relative εr, the etch and, when asked, a load scale for
// which the model's S11 best matches meas over its band, by least squares
// on the complex S11 (Levenberg 1944, Marquardt 1963, with a forward-
// difference Jacobian), started from the best of a coarse grid of states
// (εr −10 … +10 %, etch −40 … +40 µm) so that it does not stop in a local
// minimum. A fit whose RMS |S11| residual exceeds MaxResidualDB is returned
// with a *ResidualError.
func (m Model) Fit(ctx context.Context, meas Measurement, opt FitOptions) (FitResult, error) {
	n := len(meas.Freqs)
	if n < 4 || len(meas.S11) != n {
		return FitResult{}, fmt.Errorf("%s: %d points; a fit needs at least 4", meas.Source, n)
	}
	if m.F0 < meas.Freqs[0] || m.F0 > meas.Freqs[n-1] {
		return FitResult{}, &CoverageError{Source: meas.Source, Lo: meas.Freqs[0], Hi: meas.Freqs[n-1], F0: m.F0}
	}
	maxEtch := m.maxEtch()
	resid := func(p []float64, out []float64) bool {
		st := fromParams(p)
		if math.Abs(st.ErRatio-1) > MaxErDeviation || math.Abs(st.Etch) > maxEtch || st.LoadScale < 1/MaxLoadScale || st.LoadScale > MaxLoadScale {
			return false
		}
		r, err := m.Simulate(st)
		if err != nil {
			return false
		}
		for i, f := range meas.Freqs {
			g, err := r.S11(f)
			if err != nil {
				return false
			}
			d := g - meas.S11[i]
			out[2*i], out[2*i+1] = real(d), imag(d)
		}
		return true
	}
	cost := func(p []float64) float64 {
		out := make([]float64, 2*n)
		if !resid(p, out) {
			return math.Inf(1)
		}
		return floats2(out)
	}
	type start struct {
		p []float64
		c float64
	}
	var starts []start
	for _, er := range []float64{-10, -6, -3, 0, 3, 6, 10} {
		for _, etch := range []float64{-40, -20, 0, 20, 40} {
			p := []float64{er, max(-maxEtch, min(maxEtch, etch*1e-6)) * 1e6}
			if opt.FitLoad {
				p = append(p, 0)
			}
			starts = append(starts, start{p, cost(p)})
		}
		if err := ctx.Err(); err != nil {
			return FitResult{}, err
		}
	}
	sort.Slice(starts, func(a, b int) bool { return starts[a].c < starts[b].c })
	var best []float64
	bestCost := math.Inf(1)
	for _, s := range starts[:3] {
		if math.IsInf(s.c, 1) {
			continue
		}
		p, c, err := levenbergMarquardt(ctx, resid, s.p, 2*n)
		if err != nil {
			return FitResult{}, err
		}
		if c < bestCost {
			best, bestCost = p, c
		}
	}
	if best == nil {
		return FitResult{}, fmt.Errorf("%s: the model cannot be evaluated at any starting state", meas.Source)
	}
	res := FitResult{State: fromParams(best), Points: n}
	// Uncertainties from the Jacobian at the optimum.
	if j, ok := jacobian(resid, best, 2*n); ok {
		var jtj mat.Dense
		jtj.Mul(j.T(), j)
		var cov mat.Dense
		if err := cov.Inverse(&jtj); err == nil {
			dof := float64(2*n - len(best))
			s2 := bestCost / max(dof, 1)
			sig := make([]float64, len(best))
			for i := range sig {
				sig[i] = math.Sqrt(max(s2*cov.At(i, i), 0))
			}
			res.Sigma = State{ErRatio: sig[0] / 100, Etch: sig[1] * 1e-6}
			if len(sig) > 2 {
				res.Sigma.LoadScale = sig[2] / 100
			}
		}
	}
	// The residual in dB, the figure a bench reads.
	r, err := m.Simulate(res.State)
	if err != nil {
		return FitResult{}, err
	}
	ss := 0.0
	for i, f := range meas.Freqs {
		g, err := r.S11(f)
		if err != nil {
			return FitResult{}, err
		}
		d := physical.MagDB(g) - physical.MagDB(meas.S11[i])
		ss += d * d
	}
	res.ResidualDB = math.Sqrt(ss / float64(n))
	if res.ResidualDB > MaxResidualDB || math.IsNaN(res.ResidualDB) {
		return res, &ResidualError{Source: meas.Source, ResidualDB: res.ResidualDB, Fit: res}
	}
	return res, nil
}

func floats2(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x * x
	}
	return s
}

// jacobian returns the forward-difference Jacobian of resid at p.
func jacobian(resid func([]float64, []float64) bool, p []float64, m int) (*mat.Dense, bool) {
	r0 := make([]float64, m)
	if !resid(p, r0) {
		return nil, false
	}
	j := mat.NewDense(m, len(p), nil)
	r1 := make([]float64, m)
	q := append([]float64(nil), p...)
	for k := range p {
		h := 1e-4 * max(1, math.Abs(p[k]))
		q[k] = p[k] + h
		if !resid(q, r1) {
			return nil, false
		}
		q[k] = p[k]
		for i := range r1 {
			j.Set(i, k, (r1[i]-r0[i])/h)
		}
	}
	return j, true
}

// levenbergMarquardt minimises the sum of squares of resid from p, and
// returns the optimum and its cost.
func levenbergMarquardt(ctx context.Context, resid func([]float64, []float64) bool, p []float64, m int) ([]float64, float64, error) {
	p = append([]float64(nil), p...)
	r := make([]float64, m)
	if !resid(p, r) {
		return nil, math.Inf(1), nil
	}
	cost := floats2(r)
	lambda := 1e-3
	trial := make([]float64, m)
	for iter := 0; iter < 100; iter++ {
		if err := ctx.Err(); err != nil {
			return nil, 0, err
		}
		j, ok := jacobian(resid, p, m)
		if !ok {
			break
		}
		var jtj mat.Dense
		jtj.Mul(j.T(), j)
		g := mat.NewVecDense(m, r)
		var jtr mat.VecDense
		jtr.MulVec(j.T(), g)
		improved := false
		for tries := 0; tries < 20; tries++ {
			a := mat.DenseCopyOf(&jtj)
			for k := 0; k < len(p); k++ {
				a.Set(k, k, jtj.At(k, k)*(1+lambda)+1e-12)
			}
			var step mat.VecDense
			if err := step.SolveVec(a, &jtr); err != nil {
				lambda *= 10
				continue
			}
			q := make([]float64, len(p))
			for k := range p {
				q[k] = p[k] - step.AtVec(k)
			}
			if resid(q, trial) {
				if c := floats2(trial); c < cost {
					rel := (cost - c) / max(cost, 1e-300)
					p, cost = q, c
					copy(r, trial)
					lambda = max(lambda/10, 1e-12)
					improved = true
					if rel < 1e-12 {
						return p, cost, nil
					}
					break
				}
			}
			lambda *= 10
		}
		if !improved {
			break
		}
	}
	return p, cost, nil
}

// MeasurementFrom returns the reflections of a one-port Touchstone file's
// points, referred to z0 (a file with another reference is renormalised),
// within [lo, hi].
func MeasurementFrom(freqs []float64, s11 []complex128, fileZ0, z0, lo, hi float64, source string) Measurement {
	meas := Measurement{Source: source}
	for i, f := range freqs {
		if f < lo || f > hi {
			continue
		}
		g := s11[i]
		if fileZ0 != z0 {
			z := complex(fileZ0, 0) * (1 + g) / (1 - g)
			g = (z - complex(z0, 0)) / (z + complex(z0, 0))
			if cmplx.IsNaN(g) || cmplx.IsInf(g) {
				g = 1
			}
		}
		meas.Freqs = append(meas.Freqs, f)
		meas.S11 = append(meas.S11, g)
	}
	return meas
}
