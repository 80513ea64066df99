package units

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

// closeTo reports whether got equals want to within a few units in the last
// place: the parsers multiply a decimal by a unit factor, and the product
// and the decimal literal of the exact answer may round differently.
func closeTo(got, want float64) bool {
	if got == want {
		return true
	}
	return math.Abs(got-want) <= 4e-16*math.Abs(want)
}

// parser adapts the real-valued parsers to one signature for the tables.
type parser struct {
	name string
	fn   func(string) (float64, error)
}

// parsers returns the four real-valued parsers, named for messages.
func parsers() (length, copper, frequency, electrical parser) {
	return parser{"ParseLength", ParseLength},
		parser{"ParseCopperThickness", ParseCopperThickness},
		parser{"ParseFrequency", ParseFrequency},
		parser{"ParseElectricalLength", ParseElectricalLength}
}

func TestParseGood(t *testing.T) {
	length, copper, frequency, electrical := parsers()
	tests := []struct {
		p      parser
		in     string
		want   float64
		source string
	}{
		{frequency, "2.45GHz", 2.45e9, "SI prefix giga = 1e9 (BIPM SI Brochure, 9th ed.)"},
		{frequency, "2.45 GHz", 2.45e9, "SI prefix giga; space before the unit"},
		{frequency, "2.45ghz", 2.45e9, "SI prefix giga; case ignored by design (doc comment)"},
		{frequency, "100MHz", 100e6, "SI prefix mega = 1e6"},
		{frequency, "100MHZ", 100e6, "SI prefix mega; case of the hertz ignored"},
		{frequency, "10kHz", 1e4, "SI prefix kilo = 1e3"},
		{frequency, "50Hz", 50, "hertz"},
		{frequency, "1THz", 1e12, "SI prefix tera = 1e12"},
		{frequency, "1e-3GHz", 1e6, "SI prefix giga, exponent form"},
		{length, "0.8mm", 0.8e-3, "SI prefix milli = 1e-3"},
		{length, "35um", 35e-6, "SI prefix micro = 1e-6, ASCII u"},
		{length, "35µm", 35e-6, "SI prefix micro, U+00B5 micro sign"},
		{length, "35μm", 35e-6, "SI prefix micro, U+03BC Greek mu"},
		{length, "20mil", 508e-6, "1 mil = 0.001 in = 25.4 µm exactly (international inch, 1959)"},
		{length, "20 mils", 508e-6, "1 mil = 25.4 µm exactly"},
		{length, "1in", 25.4e-3, "1 in = 25.4 mm exactly (international inch, 1959)"},
		{length, "1.5cm", 15e-3, "SI prefix centi = 1e-2"},
		{length, "500nm", 500e-9, "SI prefix nano = 1e-9"},
		{length, "1e-3m", 1e-3, "metre, exponent form"},
		{length, "1.5e+2mm", 0.15, "SI prefix milli, signed exponent"},
		{length, "1E2mm", 0.1, "SI prefix milli, capital exponent"},
		{length, " 0.8 mm ", 0.8e-3, "SI prefix milli; surrounding space ignored"},
		{length, "2CM", 2e-2, "SI prefix centi; case ignored where it changes nothing (doc comment)"},
		{length, "2IN", 50.8e-3, "1 in = 25.4 mm exactly; case ignored where it changes nothing"},
		{copper, "35um", 35e-6, "SI prefix micro"},
		{copper, "1oz", 34.8e-6, "1 oz/ft² foil = 1.37 mil = 34.8 µm (IPC-4562 nominal, from memory)"},
		{copper, "0.5oz", 17.4e-6, "half of 34.8 µm (IPC-4562 nominal, from memory)"},
		{copper, "2 OZ", 69.6e-6, "twice 34.8 µm; unit case ignored"},
		{copper, "1.4mil", 35.56e-6, "1 mil = 25.4 µm exactly"},
		{electrical, "90deg", 90, "degrees as given"},
		{electrical, "90°", 90, "degrees as given, degree sign"},
		{electrical, "0.25wl", 90, "one wavelength is 360° (exact)"},
		{electrical, "0.25λ", 90, "one wavelength is 360° (exact)"},
		{electrical, "0.125 lambda", 45, "one wavelength is 360° (exact)"},
		{electrical, "3.141592653589793rad", 180, "π rad = 180° (exact)"},
		{electrical, "-45deg", -45, "degrees as given; sign kept"},
	}
	for _, tt := range tests {
		got, err := tt.p.fn(tt.in)
		if err != nil {
			t.Errorf("%s(%q): %v (want %g; %s)", tt.p.name, tt.in, err, tt.want, tt.source)
			continue
		}
		if !closeTo(got, tt.want) {
			t.Errorf("%s(%q) = %.17g, want %.17g (%s)", tt.p.name, tt.in, got, tt.want, tt.source)
		}
	}
}

func TestParseBad(t *testing.T) {
	length, copper, frequency, electrical := parsers()
	tests := []struct {
		p    parser
		in   string
		want error // the reason carried in NumError.Err
	}{
		{length, "", ErrSyntax},
		{length, "mm", ErrSyntax},
		{length, "3", ErrNoUnit},
		{length, "3 furlongs", ErrUnit},
		{length, "NaN mm", ErrSyntax},
		{length, "Inf mm", ErrSyntax},
		{length, "1e999mm", ErrNotFinite},
		{length, "-1e999mm", ErrNotFinite},
		{length, "1.2.3mm", ErrSyntax},
		{length, "0x10mm", ErrUnit},
		{length, "2.45GHz", ErrUnit},
		{length, "1oz", ErrUnit},
		{length, "1Mm", ErrUnit}, // megametres: the case of m changes the meaning
		{length, "2MM", ErrUnit},
		{length, "1M", ErrUnit},
		{length, "20MIL", ErrUnit},
		{copper, "35Mm", ErrUnit},
		{frequency, "100mHz", ErrUnit}, // millihertz, not megahertz
		{frequency, "100mhz", ErrUnit},
		{copper, "", ErrSyntax},
		{copper, "1", ErrNoUnit},
		{copper, "1 pound", ErrUnit},
		{copper, "1e999oz", ErrNotFinite},
		{frequency, "", ErrSyntax},
		{frequency, "GHz", ErrSyntax},
		{frequency, "3", ErrNoUnit},
		{frequency, "3 furlongs", ErrUnit},
		{frequency, "NaN GHz", ErrSyntax},
		{frequency, "1e999GHz", ErrNotFinite},
		{frequency, "1e300THz", ErrNotFinite}, // the number is finite, the product is not
		{frequency, "0.8mm", ErrUnit},
		{electrical, "", ErrSyntax},
		{electrical, "90", ErrNoUnit},
		{electrical, "90 furlongs", ErrUnit},
		{electrical, "NaN deg", ErrSyntax},
		{electrical, "1e999deg", ErrNotFinite},
		{electrical, "1e307wl", ErrNotFinite},
		{electrical, "1e307rad", ErrNotFinite},
	}
	for _, tt := range tests {
		got, err := tt.p.fn(tt.in)
		if err == nil {
			t.Errorf("%s(%q) = %g, want an error", tt.p.name, tt.in, got)
			continue
		}
		checkNumError(t, tt.p.name, tt.in, err, tt.want)
	}
}

// checkNumError checks that err is a *NumError naming the text in, whose
// reason is want, and whose message quotes the text.
func checkNumError(t *testing.T, name, in string, err, want error) {
	t.Helper()
	var ne *NumError
	if !errors.As(err, &ne) {
		t.Errorf("%s(%q): error %v is a %T, want *NumError", name, in, err, err)
		return
	}
	if ne.Text != in {
		t.Errorf("%s(%q): NumError.Text = %q", name, in, ne.Text)
	}
	if !errors.Is(err, want) {
		t.Errorf("%s(%q): error %q, want reason %q", name, in, err, want)
	}
	if !strings.Contains(err.Error(), strconv.Quote(in)) {
		t.Errorf("%s(%q): message %q does not quote the text", name, in, err)
	}
}

func TestNumErrorMessage(t *testing.T) {
	tests := []struct {
		err  *NumError
		want string
	}{
		{&NumError{"length", "3", ErrNoUnit}, `cannot read "3" as a length: a unit is needed`},
		{&NumError{"impedance", "x", ErrSyntax}, `cannot read "x" as an impedance: not a number`},
		{&NumError{"electrical length", "", ErrSyntax}, `cannot read "" as an electrical length: not a number`},
	}
	for _, tt := range tests {
		if got := tt.err.Error(); got != tt.want {
			t.Errorf("Error() = %q, want %q", got, tt.want)
		}
	}
}

// TestUnitCaseHint checks that a unit refused for its letter case says
// which unit to write instead.
func TestUnitCaseHint(t *testing.T) {
	tests := []struct {
		fn   func(string) (float64, error)
		in   string
		want string
	}{
		{ParseLength, "1Mm", `write "mm"`},
		{ParseLength, "2MM", `write "mm"`},
		{ParseLength, "20Mil", `write "mil"`},
		{ParseCopperThickness, "35Mm", `write "mm"`},
		{ParseFrequency, "100mHz", `write "MHz"`},
		{ParseFrequency, "100mhz", `write "MHz"`},
	}
	for _, tt := range tests {
		_, err := tt.fn(tt.in)
		if err == nil || !strings.Contains(err.Error(), tt.want) || !strings.Contains(err.Error(), "case-sensitive") {
			t.Errorf("(%q): error %v, want one that says %s", tt.in, err, tt.want)
		}
	}
}

func TestParseImpedanceGood(t *testing.T) {
	tests := []struct {
		in   string
		want complex128 // each row: the complex number as written (exact)
	}{
		{"18-j22", complex(18, -22)},
		{"18-22j", complex(18, -22)},
		{"18 + j 22", complex(18, 22)},
		{"18+j22", complex(18, 22)},
		{"18+22J", complex(18, 22)},
		{"50", complex(50, 0)},
		{"-j5", complex(0, -5)},
		{"j5", complex(0, 5)},
		{"5j", complex(0, 5)},
		{"-5j", complex(0, -5)},
		{"+j5", complex(0, 5)},
		{"-18-j22", complex(-18, -22)},
		{"1e-3+j1e-3", complex(1e-3, 1e-3)},
		{"1e+3-j1e+3", complex(1e3, -1e3)},
		{"1.5e2-j2.5E-1", complex(150, -0.25)},
		{"18-j22ohm", complex(18, -22)},
		{"18-j22 ohms", complex(18, -22)},
		{"18-j22Ω", complex(18, -22)}, // U+03A9 Greek capital omega
		{"18-j22Ω", complex(18, -22)}, // U+2126 ohm sign
		{"50 Ω", complex(50, 0)},
	}
	for _, tt := range tests {
		got, err := ParseImpedance(tt.in)
		if err != nil {
			t.Errorf("ParseImpedance(%q): %v", tt.in, err)
			continue
		}
		if got != tt.want {
			t.Errorf("ParseImpedance(%q) = %v, want %v", tt.in, got, tt.want)
		}
	}
}

func TestParseImpedanceBad(t *testing.T) {
	tests := []struct {
		in   string
		want error
	}{
		{"", ErrSyntax},
		{"   ", ErrSyntax},
		{"ohm", ErrSyntax},
		{"18-k22", ErrSyntax},
		{"18+5", ErrSyntax},
		{"18--j22", ErrSyntax},
		{"18-j-22", ErrSyntax},
		{"j5j", ErrSyntax},
		{"18e-j", ErrSyntax},
		{"31-j", ErrSyntax}, // a j needs its number (doc comment)
		{"50+j", ErrSyntax},
		{"j", ErrSyntax},
		{"-j", ErrSyntax},
		{"50+J ohm", ErrSyntax},
		{"-", ErrSyntax},
		{"NaN", ErrSyntax},
		{"Inf", ErrSyntax},
		{"18-jinf", ErrSyntax},
		{"0x12", ErrSyntax},
		{"1e999", ErrNotFinite},
		{"18-j1e999", ErrNotFinite},
		{"1e999j", ErrNotFinite},
	}
	for _, tt := range tests {
		got, err := ParseImpedance(tt.in)
		if err == nil {
			t.Errorf("ParseImpedance(%q) = %v, want an error", tt.in, got)
			continue
		}
		checkNumError(t, "ParseImpedance", tt.in, err, tt.want)
	}
}

func TestFormatImpedance(t *testing.T) {
	tests := []struct {
		z    complex128
		want string // the "18-j22" form of the doc comment, six significant digits
	}{
		{complex(18, -22), "18-j22"},
		{complex(50, 0), "50+j0"},
		{complex(50, math.Copysign(0, -1)), "50-j0"},
		{complex(-3.25, 1.5), "-3.25+j1.5"},
		{complex(123.456789, -987.654321), "123.457-j987.654"},
		{complex(1e6, -1e-6), "1e+06-j1e-06"},
	}
	for _, tt := range tests {
		if got := FormatImpedance(tt.z); got != tt.want {
			t.Errorf("FormatImpedance(%v) = %q, want %q", tt.z, got, tt.want)
		}
	}
}

// The drawing's style: fixed decimals, spaced sign, true minus (U+2212).
func TestFormatImpedanceWith(t *testing.T) {
	tests := []struct {
		z    complex128
		st   ImpedanceStyle
		want string
	}{
		{complex(18, -22), ImpedanceStyle{}, "18-j22"},
		{complex(18, -22), ImpedanceStyle{Decimals: 2}, "18.00-j22.00"},
		{complex(18, -22), ImpedanceStyle{Decimals: 2, Typeset: true}, "18.00 \u2212 j22.00"},
		{complex(-3.256, 1.5), ImpedanceStyle{Decimals: 2, Typeset: true}, "\u22123.26 + j1.50"},
		{complex(50, math.Copysign(0, -1)), ImpedanceStyle{Decimals: 1, Typeset: true}, "50.0 \u2212 j0.0"},
		{complex(1e6, -1e-6), ImpedanceStyle{Typeset: true}, "1e+06 \u2212 j1e\u221206"},
		{complex(-0.001, 0), ImpedanceStyle{Decimals: 2}, "-0.00+j0.00"},
	}
	for _, tt := range tests {
		if got := FormatImpedanceWith(tt.z, tt.st); got != tt.want {
			t.Errorf("FormatImpedanceWith(%v, %+v) = %q, want %q", tt.z, tt.st, got, tt.want)
		}
	}
}

func TestFormatImpedanceRoundTrip(t *testing.T) {
	zs := []complex128{
		complex(18, -22), complex(50, 0), complex(0, -5), complex(1e-3, 1e3),
		complex(-7.125, 0.5), complex(123.456789, -987.654321), complex(1e6, -1e-6),
	}
	for _, z := range zs {
		s := FormatImpedance(z)
		got, err := ParseImpedance(s)
		if err != nil {
			t.Errorf("ParseImpedance(FormatImpedance(%v) = %q): %v", z, s, err)
			continue
		}
		// Six significant digits move each part by at most half a unit in
		// the sixth digit (exact bound of decimal rounding).
		if math.Abs(real(got)-real(z)) > 5e-6*math.Abs(real(z)) || math.Abs(imag(got)-imag(z)) > 5e-6*math.Abs(imag(z)) {
			t.Errorf("round trip of %v: %q read back as %v", z, s, got)
		}
	}
}

// A copper thickness without a unit suggests a thickness in micrometres or
// a weight, never millimetres (35 mm of copper is not a board).
func TestCopperThicknessNoUnitHint(t *testing.T) {
	_, err := ParseCopperThickness("35")
	if err == nil || !strings.Contains(err.Error(), "35um") || !strings.Contains(err.Error(), "1oz") || strings.Contains(err.Error(), "35mm") {
		t.Errorf("ParseCopperThickness(%q): %v", "35", err)
	}
}
