package tune

import (
	"fmt"
	"math"

	"stubcraft/physical"
)

// The usable phase range of a TRL line standard: the line's electrical
// length, relative to the thru, must stay between 20° and 160° so that the
// calibration stays well conditioned (Engen and Hoer, "Thru-Reflect-Line:
// an improved technique for calibrating the dual six-port automatic
// network analyzer", IEEE Trans. MTT 27(12), 1979; the 20°–160° bound is
// the usual reading of their condition, from memory).
const (
	TRLMinDeg = 20.0
	TRLMaxDeg = 160.0
)

// TRLLine is the line standard of a TRL calibration kit: a length of line
// beyond the thru with a quarter wave at the design frequency.
type TRLLine struct {
	Extra  float64 // length beyond the thru, m
	Lo, Hi float64 // usable band, Hz: the line's phase is 20° at Lo and 160° at Hi
	DegF0  float64 // electrical length at f0, degrees (90 by construction)
}

// NewTRLLine sizes the line standard for line (the port line's model) at
// f0: the extra length is a quarter of the guided wavelength at f0, and the
// usable band's edges are where the dispersive phase reaches 20° and 160°
// (bisection on β(f)·ΔL, which rises monotonically with f).
func NewTRLLine(line physical.LineModel, f0 float64) (TRLLine, error) {
	p := line.At(f0)
	if !(p.Beta() > 0) {
		return TRLLine{}, fmt.Errorf("TRL line: no propagation at %.6g GHz", f0/1e9)
	}
	l := (math.Pi / 2) / p.Beta()
	phase := func(f float64) float64 { return line.At(f).Beta() * l * 180 / math.Pi }
	edge := func(deg, lo, hi float64) float64 {
		for i := 0; i < 200 && hi-lo > 1e-9*hi; i++ {
			mid := (lo + hi) / 2
			if phase(mid) < deg {
				lo = mid
			} else {
				hi = mid
			}
		}
		return (lo + hi) / 2
	}
	return TRLLine{
		Extra: l,
		Lo:    edge(TRLMinDeg, f0*0.01, f0),
		Hi:    edge(TRLMaxDeg, f0, f0*4),
		DegF0: phase(f0),
	}, nil
}
