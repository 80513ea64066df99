package physical

import (
	"fmt"
	"math"
)

// Step is a step in width between two microstrip lines, side A and side
// B, that share a centre line. Its model is the closed form of Gupta,
// Garg, Bahl and Bhartia, Microstrip Lines and Slotlines, 2nd ed., Artech
// House 1996, §3.5 (after Garg and Bahl, "Microstrip discontinuities",
// International Journal of Electronics, 1978), recalled from memory:
// the wide line (width W1) and the narrow one (W2) meet through a series
// inductance on each side and a shunt capacitance at the junction,
//
//	Cs/√(W1·W2) [pF/m] = (10.1·log εr + 2.33)·W1/W2 − 12.6·log εr − 3.17   εr ≤ 10, 1.5 ≤ W1/W2 ≤ 3.5
//	Cs/√(W1·W2) [pF/m] = 130·log(W1/W2) − 44                                εr = 9.6, 3.5 ≤ W1/W2 ≤ 10
//	Ls/h [nH/m]        = 40.5·(W1/W2 − 1) − 75·log(W1/W2) + 0.2·(W1/W2 − 1)²
//	Lw1 = Ls·L1'/(L1' + L2'),  Lw2 = Ls·L2'/(L1' + L2'),  Li' = Zi·√εeff_i/c0
//
// with log the common logarithm and Li' the inductance per unit length of
// each line. The capacitance formula is a fit over 1.5 ≤ W1/W2; below 1.5
// (down to the exact limit of no step at W1 = W2, where there is no
// discontinuity) the capacitance is taken linearly from 0 at W1/W2 = 1 to
// the fit's value at 1.5 (common practice, no source); the inductance
// formula is itself 0 at W1 = W2. Above W1/W2 = 3.5 the second form is
// used for any εr, with a warning.
//
// Checked 2026-12-04 (TestStepAgainstIndependentForms, DEVELOPERS.md
// "Width step"): units, logs, widths and sides match the forms above. On
// 1.6 → 4.8 mm, h 0.8 mm, εr 3.66 this gives Cs 38.2 fF and Ls 36.8 pH; a
// coarse FDTD gave about 285 fF and 200 pH. Cs lies below the wide line's
// whole open end (100.3 fF, Kirschning-Jansen-Koster), so the full-wave C
// is the doubtful figure. Ls is not settled: the planar-waveguide static
// inductance (Wolff, Kompa, Menzel), exact for W ≫ h, gives 133.5 pH, so
// Ls here is probably 3–4× low.
type Step struct {
	WA, WB           float64 // widths of side A and side B, m
	ZA, ZB           float64 // characteristic impedances, ohm
	EpsEffA, EpsEffB float64 // effective permittivities
	H                float64 // substrate height, m
	Er               float64 // substrate relative permittivity
}

// StepParams is the equivalent circuit of a Step: side A — LA — node (C
// to ground) — LB — side B. The values do not depend on frequency.
type StepParams struct {
	LA, LB   float64 // series inductances on sides A and B, H
	C        float64 // shunt capacitance at the junction, F
	Warnings []string
}

// Params returns the step's equivalent circuit.
func (s Step) Params() StepParams {
	w1, w2 := s.WA, s.WB
	z1, z2, e1, e2 := s.ZA, s.ZB, s.EpsEffA, s.EpsEffB
	wideA := true
	if w2 > w1 {
		w1, w2, z1, z2, e1, e2 = w2, w1, z2, z1, e2, e1
		wideA = false
	}
	var p StepParams
	if !(w2 > 0) || w1 == w2 {
		return p
	}
	r := w1 / w2
	lg := math.Log10(r)
	ler := math.Log10(s.Er)
	capFit := func(r float64) float64 {
		if r <= 3.5 {
			return (10.1*ler+2.33)*r - 12.6*ler - 3.17
		}
		return 130*math.Log10(r) - 44
	}
	cPerM := 0.0 // pF/m per √(W1·W2)
	switch {
	case r < 1.5:
		cPerM = capFit(1.5) * (r - 1) / 0.5
	default:
		cPerM = capFit(r)
	}
	if r > 3.5 && math.Abs(s.Er-9.6) > 0.5 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("width step %.2f:1 on εr %.3g: the step capacitance above 3.5:1 was fitted for εr = 9.6 only", r, s.Er))
	}
	if r > 10 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("width step %.2f:1 beyond the model's 10:1", r))
	}
	if s.Er > 10 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("width step on εr %.3g: the step capacitance was fitted for εr ≤ 10", s.Er))
	}
	p.C = math.Max(0, cPerM*1e-12*math.Sqrt(w1*w2))
	ls := s.H * 1e-9 * (40.5*(r-1) - 75*lg + 0.2*(r-1)*(r-1))
	ls = math.Max(0, ls)
	l1 := z1 * math.Sqrt(e1) / C0
	l2 := z2 * math.Sqrt(e2) / C0
	lw1, lw2 := ls*l1/(l1+l2), ls*l2/(l1+l2)
	if wideA {
		p.LA, p.LB = lw1, lw2
	} else {
		p.LA, p.LB = lw2, lw1
	}
	return p
}

// ABCD returns the chain matrix of the step from side A (port 1) to side
// B (port 2) at freq.
func (p StepParams) ABCD(freq float64) ABCD {
	w := 2 * math.Pi * freq
	return SeriesImpedance(complex(0, w*p.LA)).
		Mul(ShuntAdmittance(complex(0, w*p.C))).
		Mul(SeriesImpedance(complex(0, w*p.LB)))
}

// Lengths returns the lengths of line (m) by which each side should be
// shortened so that the drawn lines with the step behave, to first order
// in the parasitics, like ideal lines meeting without one: a series
// inductance L on a line of per-unit-length inductance L' is L/L' of that
// line, and the shunt capacitance is C/C'_wide of the wide line, whose
// end it mostly is (C' = √εeff/(Z·c0)).
func (p StepParams) Lengths(s Step) (dA, dB float64) {
	dA = p.LA / (s.ZA * math.Sqrt(s.EpsEffA) / C0)
	dB = p.LB / (s.ZB * math.Sqrt(s.EpsEffB) / C0)
	if s.WA >= s.WB {
		dA += p.C / (math.Sqrt(s.EpsEffA) / (s.ZA * C0))
	} else {
		dB += p.C / (math.Sqrt(s.EpsEffB) / (s.ZB * C0))
	}
	return dA, dB
}
