package synth

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"stubcraft/physical/units"
)

// Response is the passband shape of a multi-section quarter-wave
// transformer. The zero value is no response, so a forgotten one is noticed.
type Response int

// Transformer responses.
const (
	Binomial  Response = iota + 1 // maximally flat at f0
	Chebyshev                     // equal ripple across a chosen band
)

// String returns "binomial" or "chebyshev", the words ParseResponse reads.
func (r Response) String() string {
	switch r {
	case Binomial:
		return "binomial"
	case Chebyshev:
		return "chebyshev"
	}
	return "Response(" + strconv.Itoa(int(r)) + ")"
}

// ParseResponse reads "binomial" or "chebyshev" (case and surrounding
// space ignored).
func ParseResponse(s string) (Response, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "binomial":
		return Binomial, nil
	case "chebyshev":
		return Chebyshev, nil
	}
	return 0, fmt.Errorf("unknown response %q (use binomial or chebyshev)", s)
}

// MaxTransformerSections is the most sections a quarter-wave transformer
// may have.
const MaxTransformerSections = 4

// Transformer is a multi-section quarter-wave transformer from a real load
// resistance to a real line impedance, designed by the small-reflection
// theory (Pozar, Microwave Engineering 4th ed., §5.5–5.7): the reflection
// at the input is
//
//	Γ(θ) = 2·e^{−jNθ}·[Γ0·cos Nθ + Γ1·cos (N−2)θ + …]
//
// with θ = βl the electrical length of one section (90° at f0) and Γn the
// reflection of step n counted from the source side. The steps are taken
// in the logarithmic form ln(Z_{n+1}/Z_n) = 2Γn, scaled so that they add up
// to ln(RL/Z0) exactly: the last section lands on the load and the
// impedances are symmetric about √(Z0·RL).
type Transformer struct {
	Response Response
	N        int       // number of sections
	Z0, RL   float64   // line and load resistance, ohm
	Z        []float64 // section impedances from the load toward the source, ohm
	Steps    []float64 // Γ0 … ΓN, from the source side (Pozar's numbering)
	// A is the scale of the response: Γn = A·C(N,n) for a binomial
	// transformer; |Γ(θ)| = |A|·|T_N(secθm·cosθ)| for a Chebyshev one.
	A float64
	// SecThetaM is sec θm of a Chebyshev transformer (θm: the band edge
	// angle); 0 for a binomial one.
	SecThetaM float64
}

// ErrTransformer reports a transformer that cannot be designed: a load or
// line that is not a positive finite resistance, or a section count or
// bandwidth out of range.
var ErrTransformer = errors.New("no quarter-wave transformer")

func checkTransformer(rl, z0 float64, n int) error {
	if !(rl > 0) || math.IsInf(rl, 0) || !(z0 > 0) || math.IsInf(z0, 0) {
		return fmt.Errorf("%w: the load %g ohm and line %g ohm must be positive and finite", ErrTransformer, rl, z0)
	}
	if n < 1 || n > MaxTransformerSections {
		return fmt.Errorf("%w: %d sections (1 to %d)", ErrTransformer, n, MaxTransformerSections)
	}
	return nil
}

// BinomialTransformer returns the N-section binomial (maximally flat)
// transformer from rl to z0: Γn = A·C(N,n) with A = ln(RL/Z0)/2^(N+1)
// (Pozar 4th ed. eq. 5.53 in its logarithmic form, from memory).
func BinomialTransformer(rl, z0 float64, n int) (Transformer, error) {
	if err := checkTransformer(rl, z0, n); err != nil {
		return Transformer{}, err
	}
	a := math.Log(rl/z0) / math.Pow(2, float64(n+1))
	steps := make([]float64, n+1)
	c := 1.0 // C(N, k), built up term by term
	for k := 0; k <= n; k++ {
		steps[k] = a * c
		c = c * float64(n-k) / float64(k+1)
	}
	return newTransformer(Binomial, rl, z0, steps, a, 0), nil
}

// ChebyshevTransformer returns the N-section Chebyshev (equal-ripple)
// transformer from rl to z0 whose ripple band is fracBW·f0 wide, centred
// on f0 (0 < fracBW < 2): θm = (π/2)·(1 − fracBW/2), and
//
//	Γ(θ)·e^{jNθ} = A·T_N(secθm·cosθ),  A = ln(RL/Z0) / (2·T_N(secθm)),
//
// so the in-band ripple is |A| (Pozar 4th ed. §5.7, from memory). The
// step reflections are the cosine coefficients of A·T_N(secθm·cosθ).
func ChebyshevTransformer(rl, z0 float64, n int, fracBW float64) (Transformer, error) {
	if err := checkTransformer(rl, z0, n); err != nil {
		return Transformer{}, err
	}
	if !(fracBW > 0 && fracBW < 2) {
		return Transformer{}, fmt.Errorf("%w: a Chebyshev band of %g·f0 (it must lie between 0 and 2·f0)", ErrTransformer, fracBW)
	}
	thm := math.Pi / 2 * (1 - fracBW/2)
	sec := 1 / math.Cos(thm)
	a := math.Log(rl/z0) / (2 * ChebyshevT(n, sec))
	// The cosine series Σ c_m·cos(mθ) of A·T_N(sec·cosθ) holds only m =
	// N, N−2, …; c_m is its coefficient by the discrete cosine transform
	// on 4N+4 points, exact for a trigonometric polynomial of degree N.
	// The series is 2Γ0·cos Nθ + 2Γ1·cos (N−2)θ + …, with Γ_{N/2} alone
	// (not doubled) when N is even.
	m := 4*n + 4
	steps := make([]float64, n+1)
	for k := 0; k <= n/2; k++ {
		order := n - 2*k
		s := 0.0
		for j := 0; j < m; j++ {
			th := 2 * math.Pi * float64(j) / float64(m)
			s += a * ChebyshevT(n, sec*math.Cos(th)) * math.Cos(float64(order)*th)
		}
		c := 2 * s / float64(m)
		if order == 0 {
			c = s / float64(m)
			steps[k] = c
		} else {
			steps[k] = c / 2
		}
		steps[n-k] = steps[k]
	}
	return newTransformer(Chebyshev, rl, z0, steps, a, sec), nil
}

// ChebyshevFracBW returns the fractional bandwidth (Δf/f0) over which an
// N-section Chebyshev transformer from rl to z0 keeps |Γ| ≤ gammaMax by
// the small-reflection theory: secθm = cosh[(1/N)·arccosh(|ln(RL/Z0)|/(2Γm))]
// and Δf/f0 = 2 − 4θm/π (Pozar 4th ed. eqs. 5.60 and 5.64 in logarithmic
// form, from memory). It is 2 (all frequencies) when gammaMax already
// exceeds half the log ratio.
func ChebyshevFracBW(rl, z0 float64, n int, gammaMax float64) float64 {
	x := math.Abs(math.Log(rl/z0)) / (2 * gammaMax)
	if x <= 1 {
		return 2
	}
	sec := math.Cosh(math.Acosh(x) / float64(n))
	return 2 - 4*math.Acos(1/sec)/math.Pi
}

// BinomialFracBW returns the fractional bandwidth over which an N-section
// binomial transformer keeps |Γ| ≤ gammaMax by the small-reflection
// theory: Δf/f0 = 2 − (4/π)·arccos[½·(Γm/|A|)^(1/N)] (Pozar 4th ed. eq.
// 5.56, from memory), with A = ln(RL/Z0)/2^(N+1).
func BinomialFracBW(rl, z0 float64, n int, gammaMax float64) float64 {
	a := math.Abs(math.Log(rl/z0)) / math.Pow(2, float64(n+1))
	x := 0.5 * math.Pow(gammaMax/a, 1/float64(n))
	if x >= 1 {
		return 2
	}
	return 2 - 4/math.Pi*math.Acos(x)
}

// ChebyshevT returns the Chebyshev polynomial of the first kind T_n(x),
// for any real x, by its three-term recurrence.
func ChebyshevT(n int, x float64) float64 {
	if n == 0 {
		return 1
	}
	t0, t1 := 1.0, x
	for k := 1; k < n; k++ {
		t0, t1 = t1, 2*x*t1-t0
	}
	return t1
}

func newTransformer(resp Response, rl, z0 float64, steps []float64, a, sec float64) Transformer {
	n := len(steps) - 1
	// Impedances from the source side: Z_{k+1} = Z_k·exp(2Γk).
	fromSource := make([]float64, n)
	z := z0
	for k := 0; k < n; k++ {
		z *= math.Exp(2 * steps[k])
		fromSource[k] = z
	}
	zs := make([]float64, n)
	for k := range fromSource {
		zs[n-1-k] = fromSource[k]
	}
	return Transformer{Response: resp, N: n, Z0: z0, RL: rl, Z: zs, Steps: steps, A: a, SecThetaM: sec}
}

// SmallReflectionGamma returns |Γ| of the transformer at a section length
// of theta radians (π/2 at f0) by the small-reflection theory: the closed
// forms 2^N·|A|·|cosθ|^N (binomial) and |A|·|T_N(secθm·cosθ)| (Chebyshev).
func (t Transformer) SmallReflectionGamma(theta float64) float64 {
	if t.Response == Chebyshev {
		return math.Abs(t.A * ChebyshevT(t.N, t.SecThetaM*math.Cos(theta)))
	}
	return math.Pow(2, float64(t.N)) * math.Abs(t.A) * math.Pow(math.Abs(math.Cos(theta)), float64(t.N))
}

// Sections returns the transformer as quarter-wave series lines, from the
// load toward the source.
func (t Transformer) Sections() []Section {
	s := make([]Section, len(t.Z))
	for i, z := range t.Z {
		s[i] = Section{Kind: SeriesLine, Z0: z, LengthDeg: 90}
	}
	return s
}

// RealPoint is a place on a line from a complex load where the impedance
// is real.
type RealPoint struct {
	LineDeg float64 // electrical length of the line from the load, degrees in [0, 180)
	R       float64 // the real impedance there, ohm
}

// RealPoints returns the two points within half a wavelength of zLoad, on
// a lossless line of zc, where the impedance is real: the voltage maximum
// (R = zc·VSWR) and minimum (R = zc/VSWR), shortest first. Along the line
// Γ(d) = Γ_L·e^{−j2βd}, so the impedance is real where 2βd equals the
// load's reflection angle, or that angle less π (exact, lossless line).
func RealPoints(zLoad complex128, zc float64) ([2]RealPoint, error) {
	if cmplx.IsNaN(zLoad) || cmplx.IsInf(zLoad) || real(zLoad) <= 0 {
		return [2]RealPoint{}, fmt.Errorf("load %s ohm: %w: a real point needs a finite load with positive resistance", units.FormatImpedance(zLoad), ErrBadLoad)
	}
	g := (zLoad - complex(zc, 0)) / (zLoad + complex(zc, 0))
	m := cmplx.Abs(g)
	phi := cmplx.Phase(g) * 180 / math.Pi // (−180, 180]
	norm := func(d float64) float64 {
		d = math.Mod(d, 180)
		if d < 0 {
			d += 180
		}
		return d
	}
	vmax := RealPoint{LineDeg: norm(phi / 2), R: zc * (1 + m) / (1 - m)}
	vmin := RealPoint{LineDeg: norm((phi - 180) / 2), R: zc * (1 - m) / (1 + m)}
	if vmin.LineDeg < vmax.LineDeg {
		return [2]RealPoint{vmin, vmax}, nil
	}
	return [2]RealPoint{vmax, vmin}, nil
}

// QuarterWaveMatch returns the sections that match zLoad to z0 with an
// n-section transformer of the given response (fracBW is the Chebyshev
// ripple band, ignored for a binomial one). A load that is not real is
// first brought to a real impedance by a line of z0, at the nearer of the
// two real points; a load within 1e-9 of real (relative) is taken as real.
func QuarterWaveMatch(zLoad complex128, z0 float64, n int, resp Response, fracBW float64) ([]Section, []string, error) {
	if cmplx.IsNaN(zLoad) || cmplx.IsInf(zLoad) || real(zLoad) <= 0 {
		return nil, nil, fmt.Errorf("load %s ohm: %w", units.FormatImpedance(zLoad), ErrBadLoad)
	}
	var secs []Section
	var notes []string
	rl := real(zLoad)
	if math.Abs(imag(zLoad)) > 1e-9*cmplx.Abs(zLoad) {
		pts, err := RealPoints(zLoad, z0)
		if err != nil {
			return nil, nil, err
		}
		p := pts[0]
		rl = p.R
		secs = append(secs, Section{Kind: SeriesLine, Z0: z0, LengthDeg: p.LineDeg})
		notes = append(notes, fmt.Sprintf("the load is brought to a real %.4g ohm by %.2f° of %g ohm line (the nearer real point; the other is %.4g ohm at %.2f°)",
			p.R, p.LineDeg, z0, pts[1].R, pts[1].LineDeg))
	}
	var t Transformer
	var err error
	switch resp {
	case Binomial:
		t, err = BinomialTransformer(rl, z0, n)
	case Chebyshev:
		t, err = ChebyshevTransformer(rl, z0, n, fracBW)
	default:
		err = fmt.Errorf("%w: unknown response %v", ErrTransformer, resp)
	}
	if err != nil {
		return nil, nil, err
	}
	zs := make([]string, len(t.Z))
	for i, z := range t.Z {
		zs[i] = strconv.FormatFloat(z, 'f', 2, 64)
	}
	notes = append(notes, fmt.Sprintf("%d-section %s quarter-wave transformer from %.4g ohm to %g ohm: %s ohm from the load (small-reflection theory)",
		n, resp, rl, z0, strings.Join(zs, ", ")))
	return append(secs, t.Sections()...), notes, nil
}
