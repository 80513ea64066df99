package synth

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"stubcraft/physical/units"
)

// Circuit is a load model: a resistance with a capacitance, an inductance
// or both, all in series or all in parallel.
type Circuit int

// The load models the Bode-Fano limit is known for in closed form. The
// three-element ones are a resonance (an antenna near it): each reactive
// element brings its own constraint of the two-element circuit it shares
// with R, and both hold.
const (
	SeriesRC Circuit = iota + 1
	ParallelRC
	SeriesRL
	ParallelRL
	SeriesRLC
	ParallelRLC
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
	case SeriesRLC:
		return "series RLC"
	case ParallelRLC:
		return "parallel RLC"
	}
	return "Circuit(" + strconv.Itoa(int(c)) + ")"
}

// RLC is a load model: R with C (farad), L (henry) or both, in series or
// in parallel as Circuit says. An unused element is zero.
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
	case SeriesRLC:
		return r + complex(0, w*m.L-1/(w*m.C)), nil
	case ParallelRLC:
		return 1 / (1/r + complex(0, w*m.C-1/(w*m.L))), nil
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
// so, with ω = 2πf, Γm = exp(−π/(RC·Δω)) and so on. A low-Q load over a
// narrow band gives a Γm that underflows to 0; BodeFanoS11DB stays finite.
func (m RLC) BodeFanoGamma(f1, f2 float64) float64 {
	return math.Exp(-m.bodeFanoExponent(f1, f2))
}

// BodeFanoS11DB returns BodeFanoGamma in dB, computed from its exponent so
// that it is finite however low the limit is.
func (m RLC) BodeFanoS11DB(f1, f2 float64) float64 {
	return -20 / math.Ln10 * m.bodeFanoExponent(f1, f2)
}

// bodeFanoExponent returns a with Γm = exp(−a): each of Fano's bounds
// divided by the band's width in ω (or in 1/ω for the weighted forms), the
// smaller where two apply (a three-element load).
func (m RLC) bodeFanoExponent(f1, f2 float64) float64 {
	w1, w2 := 2*math.Pi*f1, 2*math.Pi*f2
	plain, weighted := m.FanoBounds()
	return math.Min(plain/(w2-w1), weighted/(1/w1-1/w2))
}

// FanoBounds returns the bounds of both of Fano's integrals for this load:
// plain, of ∫ ln(1/|Γ|) dω (rad/s), and weighted, of ∫ ω⁻² ln(1/|Γ|) dω
// (s); +Inf where the load sets none. A series L bounds the plain integral
// by πR/L and a series C the weighted one by πRC; a parallel C bounds the
// plain one by π/(RC) and a parallel L the weighted one by πL/R (Fano
// 1950: one constraint per zero of transmission of the load's reactive
// part, the series L's at infinite frequency and the series C's at zero;
// Pozar 4th ed. §5.9, from memory). A series RLC thus carries the bounds of
// its RL and its RC.
func (m RLC) FanoBounds() (plain, weighted float64) {
	plain, weighted = math.Inf(1), math.Inf(1)
	switch m.Circuit {
	case ParallelRC:
		plain = math.Pi / (m.R * m.C)
	case SeriesRL:
		plain = math.Pi * m.R / m.L
	case SeriesRC:
		weighted = math.Pi * m.R * m.C
	case ParallelRL:
		weighted = math.Pi * m.L / m.R
	case SeriesRLC:
		plain, weighted = math.Pi*m.R/m.L, math.Pi*m.R*m.C
	case ParallelRLC:
		plain, weighted = math.Pi/(m.R*m.C), math.Pi*m.L/m.R
	default:
		return math.NaN(), math.NaN()
	}
	return plain, weighted
}

// FanoIntegral returns the bound of Fano's integral for a two-element
// load: π/(RC) or πR/L for the ∫ ln(1/|Γ|) dω forms (rad/s), πRC or πL/R
// for the ∫ ω⁻² ln(1/|Γ|) dω forms (s); weighted says which form applies.
// A three-element load has both (FanoBounds); this returns the plain one.
func (m RLC) FanoIntegral() (bound float64, weighted bool) {
	plain, w := m.FanoBounds()
	if math.IsInf(plain, 1) {
		return w, true
	}
	return plain, false
}

// LoadFit is a two- or three-element model fitted to a load across a
// band, and how well it fits.
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
	switch f.Model.Circuit {
	case SeriesRL, ParallelRL:
		el = fmt.Sprintf("L = %.4g nH", f.Model.L*1e9)
	case SeriesRLC, ParallelRLC:
		el = fmt.Sprintf("L = %.4g nH, C = %.4g pF", f.Model.L*1e9, f.Model.C*1e12)
	}
	return fmt.Sprintf("%s, R = %.4g ohm, %s (worst misfit %.2g %% of |Z| across the band)", f.Model.Circuit, f.Model.R, el, 100*f.MaxRelErr)
}

// MaxFitMisfit is the worst misfit of a load fit, as a fraction of |Z|
// across the band, on which a Bode-Fano limit is still quoted. The
// limit's exponent is proportional to a fitted reactive element, so a fit
// within 5 % gives the limit in dB to about as much; a worse fit means the
// load is none of the circuits over the band, and a limit of the fitted
// one would say nothing about the load (a judgement, no source).
const MaxFitMisfit = 0.05

// BodeFanoFloorDB is the lowest limit printed as a figure: a limit below
// it is reported as "below −60 dB" (common practice, no source: no board
// holds, nor a bench measures, a return loss beyond 60 dB across a band,
// so a lower limit constrains no goal a board is built for; the figures
// of a low-Q load over a narrow band run to −1000 dB and mean nothing).
const BodeFanoFloorDB = -60.0

// LimitStatus says what a BodeFanoLimit can tell.
type LimitStatus int

// The outcomes of a Bode-Fano limit.
const (
	// LimitQuoted: a good fit and a limit at or above BodeFanoFloorDB.
	LimitQuoted LimitStatus = iota + 1
	// LimitBelowFloor: a good fit whose limit lies below BodeFanoFloorDB.
	LimitBelowFloor
	// LimitPoorFit: no circuit fits the load within MaxFitMisfit, or none
	// fits at all; no limit is quoted.
	LimitPoorFit
	// LimitNoReactance: the load is a resistance across the band; nothing
	// limits its match.
	LimitNoReactance
)

// String names the status as report.json writes it.
func (s LimitStatus) String() string {
	switch s {
	case LimitQuoted:
		return "quoted"
	case LimitBelowFloor:
		return "below_floor"
	case LimitPoorFit:
		return "poor_fit"
	case LimitNoReactance:
		return "no_reactance"
	}
	return "LimitStatus(" + strconv.Itoa(int(s)) + ")"
}

// BodeFanoLimit is the Bode-Fano limit of a load over a band as stubcraft
// reports it: the load fit it rests on, and a figure only where the
// fit holds and the figure means something.
type BodeFanoLimit struct {
	Fit    LoadFit
	Status LimitStatus
	// S11DB is the fitted circuit's limit, dB, for LimitQuoted and
	// LimitBelowFloor (finite however low); NaN otherwise.
	S11DB float64
	// Why says why no limit is quoted, for LimitPoorFit.
	Why string
}

// BodeFanoOf fits load across f1…f2 (Hz) with FitLoad at n points and
// returns its limit. A load no circuit fits gives LimitPoorFit with the
// reason, not an error: the limit is advice, and the build goes on.
func BodeFanoOf(load Load, f1, f2 float64, n int) BodeFanoLimit {
	fit, err := FitLoad(load, f1, f2, n)
	if err != nil {
		return BodeFanoLimit{Status: LimitPoorFit, S11DB: math.NaN(), Why: err.Error()}
	}
	out := BodeFanoLimit{Fit: fit, S11DB: math.NaN()}
	switch {
	case fit.Resistive:
		out.Status = LimitNoReactance
	case !(fit.MaxRelErr <= MaxFitMisfit):
		out.Status = LimitPoorFit
		out.Why = fmt.Sprintf("the best fit (%s) misses the load by %.2g %% of |Z| across the band, more than the %g %% a limit can rest on: over this band the load is no series or parallel RC, RL or RLC (a reactance that does not rise with frequency, as a fixed impedance over a wide band, is none)",
			fit.Model.Circuit, 100*fit.MaxRelErr, 100*MaxFitMisfit)
	default:
		out.S11DB = fit.Model.BodeFanoS11DB(f1, f2)
		out.Status = LimitQuoted
		if out.S11DB < BodeFanoFloorDB {
			out.Status = LimitBelowFloor
		}
	}
	return out
}

// FitText describes the fit the limit rests on: the circuit, its values
// and its misfit, or that no circuit fits.
func (b BodeFanoLimit) FitText() string {
	if b.Fit.Model.Circuit == 0 && !b.Fit.Resistive {
		return "no RC, RL or RLC circuit"
	}
	return b.Fit.String()
}

// FitCircuit names the fitted circuit: "series RC", …, "resistance" for
// a resistive load, or "" when no circuit fits.
func (b BodeFanoLimit) FitCircuit() string {
	switch {
	case b.Fit.Resistive:
		return "resistance"
	case b.Fit.Model.Circuit == 0:
		return ""
	}
	return b.Fit.Model.Circuit.String()
}

// Quoted returns the limit in dB and true when it is a figure worth
// printing (LimitQuoted).
func (b BodeFanoLimit) Quoted() (float64, bool) {
	return b.S11DB, b.Status == LimitQuoted
}

// Beyond reports whether a worst |S11| goal (dB) lies beyond the limit: no
// lossless network can hold it across the band.
func (b BodeFanoLimit) Beyond(goalDB float64) bool {
	return (b.Status == LimitQuoted || b.Status == LimitBelowFloor) && goalDB < b.S11DB
}

// Figure is the limit in a few words: "-12.34 dB", "below -60 dB", "not
// quoted" or "none".
func (b BodeFanoLimit) Figure() string {
	switch b.Status {
	case LimitQuoted:
		return fmt.Sprintf("%.2f dB", b.S11DB)
	case LimitBelowFloor:
		return fmt.Sprintf("below %g dB", BodeFanoFloorDB)
	case LimitNoReactance:
		return "none"
	}
	return "not quoted"
}

// String is the figure with what it rests on or why there is none.
func (b BodeFanoLimit) String() string {
	switch b.Status {
	case LimitQuoted:
		return b.Figure()
	case LimitBelowFloor:
		return b.Figure() + ": over this band the fitted load's reactance sets no practical limit"
	case LimitNoReactance:
		return "none: the load has no reactance across the band"
	}
	return "not quoted: " + b.Why
}

// FitLoad fits each of the four two-element circuits to load at n points
// across f1…f2 (Hz) by least squares and keeps the one with the smallest
// worst relative misfit; a series or parallel RLC replaces it only when it
// fits at least twice as well (fewer elements, fewer assumptions: a
// judgement, no source). A series model is fitted on the impedance
// (R = mean Re Z; X against −1/ω, ω or both), a parallel one on the
// admittance (G = mean Re Y; B against ω, −1/ω or both). A circuit whose
// fitted elements are not all positive is not considered.
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
	for _, c := range []Circuit{SeriesRC, ParallelRC, SeriesRL, ParallelRL, SeriesRLC, ParallelRLC} {
		m, ok := fitCircuit(c, fs, zs)
		if !ok {
			continue
		}
		worst := 0.0
		for i, f := range fs {
			zm, _ := m.Impedance(f)
			worst = math.Max(worst, cmplx.Abs(zm-zs[i])/cmplx.Abs(zs[i]))
		}
		better := worst < best.MaxRelErr
		if c == SeriesRLC || c == ParallelRLC {
			better = worst < best.MaxRelErr/2
		}
		if !found || better {
			best, found = LoadFit{Model: m, MaxRelErr: worst}, true
		}
	}
	if !found {
		return LoadFit{}, fmt.Errorf("fitting the load: no RC, RL or RLC circuit fits")
	}
	return best, nil
}

// fitCircuit fits circuit c to the samples by least squares on the
// reactive part; ok is false when a reactive element comes out not
// positive.
func fitCircuit(c Circuit, fs []float64, zs []complex128) (RLC, bool) {
	series := c == SeriesRC || c == SeriesRL || c == SeriesRLC
	// v is the fitted quantity (Z for series, Y for parallel); its
	// imaginary part is a·ω − b/ω, with a or b held at zero for a
	// two-element circuit. Normal equations of the two bases.
	useA := c != SeriesRC && c != ParallelRL
	useB := c != SeriesRL && c != ParallelRC
	var sumRe, saa, sab, sbb, sya, syb float64
	for i, f := range fs {
		w := 2 * math.Pi * f
		v := zs[i]
		if !series {
			v = 1 / v
		}
		sumRe += real(v)
		ba, bb := w, -1/w
		saa += ba * ba
		sab += ba * bb
		sbb += bb * bb
		sya += imag(v) * ba
		syb += imag(v) * bb
	}
	var a, b float64
	switch {
	case useA && useB:
		det := saa*sbb - sab*sab
		if !(det > 0) {
			return RLC{}, false
		}
		a, b = (sya*sbb-syb*sab)/det, (syb*saa-sya*sab)/det
	case useA:
		a = sya / saa
	default:
		b = syb / sbb
	}
	re := sumRe / float64(len(fs))
	if (useA && !(a > 0)) || (useB && !(b > 0)) || !(re > 0) {
		return RLC{}, false
	}
	m := RLC{Circuit: c, R: re}
	if !series {
		m.R = 1 / re
	}
	// Series: X = ωL − 1/(ωC), a = L, b = 1/C. Parallel: B = ωC − 1/(ωL),
	// a = C, b = 1/L.
	if series {
		if useA {
			m.L = a
		}
		if useB {
			m.C = 1 / b
		}
	} else {
		if useA {
			m.C = a
		}
		if useB {
			m.L = 1 / b
		}
	}
	return m, true
}
