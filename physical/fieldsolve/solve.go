package fieldsolve

import (
	"context"
	"errors"
	"fmt"
	"math"
	"sync"

	"stubcraft/physical"
)

// Options control the accuracy and cost of a solve. The zero value asks for
// the defaults.
type Options struct {
	// Tolerance is the target relative error of Z0; 0 means 0.005.
	Tolerance float64
	// MaxCells caps the number of grid nodes of the finest grid; 0 means
	// 1,500,000.
	MaxCells int
	// Progress, if set, is called after each grid level with the number of
	// levels done and the most that may be run.
	Progress func(done, total int)
}

// DefaultTolerance and DefaultMaxCells are the defaults of Options.
const (
	DefaultTolerance = 0.005
	DefaultMaxCells  = 1500000
)

// LevelResult is the raw answer on one grid of the refinement sequence.
type LevelResult struct {
	Cells      int     // grid nodes in the half domain
	C, CAir    float64 // capacitances per unit length, F/m
	Z0, EpsEff float64
	Iterations int // conjugate-gradient iterations of the slower of the two solves
}

// Result is a solved cross-section.
type Result struct {
	Z0     float64 // characteristic impedance, ohm
	EpsEff float64 // effective relative permittivity, C/C0
	C      float64 // capacitance per unit length with the dielectrics, F/m
	CAir   float64 // capacitance per unit length in vacuum, F/m
	// ErrorEstimate is the estimated relative error of Z0: the size of the
	// Richardson extrapolation step plus the estimated effect of the
	// finite box.
	ErrorEstimate float64
	// BoxError is the part of ErrorEstimate due to the finite box.
	BoxError float64
	// Order is the observed order of grid convergence of C (0 when the
	// last three grids did not converge monotonically). Refinement goes on
	// until it is between 1 and 3, near the scheme's formal order 2, so
	// that the three-grid estimate can be trusted.
	Order float64
	// Cells is the node count of the finest grid.
	Cells int
	// Levels lists the raw answer on each grid, coarsest first.
	Levels []LevelResult

	trusted bool // the observed orders are near the formal order
}

// ErrNotConverged is returned, wrapped and together with the best Result,
// when MaxCells was reached before the error estimate fell below Tolerance.
var ErrNotConverged = errors.New("fieldsolve: tolerance not reached within the cell limit")

// Grid sequence: density n0·ρ^k, k = 0, 1, ...
const (
	startDensity = 3.0
	refineRatio  = math.Sqrt2
	maxLevels    = 10
	minLevels    = 3
	// cgEnergyFraction is the relative error of C left by the conjugate
	// gradients on each grid, as a fraction of the tolerance of Z0: a
	// ten-thousandth, so that it moves neither the answer nor the
	// observed order of convergence by anything that matters.
	cgEnergyFraction = 1e-4
	formalOrder      = 2.0
)

// Solve computes the quasi-static line parameters of cs. It refines the grid
// until the estimated relative error of Z0 is below opt.Tolerance; if the
// cell limit comes first it returns the best answer and an error wrapping
// ErrNotConverged. Invalid input gives an *InputError.
func Solve(cs CrossSection, opt Options) (Result, error) {
	return SolveContext(context.Background(), cs, opt)
}

// SolveContext is Solve that stops between grid levels once ctx is done,
// returning an error that wraps ctx.Err().
func SolveContext(ctx context.Context, cs CrossSection, opt Options) (Result, error) {
	return solve(ctx, cs, opt, [2]*scratch{{}, {}})
}

// solve is SolveContext with the working memory of the two solves of each
// grid (C and C0), which it sizes for the finest grid of the usual
// sequence.
func solve(ctx context.Context, cs CrossSection, opt Options, ws [2]*scratch) (Result, error) {
	if err := cs.Validate(); err != nil {
		return Result{}, err
	}
	tol := opt.Tolerance
	if tol == 0 {
		tol = DefaultTolerance
	}
	if !(tol > 0) {
		return Result{}, fmt.Errorf("fieldsolve: tolerance %g must be positive", opt.Tolerance)
	}
	maxCells := opt.MaxCells
	if maxCells == 0 {
		maxCells = DefaultMaxCells
	}
	homogeneous := cs.Geometry == Stripline
	l := newLayout(cs, 1)
	if err := checkGridSize(&l, maxCells); err != nil {
		return Result{}, err
	}

	last := l.nodes(startDensity * math.Pow(refineRatio, minLevels-1))
	for _, w := range ws {
		w.reset(last)
	}
	var res Result
	var box float64
	var err error
	var prev *grid
	var prevPhi, prevPhiAir []float64
	n := startDensity
	for level := 0; level < maxLevels; level++ {
		if err := ctx.Err(); err != nil {
			return Result{}, fmt.Errorf("fieldsolve: %w", err)
		}
		g := newGrid(&l, n)
		cells := g.nx() * g.ny()
		if level >= minLevels && cells > maxCells {
			break
		}
		var lr LevelResult
		var phi, phiAir []float64
		lr, phi, phiAir, err = solveGrid(g, cs.Er, homogeneous, tol*cgEnergyFraction, ws, prev, prevPhi, prevPhiAir)
		if err != nil {
			return Result{}, fmt.Errorf("fieldsolve: grid of %d nodes: %w", cells, err)
		}
		if level == 0 {
			// The coarsest grid in the standard box is one half of the
			// box estimate; the other is the same grid in a smaller box.
			if box, err = boxError(cs, homogeneous, tol*cgEnergyFraction, ws, lr.Z0, g, phi, phiAir); err != nil {
				return Result{}, err
			}
		}
		res.Levels = append(res.Levels, lr)
		prev, prevPhi, prevPhiAir = g, phi, phiAir
		if opt.Progress != nil {
			opt.Progress(level+1, maxLevels)
		}
		res.extrapolate(box)
		if homogeneous {
			// TEM in one dielectric: εeff is εr exactly, not up to the
			// rounding of two extrapolations.
			res.CAir, res.EpsEff = res.C/cs.Er, cs.Er
			res.Z0, _ = lineParams(res.C, res.CAir)
		}
		if level+1 >= minLevels && res.ErrorEstimate < tol && res.trusted {
			return res, nil
		}
		n *= refineRatio
	}
	if len(res.Levels) == 0 {
		return Result{}, fmt.Errorf("%w: MaxCells %d is too small for one grid", ErrNotConverged, maxCells)
	}
	return res, fmt.Errorf("%w (estimate %.2g, tolerance %.2g, %d nodes)", ErrNotConverged, res.ErrorEstimate, tol, res.Cells)
}

// solveGrid finds C and C0 on one grid, the two solves running in parallel,
// each in its own working memory ws[0] and ws[1].
func solveGrid(g *grid, er float64, homogeneous bool, etol float64, ws [2]*scratch, prev *grid, prevPhi, prevPhiAir []float64) (LevelResult, []float64, []float64, error) {
	type out struct {
		c   float64
		phi []float64
		it  int
		err error
	}
	run := func(vacuum bool, start []float64, w *scratch) out {
		w.reset(len(g.label))
		s := newSystem(g, vacuum, w)
		var phi []float64
		if prev != nil && start != nil {
			phi = interpolate(prev, start, g)
		} else {
			phi = make([]float64, len(g.label))
		}
		it, err := s.solve(phi, etol, 20*(g.nx()+g.ny())+1000)
		return out{c: 2 * physical.Eps0 * s.energy(phi), phi: phi, it: it, err: err}
	}
	var diel, air out
	if homogeneous {
		diel = run(false, prevPhi, ws[0])
		air = out{c: diel.c / er, phi: diel.phi}
	} else {
		var wg sync.WaitGroup
		wg.Add(1)
		go func() {
			defer wg.Done()
			air = run(true, prevPhiAir, ws[1])
		}()
		diel = run(false, prevPhi, ws[0])
		wg.Wait()
	}
	for _, o := range []out{diel, air} {
		if o.err != nil {
			return LevelResult{}, nil, nil, o.err
		}
	}
	lr := LevelResult{Cells: len(g.label), C: diel.c, CAir: air.c, Iterations: max(diel.it, air.it)}
	lr.Z0, lr.EpsEff = lineParams(lr.C, lr.CAir)
	return lr, diel.phi, air.phi, nil
}

func lineParams(c, cAir float64) (z0, epsEff float64) {
	return 1 / (physical.C0 * math.Sqrt(c*cAir)), c / cAir
}

// boxError estimates the relative error of Z0 due to the grounded box, by
// solving the coarsest grid in the standard box and in one of half the size:
// the stray field of a line over a ground plane falls off as a dipole's, so
// the box's effect on C scales as 1/size² and the standard box's error is a
// third of the difference. For stripline the lateral field decays
// exponentially and the same estimate is a generous bound.
// z0 is the coarsest grid's answer in the standard box, which Solve has
// already computed as its first level on grid g with the potentials phi
// and phiAir; those start the solves in the smaller box, which differs
// from them mainly near its walls.
func boxError(cs CrossSection, homogeneous bool, etol float64, ws [2]*scratch, z0 float64, g *grid, phi, phiAir []float64) (float64, error) {
	l := newLayout(cs, 0.5)
	small := newGrid(&l, startDensity)
	lr, _, _, err := solveGrid(small, cs.Er, homogeneous, etol, ws, g, phi, phiAir)
	if err != nil {
		return 0, fmt.Errorf("fieldsolve: box estimate: %w", err)
	}
	return math.Abs(lr.Z0-z0) / z0 / 3, nil
}

// extrapolate fills the answer from the levels solved so far.
func (r *Result) extrapolate(box float64) {
	lv := r.Levels
	last := lv[len(lv)-1]
	r.Cells = last.Cells
	r.BoxError = box
	c, ec, pc := richardson(lv, func(l LevelResult) float64 { return l.C })
	ca, eca, pa := richardson(lv, func(l LevelResult) float64 { return l.CAir })
	r.C, r.CAir, r.Order = c, ca, pc
	r.trusted = asymptotic(pc) && asymptotic(pa)
	r.Z0, r.EpsEff = lineParams(c, ca)
	r.ErrorEstimate = 0.5*(ec+eca) + box
}

// richardson extrapolates the last three values of a grid sequence refined
// by refineRatio, with the observed order p capped at formalOrder. It returns the extrapolated
// value, its estimated relative error (the size of the extrapolation step)
// and the observed p. With fewer than three levels, or a sequence that does not converge
// monotonically, it returns the finest value and an error estimate from the
// last change alone, taken as first order (conservative).
func richardson(lv []LevelResult, f func(LevelResult) float64) (value, relErr, order float64) {
	n := len(lv)
	fn := f(lv[n-1])
	if n < 2 {
		return fn, math.Inf(1), 0
	}
	d1 := fn - f(lv[n-2])
	if d1 == 0 {
		return fn, 0, math.Inf(1)
	}
	conservative := math.Abs(d1) / (refineRatio - 1) / math.Abs(fn)
	if n < 3 {
		return fn, conservative, 0
	}
	d0 := f(lv[n-2]) - f(lv[n-3])
	if d0 == 0 || d0*d1 < 0 || math.Abs(d1) >= math.Abs(d0) {
		return fn, conservative, 0
	}
	p := math.Log(math.Abs(d0/d1)) / math.Log(refineRatio)
	// Cap the order at 2, the formal order of the five-point scheme: a
	// faster observed convergence is pre-asymptotic luck, and the cap
	// makes the step, and so the error estimate, larger (Roache 1998).
	step := d1 / (math.Pow(refineRatio, math.Min(p, formalOrder)) - 1)
	v := fn + step
	return v, math.Abs(step) / math.Abs(v), p
}

// asymptotic reports whether an observed order is close enough to the
// formal order for the three-level estimate to be trusted.
func asymptotic(p float64) bool { return p >= 0.5*formalOrder && p <= 1.5*formalOrder }
