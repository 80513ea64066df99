package fieldsolve

import (
	"errors"
	"fmt"
	"math"
)

// SynthesizeWidth finds the strip width that gives the characteristic
// impedance z0 (ohm), all else in cs held fixed, by a bracketed secant
// search (the Illinois variant of regula falsi) on ln Z0 against ln W, each
// step a full Solve with opt. The search stops when Z0 is within half of
// the tolerance of the target. It returns the cross-section with that width
// and its result. cache may be nil.
func SynthesizeWidth(cs CrossSection, z0 float64, opt Options, cache *Cache) (CrossSection, Result, error) {
	if !(z0 > 0) || math.IsInf(z0, 0) {
		return cs, Result{}, fmt.Errorf("fieldsolve: target impedance %g Ω must be positive", z0)
	}
	tol := opt.Tolerance
	if tol == 0 {
		tol = DefaultTolerance
	}
	scale := cs.Height
	if cs.Geometry == Stripline {
		scale = cs.Spacing
	}
	if cs.Width <= 0 {
		cs.Width = scale
	}
	minW := 2*cs.Thickness*cs.etchTan()*1.001 + 1e-3*scale
	eval := func(w float64) (float64, Result, error) {
		c := cs
		c.Width = w
		r, err := cache.Solve(c, opt)
		if err != nil && !errors.Is(err, ErrNotConverged) {
			return 0, r, err
		}
		return math.Log(r.Z0 / z0), r, nil
	}
	// Bracket: Z0 falls as the width grows.
	lo, hi := math.Max(cs.Width, minW), math.Max(cs.Width, minW)
	flo, rlo, err := eval(lo)
	if err != nil {
		return cs, Result{}, fmt.Errorf("fieldsolve: width synthesis: %w", err)
	}
	fhi, rhi := flo, rlo
	for i := 0; flo*fhi > 0; i++ {
		if i == 30 {
			return cs, Result{}, fmt.Errorf("fieldsolve: no width between %g m and %g m gives %g Ω", lo, hi, z0)
		}
		if flo < 0 { // too wide: impedance low
			hi, fhi, rhi = lo, flo, rlo
			lo = math.Max(lo/2, minW)
			if flo, rlo, err = eval(lo); err != nil {
				return cs, Result{}, fmt.Errorf("fieldsolve: width synthesis: %w", err)
			}
			if lo == minW && flo < 0 {
				return cs, Result{}, fmt.Errorf("fieldsolve: %g Ω needs a strip narrower than the etch allows", z0)
			}
		} else {
			lo, flo, rlo = hi, fhi, rhi
			hi *= 2
			if fhi, rhi, err = eval(hi); err != nil {
				return cs, Result{}, fmt.Errorf("fieldsolve: width synthesis: %w", err)
			}
		}
	}
	// glo, ghi are the secant weights, halved on a stalled side (Illinois);
	// flo, fhi stay the true residuals.
	glo, ghi := flo, fhi
	best := func() (float64, Result, float64) {
		if math.Abs(flo) < math.Abs(fhi) {
			return lo, rlo, flo
		}
		return hi, rhi, fhi
	}
	side := 0
	for i := 0; i < 40 && hi/lo-1 > 1e-9; i++ {
		if w, r, f := best(); math.Abs(math.Expm1(f)) < tol/2 {
			cs.Width = w
			return cs, r, nil
		}
		x0, x1 := math.Log(lo), math.Log(hi)
		w := math.Exp(x1 - ghi*(x1-x0)/(ghi-glo))
		f, r, err := eval(w)
		if err != nil {
			return cs, Result{}, fmt.Errorf("fieldsolve: width synthesis: %w", err)
		}
		if f > 0 { // still too narrow: replaces lo
			lo, flo, rlo, glo = w, f, r, f
			if side == -1 {
				ghi /= 2
			}
			side = -1
		} else {
			hi, fhi, rhi, ghi = w, f, r, f
			if side == 1 {
				glo /= 2
			}
			side = 1
		}
	}
	w, r, _ := best()
	cs.Width = w
	return cs, r, nil
}
