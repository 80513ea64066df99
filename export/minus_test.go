package export

import (
	"math"
	"testing"

	"stubcraft/synth"
)

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

// The Bode-Fano note every output writes: the limit's figure or the
// reason none is quoted, a minus sign U+2212 where a number starts and
// hyphens kept in words (the rows' own figures and text).
func TestBodeFanoNote(t *testing.T) {
	cases := []struct {
		bf   synth.BodeFanoLimit
		want string
	}{
		{synth.BodeFanoLimit{Status: synth.LimitQuoted, S11DB: -12.345}, "−12.35 dB"},
		{synth.BodeFanoLimit{Status: synth.LimitBelowFloor, S11DB: -75}, "below −60 dB: over this band the fitted load's reactance sets no practical limit"},
		{synth.BodeFanoLimit{Status: synth.LimitNoReactance, S11DB: math.NaN()}, "none: the load has no reactance across the band"},
		{synth.BodeFanoLimit{Status: synth.LimitPoorFit, S11DB: math.NaN(), Why: "the series-RC fit misses by -3.5 dB"}, "not quoted: the series-RC fit misses by −3.5 dB"},
	}
	for _, c := range cases {
		if got := BodeFanoNote(c.bf); got != c.want {
			t.Errorf("%v: %q, want %q", c.bf.Status, got, c.want)
		}
	}
}
