// Package physical holds the models of printed transmission lines and their
// discontinuities, and the network simulation that cascades them.
//
// A line model turns a cross-section (a Substrate and a strip width) into
// the propagation properties of the line at a frequency: characteristic
// impedance, effective permittivity and the conductor and dielectric
// attenuation. Discontinuity models (open end, T-junction, via to ground)
// return equivalent lengths or lumped networks. Networks are 2×2 ABCD
// matrices cascaded by multiplication. Every model names its paper and its
// published validity range, and reports in its warnings when a call leaves it.
//
// Inputs and outputs are SI: metres, hertz, ohms, nepers and radians per metre.
package physical

import "math"

// Physical constants (CODATA 2018, exact or to the digits given).
const (
	C0   = 299792458.0      // speed of light in vacuum, m/s
	Mu0  = 1.25663706212e-6 // vacuum permeability, H/m
	Eps0 = 8.8541878128e-12 // vacuum permittivity, F/m
	Eta0 = 376.730313668    // impedance of free space, ohm
	NpDB = 20 / math.Ln10   // decibels per neper
)

// Substrate is one signal layer's cross-section data: the dielectric under
// the strip, the copper, and optional solder mask over it.
type Substrate struct {
	Er              float64 // relative permittivity of the dielectric
	Height          float64 // dielectric thickness between strip and ground, m
	LossTangent     float64 // dielectric loss tangent
	CopperThickness float64 // strip thickness, m (0 for an ideal thin strip)
	Conductivity    float64 // copper conductivity, S/m (0 means annealed copper)
	Roughness       float64 // RMS surface roughness of the copper, m
	MaskThickness   float64 // solder mask thickness over the strip, m (0: none)
	MaskEr          float64 // solder mask relative permittivity
	// MaskLossTangent is the solder mask loss tangent (used by the field
	// solver path only).
	MaskLossTangent float64
}

// CopperConductivity is the conductivity of annealed copper, IEC 60028
// (1925) standard: 5.80e7 S/m.
const CopperConductivity = 5.8e7

// conductivity returns the copper conductivity, defaulting to annealed copper.
func (s Substrate) conductivity() float64 {
	if s.Conductivity > 0 {
		return s.Conductivity
	}
	return CopperConductivity
}

// LineParams are the propagation properties of a line at one frequency.
type LineParams struct {
	Freq            float64 // Hz
	Z0              float64 // characteristic impedance, ohm
	EpsEff          float64 // effective relative permittivity
	AlphaConductor  float64 // conductor attenuation, Np/m
	AlphaDielectric float64 // dielectric attenuation, Np/m
}

// Beta is the phase constant, rad/m.
func (p LineParams) Beta() float64 {
	return 2 * math.Pi * p.Freq * math.Sqrt(p.EpsEff) / C0
}

// Alpha is the total attenuation, Np/m.
func (p LineParams) Alpha() float64 { return p.AlphaConductor + p.AlphaDielectric }

// Gamma is the complex propagation constant α + jβ, 1/m.
func (p LineParams) Gamma() complex128 { return complex(p.Alpha(), p.Beta()) }

// GuidedWavelength is the wavelength on the line, m.
func (p LineParams) GuidedWavelength() float64 {
	return C0 / (p.Freq * math.Sqrt(p.EpsEff))
}

// LineModel is a line cross-section ready to be evaluated at any frequency.
// Work that does not depend on frequency is done when the model is made.
type LineModel interface {
	// At returns the line's properties at freq (Hz).
	At(freq float64) LineParams
	// Static returns the quasi-static characteristic impedance and
	// effective permittivity.
	Static() (z0, epsEff float64)
	// Warnings lists the ways in which evaluating at freq leaves the
	// model's published validity range; nil when it does not.
	Warnings(freq float64) []string
	// Strip returns the strip width and the substrate of the cross-section.
	Strip() (width float64, sub Substrate)
	// Name names the model, for reports.
	Name() string
}
