package synth

import (
	"fmt"
	"math"
)

// brent returns a root of f between a and b, where fa = f(a) and fb = f(b)
// have opposite signs (or one is zero), to within tol in x, calling f at
// most maxEvals times. It is Brent's method (R. P. Brent, Algorithms for
// Minimization without Derivatives, 1973, ch. 4: inverse quadratic
// interpolation and secant steps safeguarded by bisection), laid out as
// in Press et al., Numerical Recipes, 2nd ed., §9.3. An error from f is
// returned as it is.
func brent(f func(float64) (float64, error), a, b, fa, fb, tol float64, maxEvals int) (float64, error) {
	if (fa > 0 && fb > 0) || (fa < 0 && fb < 0) {
		return 0, fmt.Errorf("root not bracketed: f(%g) = %g, f(%g) = %g", a, fa, b, fb)
	}
	c, fc := b, fb
	var d, e float64
	for range maxEvals {
		if (fb > 0 && fc > 0) || (fb < 0 && fc < 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol1 := 2*0x1p-52*math.Abs(b) + tol/2
		xm := (c - b) / 2
		if math.Abs(xm) <= tol1 || fb == 0 {
			return b, nil
		}
		if math.Abs(e) >= tol1 && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c { // secant
				p = 2 * xm * s
				q = 1 - s
			} else { // inverse quadratic interpolation
				q = fa / fc
				r := fb / fc
				p = s * (2*xm*q*(q-r) - (b-a)*(r-1))
				q = (q - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*xm*q-math.Abs(tol1*q), math.Abs(e*q)) {
				e, d = d, p/q
			} else {
				d, e = xm, xm
			}
		} else {
			d, e = xm, xm
		}
		a, fa = b, fb
		if math.Abs(d) > tol1 {
			b += d
		} else {
			b += math.Copysign(tol1, xm)
		}
		var err error
		if fb, err = f(b); err != nil {
			return 0, err
		}
	}
	return b, nil
}
