package physical

import (
	"fmt"
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
// wavelength. The project's full-wave via column study (testdata/
// discontinuities/via-column.tsv, TestViaColumnConverges in this package;
// DEVELOPERS.md, "Via") holds the build's termination of one via (this
// inductance, the pad overhang) to the full-wave one within 0.2° of the
// strip at f·h ≈ 4 GHz·mm for h/r 4–5.3 (full-wave/model 0.96–1.05);
// below ViaMinHeightToRadius it overstates (ViaRangeWarning), and so does
// a row's model (ViaRowWarning).
func ViaInductance(h, radius float64) float64 {
	s := math.Hypot(radius, h)
	return Mu0 / (2 * math.Pi) * (h*math.Log((h+s)/radius) + 1.5*(radius-s))
}

// ViaMinHeightToRadius is the smallest substrate height to via radius at
// which the project's full-wave via study checked ViaInductance (see its
// doc comment).
const ViaMinHeightToRadius = 4.0

// ViaRangeWarning returns a warning when a via of radius radius (m)
// through a substrate of height h (m) lies outside what the full-wave via
// study checked (h/r below ViaMinHeightToRadius), or "" when it lies
// inside.
func ViaRangeWarning(h, radius float64) string {
	if hr := h / radius; hr < ViaMinHeightToRadius {
		return fmt.Sprintf("via of %.3g mm drill on %.3g mm: h/r = %.2g, below the %g down to which the Goldfarb-Pucel via model was checked full-wave; "+
			"at h/r 2 the full-wave via study found the model overstating the inductance (%s), which draws a shorted stub short",
			2*radius*1e3, h*1e3, hr, ViaMinHeightToRadius, viaFatFinding)
	}
	return ""
}

// viaFatFinding is the via column study's figure for its one fat via
// (h/r 2), quoted by ViaRangeWarning.
const viaFatFinding = "0.8 mm drill on 0.8 mm: 83 pH modelled against 36 pH full-wave at the finest drawing, about 16 pH extrapolated"

// ViaRowWarning returns a warning for a shorted stub that ends in a row of
// n > 1 vias, whose model (ViaRowImpedance) the full-wave via study found
// overstating the inductance; "" for one via.
func ViaRowWarning(n int) string {
	if n <= 1 {
		return ""
	}
	return "the full-wave via study found the model of a via row (Goldfarb-Pucel per via with the filament mutual inductance) overstating the row's inductance (" +
		viaRowFinding + "), which draws the shorted stub short: check it with verify"
}

// viaRowFinding is the via column study's figure for its via rows, quoted
// by ViaRowWarning.
const viaRowFinding = "a row of two 0.4 mm vias on 0.8 mm: 111 pH modelled against 84 pH full-wave at the finest drawing, about 75 pH extrapolated; a row of three on 1.6 mm: 268 pH against 201 pH, about 171 pH"

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

// ViaRowMinWidthRatio is the stub width, in via pads, above which a
// shorted stub ends in a row of vias rather than one: a stub wider than
// 1.5 pads gets at least two (common practice, no source).
const ViaRowMinWidthRatio = 1.5

// ViaRow returns how many vias end a shorted stub of width stubWidth (m)
// with vias of drill drill (m) and pads of diameter pad (m) at centre
// spacing at most pitch (m), and their actual centre spacing (m). A stub
// no wider than ViaRowMinWidthRatio pads, one whose two outer holes would
// touch, or a pitch that is not positive, gets one via (spacing 0). Otherwise the outer pads sit flush with the stub's sides
// and the vias between are spread evenly, as few as keep the spacing
// within pitch — unless that would bring neighbouring holes within a
// drill's width, when there are fewer.
func ViaRow(stubWidth, drill, pad, pitch float64) (n int, spacing float64) {
	span := stubWidth - pad
	if !(pitch > 0) || !(stubWidth > ViaRowMinWidthRatio*pad) || !(span > drill) {
		return 1, 0
	}
	n = int(math.Ceil(span/pitch-1e-9)) + 1
	if n < 2 {
		n = 2
	}
	// Holes never closer than a drill's width: fewer vias, wider spacing.
	for n > 2 && !(span/float64(n-1) > drill) {
		n--
	}
	return n, span / float64(n-1)
}

// FilamentMutualInductance returns the mutual inductance (H) of two
// parallel straight filaments of equal length h (m), side by side at
// distance d (m), from the Neumann integral in closed form as Grover gives
// it (Inductance Calculations, 1946; from memory):
//
//	M = (μ0/2π)·[h·ln(h/d + √(1 + h²/d²)) − √(h² + d²) + d]
//
// For d ≪ h it tends to (μ0·h/2π)·[ln(2h/d) − 1 + d/h]; for d ≫ h it
// falls as μ0·h²/(4π·d).
func FilamentMutualInductance(h, d float64) float64 {
	return Mu0 / (2 * math.Pi) * (h*math.Asinh(h/d) - math.Hypot(h, d) + d)
}

// ViaRowImpedance returns the series impedance (ohm) at freq (Hz) of n
// vias of radius radius (m) and height h (m) in a straight row at centre
// spacing spacing (m), all joined at both ends: each via is
// ViaImpedance, each pair is coupled by FilamentMutualInductance at their
// centre distance (the partial-inductance, or PEEC, view of the row), and
// the row is the exact parallel combination of that impedance matrix,
// 1/(1ᵀ·Z⁻¹·1). Treating the barrels as filaments for the mutual term is
// the approximation; it is good while the spacing is several radii. One
// via (n ≤ 1) is ViaImpedance itself.
func ViaRowImpedance(n int, spacing, h, radius, sigma, freq float64) complex128 {
	z1 := ViaImpedance(h, radius, sigma, freq)
	if n <= 1 {
		return z1
	}
	w := 2 * math.Pi * freq
	z := make([][]complex128, n)
	for i := range z {
		z[i] = make([]complex128, n+1)
		for j := 0; j < n; j++ {
			if i == j {
				z[i][j] = z1
				continue
			}
			d := spacing * math.Abs(float64(i-j))
			z[i][j] = complex(0, w*FilamentMutualInductance(h, d))
		}
		z[i][n] = 1 // right-hand side: unit voltage on every via
	}
	x, ok := solveComplex(z)
	if !ok {
		return z1 / complex(float64(n), 0)
	}
	var sum complex128
	for _, v := range x {
		sum += v
	}
	return 1 / sum
}

// solveComplex solves the augmented n×(n+1) system a by Gaussian
// elimination with partial pivoting, overwriting a. It reports false for a
// singular system.
func solveComplex(a [][]complex128) ([]complex128, bool) {
	n := len(a)
	for c := 0; c < n; c++ {
		p := c
		for r := c + 1; r < n; r++ {
			if cmplx.Abs(a[r][c]) > cmplx.Abs(a[p][c]) {
				p = r
			}
		}
		if cmplx.Abs(a[p][c]) == 0 {
			return nil, false
		}
		a[c], a[p] = a[p], a[c]
		for r := c + 1; r < n; r++ {
			f := a[r][c] / a[c][c]
			for k := c; k <= n; k++ {
				a[r][k] -= f * a[c][k]
			}
		}
	}
	x := make([]complex128, n)
	for r := n - 1; r >= 0; r-- {
		s := a[r][n]
		for k := r + 1; k < n; k++ {
			s -= a[r][k] * x[k]
		}
		x[r] = s / a[r][r]
	}
	return x, true
}
