package physical

import "math"

// Logarithms of the Kirschning-Jansen normalising frequencies (GHz·mm), so
// that a power (fn/a)^p becomes one exp(p·(ln fn − ln a)) per frequency.
const (
	ln38p7   = 3.655839600035736   // ln 38.7
	ln18p365 = 2.9104466792716304  // ln 18.365
	ln12p3   = 2.509599262378372   // ln 12.3
	ln0p0514 = -2.9681171065210177 // ln 0.0514
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
	m.p1a = 0.27488 - 0.065683*expFast(-8.7513*u)
	m.p2 = 0.33622 * (1 - expFast(-0.03442*er))
	m.p3a = 0.0363 * expFast(-4.6*u)
	q := er / 15.916
	q2 := q * q
	q4 := q2 * q2
	m.p4 = 1 + 2.751*(1-expFast(-q4*q4))

	// Z0(f), Kirschning and Jansen R1..R17; powers as exp(p·ln x).
	lu, ler := math.Log(u), math.Log(er)
	u2 := u * u
	r1 := 0.03891 * expFast(1.4*ler)
	r2 := 0.267 * u2 * u2 * u2 * u
	r3 := 4.766 * expFast(-3.228*expFast(0.641*lu))
	r4 := 0.016 + expFast(4.524*(ln0p0514+ler))
	r6 := 22.20 * expFast(1.92*lu)
	m.r7 = 1.206 - 0.3144*expFast(-r1)*(1-expFast(-r2))
	m.r8c = 0.004625 * r3 * expFast(1.674*ler)
	e1 := er - 1
	e6 := e1 * e1 * e1
	e6 *= e6
	m.r9c = 5.086 * r4 / (0.3838 + 0.386*r4) * expFast(-r6) * e6 / (1 + 10*e6)
	m.r10 = 0.00044*expFast(2.136*ler) + 0.0184
	m.r12 = 1 / (1 + 0.00245*u2)
	v := u / 15
	v2 := v * v
	m.r16c = 0.0503 * er * er * (1 - expFast(-v2*v2*v2))
}

// blockLen is the number of frequencies evaluateBlock works on together.
// Working stage by stage over a block lets the processor overlap the
// independent exponentials and logarithms of neighbouring frequencies,
// which a single frequency's chain of dependent calls does not allow.
const blockLen = 16

// evaluateBlock writes the line's properties at freqs[i] into out[i], for
// len(freqs) ≤ blockLen; a frequency ≤ 0 gets the static values.
func (m *MicrostripModel) evaluateBlock(freqs []float64, out []LineParams) {
	n := len(freqs)
	out = out[:n]
	var fns, lfn, ef, r8, lnRatio [blockLen]float64
	er := m.er

	// Stage 1: ln fn and εeff(f), Kirschning and Jansen 1982.
	for i, f := range freqs {
		if !(f > 0) {
			f = 1 // replaced by the static values at the end
		}
		fn := f * m.h * 1e-6 // GHz·mm
		l := math.Log(fn)
		fns[i], lfn[i] = fn, l
		x := 1 + 0.0157*fn
		x2 := x * x
		x4 := x2 * x2
		x16 := x4 * x4
		x16 *= x16
		p1 := m.p1a + (0.6315+0.525/(x16*x4))*m.ur
		p3 := m.p3a * (1 - expFast(-expFast(4.97*(l-ln38p7))))
		pf := p1 * m.p2 * expFast(1.5763*(math.Log(0.1844+p3*m.p4)+l))
		ef[i] = er - (er-m.e0)/(1+pf)
	}

	// Stage 2: R8.
	for i := range n {
		r8[i] = 1 + 1.275*(1-expFast(-m.r8c*expFast(2.745*(lfn[i]-ln18p365))))
	}

	// Stage 3: the rest of Z0(f), Kirschning and Jansen R1..R17.
	for i := range n {
		l := lfn[i]
		fn := fns[i]
		y := fn / 28.843
		y2 := y * y
		y4 := y2 * y2
		r5 := y4 * y4 * y4
		r9 := m.r9c * r5 / (1 + 1.2992*r5)
		w := fn / 19.47
		w2 := w * w
		w6 := w2 * w2 * w2
		r11 := w6 / (1 + 0.0962*w6)
		r13 := 0.9408*expFast(r8[i]*math.Log(ef[i])) - 0.9603
		r14 := (0.9408-r9)*expFast(r8[i]*m.lnE0) - 0.9603
		r15 := 0.707 * m.r10 * expFast(1.097*(l-ln12p3))
		r16 := 1 + m.r16c*r11
		r17 := m.r7 * (1 - 1.1241*m.r12/r16*expFast(-0.026*expFast(1.15656*l)-r15))
		// Just above εr = 1, R13 and R14 pass through zero (near εeff 1.01
		// to 1.02) and the ratio can turn negative: the published form
		// fails there, and the static Z0 is kept (Warnings says so).
		lnRatio[i] = 0
		if q := r13 / r14; q > 0 && !math.IsInf(q, 0) {
			lnRatio[i] = r17 * math.Log(q)
		}
	}

	// Stage 4: Z0(f) and the losses.
	for i, f := range freqs {
		if !(f > 0) {
			out[i] = LineParams{Freq: f, Z0: m.z0, EpsEff: m.e0}
			continue
		}
		z := m.z0 * expFast(lnRatio[i])
		kr := 1 + 2/math.Pi*math.Atan(1.4*m.roughK*f)
		ki := expFast(-1.2 * expFast(0.7*(m.lnZ0Eta+lnRatio[i])))
		out[i] = LineParams{
			Freq:            f,
			Z0:              z,
			EpsEff:          ef[i],
			AlphaConductor:  m.rsK * math.Sqrt(f) * kr * ki / (z * m.wr),
			AlphaDielectric: m.adK * f,
		}
	}
}
