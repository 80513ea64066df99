package synth

import (
	"math"

	"stubcraft/physical"
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
	closed := func(w float64, s physical.Substrate) (physical.LineModel, error) {
		m, err := physical.NewMicrostrip(w, s)
		if err != nil {
			return nil, err
		}
		return scaledLine{m, lineRatio{z: ratio(w), e: 1, ac: 1, ad: 1}}, nil
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
		cf, err := physical.NewMicrostrip(w, bare)
		if err != nil || !(p.Z0 > 0) {
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
		pts = append(pts, point{math.Log(w), math.Log(p.Z0 / cf.At(freq).Z0)})
	}
	return WidthResult{}, false, nil
}
