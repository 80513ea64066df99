package physical

import "math"

// SkinDepth returns the skin depth δ = 1/√(πfμ0σ) (m) of a non-magnetic
// conductor of conductivity sigma (S/m) at freq (Hz).
func SkinDepth(freq, sigma float64) float64 {
	return 1 / math.Sqrt(math.Pi*freq*Mu0*sigma)
}

// SurfaceResistance returns the surface resistance Rs = √(πfμ0/σ) (ohm per
// square) of a non-magnetic conductor of conductivity sigma (S/m) at freq
// (Hz), valid when the conductor is several skin depths thick.
func SurfaceResistance(freq, sigma float64) float64 {
	return math.Sqrt(math.Pi * freq * Mu0 / sigma)
}

// RoughnessFactor returns the Hammerstad-Bekkadal factor by which surface
// roughness of RMS height rms raises conductor loss,
//
//	Kr = 1 + (2/π)·atan(1.4·(Δ/δ)²),
//
// for skin depth delta (E. Hammerstad and F. Bekkadal, Microstrip
// Handbook, ELAB report STF44 A74169, 1975, from memory). It is 1 for a
// smooth conductor and tends to 2 when Δ ≫ δ.
func RoughnessFactor(rms, delta float64) float64 {
	r := rms / delta
	return 1 + 2/math.Pi*math.Atan(1.4*r*r)
}

// initLoss computes the frequency-independent loss coefficients:
// Rs = rsK·√f, (Δ/δ)² = roughK·f and αd = adK·f.
func (m *MicrostripModel) initLoss() {
	sub := m.ms.Sub
	m.rsK = math.Sqrt(math.Pi * Mu0 / m.sigma)
	m.roughK = sub.Roughness * sub.Roughness * math.Pi * Mu0 * m.sigma
	// Filling factor q = (εeff−1)/(εr−1); at εr = 1 its limit (1 + X)/2,
	// X being the width term of the Hammerstad-Jensen εeff (no thickness
	// term: Δur = Δu1 there).
	var q float64
	if m.er > 1 {
		q = (m.e0 - 1) / (m.er - 1)
	} else {
		q = (1 + hjWidthTerm(m.ur, m.er)) / 2
	}
	m.adK = math.Pi / C0 * m.er / math.Sqrt(m.e0) * q * sub.LossTangent
}
