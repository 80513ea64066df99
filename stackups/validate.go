package stackups

import (
	"fmt"
	"strings"
	"stubcraft/stackups/tomlx"
	"unicode"
)

// Validation limits. They bound what the line models are fed to sensible
// boards; they are common practice, not taken from a standard.
const (
	maxEr            = 30     // above any printed-board ceramic in use
	minThickness     = 10e-6  // thinnest dielectric: a thin build-up film
	maxThickness     = 20e-3  // thickest: a thick plate
	maxCopper        = 500e-6 // about 14 oz foil
	maxRoughness     = 20e-6
	minConductivity  = 1e5 // below graphite-filled inks is not a conductor for our purpose
	maxConductivity  = 1e8 // above silver (6.3e7 S/m)
	maxMaskThickness = 200e-6
	maxGap           = 20e-3
	maxErFrequency   = 1e12
	maxSpread        = 0.5
)

// Validate reports the first value of s that is out of its range, as an
// *Error with Key and Value set and no Source or Line. Decode calls it on
// every stackup it reads.
func (s Stackup) Validate() error {
	for _, c := range s.checks() {
		if c.err != nil {
			return &Error{Key: c.key, Value: c.value(), Err: c.err}
		}
	}
	return nil
}

// check is one validated field: its key, its value as TOML writes it
// (made only when there is an error, as writing lengths exactly takes
// time), and what is wrong with it (nil when nothing is).
type check struct {
	key   string
	value func() string
	err   error
}

// Value writers for checks.
func textValue(s string) func() string { return func() string { return tomlx.Quote(s) } }
func numValue(v float64) func() string { return func() string { return tomlx.Number(v) } }
func lenValue(v float64) func() string { return func() string { return tomlx.Quote(formatLength(v)) } }
func freqValue(v float64) func() string {
	return func() string { return tomlx.Quote(formatFrequency(v)) }
}
func pctValue(v float64) func() string { return func() string { return tomlx.Quote(formatPercent(v)) } }
func noValue() string                  { return "" }

// checks lists the checks of every field in schema order.
func (s Stackup) checks() []check {
	d, c := s.Dielectric, s.Copper
	cs := []check{
		{"name", textValue(s.Name), checkName(s.Name)},
		{"description", textValue(s.Description), checkText("a description", s.Description)},
		{"line", textValue(s.Line.String()), checkLine(s.Line)},
		checkGap(s.Line, s.Gap),
		{"dielectric.er", numValue(d.Er), between("relative permittivity", d.Er, 1, maxEr, tomlx.Number)},
		{"dielectric.er_frequency", freqValue(d.ErFrequency), checkErFrequency(d.ErFrequency)},
		{"dielectric.loss_tangent", numValue(d.LossTangent), lossTangent(d.LossTangent)},
		{"dielectric.thickness", lenValue(d.Thickness), between("dielectric thickness", d.Thickness, minThickness, maxThickness, roundLength)},
		{"copper.thickness", lenValue(c.Thickness), between("copper thickness", c.Thickness, 0, maxCopper, roundLength)},
		{"copper.roughness", lenValue(c.Roughness), checkRoughness(c.Roughness, c.Thickness)},
		{"copper.conductivity", numValue(c.Conductivity), between("conductivity", c.Conductivity, minConductivity, maxConductivity, tomlx.Number)},
	}
	if m := s.Mask; m != nil {
		cs = append(cs,
			check{"mask.thickness", lenValue(m.Thickness), checkMaskThickness(m.Thickness)},
			check{"mask.er", numValue(m.Er), between("mask relative permittivity", m.Er, 1, maxEr, tomlx.Number)},
			check{"mask.loss_tangent", numValue(m.LossTangent), lossTangent(m.LossTangent)},
		)
	}
	if b := s.Board; b != nil {
		cs = append(cs,
			check{"board.layers", numValue(float64(b.Layers)), checkLayers(b.Layers)},
			check{"board.thickness", lenValue(b.Thickness), between("board thickness", b.Thickness, d.Thickness+2*c.Thickness, 10e-3, roundLength)},
		)
	}
	return append(cs,
		check{"spread.er", pctValue(s.Spread.ErRel), between("a spread", s.Spread.ErRel, 0, maxSpread, formatPercent)},
		check{"spread.thickness", pctValue(s.Spread.ThicknessRel), between("a spread", s.Spread.ThicknessRel, 0, maxSpread, formatPercent)},
	)
}

// between checks lo ≤ v ≤ hi, NaN failing, and says which bound was passed.
func between(what string, v, lo, hi float64, format func(float64) string) error {
	switch {
	case v < lo:
		return fmt.Errorf("%s must be at least %s", what, format(lo))
	case v > hi:
		return fmt.Errorf("%s must be at most %s", what, format(hi))
	case !(v >= lo && v <= hi):
		return fmt.Errorf("%s must be a number from %s to %s", what, format(lo), format(hi))
	}
	return nil
}

func checkName(name string) error {
	if strings.TrimSpace(name) == "" {
		return fmt.Errorf("a name must not be empty")
	}
	if strings.ContainsFunc(name, unicode.IsControl) {
		return fmt.Errorf("a name must be one line without control characters")
	}
	return checkText("a name", name)
}

func checkText(what, s string) error {
	if !validText(s) {
		return fmt.Errorf("%s must be valid UTF-8", what)
	}
	return nil
}

func checkLine(line LineKind) error {
	if line != Microstrip && line != GCPW {
		return fmt.Errorf("line must be %q or %q", Microstrip, GCPW)
	}
	return nil
}

func checkGap(line LineKind, gap float64) check {
	c := check{key: "gap", value: lenValue(gap)}
	switch {
	case line == GCPW && gap == 0:
		c.value = noValue
		c.err = fmt.Errorf("%w: a %s line needs the gap between strip and side grounds", ErrMissing, GCPW)
	case line == GCPW:
		c.err = between("the gap", gap, 0, maxGap, roundLength)
		if c.err == nil && gap <= 0 {
			c.err = fmt.Errorf("the gap must be positive")
		}
	case gap != 0:
		c.err = fmt.Errorf("a %s line has no gap (set line = %q for a grounded coplanar line)", Microstrip, GCPW)
	}
	return c
}

func checkErFrequency(f float64) error {
	if f == 0 {
		return nil // not given
	}
	if !(f > 0 && f <= maxErFrequency) {
		return fmt.Errorf("the frequency of er must be positive and at most %s", "1THz")
	}
	return nil
}

func lossTangent(t float64) error {
	if !(t >= 0 && t < 1) {
		return fmt.Errorf("a loss tangent must be at least 0 and less than 1")
	}
	return nil
}

func checkRoughness(r, copper float64) error {
	if err := between("roughness", r, 0, maxRoughness, roundLength); err != nil {
		return err
	}
	if copper > 0 && r >= copper {
		return fmt.Errorf("RMS roughness must be less than the copper thickness (%s)", roundLength(copper))
	}
	return nil
}

func checkMaskThickness(t float64) error {
	if err := between("mask thickness", t, 0, maxMaskThickness, roundLength); err != nil {
		return err
	}
	if t <= 0 {
		return fmt.Errorf("mask thickness must be positive (leave out [mask] for no mask)")
	}
	return nil
}

// checkLayers wants an even copper layer count from 2 to 32.
func checkLayers(n int) error {
	if n < 2 || n > 32 || n%2 != 0 {
		return fmt.Errorf("the board's copper layer count must be an even whole number from 2 to 32")
	}
	return nil
}
