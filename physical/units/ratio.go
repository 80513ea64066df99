package units

import (
	"fmt"
	"strings"
)

// ParseNumber reads a plain finite number with no unit ("3.5", "-2e-3").
func ParseNumber(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"number", s, err}
	}
	if u != "" {
		return 0, &NumError{"number", s, fmt.Errorf("%w %q (a plain number is wanted)", ErrUnit, u)}
	}
	return v, nil
}

// ParsePercent reads a percentage, "5%", and returns the fraction 0.05. The
// percent sign is required.
func ParsePercent(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"percentage", s, err}
	}
	if u != "%" {
		return 0, &NumError{"percentage", s, fmt.Errorf("%w (for example %g%%)", ErrNoUnit, v)}
	}
	return v / 100, nil
}

// ParseFraction reads a fraction written plainly ("0.005") or as a
// percentage ("0.5%") and returns the fraction.
func ParseFraction(s string) (float64, error) {
	if strings.HasSuffix(strings.TrimSpace(s), "%") {
		v, err := ParsePercent(s)
		if err != nil {
			return 0, &NumError{"fraction", s, err.(*NumError).Err}
		}
		return v, nil
	}
	v, err := ParseNumber(s)
	if err != nil {
		return 0, &NumError{"fraction", s, err.(*NumError).Err}
	}
	return v, nil
}

// ParseAngle reads a geometric angle in degrees, written "10deg", "10°" or
// plainly "10", and returns degrees.
func ParseAngle(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"angle", s, err}
	}
	switch strings.ToLower(u) {
	case "", "deg", "°", "degrees":
		return v, nil
	}
	return 0, &NumError{"angle", s, fmt.Errorf("%w %q (use deg)", ErrUnit, u)}
}
