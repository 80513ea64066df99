package physical

import "math"

// Constants of expFast: log2(e), and ln 2 split into a high part with
// trailing zero bits (so that k·ln2Hi is exact for |k| < 2^11) and the rest.
const (
	log2E      = 1.4426950408889634
	ln2Hi      = 6.93147180369123816490e-01 // as in the Go math package
	ln2Lo      = 1.90821492927058770002e-10
	roundMagic = 0x1.8p52 // adding and subtracting it rounds to an integer
)

// expFast returns e^x to within a few units in the last place. The model
// evaluates thirteen exponentials per frequency, mostly in dependent
// chains; math.Exp on amd64 has a long latency (its argument is reduced,
// the series summed and the result squared four times in sequence), and
// this version, a Taylor series of degree 13 on |r| ≤ ln2/2 summed by
// Estrin's scheme and scaled by 2^k through the exponent bits, roughly
// halves a sweep's time. Arguments outside (−708, 709), where the result
// would be subnormal or overflow, and NaN go to math.Exp.
func expFast(x float64) float64 {
	if !(x > -708 && x < 709) {
		return math.Exp(x)
	}
	k := (x*log2E + roundMagic) - roundMagic
	r := (x - k*ln2Hi) - k*ln2Lo
	// 1/n! for n = 2..13.
	const (
		c2  = 1.0 / 2
		c3  = 1.0 / 6
		c4  = 1.0 / 24
		c5  = 1.0 / 120
		c6  = 1.0 / 720
		c7  = 1.0 / 5040
		c8  = 1.0 / 40320
		c9  = 1.0 / 362880
		c10 = 1.0 / 3628800
		c11 = 1.0 / 39916800
		c12 = 1.0 / 479001600
		c13 = 1.0 / 6227020800
	)
	r2 := r * r
	r4 := r2 * r2
	r8 := r4 * r4
	b0 := (1 + r) + (c2+c3*r)*r2
	b1 := (c4 + c5*r) + (c6+c7*r)*r2
	b2 := (c8 + c9*r) + (c10+c11*r)*r2
	b3 := c12 + c13*r
	p := (b0 + b1*r4) + (b2+b3*r4)*r8
	return p * math.Float64frombits(uint64(int64(k)+1023)<<52)
}
