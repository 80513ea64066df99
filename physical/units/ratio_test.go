package units

import (
	"errors"
	"testing"
)

// The expected values are exact decimal arithmetic (a percentage is a
// hundredth by definition).
func TestParseRatiosAndAngles(t *testing.T) {
	cases := []struct {
		name  string
		parse func(string) (float64, error)
		in    string
		want  float64
		err   error
	}{
		{"number", ParseNumber, "3.5", 3.5, nil},
		{"number with unit", ParseNumber, "3.5mm", 0, ErrUnit},
		{"number nan", ParseNumber, "nan", 0, ErrSyntax},
		{"percent", ParsePercent, "5%", 0.05, nil},
		{"percent spaced", ParsePercent, " 2.5 % ", 0.025, nil},
		{"percent bare", ParsePercent, "5", 0, ErrNoUnit},
		{"fraction plain", ParseFraction, "0.005", 0.005, nil},
		{"fraction percent", ParseFraction, "0.5%", 0.005, nil},
		{"fraction junk", ParseFraction, "half", 0, ErrSyntax},
		{"fraction overflow", ParseFraction, "1e999%", 0, ErrNotFinite},
		{"angle plain", ParseAngle, "10", 10, nil},
		{"angle deg", ParseAngle, "10deg", 10, nil},
		{"angle sign", ParseAngle, "12.5°", 12.5, nil},
		{"angle rad", ParseAngle, "1rad", 0, ErrUnit},
	}
	for _, c := range cases {
		got, err := c.parse(c.in)
		if c.err != nil {
			var ne *NumError
			if !errors.Is(err, c.err) || !errors.As(err, &ne) || ne.Text != c.in {
				t.Errorf("%s: %q: got %v, want %v in a NumError naming the text", c.name, c.in, err, c.err)
			}
			continue
		}
		if err != nil || abs(got-c.want) > 1e-15 {
			t.Errorf("%s: %q = %v, %v; want %v", c.name, c.in, got, err, c.want)
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
