package synth

import (
	"errors"
	"fmt"
	"math"
	"strconv"

	"stubcraft/physical"
	"stubcraft/physical/fieldsolve"
)

// ErrOutOfRange is wrapped by every refusal of a quantity outside the
// range the models support; the message gives the range.
var ErrOutOfRange = errors.New("out of range")

// Frequencies a design, a trace or a sweep may use, Hz.
//
// Below MinFrequency a quarter-wave line is tens of metres long and the
// copper is thinner than a skin depth, so the skin-effect loss model no
// longer holds; above MaxFrequency the quasi-static microstrip models,
// the T-junction and the open end are far outside the ranges their papers
// give (common practice, no source: the span of printed stub matching).
const (
	MinFrequency = 1e6
	MaxFrequency = 110e9
)

// The sweep may reach this far beyond the design frequency range, Hz: a
// default sweep of ±30 % around any design frequency stays inside.
const (
	MinSweepFrequency = MinFrequency / 2
	MaxSweepFrequency = MaxFrequency * 2
)

// Lengths a layout may ask for, m (common practice, no source: a feed or
// a margin longer than a large production panel, about half a metre, is a
// typing error; a via outside 50 µm – 5 mm is not drilled on a board).
const (
	MaxFeedLength = 0.5
	MaxMargin     = 0.1
	MinBoardSide  = 1e-3
	MaxBoardSide  = 1.0
	MinViaDrill   = 50e-6
	MaxViaDrill   = 5e-3
	MaxViaPad     = 10e-3
	MaxViaPitch   = 20e-3
	MinFabWidth   = 10e-6
	MaxFabWidth   = 5e-3
	MaxEtchSpread = 1e-3
)

// MaxHeightOverWavelength is the largest dielectric height a design may
// have, in free-space wavelengths at its frequency: h/λ0 = 0.13 is the top
// of the Kirschning-Jansen dispersion range (Electronics Letters 18, 1982,
// from memory), beyond which the line models and the discontinuity
// corrections have no support.
const MaxHeightOverWavelength = 0.13

// RangeError is a refusal of a quantity outside the range the models
// support. Its message gives the range (the caller names the key or flag);
// errors.Is(err, ErrOutOfRange) holds for it.
type RangeError struct{ Msg string }

func (e *RangeError) Error() string { return e.Msg }

// Is reports whether target is ErrOutOfRange.
func (e *RangeError) Is(target error) bool { return target == ErrOutOfRange }

// rangeError formats a RangeError.
func rangeError(format string, args ...any) error {
	return &RangeError{Msg: fmt.Sprintf(format, args...)}
}

// FormatHz writes a frequency with the unit a reader would pick ("1 MHz",
// "110 GHz").
func FormatHz(f float64) string {
	switch a := math.Abs(f); {
	case a >= 1e9:
		return strconv.FormatFloat(f/1e9, 'g', 4, 64) + " GHz"
	case a >= 1e6:
		return strconv.FormatFloat(f/1e6, 'g', 4, 64) + " MHz"
	case a >= 1e3:
		return strconv.FormatFloat(f/1e3, 'g', 4, 64) + " kHz"
	}
	return strconv.FormatFloat(f, 'g', 4, 64) + " Hz"
}

// formatMM writes a length in millimetres.
func formatMM(m float64) string { return strconv.FormatFloat(m*1e3, 'g', 4, 64) + " mm" }

// CheckFrequency refuses a frequency (Hz) outside MinFrequency to
// MaxFrequency.
func CheckFrequency(f float64) error {
	if !(f >= MinFrequency && f <= MaxFrequency) {
		return rangeError("the frequency must be from %s to %s, the range of the line models", FormatHz(MinFrequency), FormatHz(MaxFrequency))
	}
	return nil
}

// CheckFrequencyOn refuses a frequency (Hz) at which the dielectric of sub
// is more than MaxHeightOverWavelength free-space wavelengths thick.
func CheckFrequencyOn(f float64, sub physical.Substrate) error {
	if err := CheckFrequency(f); err != nil {
		return err
	}
	if fmax := MaxHeightOverWavelength * physical.C0 / sub.Height; f > fmax {
		return rangeError("at %s the %s dielectric is %.3g wavelengths thick, above the %g the microstrip models support; use at most %s on this stackup, or a thinner one",
			FormatHz(f), formatMM(sub.Height), f*sub.Height/physical.C0, MaxHeightOverWavelength, FormatHz(math.Floor(fmax/1e6)*1e6))
	}
	return nil
}

// CheckLineZ0 refuses a line impedance (ohm) outside MinLineZ0 to MaxLineZ0.
func CheckLineZ0(z float64) error {
	if !(z >= MinLineZ0 && z <= MaxLineZ0) {
		return rangeError("a line impedance must be from %g to %g ohm for a printable microstrip", MinLineZ0, MaxLineZ0)
	}
	return nil
}

// CheckElectricalLength refuses an electrical length (degrees) that is not
// positive or is longer than MaxSectionDeg.
func CheckElectricalLength(deg float64) error {
	if !(deg > 0 && deg <= MaxSectionDeg) {
		return rangeError("an electrical length must be more than 0° and at most %g° (two wavelengths)", float64(MaxSectionDeg))
	}
	return nil
}

// CheckStripWidth refuses a strip width (m) on sub outside what width
// synthesis explores: MinWidth to MaxWidthOverH dielectric heights.
func CheckStripWidth(w float64, sub physical.Substrate) error {
	hi := MaxWidthOverH * sub.Height
	if !(w >= MinWidth && w <= hi) {
		return rangeError("the strip width must be from %s to %s (%g dielectric heights) on this stackup", formatMM(MinWidth), formatMM(hi), float64(MaxWidthOverH))
	}
	return nil
}

// Cross-section proportions the field solver is asked to solve (common
// practice, no source: beyond these the line is not a printed line, and
// the graded grid needs more nodes than a solve should take).
const (
	minCrossRatio = 1e-3 // smallest width, gap, copper or mask, in dielectric heights
	maxCrossRatio = 1e3  // largest width or gap, in dielectric heights
	minHeight     = 1e-6 // thinnest dielectric, m
	maxHeight     = 0.1  // thickest dielectric, m
)

// CheckCrossSection refuses a cross-section whose proportions lie outside
// what the field solver is meant for, before any grid is built. The error
// is a *fieldsolve.InputError naming the field, so callers can name their
// own key or flag.
func CheckCrossSection(cs fieldsolve.CrossSection) error {
	h := cs.Height
	if cs.Geometry == fieldsolve.Stripline {
		h = cs.Spacing
		if !(h >= minHeight && h <= maxHeight) {
			return &fieldsolve.InputError{Field: "Spacing", Value: h, Err: rangeError("the plane spacing must be from %s to %s", formatMM(minHeight), formatMM(maxHeight))}
		}
	} else if !(h >= minHeight && h <= maxHeight) {
		return &fieldsolve.InputError{Field: "Height", Value: h, Err: rangeError("the dielectric height must be from %s to %s", formatMM(minHeight), formatMM(maxHeight))}
	}
	lo, hi := minCrossRatio*h, maxCrossRatio*h
	for _, f := range []struct {
		field string
		v     float64
		zero  bool // 0 allowed (absent)
		max   float64
	}{
		{"Width", cs.Width, false, hi},
		{"Gap", cs.Gap, cs.Geometry != fieldsolve.GCPW, hi},
		{"GroundWidth", cs.GroundWidth, true, hi},
		{"Thickness", cs.Thickness, true, h},
		{"MaskThickness", cs.MaskThickness, true, h},
	} {
		if f.zero && f.v == 0 {
			continue
		}
		if !(f.v >= lo && f.v <= f.max) {
			return &fieldsolve.InputError{Field: f.field, Value: f.v, Err: rangeError("must be from %s to %s (%g to %g dielectric heights of %s)",
				formatMM(lo), formatMM(f.max), minCrossRatio, f.max/h, formatMM(h))}
		}
	}
	return nil
}
