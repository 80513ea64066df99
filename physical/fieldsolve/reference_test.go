package fieldsolve

import "math"

// Independent references, written out here from their publications so that
// the tests do not lean on other packages of the project.

// ellipticK is the complete elliptic integral of the first kind K(k), by the
// arithmetic-geometric mean: K(k) = π / (2·AGM(1, √(1−k²))) (Abramowitz &
// Stegun 17.6).
func ellipticK(k float64) float64 {
	a, b := 1.0, math.Sqrt(1-k*k)
	for i := 0; i < 60 && math.Abs(a-b) > 1e-15*a; i++ {
		a, b = (a+b)/2, math.Sqrt(a*b)
	}
	return math.Pi / (2 * a)
}

// kRatio is K(k)/K(k′).
func kRatio(k float64) float64 { return ellipticK(k) / ellipticK(math.Sqrt(1-k*k)) }

// eta0 is the impedance of free space, μ0·c0 (CODATA 2018).
const eta0 = 376.730313668

// cohnStripline is the exact impedance of a zero-thickness strip of width w
// centred between planes b apart (Cohn 1954, by conformal mapping):
// Z0 = (η0/(4√εr))·K(k)/K(k′), k = sech(πw/2b). Cohn writes 30π for η0/4,
// i.e. η0 ≈ 120π; the exact η0 is used here, since 120π is 0.07 % high.
func cohnStripline(w, b, er float64) float64 {
	k := 1 / math.Cosh(math.Pi*w/(2*b))
	return eta0 / (4 * math.Sqrt(er)) * kRatio(k)
}

// hammerstadJensen is the static zero-thickness microstrip of Hammerstad &
// Jensen, "Accurate models for microstrip computer-aided design", IEEE
// MTT-S 1980, eqs. (1)–(4) as we recall them (from memory): quoted
// accuracy 0.01 % (Z01, u ≤ 1), 0.03 % (u ≤ 1000) and 0.2 % (εeff,
// 0.01 ≤ u ≤ 100, εr ≤ 128).
func hammerstadJensen(u, er float64) (z0, epsEff float64) {
	f := 6 + (2*math.Pi-6)*math.Exp(-math.Pow(30.666/u, 0.7528))
	z01 := eta0 / (2 * math.Pi) * math.Log(f/u+math.Sqrt(1+4/(u*u)))
	a := 1 + math.Log((math.Pow(u, 4)+math.Pow(u/52, 2))/(math.Pow(u, 4)+0.432))/49 +
		math.Log(1+math.Pow(u/18.1, 3))/18.7
	b := 0.564 * math.Pow((er-0.9)/(er+3), 0.053)
	epsEff = (er+1)/2 + (er-1)/2*math.Pow(1+10/u, -a*b)
	return z01 / math.Sqrt(epsEff), epsEff
}

// conformalGCPW is the quasi-static conductor-backed coplanar waveguide of
// zero thickness with infinitely wide side grounds, by conformal mapping with
// the partial-capacitance split at the strip plane (Ghione & Naldi 1987;
// Simons, "Coplanar Waveguide Circuits, Components, and Systems", 2001,
// ch. 3; from memory): k = a/b, k1 = tanh(πa/2h)/tanh(πb/2h),
// with a = w/2, b = w/2 + gap,
// εeff = (1 + εr·q)/(1 + q), q = [K(k1)/K(k1′)]/[K(k)/K(k′)],
// Z0 = η0 / (2√εeff · (K(k)/K(k′) + K(k1)/K(k1′))).
// The split is an approximation; it is best for gaps small against h.
func conformalGCPW(w, gap, h, er float64) (z0, epsEff float64) {
	a, b := w/2, w/2+gap
	k := a / b
	k1 := math.Tanh(math.Pi*a/(2*h)) / math.Tanh(math.Pi*b/(2*h))
	q := kRatio(k1) / kRatio(k)
	epsEff = (1 + er*q) / (1 + q)
	return eta0 / (2 * math.Sqrt(epsEff) * (kRatio(k) + kRatio(k1))), epsEff
}
