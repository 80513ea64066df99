package export

import "testing"

// A minus sign is U+2212 where a hyphen-minus starts a number, and a
// hyphen stays a hyphen in words, names, exponents, dates and impedances
// (Unicode 15, U+2212 MINUS SIGN and U+002D HYPHEN-MINUS).
func TestMinus(t *testing.T) {
	cases := []struct{ in, want string }{
		{"-36.0 dB", "−36.0 dB"},
		{"median -29.0 dB, 90th percentile -22.5 dB", "median −29.0 dB, 90th percentile −22.5 dB"},
		{"(-3 dB)", "(−3 dB)"},
		{"-21.48 dB → -35.99 dB", "−21.48 dB → −35.99 dB"},
		{"-.5", "−.5"},
		{"+0.135, -0.512", "+0.135, −0.512"},
		{"feed-load", "feed-load"},
		{"line-1 and stub-2", "line-1 and stub-2"},
		{"fr4-1.6mm", "fr4-1.6mm"},
		{"re-centring", "re-centring"},
		{"1e-3", "1e-3"},
		{"2026-12-04", "2026-12-04"},
		{"31-j24", "31-j24"},
		{"--force", "--force"},
		{"a - b", "a - b"},
		{"", ""},
		{"-", "-"},
	}
	for _, c := range cases {
		if got := Minus(c.in); got != c.want {
			t.Errorf("Minus(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}
