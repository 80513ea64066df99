package physical

import (
	"fmt"
	"math"
)

// Microstrip describes a microstrip cross-section: a strip of the given
// width (m) over one Substrate. Call Model, or NewMicrostrip, to get a
// model ready for evaluation.
type Microstrip struct {
	Width float64 // strip width, m
	Sub   Substrate
}

// Model returns the cross-section's MicrostripModel.
func (m Microstrip) Model() (*MicrostripModel, error) { return NewMicrostrip(m.Width, m.Sub) }

// MicrostripModel is a microstrip line evaluated with closed-form models:
//
//   - static impedance and effective permittivity: E. Hammerstad and
//     Ø. Jensen, "Accurate models for microstrip computer-aided design",
//     IEEE MTT-S Int. Microwave Symp. Digest, 1980, pp. 407-409, including
//     their finite strip-thickness correction (effective widths u1 and ur);
//     stated accuracy 0.01 ≤ W/h ≤ 100, εr ≤ 128 (from memory);
//   - dispersion of εeff: M. Kirschning and R. H. Jansen, "Accurate model
//     for effective dielectric constant of microstrip with validity up to
//     millimetre-wave frequencies", Electronics Letters 18(6), 1982,
//     pp. 272-273 (the P1..P4 form); range 0.1 ≤ W/h ≤ 100, 1 ≤ εr ≤ 20,
//     h/λ0 ≤ 0.13 (from memory);
//   - dispersion of Z0: Kirschning and Jansen's frequency-dependent
//     impedance in its R1..R17 form (dated 1984 here, after its use with
//     the coupled-line equations, IEEE Trans. MTT-32(1), 1984; the
//     single-line equations appear in R. H. Jansen and M. Kirschning,
//     AEÜ 37, 1983, pp. 108-112; references from memory), with
//     R8 = 1 + 1.275·(1 − exp(−0.004625·R3·εr^1.674·(fn/18.365)^2.745));
//     range 0.1 ≤ W/h ≤ 10, 1 ≤ εr ≤ 18, f·h ≤ 15 GHz·mm (from memory);
//   - conductor loss: αc = Rs·Kr·Ki/(Z0(f)·Wr), with Rs = √(πfμ0/σ), the
//     Hammerstad-Jensen current-distribution factor Ki = exp(−1.2(Z0/η0)^0.7)
//     and the Hammerstad-Bekkadal roughness factor Kr (see RoughnessFactor);
//     this is the form used by the scikit-rf MLine reference model, so the
//     golden table checks it;
//   - dielectric loss: αd = (π/λ0)·εr/√εeff·(εeff−1)/(εr−1)·tanδ with the
//     static εeff (D. M. Pozar, Microwave Engineering 4th ed., eq. 3.198;
//     J. D. Welch and H. J. Pratt, 1966).
//
// As in Hammerstad and Jensen, the dispersion and loss formulas use the
// thickness-corrected width Wr. All frequency-independent terms are
// computed once, in NewMicrostrip; At does only the frequency-dependent
// part. A MicrostripModel is immutable and safe for concurrent use.
type MicrostripModel struct {
	ms Microstrip

	h, er, t float64 // height, relative permittivity, copper thickness
	sigma    float64 // copper conductivity, S/m
	u, ur    float64 // W/h and thickness-corrected Wr/h
	z0, e0   float64 // static impedance and effective permittivity
	lnE0     float64 // ln(e0)

	// Kirschning-Jansen 1982 εeff(f) terms.
	p1a, p2, p3a, p4 float64
	// Kirschning-Jansen 1984 Z0(f) terms.
	r8c, r7, r9c, r10, r12, r16c float64
	// Loss terms: Rs = rsK·√f, (Δ/δ)² = roughK·f, αd = adK·f.
	rsK, roughK, adK float64
	lnZ0Eta          float64 // ln(Z0/η0) for Ki
	wr               float64 // thickness-corrected width, m
}

// NewMicrostrip makes the model of a strip of the given width (m) on sub.
// It fails when the width or the dielectric height is not positive, when
// εr < 1, or when another substrate field is negative or not finite.
func NewMicrostrip(width float64, sub Substrate) (*MicrostripModel, error) {
	if err := checkMicrostrip(width, sub); err != nil {
		return nil, err
	}
	m := &MicrostripModel{
		ms:    Microstrip{Width: width, Sub: sub},
		h:     sub.Height,
		er:    sub.Er,
		t:     sub.CopperThickness,
		sigma: sub.conductivity(),
	}
	m.initStatic()
	m.initDispersion()
	m.initLoss()
	return m, nil
}

// checkMicrostrip validates the cross-section.
func checkMicrostrip(width float64, sub Substrate) error {
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	switch {
	case bad(width) || width <= 0:
		return fmt.Errorf("microstrip: strip width must be positive, got %g m", width)
	case bad(sub.Height) || sub.Height <= 0:
		return fmt.Errorf("microstrip: dielectric height must be positive, got %g m", sub.Height)
	case bad(sub.Er) || sub.Er < 1:
		return fmt.Errorf("microstrip: relative permittivity must be at least 1, got %g", sub.Er)
	case bad(sub.CopperThickness) || sub.CopperThickness < 0:
		return fmt.Errorf("microstrip: copper thickness must not be negative, got %g m", sub.CopperThickness)
	case bad(sub.LossTangent) || sub.LossTangent < 0:
		return fmt.Errorf("microstrip: loss tangent must not be negative, got %g", sub.LossTangent)
	case bad(sub.Conductivity) || sub.Conductivity < 0:
		return fmt.Errorf("microstrip: conductivity must not be negative, got %g S/m", sub.Conductivity)
	case bad(sub.Roughness) || sub.Roughness < 0:
		return fmt.Errorf("microstrip: roughness must not be negative, got %g m", sub.Roughness)
	}
	return nil
}

// initStatic computes the Hammerstad-Jensen static Z0 and εeff with the
// strip-thickness correction:
//
//	Δu1 = (t/π)·ln(1 + 4e/(t·coth²√(6.517u)))   (t normalised to h)
//	Δur = Δu1·(1 + sech√(εr−1))/2
//	Z0  = Z01(ur)/√εe(ur, εr)
//	εeff = εe(ur, εr)·(Z01(u1)/Z01(ur))²
func (m *MicrostripModel) initStatic() {
	m.u = m.ms.Width / m.h
	th := m.t / m.h
	var du1 float64
	if th > 0 {
		tanh := math.Tanh(math.Sqrt(6.517 * m.u))
		du1 = th / math.Pi * math.Log(1+4*math.E*tanh*tanh/th)
	}
	dur := du1 * (1 + 1/math.Cosh(math.Sqrt(m.er-1))) / 2
	u1 := m.u + du1
	m.ur = m.u + dur
	m.wr = m.ur * m.h
	zr := hjZ01(m.ur)
	z1 := hjZ01(u1)
	er := hjEpsEff(m.ur, m.er)
	m.z0 = zr / math.Sqrt(er)
	m.e0 = er * (z1 / zr) * (z1 / zr)
	m.lnE0 = math.Log(m.e0)
	m.lnZ0Eta = math.Log(m.z0 / Eta0)
}

// ln30p666 is ln 30.666, for the Hammerstad-Jensen f(u).
const ln30p666 = 3.4231545490141975

// hjZ01 is the Hammerstad-Jensen impedance of a zero-thickness strip of
// normalised width u in air (1980, accuracy better than 0.01 % for u ≤ 1
// and 0.03 % for u ≤ 1000, from memory).
func hjZ01(u float64) float64 {
	f := 6 + (2*math.Pi-6)*expFast(-expFast(0.7528*(ln30p666-math.Log(u))))
	return Eta0 / (2 * math.Pi) * math.Log(f/u+math.Sqrt(1+4/(u*u)))
}

// hjEpsEff is the Hammerstad-Jensen static effective permittivity of a
// zero-thickness strip of normalised width u:
// εe = (εr+1)/2 + (εr−1)/2·X(u, εr).
func hjEpsEff(u, er float64) float64 {
	return (er+1)/2 + (er-1)/2*hjWidthTerm(u, er)
}

// hjWidthTerm is X = (1 + 10/u)^(−a(u)·b(εr)) of the Hammerstad-Jensen εeff.
func hjWidthTerm(u, er float64) float64 {
	u4 := u * u * u * u
	v := u / 18.1
	a := 1 + math.Log((u4+(u/52)*(u/52))/(u4+0.432))/49 + math.Log(1+v*v*v)/18.7
	b := 0.564 * expFast(0.053*math.Log((er-0.9)/(er+3)))
	return expFast(-a * b * math.Log(1+10/u))
}

// Static returns the Hammerstad-Jensen quasi-static impedance (ohm) and
// effective permittivity, thickness correction included.
func (m *MicrostripModel) Static() (z0, epsEff float64) { return m.z0, m.e0 }

// Strip returns the strip width (m) and the substrate.
func (m *MicrostripModel) Strip() (width float64, sub Substrate) { return m.ms.Width, m.ms.Sub }

// Microstrip returns the cross-section the model was made from.
func (m *MicrostripModel) Microstrip() Microstrip { return m.ms }

// EffectiveWidth returns the Hammerstad-Jensen thickness-corrected width Wr
// (m) used by the dispersion and loss formulas; it equals the drawn width
// for a zero-thickness strip.
func (m *MicrostripModel) EffectiveWidth() float64 { return m.wr }

// Name names the models used.
func (m *MicrostripModel) Name() string {
	return "Hammerstad-Jensen 1980 + Kirschning-Jansen 1982/1984"
}

// At returns the line's properties at freq (Hz). At freq ≤ 0 it returns
// the static impedance and permittivity with zero attenuation.
func (m *MicrostripModel) At(freq float64) LineParams {
	var out [1]LineParams
	m.evaluateBlock([]float64{freq}, out[:])
	return out[0]
}
