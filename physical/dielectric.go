package physical

import (
	"math"
	"math/cmplx"
)

// WidebandDebye is the causal wideband Debye model of a laminate's
// permittivity by Djordjevic, Biljić, Likar-Smiljanić and Sarkar
// ("Wideband frequency-domain characterization of FR-4 and time-domain
// causality", IEEE Trans. Electromagnetic Compatibility 43(4), 2001; form
// from memory):
//
//	ε(f) = ε∞ + Δε/(m2 − m1) · log10((f2 + jf)/(f1 + jf)),  f1 = 10^m1 Hz, f2 = 10^m2 Hz,
//
// with ε = ε′ − jε″. Between the corner frequencies the loss tangent is
// nearly flat and ε′ falls slowly with frequency, as glass-reinforced
// laminates do; the model obeys the Kramers-Kronig relations by
// construction. It is fitted to the one (εr, tanδ) pair a datasheet gives
// at one frequency, so it moves εr from where it was measured to where a
// design works.
type WidebandDebye struct {
	EpsInf, DeltaEps float64 // ε∞ and Δε
	M1, M2           float64 // decade exponents of the corner frequencies, Hz
}

// DebyeCorners are the corner-frequency exponents used by
// FitWidebandDebye: 10 kHz and 1 THz, around every band a board is used
// in (common choice, from memory).
const (
	DebyeM1 = 4
	DebyeM2 = 12
)

// FitWidebandDebye returns the model that has relative permittivity er and
// loss tangent tanD at fRef (Hz), with corners at 10^DebyeM1 and
// 10^DebyeM2 Hz. A loss-free laminate (tanD = 0) gets a constant εr.
func FitWidebandDebye(er, tanD, fRef float64) WidebandDebye {
	m := WidebandDebye{M1: DebyeM1, M2: DebyeM2}
	l := m.logTerm(fRef)
	// ε′ = ε∞ + k·Re(l), ε″ = −k·Im(l), with k = Δε/(m2 − m1).
	k := tanD * er / -imag(l)
	m.DeltaEps = k * (m.M2 - m.M1)
	m.EpsInf = er - k*real(l)
	return m
}

func (m WidebandDebye) logTerm(f float64) complex128 {
	f1, f2 := math.Pow(10, m.M1), math.Pow(10, m.M2)
	return cmplx.Log(complex(f2, f)/complex(f1, f)) / math.Ln10
}

// At returns the relative permittivity ε′ and loss tangent ε″/ε′ at f (Hz).
func (m WidebandDebye) At(f float64) (er, tanD float64) {
	e := complex(m.EpsInf, 0) + complex(m.DeltaEps/(m.M2-m.M1), 0)*m.logTerm(f)
	return real(e), -imag(e) / real(e)
}

// At returns the substrate with its dielectric's εr and loss tangent moved
// from erFreq, where they were given, to f by the wideband Debye model. With
// erFreq ≤ 0 (not given) the substrate is returned as it is.
func (s Substrate) At(erFreq, f float64) Substrate {
	if erFreq <= 0 || f <= 0 || s.Er <= 1 {
		return s
	}
	s.Er, s.LossTangent = FitWidebandDebye(s.Er, s.LossTangent, erFreq).At(f)
	return s
}
