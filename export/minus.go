package export

import (
	"strings"
	"unicode"

	"stubcraft/synth"
)

// Minus writes the minus signs of s as U+2212, as every figure of the
// reports and the drawing is written: an ASCII hyphen-minus becomes one
// where it starts a number, that is where a digit or a point follows it
// and no letter, digit or point comes before it ("-36.0 dB", "(-3 dB)",
// "→ -35.99"). A hyphen inside a word or a name ("feed-load", "line-1",
// "fr4-1.6mm", "re-centring"), an exponent ("1e-3"), a date or an
// impedance ("31-j24") stays as it is.
func Minus(s string) string {
	if !strings.Contains(s, "-") {
		return s
	}
	rs := []rune(s)
	var b strings.Builder
	for i, r := range rs {
		if r == '-' && startsNumber(rs, i) {
			r = '−'
		}
		b.WriteRune(r)
	}
	return b.String()
}

// BodeFanoNote is the Bode-Fano limit of a band match in words, as every
// output writes it (report.json's bode_fano_note, the build's summary
// through it, solve --band's listing and its JSON): the figure with what
// it rests on or why there is none (synth.BodeFanoLimit.String), its
// minus signs U+2212.
func BodeFanoNote(bf synth.BodeFanoLimit) string { return Minus(bf.String()) }

// startsNumber reports whether the hyphen at rs[i] starts a number.
func startsNumber(rs []rune, i int) bool {
	if i+1 >= len(rs) || !(unicode.IsDigit(rs[i+1]) || rs[i+1] == '.') {
		return false
	}
	if i == 0 {
		return true
	}
	p := rs[i-1]
	return !(unicode.IsLetter(p) || unicode.IsDigit(p) || p == '.' || p == '_' || p == '-')
}
