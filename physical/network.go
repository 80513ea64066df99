package physical

import (
	"math"
	"math/cmplx"
)

// ABCD is the chain (transmission) matrix of a two-port:
//
//	[V1]   [A B] [ V2]
//	[I1] = [C D] [-I2]
//
// with the currents flowing into each port. It is a plain value: cascading
// two networks is a.Mul(b), port 2 of a joined to port 1 of b.
type ABCD [2][2]complex128

// Identity returns the ABCD matrix of a through connection.
func Identity() ABCD {
	return ABCD{{1, 0}, {0, 1}}
}

// Mul returns the cascade of a followed by b.
func (a ABCD) Mul(b ABCD) ABCD {
	var c ABCD
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			c[i][j] = a[i][0]*b[0][j] + a[i][1]*b[1][j]
		}
	}
	return c
}

// Det returns AD − BC, which is 1 for every reciprocal network.
func (a ABCD) Det() complex128 {
	return a[0][0]*a[1][1] - a[0][1]*a[1][0]
}

// SeriesImpedance returns the ABCD matrix of an impedance z in series
// between the ports.
func SeriesImpedance(z complex128) ABCD {
	return ABCD{{1, z}, {0, 1}}
}

// ShuntAdmittance returns the ABCD matrix of an admittance y from the
// through path to ground.
func ShuntAdmittance(y complex128) ABCD {
	return ABCD{{1, 0}, {y, 1}}
}

// IdealTransformer returns the ABCD matrix of an ideal transformer with
// turns ratio n:1 (port 1 : port 2), so that V1 = n·V2 and an impedance Z on
// port 2 is seen as n²·Z at port 1.
func IdealTransformer(n float64) ABCD {
	return ABCD{{complex(n, 0), 0}, {0, complex(1/n, 0)}}
}

// CharacteristicImpedance returns the complex characteristic impedance of a
// lossy line, Zc = √((R+jωL)/(G+jωC)), with the per-unit-length constants
// taken from p for a quasi-TEM line:
//
//	L = Z0·√εeff/c0, C = √εeff/(Z0·c0), R = 2·Z0·αc, G = 2·αd/Z0,
//
// the usual low-loss identities αc = R/(2Z0) and αd = G·Z0/2 (Pozar,
// Microwave Engineering 4th ed., §2.7, from memory). At zero frequency, or
// when R and G are both zero, it is p.Z0.
func CharacteristicImpedance(p LineParams) complex128 {
	w := 2 * math.Pi * p.Freq
	sq := math.Sqrt(p.EpsEff)
	l := p.Z0 * sq / C0
	c := sq / (p.Z0 * C0)
	r := 2 * p.Z0 * p.AlphaConductor
	g := 2 * p.AlphaDielectric / p.Z0
	num := complex(r, w*l)
	den := complex(g, w*c)
	if den == 0 || num == 0 {
		return complex(p.Z0, 0)
	}
	return cmplx.Sqrt(num / den)
}

// Line returns the ABCD matrix of a length (m) of line with properties p:
//
//	[cosh γl      Zc·sinh γl]
//	[sinh γl/Zc   cosh γl   ]
//
// with γ = α + jβ from p (so the loss per metre is exactly the line
// model's) and Zc from CharacteristicImpedance. A negative length is
// allowed and de-embeds that much line.
func Line(p LineParams, length float64) ABCD {
	gl := p.Gamma() * complex(length, 0)
	zc := CharacteristicImpedance(p)
	ch, sh := cmplx.Cosh(gl), cmplx.Sinh(gl)
	return ABCD{{ch, zc * sh}, {sh / zc, ch}}
}

// InputImpedance returns the impedance seen at port 1 when port 2 is
// terminated in zLoad. An infinite zLoad (cmplx.Inf()) is an open circuit.
func (a ABCD) InputImpedance(zLoad complex128) complex128 {
	if cmplx.IsInf(zLoad) {
		return a[0][0] / a[1][0]
	}
	return (a[0][0]*zLoad + a[0][1]) / (a[1][0]*zLoad + a[1][1])
}

// InputImpedanceOfLine returns the input impedance of a length of line
// terminated in zLoad: cmplx.Inf() for an open end, 0 for a short.
func InputImpedanceOfLine(p LineParams, length float64, zLoad complex128) complex128 {
	return Line(p, length).InputImpedance(zLoad)
}

// S returns the scattering matrix of the two-port referred to the real
// reference impedance z0 at both ports, indexed S[i][j] = S(i+1)(j+1), by
// the ABCD-to-S conversion of Pozar, Microwave Engineering 4th ed.,
// Table 4.2.
func (a ABCD) S(z0 float64) [2][2]complex128 {
	A, B, C, D := a[0][0], a[0][1], a[1][0], a[1][1]
	z := complex(z0, 0)
	den := A + B/z + C*z + D
	return [2][2]complex128{
		{(A + B/z - C*z - D) / den, 2 * (A*D - B*C) / den},
		{2 / den, (-A + B/z - C*z + D) / den},
	}
}

// Reflection returns the reflection coefficient Γ = (z − z0)/(z + z0) of
// an impedance z against the real reference z0. An infinite z gives 1.
func Reflection(z complex128, z0 float64) complex128 {
	if cmplx.IsInf(z) {
		return 1
	}
	r := complex(z0, 0)
	return (z - r) / (z + r)
}

// MagDB returns 20·log10|c| in dB, the one |Γ| and |S| in dB of the
// project, floored at MinDB so that a perfect match stays finite.
func MagDB(c complex128) float64 {
	return 20 * math.Log10(max(cmplx.Abs(c), 1e-15))
}

// MinDB is the floor of MagDB: |c| below 1e-15 (a perfect model match).
const MinDB = -300

// ReturnLossDB returns the return loss −20·log10|Γ| in dB, positive for a
// passive load, at most −MinDB.
func ReturnLossDB(gamma complex128) float64 {
	return -MagDB(gamma)
}

// VSWR returns the voltage standing-wave ratio (1+|Γ|)/(1−|Γ|); it is
// +Inf for |Γ| ≥ 1.
func VSWR(gamma complex128) float64 {
	m := cmplx.Abs(gamma)
	if m >= 1 {
		return math.Inf(1)
	}
	return (1 + m) / (1 - m)
}
