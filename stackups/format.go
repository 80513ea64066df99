package stackups

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"stubcraft/stackups/tomlx"
	"unicode/utf8"

	"stubcraft/physical/units"
)

// nearest returns the shortest text, among v and its neighbours a few ulps
// away written with the suffix, for which ok holds; ok is false when none
// does.
func nearest(v float64, suffix string, ok func(string) bool) (string, bool) {
	best := ""
	up, down := v, v
	for i := 0; i < 8; i++ {
		for _, c := range []float64{up, down} {
			s := strconv.FormatFloat(c, 'g', -1, 64) + suffix
			if (best == "" || len(s) < len(best)) && ok(s) {
				best = s
			}
		}
		up, down = math.Nextafter(up, math.Inf(1)), math.Nextafter(down, math.Inf(-1))
	}
	return best, best != ""
}

// sigDigits counts the significant digits of a decimal number's text.
func sigDigits(s string) int {
	mant, _, _ := strings.Cut(strings.ToLower(s), "e")
	mant = strings.TrimLeft(strings.ReplaceAll(mant, ".", ""), "+-0")
	n := 0
	for _, r := range mant {
		if r >= '0' && r <= '9' {
			n++
		}
	}
	return n
}

// short is the most significant digits a quantity is written with before
// another unit or form is preferred.
const short = 6

// quantityText writes x as a number with one of the units (name and size,
// in order of preference), choosing the first whose text is short, or else
// the shortest, among those that parse reads back exactly as x; failing
// all, it writes x in the base unit (size 1, always exact).
func quantityText(x float64, unitNames []string, sizes []float64, base string, parse func(string) (float64, error)) string {
	best := ""
	for i, u := range unitNames {
		s, ok := nearest(x/sizes[i], u, func(s string) bool {
			got, err := parse(s)
			return err == nil && got == x
		})
		if !ok {
			continue
		}
		if sigDigits(s) <= short {
			return s
		}
		if best == "" || len(s) < len(best) {
			best = s
		}
	}
	if best != "" {
		return best
	}
	return strconv.FormatFloat(x, 'g', -1, 64) + base
}

// formatLength writes a length in metres as a quantity string, in mm from
// 0.1 mm up and in µm ("um", plain ASCII) below, that units.ParseLength
// reads back exactly.
func formatLength(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return tomlx.Number(x) // not readable; only for messages
	}
	if math.Abs(x) >= 0.1e-3 {
		return quantityText(x, []string{"mm", "um", "mil"}, []float64{1e-3, 1e-6, 25.4e-6}, "m", units.ParseLength)
	}
	return quantityText(x, []string{"um", "mm", "nm"}, []float64{1e-6, 1e-3, 1e-9}, "m", units.ParseLength)
}

// roundLength writes a length for a message, in mm from 0.1 mm up and in
// µm below, to six significant digits; it need not read back exactly.
func roundLength(x float64) string {
	if math.Abs(x) >= 0.1e-3 {
		return strconv.FormatFloat(x/1e-3, 'g', short, 64) + "mm"
	}
	return strconv.FormatFloat(x/1e-6, 'g', short, 64) + "um"
}

// formatFrequency writes a frequency in hertz as a quantity string that
// units.ParseFrequency reads back exactly.
func formatFrequency(f float64) string {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return tomlx.Number(f)
	}
	names := []string{"GHz", "MHz", "kHz", "Hz"}
	sizes := []float64{1e9, 1e6, 1e3, 1}
	for len(names) > 1 && math.Abs(f) < sizes[0] {
		names, sizes = names[1:], sizes[1:]
	}
	return quantityText(f, names, sizes, "Hz", units.ParseFrequency)
}

// errPercent returns the reason for a percentage that cannot be read.
func errPercent() error { return errors.New(`not a percentage such as "5%"`) }

// parsePercent reads "5%" or "2.5 %" as a fraction (0.05, 0.025). The
// decimal point is moved in the text rather than dividing by 100, so that
// formatPercent(parsePercent(s)) gives back s's value exactly.
func parsePercent(s string) (float64, error) {
	t := strings.TrimSpace(s)
	if !strings.HasSuffix(t, "%") {
		return 0, errPercent()
	}
	t = strings.TrimSpace(strings.TrimSuffix(t, "%"))
	if t == "" || strings.IndexFunc(t, func(r rune) bool { return !strings.ContainsRune("0123456789.eE+-", r) }) >= 0 {
		return 0, errPercent()
	}
	mant, exp := t, 0
	if i := strings.IndexAny(t, "eE"); i >= 0 {
		e, err := strconv.Atoi(t[i+1:])
		if err != nil || e < -10000 || e > 10000 {
			return 0, errPercent()
		}
		mant, exp = t[:i], e
	}
	v, err := strconv.ParseFloat(mant+"e"+strconv.Itoa(exp-2), 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, errPercent()
	}
	return v, nil
}

// formatPercent writes a fraction as a percentage ("5%" for 0.05) that
// parsePercent reads back exactly: the shortest decimal of x, with the
// decimal point moved two places in the text.
func formatPercent(x float64) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return tomlx.Number(x)
	}
	s := strconv.FormatFloat(x, 'f', -1, 64)
	sign := ""
	if strings.HasPrefix(s, "-") {
		sign, s = "-", s[1:]
	}
	whole, frac, _ := strings.Cut(s, ".")
	frac += "00"
	whole = strings.TrimLeft(whole+frac[:2], "0")
	frac = strings.TrimRight(frac[2:], "0")
	if whole == "" {
		whole = "0"
	}
	if frac != "" {
		whole += "." + frac
	}
	return sign + whole + "%"
}

// validText reports whether s can be written to a TOML file as it is.
func validText(s string) bool { return utf8.ValidString(s) }
