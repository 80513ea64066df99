package synth

import (
	"fmt"
	"math"

	"stubcraft/physical"
	"stubcraft/physical/fieldsolve"
)

// ApproximateModel is a line model computed numerically to a stated
// relative accuracy of Z0, such as the field solver's (fieldsolve.Model).
type ApproximateModel interface {
	physical.LineModel
	// Accuracy is the relative accuracy of Z0 the model was computed to.
	Accuracy() float64
}

// Limits of the mapped width search.
const (
	// mappedAccuracy is how close to the target, relative to the model's
	// own accuracy, the mapped search brings Z0: a hundredth, so that the
	// search adds nothing that matters to the model's error.
	mappedAccuracy = 0.01
	// mappedMaxSolves caps the model evaluations before the bracketing
	// search takes over.
	mappedMaxSolves = 6
)

// widthMapped searches the width of an expensive numerical model with the
// closed-form microstrip (Hammerstad-Jensen + Kirschning-Jansen, on the
// same dielectric without solder mask) as a map: the ratio k(W) of the
// model's Z0 to the closed form's varies slowly with the width, so each step
// solves Z_closed(W)·k(W) = z0 with the closed forms alone, k taken from
// the model evaluations so far (constant after one, linear in ln W through
// the last two after that). The first width is the closed form's own; the
// second usually lands within the accuracy already, so a field-solver
// synthesis costs two or three solves where the bracketing search costs six
// to eight. It stops when Z0 is within mappedAccuracy of the model's stated
// accuracy of z0.
//
// ok is false, with no error, when mk does not make ApproximateModels or
// the search did not settle; the caller then runs the bracketing search.
func widthMapped(mk LineMaker, sub physical.Substrate, z0, freq float64) (r WidthResult, ok bool, err error) {
	bare := sub
	bare.MaskThickness, bare.MaskEr, bare.MaskLossTangent = 0, 0, 0
	type point struct{ lnW, lnK float64 }
	var pts []point
	ratio := func(w float64) float64 {
		switch n := len(pts); n {
		case 0:
			return 1
		case 1:
			return math.Exp(pts[0].lnK)
		default:
			a, b := pts[n-2], pts[n-1]
			if a.lnW == b.lnW {
				return math.Exp(b.lnK)
			}
			t := (math.Log(w) - b.lnW) / (b.lnW - a.lnW)
			return math.Exp(b.lnK + t*(b.lnK-a.lnK))
		}
	}
	// gcpw is set once the first solve shows a grounded coplanar line:
	// from then on the map is the conformal-mapping GCPW, whose ratio to
	// the solver varies far less with the width than the microstrip's.
	var gcpw *fieldsolve.CrossSection
	closed := func(w float64, s physical.Substrate) (physical.LineModel, error) {
		if gcpw != nil {
			z, err := conformalGCPW(w, gcpw.Gap, gcpw.Height, gcpw.Er)
			if err != nil {
				return nil, err
			}
			return mapLine{z: z * ratio(w), w: w, sub: s}, nil
		}
		m, err := physical.NewMicrostrip(w, s)
		if err != nil {
			return nil, err
		}
		return scaledLine{m, lineRatio{z: ratio(w), e: 1, ac: 1, ad: 1}}, nil
	}
	base := func(w float64) (float64, error) {
		if gcpw != nil {
			return conformalGCPW(w, gcpw.Gap, gcpw.Height, gcpw.Er)
		}
		cf, err := physical.NewMicrostrip(w, bare)
		if err != nil {
			return 0, err
		}
		return cf.At(freq).Z0, nil
	}
	var best WidthResult
	bestErr := math.Inf(1)
	for range mappedMaxSolves {
		guess, err := widthBracketed(closed, bare, z0, freq)
		if err != nil {
			return WidthResult{}, false, nil
		}
		w := guess.Width
		m, err := mk(w, sub)
		if err != nil {
			return WidthResult{}, false, err
		}
		am, isApprox := m.(ApproximateModel)
		if !isApprox {
			return WidthResult{}, false, nil
		}
		p := m.At(freq)
		if !(p.Z0 > 0) {
			return WidthResult{}, false, nil
		}
		if cm, ok := m.(interface {
			CrossSection() fieldsolve.CrossSection
		}); ok && gcpw == nil && len(pts) == 0 {
			if cs := cm.CrossSection(); cs.Geometry == fieldsolve.GCPW && cs.Gap > 0 && cs.Height > 0 {
				gcpw = &cs
			}
		}
		zb, err := base(w)
		if err != nil || !(zb > 0) {
			return WidthResult{}, false, nil
		}
		zs, es := m.Static()
		rel := math.Abs(p.Z0/z0 - 1)
		if rel < bestErr {
			bestErr = rel
			best = WidthResult{Width: w, Model: m, Params: p, Z0Static: zs, EpsEffStatic: es}
		}
		if rel <= mappedAccuracy*am.Accuracy() {
			best.Warnings = best.Model.Warnings(freq)
			return best, true, nil
		}
		pts = append(pts, point{math.Log(w), math.Log(p.Z0 / zb)})
	}
	return WidthResult{}, false, nil
}

// mapLine is the GCPW map of widthMapped: a line that has only an
// impedance.
type mapLine struct {
	z, w float64
	sub  physical.Substrate
}

func (l mapLine) At(float64) physical.LineParams { return physical.LineParams{Z0: l.z, EpsEff: 1} }
func (l mapLine) Static() (z0, epsEff float64)   { return l.z, 1 }
func (l mapLine) Warnings(float64) []string      { return nil }
func (l mapLine) Strip() (float64, physical.Substrate) {
	return l.w, l.sub
}
func (l mapLine) Name() string { return "conformal-mapping GCPW (width search map)" }

// conformalGCPW is the quasi-static impedance of a conductor-backed
// coplanar waveguide of zero thickness with infinitely wide side grounds,
// by conformal mapping with the partial-capacitance split at the strip
// plane (G. Ghione and C. Naldi, 1987; from memory): with a = w/2,
// b = w/2 + gap, k = a/b and k1 = tanh(πa/2h)/tanh(πb/2h),
// q = [K(k1)/K(k1′)]/[K(k)/K(k′)], εeff = (1 + εr·q)/(1 + q) and
// Z0 = η0 / (2√εeff · (K(k)/K(k′) + K(k1)/K(k1′))). It serves only as the
// map of the width search: the field solver corrects it, so its error
// (thickness, finite grounds, the split) costs at most a solve, never
// accuracy.
func conformalGCPW(w, gap, h, er float64) (float64, error) {
	a, b := w/2, w/2+gap
	k := a / b
	k1 := math.Tanh(math.Pi*a/(2*h)) / math.Tanh(math.Pi*b/(2*h))
	if !(k > 0 && k < 1 && k1 > 0 && k1 < 1) {
		return 0, fmt.Errorf("conformal GCPW: no map for width %g m, gap %g m, height %g m", w, gap, h)
	}
	rk, rk1 := ellipticKRatio(k), ellipticKRatio(k1)
	q := rk1 / rk
	epsEff := (1 + er*q) / (1 + q)
	return physical.Eta0 / (2 * math.Sqrt(epsEff) * (rk + rk1)), nil
}

// ellipticKRatio is K(k)/K(k′), k′ = √(1−k²), K the complete elliptic
// integral of the first kind, each by the arithmetic-geometric mean
// K(k) = π / (2·AGM(1, k′)) (Abramowitz and Stegun 17.6).
func ellipticKRatio(k float64) float64 {
	kp := math.Sqrt(1 - k*k)
	return agmK(kp) / agmK(k)
}

// agmK is K(k) given k′ (π / (2·AGM(1, k′))).
func agmK(kp float64) float64 {
	a, b := 1.0, kp
	for i := 0; i < 60 && math.Abs(a-b) > 1e-15*a; i++ {
		a, b = (a+b)/2, math.Sqrt(a*b)
	}
	return math.Pi / (2 * a)
}
