package synth

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"stubcraft/physical/units"
)

// DefaultStubSpacingDeg is the spacing of the two stubs of a double-stub
// match when a design does not choose one: 3λ/8 (135°), which leaves the
// forbidden region g > 1/sin²(βd) = 2 (Pozar 4th ed. §5.3, from memory:
// spacings near 0 or λ/2 make the region large, λ/4 makes it g > 1, and
// λ/8 or 3λ/8 are the usual choices).
const DefaultStubSpacingDeg = 135

// DoubleStubSolution is one double-stub match: a line of Z0 from the load
// to the first stub, LineDeg long, the first stub (Stub1Deg), a line of
// SpacingDeg to the second stub (Stub2Deg), all of impedance Z0, stubs
// terminated by End. Lengths are electrical, degrees; stub lengths lie in
// (0, 180].
type DoubleStubSolution struct {
	LineDeg, Stub1Deg, SpacingDeg, Stub2Deg float64
	End                                     StubEnd
	Z0                                      float64
}

// TotalDeg returns the stubs' and the spacing's electrical lengths added.
func (s DoubleStubSolution) TotalDeg() float64 {
	return s.LineDeg + s.Stub1Deg + s.SpacingDeg + s.Stub2Deg
}

// Sections returns the solution from the load toward the source.
func (s DoubleStubSolution) Sections() []Section {
	return []Section{
		{Kind: SeriesLine, Z0: s.Z0, LengthDeg: s.LineDeg},
		{Kind: ShuntStub, End: s.End, Z0: s.Z0, LengthDeg: s.Stub1Deg},
		{Kind: SeriesLine, Z0: s.Z0, LengthDeg: s.SpacingDeg},
		{Kind: ShuntStub, End: s.End, Z0: s.Z0, LengthDeg: s.Stub2Deg},
	}
}

// ErrForbiddenRegion is wrapped by a *ForbiddenRegionError.
var ErrForbiddenRegion = errors.New("the load lies in the forbidden region of the double-stub match")

// ForbiddenRegionError reports a load whose normalised conductance at the
// first stub exceeds 1/sin²(βd): no pair of stubs at spacing d can match
// it. FixLineDeg is the shortest line of z0 before the first stub (from
// the load, at least the line asked for) that brings it out of the region.
type ForbiddenRegionError struct {
	Load       complex128 // ohm
	G, GMax    float64    // normalised conductance at the first stub, and its limit
	SpacingDeg float64
	LineDeg    float64 // the line before the first stub that was asked for
	FixLineDeg float64 // a line before the first stub that works
}

func (e *ForbiddenRegionError) Error() string {
	return fmt.Sprintf("load %s ohm: %v: at the first stub (%.2f° from the load) its conductance is %.4g·Y0, above 1/sin²(%.1f°) = %.4g·Y0; fix: put %.2f° of line before the first stub",
		units.FormatImpedance(e.Load), ErrForbiddenRegion, e.LineDeg, e.G, e.SpacingDeg, e.GMax, e.FixLineDeg)
}

// Unwrap returns ErrForbiddenRegion.
func (e *ForbiddenRegionError) Unwrap() error { return ErrForbiddenRegion }

// forbiddenMargin places the conductance a fix line aims for: that
// fraction of the way from the line's least conductance (1/VSWR) up to the
// limit (common practice, no source: at the limit the two solutions merge
// and the stubs become very sensitive).
const forbiddenMargin = 0.9

// SolveDoubleStub returns the double-stub matches of zLoad to z0 with
// lineDeg of z0 line from the load to the first stub and the stubs
// spacingDeg apart, every line and stub of z0. There are usually two.
//
// Method (Pozar, Microwave Engineering 4th ed. §5.3, eqs. 5.22–5.23 as
// recalled, normalised to Y0 = 1): with y = g + jb the load admittance at
// the first stub and t = tan βd,
//
//	b1 = −b + (1 ± √((1+t²)·g − g²t²)) / t
//	b2 = (±√(g·(1+t²) − g²t²) + g) / (g·t)
//
// and the square root is real only for g ≤ (1+t²)/t² = 1/sin²βd. A load
// beyond it is refused with a *ForbiddenRegionError that names a line to
// put before the first stub. A spacing that is a multiple of 180° (t = 0 or
// ∞ in effect) is refused.
func SolveDoubleStub(zLoad complex128, z0, lineDeg, spacingDeg float64, end StubEnd) ([]DoubleStubSolution, error) {
	if !(z0 > 0) || math.IsInf(z0, 0) {
		return nil, fmt.Errorf("the reference impedance must be positive and finite, not %g ohm", z0)
	}
	if end != Open && end != Short {
		return nil, fmt.Errorf("the stub end must be open or short, not %v", end)
	}
	if cmplx.IsNaN(zLoad) || cmplx.IsInf(zLoad) || real(zLoad) < 0 {
		return nil, fmt.Errorf("load %s ohm: %w", units.FormatImpedance(zLoad), ErrBadLoad)
	}
	if gm, _, _ := LoadReport(zLoad, z0); real(zLoad) == 0 || gm > 1-1e-12 {
		return nil, fmt.Errorf("load %s ohm: %w: it is purely reactive (|Γ| = 1)", units.FormatImpedance(zLoad), ErrUnmatchable)
	} else if gm < MatchedGamma {
		return nil, fmt.Errorf("load %s ohm on %g ohm: %w (|Γ| = %.2g), no stub is needed", units.FormatImpedance(zLoad), z0, ErrMatched, gm)
	}
	sd := math.Sin(spacingDeg * math.Pi / 180)
	if math.Abs(sd) < 1e-6 || lineDeg < 0 {
		return nil, fmt.Errorf("a double stub needs a stub spacing that is not a multiple of 180° (not %g°) and a line before the first stub of at least 0° (not %g°)", spacingDeg, lineDeg)
	}
	gMax := 1 / (sd * sd)
	y := doubleStubAdmittance(zLoad, z0, lineDeg)
	g, b := real(y), imag(y)
	if g > gMax*(1-1e-12) {
		// Along the line the conductance falls to 1/VSWR at the voltage
		// maximum; aim a little inside the allowed region.
		gm, _, _ := LoadReport(zLoad, z0)
		gMin := (1 - gm) / (1 + gm)
		target := gMin + forbiddenMargin*(gMax-gMin)
		return nil, &ForbiddenRegionError{Load: zLoad, G: g, GMax: gMax, SpacingDeg: spacingDeg,
			LineDeg: lineDeg, FixLineDeg: doubleStubFix(zLoad, z0, lineDeg, target)}
	}
	t := math.Tan(spacingDeg * math.Pi / 180)
	root := math.Sqrt(math.Max(0, (1+t*t)*g-g*g*t*t))
	var sols []DoubleStubSolution
	for _, sgn := range []float64{1, -1} {
		b1 := -b + (1+sgn*root)/t
		b2 := (sgn*root + g) / (g * t)
		s := DoubleStubSolution{
			LineDeg:    lineDeg,
			Stub1Deg:   matchStubDeg(b1/z0, z0, end),
			SpacingDeg: spacingDeg,
			Stub2Deg:   matchStubDeg(b2/z0, z0, end),
			End:        end,
			Z0:         z0,
		}
		if len(sols) == 1 && math.Abs(sols[0].Stub1Deg-s.Stub1Deg) < 1e-9 && math.Abs(sols[0].Stub2Deg-s.Stub2Deg) < 1e-9 {
			continue
		}
		sols = append(sols, s)
	}
	sort.SliceStable(sols, func(i, j int) bool { return sols[i].TotalDeg() < sols[j].TotalDeg() })
	return sols, nil
}

// doubleStubAdmittance returns the admittance, normalised to 1/z0, looking
// into lineDeg of z0 line ending in zLoad.
func doubleStubAdmittance(zLoad complex128, z0, lineDeg float64) complex128 {
	return matchLineAdmittance(zLoad, z0, lineDeg*math.Pi/180) * complex(z0, 0)
}

// doubleStubFix returns the shortest line at or beyond fromDeg (within
// half a wavelength more) whose normalised conductance is at most target:
// a scan in 0.25° steps, then bisection on the crossing.
func doubleStubFix(zLoad complex128, z0, fromDeg, target float64) float64 {
	g := func(d float64) float64 { return real(doubleStubAdmittance(zLoad, z0, d)) }
	const step = 0.25
	prev := fromDeg
	for d := fromDeg + step; d <= fromDeg+180; d += step {
		if g(d) <= target {
			lo, hi := prev, d
			for i := 0; i < 60; i++ {
				mid := (lo + hi) / 2
				if g(mid) <= target {
					hi = mid
				} else {
					lo = mid
				}
			}
			return hi
		}
		prev = d
	}
	// Unreachable: the conductance along the line falls to 1/VSWR, below
	// target, within half a wavelength.
	return math.NaN()
}
