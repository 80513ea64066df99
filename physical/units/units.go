// Package units reads and writes the quantities a board designer types:
// lengths ("0.8mm", "35um", "20mil", copper weight "1oz"), frequencies
// ("2.45GHz"), electrical lengths ("90deg", "0.25wl") and complex impedances
// ("18-j22"). Values come back in SI units (metres, hertz, ohms) or, for
// electrical lengths, in degrees. Like strconv, every parser returns
// (value, error) and the error names the text it could not read.
package units

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"unicode"
)

// CopperOunceThickness is the thickness of one ounce per square foot of
// copper foil: 1.37 mil = 34.8 µm (IPC-4562 nominal, from memory; boards are
// commonly quoted as 35 µm per ounce).
const CopperOunceThickness = 34.8e-6

// NumError records a failed parse, in the manner of strconv.NumError.
type NumError struct {
	Quantity string // what was being read: "length", "frequency", ...
	Text     string // the text that could not be read
	Err      error  // the reason
}

// Error reports the text, what it was read as, and why it failed.
func (e *NumError) Error() string {
	article := "a"
	if e.Quantity != "" && strings.ContainsRune("aeiou", rune(e.Quantity[0])) {
		article = "an"
	}
	return fmt.Sprintf("cannot read %q as %s %s: %v", e.Text, article, e.Quantity, e.Err)
}

// Unwrap returns the reason, so that errors.Is(err, ErrUnit) and the like work.
func (e *NumError) Unwrap() error { return e.Err }

// Reasons carried by NumError.Err.
var (
	ErrSyntax    = errors.New("not a number")
	ErrNoUnit    = errors.New("a unit is needed")
	ErrUnit      = errors.New("unknown unit")
	ErrNotFinite = errors.New("not a finite value")
)

// split separates "0.8 mm" into 0.8 and "mm". The number is the longest
// prefix that strconv accepts as a float.
func split(s string) (float64, string, error) {
	s = strings.TrimSpace(s)
	end := 0
	for end < len(s) {
		c := s[end]
		if (c >= '0' && c <= '9') || c == '.' || c == '+' || c == '-' {
			end++
			continue
		}
		if (c == 'e' || c == 'E') && end+1 < len(s) {
			n := s[end+1]
			if (n >= '0' && n <= '9') || ((n == '+' || n == '-') && end+2 < len(s) && s[end+2] >= '0' && s[end+2] <= '9') {
				end += 2
				continue
			}
		}
		break
	}
	if end == 0 {
		return 0, "", ErrSyntax
	}
	v, err := strconv.ParseFloat(s[:end], 64)
	if errors.Is(err, strconv.ErrRange) && math.IsInf(v, 0) {
		return 0, "", ErrNotFinite
	}
	if err != nil {
		return 0, "", ErrSyntax
	}
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, "", ErrNotFinite
	}
	return v, strings.TrimSpace(s[end:]), nil
}

// lengthUnit returns the size in metres of the length unit u, as written.
// A switch rather than a map keeps the table read-only. Letter case is
// ignored except for a leading m, which is milli (or the metre) only in
// lower case: "Mm" would be megametres, so it is refused by caseHint.
func lengthUnit(u string) (float64, bool) {
	if strings.HasPrefix(u, "M") {
		return 0, false
	}
	switch strings.ToLower(u) {
	case "m":
		return 1, true
	case "cm":
		return 1e-2, true
	case "mm":
		return 1e-3, true
	case "um", "µm", "μm": // ASCII, micro sign, Greek mu
		return 1e-6, true
	case "nm":
		return 1e-9, true
	case "mil", "mils", "thou":
		return 25.4e-6, true
	case "in":
		return 25.4e-3, true
	}
	return 0, false
}

// caseHint explains a unit refused only for its letter case: an upper-case
// M (mega) where a lower-case m (milli, or the metre) is meant, or the
// reverse. canon returns the usual spelling of a unit, or "" for an unknown
// one. caseHint returns "" when the unit's case is not the trouble.
func caseHint(u string, canon func(string) string) string {
	if u == "" {
		return ""
	}
	var alt string
	switch u[0] {
	case 'M':
		alt = "m" + u[1:]
	case 'm':
		alt = "M" + u[1:]
	default:
		return ""
	}
	name := canon(alt)
	if name == "" {
		return ""
	}
	return fmt.Sprintf("units are case-sensitive: M is mega and m is milli; write %q", name)
}

// lengthName is the usual spelling of a length unit, for caseHint.
func lengthName(u string) string {
	if _, ok := lengthUnit(u); ok {
		return strings.ToLower(u)
	}
	return ""
}

// frequencyName is the usual spelling of a frequency unit, for caseHint.
func frequencyName(u string) string {
	if _, ok := frequencyUnit(u); !ok {
		return ""
	}
	switch strings.ToLower(u) {
	case "hz":
		return "Hz"
	case "khz":
		return "kHz"
	case "mhz":
		return "MHz"
	case "ghz":
		return "GHz"
	}
	return "THz"
}

// finite reports an overflow of value × unit as a NumError.
func finite(quantity, text string, v float64) (float64, error) {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, &NumError{quantity, text, ErrNotFinite}
	}
	return v, nil
}

// ParseLength reads a length with its unit (m, cm, mm, um, µm, nm, mil, in)
// and returns metres. A bare number is refused: "0.8" could be millimetres
// or mils.
func ParseLength(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"length", s, err}
	}
	if u == "" {
		return 0, &NumError{"length", s, fmt.Errorf("%w (for example %gmm)", ErrNoUnit, v)}
	}
	f, ok := lengthUnit(u)
	if !ok {
		if hint := caseHint(u, lengthName); hint != "" {
			return 0, &NumError{"length", s, fmt.Errorf("%w %q: %s", ErrUnit, u, hint)}
		}
		return 0, &NumError{"length", s, fmt.Errorf("%w %q (use m, mm, um, mil or in)", ErrUnit, u)}
	}
	return finite("length", s, v*f)
}

// ParseCopperThickness reads a copper thickness as a length or as a foil
// weight in ounces per square foot ("1oz", "0.5oz"), and returns metres.
func ParseCopperThickness(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"copper thickness", s, err}
	}
	if strings.EqualFold(u, "oz") {
		return finite("copper thickness", s, v*CopperOunceThickness)
	}
	m, err := ParseLength(s)
	if err != nil {
		var ne *NumError
		if errors.As(err, &ne) {
			ne.Quantity = "copper thickness"
			if errors.Is(ne.Err, ErrUnit) && caseHint(u, lengthName) == "" {
				ne.Err = fmt.Errorf("%w %q (use mm, um, mil or oz)", ErrUnit, u)
			}
			if errors.Is(ne.Err, ErrNoUnit) {
				ne.Err = fmt.Errorf("%w (for example %gum, or a weight such as 1oz)", ErrNoUnit, v)
			}
		}
		return 0, err
	}
	return m, nil
}

// frequencyUnit returns the size in hertz of the frequency unit u, as
// written. Letter case is ignored except for the m of MHz: "mHz" would be
// millihertz, so it is refused (see caseHint) rather than read as MHz.
func frequencyUnit(u string) (float64, bool) {
	if u == "" || u[0] == 'm' {
		return 0, false
	}
	switch strings.ToLower(u) {
	case "hz":
		return 1, true
	case "khz":
		return 1e3, true
	case "mhz":
		return 1e6, true
	case "ghz":
		return 1e9, true
	case "thz":
		return 1e12, true
	}
	return 0, false
}

// ParseFrequency reads a frequency with its unit (Hz, kHz, MHz, GHz, THz)
// and returns hertz. Unit case is ignored except for the M of MHz.
func ParseFrequency(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"frequency", s, err}
	}
	if u == "" {
		return 0, &NumError{"frequency", s, fmt.Errorf("%w (for example %gGHz)", ErrNoUnit, v)}
	}
	f, ok := frequencyUnit(u)
	if !ok {
		if hint := caseHint(u, frequencyName); hint != "" {
			return 0, &NumError{"frequency", s, fmt.Errorf("%w %q: %s", ErrUnit, u, hint)}
		}
		return 0, &NumError{"frequency", s, fmt.Errorf("%w %q (use Hz, kHz, MHz or GHz)", ErrUnit, u)}
	}
	return finite("frequency", s, v*f)
}

// ParseElectricalLength reads an electrical length in degrees ("90deg",
// "90°"), wavelengths ("0.25wl", "0.25λ") or radians ("1.571rad") and
// returns degrees.
func ParseElectricalLength(s string) (float64, error) {
	v, u, err := split(s)
	if err != nil {
		return 0, &NumError{"electrical length", s, err}
	}
	switch strings.ToLower(u) {
	case "deg", "°", "degrees":
		return v, nil
	case "wl", "λ", "lambda":
		return finite("electrical length", s, v*360)
	case "rad":
		return finite("electrical length", s, v*(180/math.Pi))
	case "":
		return 0, &NumError{"electrical length", s, fmt.Errorf("%w (for example %gdeg or %gwl)", ErrNoUnit, v, v)}
	}
	return 0, &NumError{"electrical length", s, fmt.Errorf("%w %q (use deg, wl or rad)", ErrUnit, u)}
}

// decimal reads a plain decimal number such as "18", "-2.5" or "1e-3". It
// refuses what strconv.ParseFloat would also take but a board designer does
// not write: hexadecimal, underscores, "inf" and "nan".
func decimal(s string) (float64, error) {
	if s == "" || strings.IndexFunc(s, func(r rune) bool {
		return !strings.ContainsRune("0123456789.eE+-", r)
	}) >= 0 {
		return 0, ErrSyntax
	}
	v, err := strconv.ParseFloat(s, 64)
	if errors.Is(err, strconv.ErrRange) && math.IsInf(v, 0) {
		return 0, ErrNotFinite
	}
	if err != nil {
		return 0, ErrSyntax
	}
	return v, nil
}

// ParseImpedance reads a complex impedance in ohms written as "50",
// "18-j22", "18-22j", "18 + j 22", "18-j22ohm" or "18-j22Ω". A j needs its
// number: "18+j" is refused (write "18+j1"), since a forgotten digit must
// not change the load.
func ParseImpedance(s string) (complex128, error) {
	t := strings.Map(func(r rune) rune {
		if unicode.IsSpace(r) {
			return -1
		}
		return r
	}, s)
	for _, suffix := range []string{"ohms", "ohm", "Ω", "Ω"} {
		t = strings.TrimSuffix(t, suffix)
	}
	if t == "" {
		return 0, &NumError{"impedance", s, ErrSyntax}
	}
	// Find the sign that starts the imaginary part: the last + or - that is
	// not at the start and not part of an exponent.
	cut := -1
	for i := len(t) - 1; i > 0; i-- {
		if (t[i] == '+' || t[i] == '-') && t[i-1] != 'e' && t[i-1] != 'E' {
			cut = i
			break
		}
	}
	re, im := t, ""
	if cut > 0 {
		re, im = t[:cut], t[cut:]
	} else if strings.ContainsAny(t, "jJ") {
		re, im = "", t
	}
	var z complex128
	if re != "" {
		r, err := decimal(re)
		if err != nil {
			return 0, &NumError{"impedance", s, err}
		}
		z += complex(r, 0)
	}
	if im != "" {
		sign := 1.0
		body := im
		if body[0] == '+' || body[0] == '-' {
			if body[0] == '-' {
				sign = -1
			}
			body = body[1:]
		}
		switch {
		case strings.HasPrefix(body, "j") || strings.HasPrefix(body, "J"):
			body = body[1:]
		case strings.HasSuffix(body, "j") || strings.HasSuffix(body, "J"):
			body = body[:len(body)-1]
		default:
			return 0, &NumError{"impedance", s, fmt.Errorf("%w: the imaginary part needs a j", ErrSyntax)}
		}
		if body == "" {
			return 0, &NumError{"impedance", s, fmt.Errorf("%w: the j needs a number, for example %q", ErrSyntax, t+"1")}
		}
		x, err := decimal(body)
		if err != nil {
			return 0, &NumError{"impedance", s, err}
		}
		z += complex(0, sign*x)
	}
	if cmplx.IsInf(z) || cmplx.IsNaN(z) {
		return 0, &NumError{"impedance", s, ErrNotFinite}
	}
	return z, nil
}

// FormatImpedance writes z as "18-j22", each part with up to six
// significant digits: the form ParseImpedance reads, and the one every
// message and table of the project uses. A value that is not finite is
// written as Go prints it. It is FormatImpedanceWith with the zero
// ImpedanceStyle.
func FormatImpedance(z complex128) string {
	return FormatImpedanceWith(z, ImpedanceStyle{})
}

// ImpedanceStyle says how FormatImpedanceWith writes an impedance. The zero
// value is the plain form ParseImpedance reads back.
type ImpedanceStyle struct {
	// Decimals, when positive, writes each part with that many digits
	// after the point ("18.00-j22.00"); zero writes up to six significant
	// digits ("18-j22").
	Decimals int
	// Typeset writes the form for a drawing: a space each side of the
	// sign of the reactance and a true minus (U+2212) for every minus,
	// "18.00 − j22.00". ParseImpedance does not read it back.
	Typeset bool
}

// FormatImpedanceWith writes z as R±jX in style st. The sign follows the
// reactance's sign bit, so −0 is written with a minus. A value that is not
// finite is written as Go prints it.
func FormatImpedanceWith(z complex128, st ImpedanceStyle) string {
	if cmplx.IsNaN(z) || cmplx.IsInf(z) {
		return fmt.Sprint(z)
	}
	part := func(v float64) string {
		if st.Decimals > 0 {
			return strconv.FormatFloat(v, 'f', st.Decimals, 64)
		}
		return strconv.FormatFloat(v, 'g', 6, 64)
	}
	sign, x := "+", imag(z)
	if math.Signbit(x) {
		sign, x = "-", -x
	}
	if !st.Typeset {
		return part(real(z)) + sign + "j" + part(x)
	}
	s := part(real(z)) + " " + sign + " j" + part(x)
	return strings.ReplaceAll(s, "-", "\u2212")
}
