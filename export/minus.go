package export

import (
	"strings"
	"unicode"
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
