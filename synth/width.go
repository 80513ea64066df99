package synth

import (
	"errors"
	"fmt"
	"math"

	"stubcraft/physical"
)

// LineMaker makes the line model of a strip of the given width (m) on a
// substrate; physical.MicrostripMaker is the closed-form one.
type LineMaker = physical.LineMaker

// Width limits searched by WidthWith.
const (
	MinWidth         = 1e-6 // narrowest strip considered, m
	MaxWidthOverH    = 100  // widest strip considered, in dielectric heights
	widthRelTol      = 1e-10
	widthZ0RelTol    = 1e-9 // stop as soon as Z0 is this close to the target
	widthMaxEvals    = 100
	widthFirstStepLn = 0.1 // first bracketing step, in ln(width)
)

// ErrImpedanceRange is wrapped by the error of a target impedance that no
// strip between MinWidth and MaxWidthOverH·h reaches.
var ErrImpedanceRange = errors.New("impedance out of reach")

// WidthResult is a synthesised strip.
type WidthResult struct {
	Width  float64            // strip width, m
	Model  physical.LineModel // the line model at that width
	Params physical.LineParams
	// Z0Static and EpsEffStatic are the model's quasi-static values.
	Z0Static, EpsEffStatic float64
	// Warnings are the model's warnings at the synthesis frequency.
	Warnings []string
}

// Width returns the microstrip width on sub whose Hammerstad-Jensen +
// Kirschning-Jansen impedance at freq (Hz; 0 for the static impedance) is
// z0 (ohm), copper thickness and dispersion included.
func Width(sub physical.Substrate, z0, freq float64) (WidthResult, error) {
	return WidthWith(physical.MicrostripMaker, sub, z0, freq)
}

// WidthWith returns the width whose line, as made by mk, has impedance z0
// (ohm) at freq (Hz). For a numerical model (ApproximateModel, the field
// solver's) it searches with the closed form as a map, see widthMapped;
// if that does not settle, and for every other model, it starts from the Hammerstad synthesis formula
// (StartWidth), brackets the root in ln(width) and closes it with Brent's
// method until the width is known to 1e-10 or Z0 matches to 1e-9, both
// relative. The impedance must fall with width, as it does for every
// printed line. A target that needs a strip narrower than MinWidth or
// wider than MaxWidthOverH dielectric heights is an error wrapping
// ErrImpedanceRange.
func WidthWith(mk LineMaker, sub physical.Substrate, z0, freq float64) (WidthResult, error) {
	if !(z0 > 0) || math.IsInf(z0, 0) {
		return WidthResult{}, fmt.Errorf("width synthesis: target impedance must be positive and finite, got %g Ω", z0)
	}
	if !(freq >= 0) || math.IsInf(freq, 0) {
		return WidthResult{}, fmt.Errorf("width synthesis: frequency must be zero or positive and finite, got %g Hz", freq)
	}
	if !(sub.Height > 0) {
		return WidthResult{}, fmt.Errorf("width synthesis: dielectric height must be positive, got %g m", sub.Height)
	}
	r, ok, err := widthMapped(mk, sub, z0, freq)
	if !ok && err == nil {
		r, err = widthBracketed(mk, sub, z0, freq)
	}
	if err != nil {
		return r, err
	}
	if ms, closed := r.Model.(*physical.MicrostripModel); closed && ms.ThinStrip() {
		return WidthResult{}, fmt.Errorf("%w: the %g Ω line would be %.3g µm wide on %.3g µm copper, narrower than thick, where the Hammerstad-Jensen thickness correction does not hold; use a lower impedance, thinner copper, or a stackup with [mask] so that the field solver sizes the strip",
			ErrThinStrip, z0, r.Width*1e6, sub.CopperThickness*1e6)
	}
	return r, nil
}

// ErrThinStrip is wrapped by the refusal to size with the closed forms a
// strip narrower than its copper is thick.
var ErrThinStrip = errors.New("strip narrower than its copper is thick")

// widthBracketed is WidthWith's bracketing search: from the Hammerstad
// start width, out to a bracket in ln(width), closed by Brent's method.
func widthBracketed(mk LineMaker, sub physical.Substrate, z0, freq float64) (WidthResult, error) {
	s := widthSearch{mk: mk, sub: sub, z0: z0, freq: freq}
	lnMin, lnMax := math.Log(MinWidth), math.Log(MaxWidthOverH*sub.Height)
	if lnMin >= lnMax {
		return WidthResult{}, fmt.Errorf("width synthesis: dielectric height %g m is too thin for a %g m strip", sub.Height, MinWidth)
	}
	x0 := math.Log(StartWidth(sub.Er, sub.Height, z0))
	x0 = math.Min(math.Max(x0, lnMin), lnMax)
	a, fa, b, fb, err := s.bracket(x0, lnMin, lnMax)
	if err != nil {
		return WidthResult{}, err
	}
	if fa != 0 && fb != 0 && s.bestErr > widthZ0RelTol*z0 {
		if _, err := brent(s.eval, a, b, fa, fb, widthRelTol, widthMaxEvals); err != nil {
			return WidthResult{}, err
		}
	}
	m := s.bestModel
	zs, es := m.Static()
	return WidthResult{
		Width:        s.bestWidth,
		Model:        m,
		Params:       s.bestParams,
		Z0Static:     zs,
		EpsEffStatic: es,
		Warnings:     m.Warnings(freq),
	}, nil
}

// widthSearch evaluates Z0(width) − z0 and remembers the best model seen.
type widthSearch struct {
	mk       LineMaker
	sub      physical.Substrate
	z0, freq float64

	bestErr    float64
	bestWidth  float64
	bestModel  physical.LineModel
	bestParams physical.LineParams
}

// eval returns Z0(e^x) − z0, where e^x is the width.
func (s *widthSearch) eval(x float64) (float64, error) {
	w := math.Exp(x)
	m, err := s.mk(w, s.sub)
	if err != nil {
		return 0, fmt.Errorf("width synthesis: %w", err)
	}
	p := m.At(s.freq)
	d := p.Z0 - s.z0
	if math.IsNaN(d) {
		return 0, fmt.Errorf("width synthesis: the %s model gives no impedance for a %g m strip at %g Hz", m.Name(), w, s.freq)
	}
	if s.bestModel == nil || math.Abs(d) < s.bestErr {
		s.bestErr, s.bestWidth, s.bestModel, s.bestParams = math.Abs(d), w, m, p
	}
	return d, nil
}

// bracket finds a < b in [lnMin, lnMax] with eval(a) ≥ 0 ≥ eval(b),
// stepping out from x0 by doubling steps.
func (s *widthSearch) bracket(x0, lnMin, lnMax float64) (a, fa, b, fb float64, err error) {
	f0, err := s.eval(x0)
	if err != nil || f0 == 0 {
		return x0, f0, x0, f0, err
	}
	step := widthFirstStepLn
	if f0 > 0 { // impedance too high: widen
		a, fa = x0, f0
		for {
			b = math.Min(a+step, lnMax)
			if fb, err = s.eval(b); err != nil || fb <= 0 {
				return a, fa, b, fb, err
			}
			if b == lnMax {
				return 0, 0, 0, 0, s.outOfReach(true, fb)
			}
			a, fa, step = b, fb, 2*step
		}
	}
	b, fb = x0, f0 // impedance too low: narrow
	for {
		a = math.Max(b-step, lnMin)
		if fa, err = s.eval(a); err != nil || fa >= 0 {
			return a, fa, b, fb, err
		}
		if a == lnMin {
			return 0, 0, 0, 0, s.outOfReach(false, fa)
		}
		b, fb, step = a, fa, 2*step
	}
}

// outOfReach explains a target beyond the width limits; d is Z0 − z0 at
// the limit reached.
func (s *widthSearch) outOfReach(wide bool, d float64) error {
	where := fmt.Sprintf("εr %g, h %.4g mm", s.sub.Er, s.sub.Height*1e3)
	if wide {
		return fmt.Errorf("%w: %.4g Ω needs a strip wider than %d dielectric heights (%.4g mm) on this stackup (%s); that width gives %.4g Ω",
			ErrImpedanceRange, s.z0, MaxWidthOverH, MaxWidthOverH*s.sub.Height*1e3, where, s.z0+d)
	}
	return fmt.Errorf("%w: %.4g Ω needs a strip narrower than 1 µm on this stackup (%s); 1 µm gives only %.4g Ω",
		ErrImpedanceRange, s.z0, where, s.z0+d)
}

// StartWidth is the Hammerstad synthesis formula for a zero-thickness
// microstrip of impedance z0 on a dielectric of relative permittivity er
// and height h (E. O. Hammerstad, "Equations for microstrip circuit
// design", Proc. 5th European Microwave Conf., 1975; D. M. Pozar,
// Microwave Engineering 4th ed., eq. 3.197), used as the starting width:
//
//	W/h = 8e^A/(e^2A − 2)                                          for W/h < 2,
//	W/h = (2/π)[B − 1 − ln(2B−1) + (εr−1)/(2εr)(ln(B−1) + 0.39 − 0.61/εr)] otherwise,
//
// with A = (z0/60)√((εr+1)/2) + (εr−1)/(εr+1)(0.23 + 0.11/εr) and
// B = 377π/(2 z0 √εr). It returns h where the formula fails.
func StartWidth(er, h, z0 float64) float64 {
	a := z0/60*math.Sqrt((er+1)/2) + (er-1)/(er+1)*(0.23+0.11/er)
	u := 8 * math.Exp(a) / (math.Exp(2*a) - 2)
	if !(u > 0 && u < 2) {
		b := 377 * math.Pi / (2 * z0 * math.Sqrt(er))
		u = 2 / math.Pi * (b - 1 - math.Log(2*b-1) + (er-1)/(2*er)*(math.Log(b-1)+0.39-0.61/er))
	}
	if !(u > 0) || math.IsInf(u, 0) {
		return h
	}
	return u * h
}
