package synth

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strconv"
	"strings"
	"stubcraft/physical/units"
)

// StubEnd is how the far end of a shunt stub is terminated. The zero value
// is no termination at all (not a stub), so a forgotten end is noticed.
type StubEnd int

// Stub terminations.
const (
	Open  StubEnd = iota + 1 // the stub's far end is left open
	Short                    // the stub's far end goes to ground through a via
)

// String returns "open" or "short", the words ParseStubEnd reads.
func (e StubEnd) String() string {
	switch e {
	case Open:
		return "open"
	case Short:
		return "short"
	}
	return "StubEnd(" + strconv.Itoa(int(e)) + ")"
}

// ParseStubEnd reads "open" or "short" (case and surrounding space ignored).
func ParseStubEnd(s string) (StubEnd, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "open":
		return Open, nil
	case "short":
		return Short, nil
	}
	return 0, fmt.Errorf("unknown stub end %q (use open or short)", s)
}

// Reasons a load cannot be matched, carried (wrapped) by the errors of
// SolveShuntStub and SolveShuntStubZ.
var (
	// ErrMatched reports a load whose reflection against z0 is below
	// MatchedGamma: there is nothing to match, and rather than invent a
	// neutral half-wave line and stub the solver says so.
	ErrMatched = errors.New("the load is already matched")
	// ErrUnmatchable reports a load that no lossless single shunt stub can
	// match: a purely reactive one, or one out of reach of the series line.
	ErrUnmatchable = errors.New("the load cannot be matched by a single shunt stub")
	// ErrBadLoad reports a load impedance that is not a passive finite value.
	ErrBadLoad = errors.New("the load impedance is not usable")
)

// MatchedGamma is the reflection magnitude below which a load counts as
// already matched (a return loss better than 120 dB; common practice, no
// source: far below what any board can measure).
const MatchedGamma = 1e-6

// StubSolution is one single-shunt-stub match: a series line of LineZ0 from
// the load to the stub, LineDeg long, and a shunt stub of StubZ0, StubDeg
// long, terminated by End. Both lengths are electrical, in degrees, in the
// half-open range (0, 180]: lines and stubs repeat every half wavelength.
type StubSolution struct {
	LineDeg float64 // electrical length of the series line from the load to the stub, degrees
	StubDeg float64 // electrical length of the shunt stub, degrees
	End     StubEnd // stub termination
	StubZ0  float64 // characteristic impedance of the stub, ohm
	LineZ0  float64 // characteristic impedance of the series line, ohm
}

// LineWL returns the series line length in wavelengths.
func (s StubSolution) LineWL() float64 { return s.LineDeg / 360 }

// StubWL returns the stub length in wavelengths.
func (s StubSolution) StubWL() float64 { return s.StubDeg / 360 }

// TotalDeg returns the line and stub lengths added, degrees: the measure
// Pick uses for "shortest".
func (s StubSolution) TotalDeg() float64 { return s.LineDeg + s.StubDeg }

// LoadReport returns how badly zLoad is matched to z0: the reflection
// magnitude |Γ| = |(ZL−Z0)/(ZL+Z0)|, the voltage standing-wave ratio
// (1+|Γ|)/(1−|Γ|) (+Inf when |Γ| ≥ 1) and the return loss −20·log10|Γ| in
// dB (+Inf for a perfect match).
func LoadReport(zLoad complex128, z0 float64) (gammaMag, vswr, returnLossDB float64) {
	// |ZL−Z0| / |ZL+Z0| with hypot, so that a reactive load gives exactly 1.
	r, x := real(zLoad), imag(zLoad)
	gammaMag = math.Hypot(r-z0, x) / math.Hypot(r+z0, x)
	if gammaMag >= 1 {
		vswr = math.Inf(1)
	} else {
		vswr = (1 + gammaMag) / (1 - gammaMag)
	}
	returnLossDB = -20 * math.Log10(gammaMag)
	return gammaMag, vswr, returnLossDB
}

// SolveShuntStub returns the single-shunt-stub matches of zLoad to z0 with
// line and stub of impedance z0. See SolveShuntStubZ.
func SolveShuntStub(zLoad complex128, z0 float64, end StubEnd) ([]StubSolution, error) {
	return SolveShuntStubZ(zLoad, z0, z0, z0, end)
}

// SolveShuntStubZ returns the single-shunt-stub matches of zLoad to z0, for
// a series line of lineZ0 between the load and the stub and a stub of
// stubZ0. There are usually two, sorted by line length (solution 1 puts the
// stub nearest the load); one when the two coincide.
//
// Method (closed form, in the manner of Pozar, Microwave Engineering 4th
// ed. §5.2, generalised to lineZ0 ≠ z0): normalise the load to the line,
// zL = r + jx = ZL/lineZ0, and let t = tan βd. The admittance looking into
// the line, normalised to the line, is y(t) = (1 + j·zL·t)/(zL + j·t), whose
// real part is r(1+t²)/(r² + (x+t)²). Asking it to equal g0 = lineZ0/z0
// gives the quadratic
//
//	(r − g0)·t² − 2·g0·x·t + (r − g0·(r² + x²)) = 0.
//
// Its roots are taken as angles, βd = atan2(numerator, denominator) of the
// numerically stable quadratic formula, so that a vanishing leading
// coefficient (r = g0, for example RL = Z0 on a z0 line) yields the root at
// t = ∞, a quarter-wave line, instead of a division by zero. The stub then
// cancels the susceptance B left at that point: an open stub needs
// tan βl = −B·stubZ0, a shorted one tan βl = 1/(B·stubZ0).
//
// Errors wrap ErrBadLoad (negative resistance, infinite or NaN load),
// ErrUnmatchable (purely reactive load, or a load the series line cannot
// bring to Re(Y) = 1/z0 when lineZ0 ≠ z0) or ErrMatched (|Γ| < MatchedGamma).
func SolveShuntStubZ(zLoad complex128, z0, lineZ0, stubZ0 float64, end StubEnd) ([]StubSolution, error) {
	for _, p := range []struct {
		name string
		v    float64
	}{{"reference impedance z0", z0}, {"line impedance", lineZ0}, {"stub impedance", stubZ0}} {
		if !(p.v > 0) || math.IsInf(p.v, 0) {
			return nil, fmt.Errorf("the %s must be positive and finite, not %g ohm", p.name, p.v)
		}
	}
	if end != Open && end != Short {
		return nil, fmt.Errorf("the stub end must be open or short, not %v", end)
	}
	if cmplx.IsNaN(zLoad) || cmplx.IsInf(zLoad) {
		return nil, fmt.Errorf("load %s ohm: %w: not a finite value", units.FormatImpedance(zLoad), ErrBadLoad)
	}
	if real(zLoad) < 0 {
		return nil, fmt.Errorf("load %s ohm: %w: negative resistance (an active load)", units.FormatImpedance(zLoad), ErrBadLoad)
	}
	gamma, _, _ := LoadReport(zLoad, z0)
	if real(zLoad) == 0 || gamma > 1-1e-12 {
		return nil, fmt.Errorf("load %s ohm: %w: it is purely reactive (|Γ| = 1)", units.FormatImpedance(zLoad), ErrUnmatchable)
	}
	if gamma < MatchedGamma {
		return nil, &MatchedError{Load: zLoad, Z0: z0, Gamma: gamma}
	}

	zl := zLoad / complex(lineZ0, 0)
	r, x := real(zl), imag(zl)
	g0 := lineZ0 / z0
	a := r - g0
	b := -2 * g0 * x
	c := r - g0*(r*r+x*x)
	// The discriminant b²−4ac, in the factored form 4r(g0(r²+x²+1) − r(1+g0²)),
	// which loses no digits when the load is close to a match.
	disc := 4 * r * (g0*(r*r+x*x+1) - r*(1+g0*g0))
	scale := 4 * r * (g0*(r*r+x*x+1) + r*(1+g0*g0))
	if disc < 0 {
		if disc < -1e-12*scale {
			return nil, fmt.Errorf("load %s ohm: %w: no point on a %g ohm line has a conductance of 1/%g S", units.FormatImpedance(zLoad), ErrUnmatchable, lineZ0, z0)
		}
		disc = 0
	}
	sq := math.Sqrt(disc)
	if b < 0 {
		sq = -sq
	}
	q := -(b + sq) / 2
	// Roots t1 = q/a and t2 = c/q, written as angles (y, x) for atan2.
	var angles [][2]float64
	if q != 0 {
		angles = [][2]float64{{q, a}, {c, q}}
	} else {
		// b = 0 and disc = 0: the double root t = 0 when c = 0, otherwise
		// a·t² = −c.
		if a == 0 {
			return nil, fmt.Errorf("load %s ohm: %w: degenerate line condition", units.FormatImpedance(zLoad), ErrUnmatchable)
		}
		s := math.Sqrt(math.Max(0, -c/a))
		angles = [][2]float64{{s, 1}, {-s, 1}}
	}
	var sols []StubSolution
	for _, yx := range angles {
		theta := math.Atan2(yx[0], yx[1])
		lineDeg := matchNorm180(theta * 180 / math.Pi)
		dup := false
		for _, s := range sols {
			if math.Abs(s.LineDeg-lineDeg) < 1e-9 || math.Abs(math.Abs(s.LineDeg-lineDeg)-180) < 1e-9 {
				dup = true
			}
		}
		if dup {
			continue
		}
		th := lineDeg * math.Pi / 180
		y := matchLineAdmittance(zLoad, lineZ0, th)
		sols = append(sols, StubSolution{
			LineDeg: lineDeg,
			StubDeg: matchStubDeg(-imag(y), stubZ0, end),
			End:     end,
			StubZ0:  stubZ0,
			LineZ0:  lineZ0,
		})
	}
	sort.SliceStable(sols, func(i, j int) bool { return sols[i].LineDeg < sols[j].LineDeg })
	return sols, nil
}

// matchLineAdmittance returns the admittance looking into a lossless line
// of impedance zc and electrical length theta (radians) ending in zLoad.
func matchLineAdmittance(zLoad complex128, zc, theta float64) complex128 {
	zcc := complex(zc, 0)
	cs, sn := complex(math.Cos(theta), 0), complex(0, math.Sin(theta))
	return (zcc*cs + zLoad*sn) / (zcc * (zLoad*cs + zcc*sn))
}

// matchStubDeg returns the length, in degrees in (0, 180], of a stub of
// impedance zs and termination end whose input susceptance is bStub.
func matchStubDeg(bStub, zs float64, end StubEnd) float64 {
	if end == Short {
		// Y = −j·cot(βl)/zs = j·bStub ⇒ tan βl = −1/(bStub·zs); atan2 keeps
		// bStub = 0 finite (a quarter-wave shorted stub).
		return matchNorm180(math.Atan2(1, -bStub*zs) * 180 / math.Pi)
	}
	// Y = j·tan(βl)/zs = j·bStub.
	return matchNorm180(math.Atan(bStub*zs) * 180 / math.Pi)
}

// matchNorm180 maps an angle in degrees into (0, 180].
func matchNorm180(deg float64) float64 {
	v := math.Mod(deg, 180)
	if v < 0 {
		v += 180
	}
	if v == 0 {
		v = 180
	}
	return v
}

// Pick says which solution of a solve to take: PickShortest, or Pick(n)
// for the n-th solution of the list, counted from 1.
type Pick int

// PickShortest takes the solution with the least total electrical length
// (line plus stub; the first on a tie).
const PickShortest Pick = 0

// String returns the pick as a design file writes it: "shortest", "1", "2".
func (p Pick) String() string {
	if p == PickShortest {
		return "shortest"
	}
	return strconv.Itoa(int(p))
}

// ParsePick reads "shortest" or a solution number from 1.
func ParsePick(s string) (Pick, error) {
	t := strings.ToLower(strings.TrimSpace(s))
	if t == "shortest" {
		return PickShortest, nil
	}
	n, err := strconv.Atoi(t)
	if err != nil || n < 1 {
		return 0, fmt.Errorf("unknown pick %q (use shortest, 1 or 2)", s)
	}
	return Pick(n), nil
}

// PickSolution chooses one of solutions as p says.
func PickSolution(solutions []StubSolution, p Pick) (StubSolution, error) {
	if len(solutions) == 0 {
		return StubSolution{}, errors.New("there is no solution to pick from")
	}
	if p == PickShortest {
		best := 0
		for i, s := range solutions {
			if s.TotalDeg() < solutions[best].TotalDeg() {
				best = i
			}
		}
		return solutions[best], nil
	}
	n := int(p)
	if n < 1 || n > len(solutions) {
		return StubSolution{}, fmt.Errorf("pick %q: there are %d solutions", p, len(solutions))
	}
	return solutions[n-1], nil
}
