package physical

import "math"

// Logarithms of the Kirschning-Jansen normalising frequencies (GHz·mm), so
// that a power (fn/a)^p becomes one exp(p·(ln fn − ln a)) per frequency.
const (
	ln38p7   = 3.655839600035736  // ln 38.7
	ln18p365 = 2.9104466792716304 // ln 18.365
	ln12p3   = 2.509599262378372  // ln 12.3
)

// initDispersion computes the frequency-independent parts of the
// Kirschning-Jansen εeff(f) (1982) and Z0(f) (R1..R17) expressions. As in
// Hammerstad and Jensen, u is the thickness-corrected width ur.
func (m *MicrostripModel) initDispersion() {
	u, er := m.ur, m.er
	// εeff(f), Kirschning and Jansen 1982:
	//   P1 = 0.27488 + (0.6315 + 0.525/(1+0.0157fn)^20)·u − 0.065683·exp(−8.7513u)
	//   P2 = 0.33622·(1 − exp(−0.03442εr))
	//   P3 = 0.0363·exp(−4.6u)·(1 − exp(−(fn/38.7)^4.97))
	//   P4 = 1 + 2.751·(1 − exp(−(εr/15.916)^8))
	m.p1a = 0.27488 - 0.065683*math.Exp(-8.7513*u)
	m.p2 = 0.33622 * (1 - math.Exp(-0.03442*er))
	m.p3a = 0.0363 * math.Exp(-4.6*u)
	m.p4 = 1 + 2.751*(1-math.Exp(-math.Pow(er/15.916, 8)))

	// Z0(f), Kirschning and Jansen R1..R17.
	r1 := 0.03891 * math.Pow(er, 1.4)
	r2 := 0.267 * math.Pow(u, 7)
	r3 := 4.766 * math.Exp(-3.228*math.Pow(u, 0.641))
	r4 := 0.016 + math.Pow(0.0514*er, 4.524)
	r6 := 22.20 * math.Pow(u, 1.92)
	m.r7 = 1.206 - 0.3144*math.Exp(-r1)*(1-math.Exp(-r2))
	m.r8c = 0.004625 * r3 * math.Pow(er, 1.674)
	e6 := math.Pow(er-1, 6)
	m.r9c = 5.086 * r4 / (0.3838 + 0.386*r4) * math.Exp(-r6) * e6 / (1 + 10*e6)
	m.r10 = 0.00044*math.Pow(er, 2.136) + 0.0184
	m.r12 = 1 / (1 + 0.00245*u*u)
	m.r16c = 0.0503 * er * er * (1 - math.Exp(-math.Pow(u/15, 6)))
}

// at evaluates the model at freq > 0.
func (m *MicrostripModel) at(freq float64) LineParams {
	er := m.er
	fn := freq * m.h * 1e-6 // GHz·mm
	lfn := math.Log(fn)

	// εeff(f), Kirschning and Jansen 1982.
	x := 1 + 0.0157*fn
	x2 := x * x
	x4 := x2 * x2
	x16 := x4 * x4
	x16 *= x16
	p1 := m.p1a + (0.6315+0.525/(x16*x4))*m.ur
	p3 := m.p3a * (1 - math.Exp(-math.Exp(4.97*(lfn-ln38p7))))
	pf := p1 * m.p2 * math.Exp(1.5763*(math.Log(0.1844+p3*m.p4)+lfn))
	ef := er - (er-m.e0)/(1+pf)

	// Z0(f), Kirschning and Jansen R1..R17.
	y := fn / 28.843
	y2 := y * y
	y4 := y2 * y2
	r5 := y4 * y4 * y4
	r8 := 1 + 1.275*(1-math.Exp(-m.r8c*math.Exp(2.745*(lfn-ln18p365))))
	r9 := m.r9c * r5 / (1 + 1.2992*r5)
	w := fn / 19.47
	w2 := w * w
	w6 := w2 * w2 * w2
	r11 := w6 / (1 + 0.0962*w6)
	r13 := 0.9408*math.Exp(r8*math.Log(ef)) - 0.9603
	r14 := (0.9408-r9)*math.Exp(r8*m.lnE0) - 0.9603
	r15 := 0.707 * m.r10 * math.Exp(1.097*(lfn-ln12p3))
	r16 := 1 + m.r16c*r11
	r17 := m.r7 * (1 - 1.1241*m.r12/r16*math.Exp(-0.026*math.Exp(1.15656*lfn)-r15))
	// Just above εr = 1, R13 and R14 pass through zero (near εeff 1.01 to
	// 1.02) and the ratio can turn negative: the published form fails
	// there, and the static Z0 is kept (Warnings says so).
	var lnRatio float64
	if q := r13 / r14; q > 0 && !math.IsInf(q, 0) {
		lnRatio = r17 * math.Log(q)
	}
	z := m.z0 * math.Exp(lnRatio)

	// Losses.
	kr := 1 + 2/math.Pi*math.Atan(1.4*m.roughK*freq)
	ki := math.Exp(-1.2 * math.Exp(0.7*(m.lnZ0Eta+lnRatio)))
	ac := m.rsK * math.Sqrt(freq) * kr * ki / (z * m.wr)

	return LineParams{
		Freq:            freq,
		Z0:              z,
		EpsEff:          ef,
		AlphaConductor:  ac,
		AlphaDielectric: m.adK * freq,
	}
}
