package physical

import "fmt"

// Published validity ranges of the microstrip models (all from memory of
// the papers named on MicrostripModel).
const (
	hjMinU, hjMaxU = 0.01, 100.0 // Hammerstad-Jensen 1980, W/h
	hjMaxEr        = 128.0       // Hammerstad-Jensen 1980, εr
	kjMinU         = 0.1         // Kirschning-Jansen εeff(f) and Z0(f), W/h
	kjEpsMaxU      = 100.0       // Kirschning-Jansen 1982, W/h
	kjEpsMaxEr     = 20.0        // Kirschning-Jansen 1982, εr
	kjEpsMaxHLam   = 0.13        // Kirschning-Jansen 1982, h/λ0
	kjZMaxU        = 10.0        // Kirschning-Jansen Z0(f), W/h
	kjZMaxEr       = 18.0        // Kirschning-Jansen Z0(f), εr
	kjZMaxFH       = 15.0        // Kirschning-Jansen Z0(f), f·h in GHz·mm

	// kjZIllEr: below this εr (and above 1) the Kirschning-Jansen Z0(f)
	// form is ill-conditioned; found by sweeping the formula itself (no
	// published source).
	kjZIllEr = 1.1

	// thinSkinDepths: below this many skin depths of copper the
	// surface-resistance loss formula no longer holds (common practice, no
	// source).
	thinSkinDepths = 2.0
)

// Warnings lists the ways in which evaluating the line at freq (Hz) leaves
// the models' published ranges or assumptions, as sentences for a report;
// nil when it does not. At freq ≤ 0 only the static model is checked.
func (m *MicrostripModel) Warnings(freq float64) []string {
	var w []string
	u, er := m.u, m.er
	if u < hjMinU || u > hjMaxU {
		w = append(w, fmt.Sprintf("W/h = %.3g is outside %g–%g, the Hammerstad-Jensen static range", u, hjMinU, hjMaxU))
	}
	if er > hjMaxEr {
		w = append(w, fmt.Sprintf("εr = %.3g is above %g, the Hammerstad-Jensen static range", er, hjMaxEr))
	}
	if m.ThinStrip() {
		w = append(w, ThinStripWarning(m.ms.Width, m.t))
	}
	if sub := m.ms.Sub; sub.MaskThickness > 0 {
		w = append(w, fmt.Sprintf("the %.3g µm solder mask is ignored by the closed-form microstrip model; a field-solver model accounts for it", sub.MaskThickness*1e6))
	}
	if !(freq > 0) {
		return w
	}
	fh := freq * m.h * 1e-6 // GHz·mm
	switch {
	case u < kjMinU:
		w = append(w, fmt.Sprintf("W/h = %.3g is below %g, the Kirschning-Jansen dispersion range", u, kjMinU))
	case u > kjEpsMaxU:
		w = append(w, fmt.Sprintf("W/h = %.3g is above %g, the Kirschning-Jansen dispersion range", u, kjEpsMaxU))
	case u > kjZMaxU:
		w = append(w, fmt.Sprintf("W/h = %.3g is above %g, the Kirschning-Jansen impedance-dispersion range", u, kjZMaxU))
	}
	switch {
	case er > kjEpsMaxEr:
		w = append(w, fmt.Sprintf("εr = %.3g is above %g, the Kirschning-Jansen dispersion range", er, kjEpsMaxEr))
	case er > kjZMaxEr:
		w = append(w, fmt.Sprintf("εr = %.3g is above %g, the Kirschning-Jansen impedance-dispersion range", er, kjZMaxEr))
	}
	if er > 1 && er < kjZIllEr {
		w = append(w, fmt.Sprintf("εr = %.4g is so close to 1 that the Kirschning-Jansen impedance dispersion is ill-conditioned (its R13 and R14 terms pass through zero); Z0(f) is unreliable, and the static Z0 is used where the formula fails", er))
	}
	if hl := freq * m.h / C0; hl > kjEpsMaxHLam {
		w = append(w, fmt.Sprintf("h/λ0 = %.3g at %.4g GHz is above %g, the Kirschning-Jansen dispersion range", hl, freq/1e9, kjEpsMaxHLam))
	}
	if fh > kjZMaxFH {
		w = append(w, fmt.Sprintf("f·h = %.3g GHz·mm is above %g GHz·mm, the Kirschning-Jansen impedance-dispersion range", fh, kjZMaxFH))
	}
	if m.t > 0 {
		if d := SkinDepth(freq, m.sigma); m.t < thinSkinDepths*d {
			w = append(w, fmt.Sprintf("the %.3g µm copper is thinner than %g skin depths (δ = %.3g µm) at %.4g GHz; the skin-effect conductor loss is not accurate there", m.t*1e6, thinSkinDepths, d*1e6, freq/1e9))
		}
	}
	return w
}

// ThinStrip reports whether the strip is narrower than its copper is
// thick: the Hammerstad-Jensen thickness correction (a width increment
// for a strip wider than thick) does not hold there. For the 1.6 µm ×
// 70 µm strip on εr 10.2, h 0.1 mm the closed forms give 100 Ω where a 2-D
// field solve (physical/fieldsolve) gives about 85 Ω.
func (m *MicrostripModel) ThinStrip() bool { return m.t > 0 && m.ms.Width < m.t }

// ThinStripWarning is the warning for a strip of width w (m) on copper of
// thickness t (m) narrower than thick.
func ThinStripWarning(w, t float64) string {
	return fmt.Sprintf("the strip is %.3g µm wide on %.3g µm copper, narrower than thick: outside the Hammerstad-Jensen thickness correction, so Z0 may be off by 15 %% or more; size it with the field solver (xsect, or a stackup with [mask])", w*1e6, t*1e6)
}
