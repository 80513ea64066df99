package synth

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"stubcraft/physical/units"
)

// Circuit is a two-element load model: a resistance with a capacitance or
// an inductance, in series or in parallel.
type Circuit int

// The load models the Bode-Fano limit is known for in closed form.
const (
	SeriesRC Circuit = iota + 1
	ParallelRC
	SeriesRL
	ParallelRL
)

// String names the circuit as the report writes it.
func (c Circuit) String() string {
	switch c {
	case SeriesRC:
		return "series RC"
	case ParallelRC:
		return "parallel RC"
	case SeriesRL:
		return "series RL"
	case ParallelRL:
		return "parallel RL"
	}
	return "Circuit(" + strconv.Itoa(int(c)) + ")"
}

// RLC is a two-element load: R with C (farad) or L (henry), in series or
// in parallel as Circuit says. The unused element is zero.
type RLC struct {
	Circuit Circuit
	R, C, L float64 // ohm, F, H
}

// Impedance returns the model's impedance at freq (Hz).
func (m RLC) Impedance(freq float64) (complex128, error) {
	w := 2 * math.Pi * freq
	r := complex(m.R, 0)
	switch m.Circuit {
	case SeriesRC:
		return r + complex(0, -1/(w*m.C)), nil
	case SeriesRL:
		return r + complex(0, w*m.L), nil
	case ParallelRC:
		return 1 / (1/r + complex(0, w*m.C)), nil
	case ParallelRL:
		return 1 / (1/r + complex(0, -1/(w*m.L))), nil
	}
	return 0, fmt.Errorf("unknown load circuit %v", m.Circuit)
}

// BodeFanoGamma returns the least worst-case |Γ| that any lossless
// matching network can hold over the band f1…f2 (Hz) with this load,
// taking |Γ| constant in the band and 1 outside it in Fano's integral
// (Fano 1950; Pozar, Microwave Engineering 4th ed. §5.9, Fig. 5.23, from
// memory):
//
//	parallel RC: ∫ ln(1/|Γ|) dω ≤ π/(RC)
//	series RL:   ∫ ln(1/|Γ|) dω ≤ πR/L
//	series RC:   ∫ ω⁻² ln(1/|Γ|) dω ≤ πRC
//	parallel RL: ∫ ω⁻² ln(1/|Γ|) dω ≤ πL/R
//
// so, with ω = 2πf, Γm = exp(−π/(RC·Δω)) and so on.
func (m RLC) BodeFanoGamma(f1, f2 float64) float64 {
	w1, w2 := 2*math.Pi*f1, 2*math.Pi*f2
	dw, dinv := w2-w1, 1/w1-1/w2
	switch m.Circuit {
	case ParallelRC:
		return math.Exp(-math.Pi / (m.R * m.C * dw))
	case SeriesRL:
		return math.Exp(-math.Pi * m.R / (m.L * dw))
	case SeriesRC:
		return math.Exp(-math.Pi * m.R * m.C / dinv)
	case ParallelRL:
		return math.Exp(-math.Pi * m.L / m.R / dinv)
	}
	return math.NaN()
}

// FanoIntegral returns the bound of Fano's integral for this load: π/(RC)
// or πR/L for the ∫ ln(1/|Γ|) dω forms (rad/s), πRC or πL/R for the
// ∫ ω⁻² ln(1/|Γ|) dω forms (s); weighted says which form applies.
func (m RLC) FanoIntegral() (bound float64, weighted bool) {
	switch m.Circuit {
	case ParallelRC:
		return math.Pi / (m.R * m.C), false
	case SeriesRL:
		return math.Pi * m.R / m.L, false
	case SeriesRC:
		return math.Pi * m.R * m.C, true
	case ParallelRL:
		return math.Pi * m.L / m.R, true
	}
	return math.NaN(), false
}

// LoadFit is a two-element model fitted to a load across a band, and how
// well it fits.
type LoadFit struct {
	Model RLC
	// MaxRelErr is the largest |Z_model − Z_load| / |Z_load| over the
	// band samples.
	MaxRelErr float64
	// Resistive is true when the load has no reactance worth fitting (its
	// reactive part is below 1e-6 of its magnitude across the band); the
	// Bode-Fano limit is then 0.
	Resistive bool
}

// String says which model fits, with its values and how well.
func (f LoadFit) String() string {
	if f.Resistive {
		return fmt.Sprintf("a resistance of %.4g ohm (no reactance to limit the match)", f.Model.R)
	}
	el := fmt.Sprintf("C = %.4g pF", f.Model.C*1e12)
	if f.Model.Circuit == SeriesRL || f.Model.Circuit == ParallelRL {
		el = fmt.Sprintf("L = %.4g nH", f.Model.L*1e9)
	}
	return fmt.Sprintf("%s, R = %.4g ohm, %s (worst misfit %.2g %% of |Z| across the band)", f.Model.Circuit, f.Model.R, el, 100*f.MaxRelErr)
}

// BodeFanoGamma returns the fitted model's limit over f1…f2, or 0 for a
// resistive load.
func (f LoadFit) BodeFanoGamma(f1, f2 float64) float64 {
	if f.Resistive {
		return 0
	}
	return f.Model.BodeFanoGamma(f1, f2)
}

// FitLoad fits each of the four two-element circuits to load at n points
// across f1…f2 (Hz) by least squares and keeps the one with the smallest
// worst relative misfit. A series model is fitted on the impedance
// (R = mean Re Z; X against −1/ω or ω), a parallel one on the admittance
// (G = mean Re Y; B against ω or −1/ω). A circuit whose fitted element is
// not positive is not considered.
func FitLoad(load Load, f1, f2 float64, n int) (LoadFit, error) {
	if n < 2 {
		n = 2
	}
	if !(f1 > 0 && f2 > f1) {
		return LoadFit{}, fmt.Errorf("fitting the load: the band %g–%g Hz is not a positive increasing range", f1, f2)
	}
	fs := make([]float64, n)
	zs := make([]complex128, n)
	reactive := false
	for i := range fs {
		fs[i] = f1 + (f2-f1)*float64(i)/float64(n-1)
		z, err := load.Impedance(fs[i])
		if err != nil {
			return LoadFit{}, err
		}
		if cmplx.IsNaN(z) || cmplx.IsInf(z) || real(z) <= 0 {
			return LoadFit{}, fmt.Errorf("fitting the load: %s ohm at %.6g GHz is not a passive finite load with resistance", units.FormatImpedance(z), fs[i]/1e9)
		}
		zs[i] = z
		if math.Abs(imag(z)) > 1e-6*cmplx.Abs(z) {
			reactive = true
		}
	}
	if !reactive {
		sum := 0.0
		for _, z := range zs {
			sum += real(z)
		}
		return LoadFit{Model: RLC{R: sum / float64(n)}, Resistive: true}, nil
	}
	var best LoadFit
	found := false
	for _, c := range []Circuit{SeriesRC, ParallelRC, SeriesRL, ParallelRL} {
		m, ok := fitCircuit(c, fs, zs)
		if !ok {
			continue
		}
		worst := 0.0
		for i, f := range fs {
			zm, _ := m.Impedance(f)
			worst = math.Max(worst, cmplx.Abs(zm-zs[i])/cmplx.Abs(zs[i]))
		}
		if !found || worst < best.MaxRelErr {
			best, found = LoadFit{Model: m, MaxRelErr: worst}, true
		}
	}
	if !found {
		return LoadFit{}, fmt.Errorf("fitting the load: no two-element circuit fits")
	}
	return best, nil
}

// fitCircuit fits circuit c to the samples; ok is false when the reactive
// element comes out not positive.
func fitCircuit(c Circuit, fs []float64, zs []complex128) (RLC, bool) {
	series := c == SeriesRC || c == SeriesRL
	// v is the fitted quantity (Z for series, Y for parallel); the
	// imaginary part is k·basis(ω).
	var sumRe, num, den float64
	for i, f := range fs {
		w := 2 * math.Pi * f
		v := zs[i]
		if !series {
			v = 1 / v
		}
		sumRe += real(v)
		var basis float64
		switch c {
		case SeriesRC, ParallelRL:
			basis = -1 / w // X = −1/(ωC) or B = −1/(ωL)
		case SeriesRL, ParallelRC:
			basis = w // X = ωL or B = ωC
		}
		num += imag(v) * basis
		den += basis * basis
	}
	k := num / den
	re := sumRe / float64(len(fs))
	if !(k > 0) || !(re > 0) {
		return RLC{}, false
	}
	m := RLC{Circuit: c}
	switch c {
	case SeriesRC:
		m.R, m.C = re, 1/k
	case SeriesRL:
		m.R, m.L = re, k
	case ParallelRC:
		m.R, m.C = 1/re, k
	case ParallelRL:
		m.R, m.L = 1/re, 1/k
	}
	return m, true
}
