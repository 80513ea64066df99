package physical

import "math"

// MitredBendShortening returns how much shorter (m) a 90° microstrip bend
// whose outer corner is cut by Douville and James's optimal miter (R. J.
// P. Douville and D. S. James, IEEE Trans. MTT 26(3), 1978) is
// electrically than its centre-line length, for a strip of width w on a
// substrate of height h (m):
//
//	δ = W·(0.50 + 0.34·exp(−3·(W/h − 0.5)))
//
// It is a fit to the project's full-wave (FDTD) record
// testdata/discontinuities/bend.tsv: six strips, W/h 0.5–3, εr
// 3.66–10.2, each drawn with two mitred bends and two lengths of the leg
// between them, nine frequencies up to f·h ≈ 4 GHz·mm. The full-wave
// excess phase is frequency-independent (a pure length) and the bends
// reflect little (|S11| ≤ 0.056 for the pair), so a length is the whole
// of the model. The fit is within 0.04·W of the per-bend shortening
// extrapolated to a zero-length leg (0.84 W at W/h 0.5, 0.48–0.57 W at
// W/h 0.94–3); the two leg lengths alone differ by up to 0.1·W (the
// solver's leg along y runs up to 5 % faster than one along x: an
// anisotropy of the coarse mesh, not of the bend), which is the
// uncertainty of these figures. It returns NaN for w or h not positive.
func MitredBendShortening(w, h float64) float64 {
	if !(w > 0) || !(h > 0) {
		return math.NaN()
	}
	return w * (0.50 + 0.34*math.Exp(-3*(w/h-0.5)))
}
