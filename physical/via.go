package physical

import (
	"math"
	"math/cmplx"
)

// ViaInductance returns the inductance (H) of a cylindrical via of radius
// radius (m) through a substrate of height h (m) to the ground plane, by
// Goldfarb and Pucel, "Modeling via hole grounds in microstrip", IEEE
// Microwave and Guided Wave Letters 1(6), 1991:
//
//	L = (μ0/2π)·[h·ln((h + √(r² + h²))/r) + 1.5·(r − √(r² + h²))]
//
// The authors compare it with measurements for via heights and radii of
// typical thin-film and printed substrates (from memory: h/r roughly 1 to
// 10); it is a quasi-static inductance, valid while h is small against the
// wavelength.
func ViaInductance(h, radius float64) float64 {
	s := math.Hypot(radius, h)
	return Mu0 / (2 * math.Pi) * (h*math.Log((h+s)/radius) + 1.5*(radius-s))
}

// ViaResistance returns the resistance (ohm) at freq (Hz) of a solid
// cylindrical via of radius radius (m) and height h (m) in a metal of
// conductivity sigma (S/m), in the form Goldfarb and Pucel use (from
// memory), R = Rdc·√(1 + f/fδ), with Rdc = h/(σ·π·r²). The corner fδ is
// chosen here so that the high-frequency asymptote is the exact
// skin-effect resistance of the barrel, h·Rs/(2πr) with
// Rs = √(π·f·μ0/σ): fδ = 4/(π·μ0·σ·r²). Both limits are exact; the blend
// between them is an approximation.
func ViaResistance(h, radius, sigma, freq float64) float64 {
	rdc := h / (sigma * math.Pi * radius * radius)
	fd := 4 / (math.Pi * Mu0 * sigma * radius * radius)
	return rdc * math.Sqrt(1+freq/fd)
}

// ViaImpedance returns the series impedance R + jωL (ohm) of a via to
// ground at freq (Hz): ViaResistance plus ViaInductance.
func ViaImpedance(h, radius, sigma, freq float64) complex128 {
	w := 2 * math.Pi * freq
	return complex(ViaResistance(h, radius, sigma, freq), w*ViaInductance(h, radius))
}

// ViaPadCapacitance returns the capacitance (F) of a round via pad of
// radius padRadius (m) around a hole of radius holeRadius (m) over a ground
// plane at height h (m) in a dielectric of relative permittivity er. The
// pad is treated as a small lumped capacitance, not as a length of line:
// the parallel-plate capacitance of the annulus, ε0·εr·π·(rp² − rh²)/h,
// with no fringing, so it is a lower bound (common practice, no source).
func ViaPadCapacitance(padRadius, holeRadius, h, er float64) float64 {
	return Eps0 * er * math.Pi * (padRadius*padRadius - holeRadius*holeRadius) / h
}

// ViaToGround returns the impedance (ohm) from a via pad to ground at freq
// (Hz): the via's series R + jωL in parallel with the pad capacitance c
// (F), zVia being usually ViaImpedance. A zero c gives zVia itself.
func ViaToGround(zVia complex128, c, freq float64) complex128 {
	if zVia == 0 {
		return 0
	}
	y := 1/zVia + complex(0, 2*math.Pi*freq*c)
	if cmplx.Abs(y) == 0 {
		return cmplx.Inf()
	}
	return 1 / y
}
