package units

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"
)

// seeds returns the inputs the fuzzers start from: the table inputs of the unit
// tests and a few awkward ones.
func seeds() []string {
	return []string{
		"2.45GHz", "0.8mm", "35um", "35µm", "1oz", "20mil", "90deg", "0.25wl", "1.571rad",
		"18-j22", "18-22j", "18 + j 22", "50", "-j5", "1e-3m", "1.5e+2mm", "", "mm", "3",
		"3 furlongs", "NaN GHz", "1e999mm", "18-k22", "1e308THz", "-", "e", "1e", "+.e-", "\xff",
	}
}

// fuzzReal checks one real-valued parser: no panic, a finite value when there
// is no error, and a *NumError naming the text when there is one.
func fuzzReal(f *testing.F, fn func(string) (float64, error)) {
	for _, s := range seeds() {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, err := fn(s)
		if err != nil {
			var ne *NumError
			if !errors.As(err, &ne) || ne.Text != s {
				t.Fatalf("(%q): error %v is not a *NumError naming the text", s, err)
			}
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			t.Fatalf("(%q) = %v without an error", s, v)
		}
	})
}

func FuzzParseLength(f *testing.F)           { fuzzReal(f, ParseLength) }
func FuzzParseFrequency(f *testing.F)        { fuzzReal(f, ParseFrequency) }
func FuzzParseElectricalLength(f *testing.F) { fuzzReal(f, ParseElectricalLength) }
func FuzzParseCopperThickness(f *testing.F)  { fuzzReal(f, ParseCopperThickness) }

func FuzzParseImpedance(f *testing.F) {
	for _, s := range seeds() {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		z, err := ParseImpedance(s)
		if err != nil {
			var ne *NumError
			if !errors.As(err, &ne) || ne.Text != s {
				t.Fatalf("(%q): error %v is not a *NumError naming the text", s, err)
			}
			return
		}
		if cmplx.IsNaN(z) || cmplx.IsInf(z) {
			t.Fatalf("(%q) = %v without an error", s, z)
		}
		// What was read must read back the same once written with enough
		// decimals for its size.
		if math.Abs(real(z)) < 1e12 && math.Abs(imag(z)) < 1e12 {
			back, err := ParseImpedance(FormatImpedance(z))
			if err != nil {
				t.Fatalf("(%q) = %v, but FormatImpedance gives %q which does not parse: %v", s, z, FormatImpedance(z), err)
			}
			if math.Abs(real(back)-real(z)) > 5e-6*math.Abs(real(z)) || math.Abs(imag(back)-imag(z)) > 5e-6*math.Abs(imag(z)) {
				t.Fatalf("(%q) = %v, read back as %v", s, z, back)
			}
		}
	})
}
