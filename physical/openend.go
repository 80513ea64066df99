package physical

import (
	"fmt"
	"math"
)

// OpenEndExtension returns the equivalent length extension Δl (m) of the
// open end of a microstrip line of width w (m) on a substrate of height h
// (m) and relative permittivity er, whose effective permittivity at freq
// (Hz) is epsEff. The fringing field at the end stores charge as a line
// Δl longer would; a stub drawn Δl shorter than its electrical length
// resonates where the electrical length says.
//
// The model is Kirschning, Jansen and Koster, "Accurate model for open end
// effect of microstrip lines", Electronics Letters 17(3), 1981, with
// u = w/h and εeff taken at the working frequency to carry dispersion:
//
//	ξ1 = 0.434907·(εeff^0.81 + 0.26)/(εeff^0.81 − 0.189)·(u^0.8544 + 0.236)/(u^0.8544 + 0.87)
//	ξ2 = 1 + u^0.371/(2.358·εr + 1)
//	ξ3 = 1 + 0.5274·atan(0.084·u^(1.9413/ξ2))/εeff^0.9236
//	ξ4 = 1 + 0.0377·atan(0.067·u^1.456)·(6 − 5·exp(0.036·(1 − εr)))
//	ξ5 = 1 − 0.218·exp(−7.5·u)
//	Δl/h = ξ1·ξ3·ξ5/ξ4
//
// The coefficients are as the authors published them, recalled from
// memory. The validity range the authors give (from memory) is
// 0.01 ≤ u ≤ 100 and εr ≤ 50; εeff(f) is only as good as the dispersion
// model behind it, taken here as h/λ0 ≤ 0.13 (from memory: the range of
// the Kirschning-Jansen εeff(f) formula). warnings lists each way in which the call leaves that range; the
// value is still returned.
func OpenEndExtension(w, h, er, epsEff, freq float64) (dl float64, warnings []string) {
	u := w / h
	if u < 0.01 || u > 100 {
		warnings = append(warnings, fmt.Sprintf("open end: w/h = %.4g outside the Kirschning-Jansen-Koster range 0.01 to 100", u))
	}
	if er > 50 {
		warnings = append(warnings, fmt.Sprintf("open end: εr = %.4g above the Kirschning-Jansen-Koster range (≤ 50)", er))
	}
	if r := h * freq / C0; r > 0.13 {
		warnings = append(warnings, fmt.Sprintf("open end: h/λ0 = %.3g above the dispersion range (≤ 0.13)", r))
	}
	e81 := math.Pow(epsEff, 0.81)
	u8544 := math.Pow(u, 0.8544)
	x1 := 0.434907 * (e81 + 0.26) / (e81 - 0.189) * (u8544 + 0.236) / (u8544 + 0.87)
	x2 := 1 + math.Pow(u, 0.371)/(2.358*er+1)
	x3 := 1 + 0.5274*math.Atan(0.084*math.Pow(u, 1.9413/x2))/math.Pow(epsEff, 0.9236)
	x4 := 1 + 0.0377*math.Atan(0.067*math.Pow(u, 1.456))*(6-5*math.Exp(0.036*(1-er)))
	x5 := 1 - 0.218*math.Exp(-7.5*u)
	return h * x1 * x3 * x5 / x4, warnings
}

// OpenEndHammerstad returns the open-end length extension (m) of
// Hammerstad, "Equations for microstrip circuit design", Proc. 5th European
// Microwave Conference, 1975:
//
//	Δl = 0.412·h·(εeff + 0.3)/(εeff − 0.258)·(u + 0.264)/(u + 0.8), u = w/h.
//
// It is a static formula, simpler and less accurate than OpenEndExtension,
// and is kept as its cross-check.
func OpenEndHammerstad(w, h, epsEff float64) float64 {
	u := w / h
	return 0.412 * h * (epsEff + 0.3) / (epsEff - 0.258) * (u + 0.264) / (u + 0.8)
}
