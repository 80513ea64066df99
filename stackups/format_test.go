package stackups

import (
	"math"
	"math/rand"
	"stubcraft/stackups/tomlx"
	"testing"

	"stubcraft/physical/units"
)

func TestPercent(t *testing.T) {
	tests := []struct {
		in   string
		want float64 // the decimal fraction, exact up to float64 rounding of the literal
	}{
		{"5%", 0.05},
		{"10%", 0.1},
		{"2.5 %", 0.025},
		{" 0.1% ", 0.001},
		{"1e1%", 0.1},
		{"1.5E-1%", 0.0015},
		{"-5%", -0.05},
		{"0%", 0},
	}
	for _, tt := range tests {
		got, err := parsePercent(tt.in)
		if err != nil || got != tt.want {
			t.Errorf("parsePercent(%q) = %v, %v; want %v", tt.in, got, err, tt.want)
		}
	}
	for _, bad := range []string{"5", "%", "x%", "0x5%", "inf%", "nan%", "5%%", "1e99999%", "1e%"} {
		if v, err := parsePercent(bad); err == nil {
			t.Errorf("parsePercent(%q) = %v, want an error", bad, v)
		}
	}
	format := []struct {
		x    float64
		want string
	}{
		{0.05, "5%"}, {0.1, "10%"}, {0.015, "1.5%"}, {1e-5, "0.001%"}, {1, "100%"}, {0, "0%"},
		{0.056818181818181816, "5.6818181818181816%"}, {-0.01, "-1%"},
	}
	for _, tt := range format {
		if got := formatPercent(tt.x); got != tt.want {
			t.Errorf("formatPercent(%v) = %q, want %q", tt.x, got, tt.want)
		}
	}
}

// TestPercentRoundTrip checks the claim of formatPercent: every fraction
// reads back bit for bit.
func TestPercentRoundTrip(t *testing.T) {
	r := rand.New(rand.NewSource(1))
	for i := 0; i < 20000; i++ {
		x := r.Float64() * math.Pow(10, float64(r.Intn(12)-10))
		s := formatPercent(x)
		got, err := parsePercent(s)
		if err != nil || got != x {
			t.Fatalf("formatPercent(%v) = %q reads back as %v, %v", x, s, got, err)
		}
	}
}

func TestFormatLength(t *testing.T) {
	tests := []struct {
		in   string // a quantity as a user writes it
		want string // what Encode writes back
	}{
		{"0.508mm", "0.508mm"}, {"20mil", "0.508mm"}, {"1.6mm", "1.6mm"}, {"0.2mm", "0.2mm"},
		{"35um", "35um"}, {"1oz", "34.8um"}, {"10um", "10um"}, {"0.635mm", "0.635mm"},
		{"100um", "100um"}, {"0.1mm", "0.1mm"}, {"0.1um", "0.1um"}, {"31mil", "0.7874mm"}, {"0um", "0um"},
	}
	for _, tt := range tests {
		x, err := units.ParseCopperThickness(tt.in)
		if err != nil {
			t.Fatal(err)
		}
		if got := formatLength(x); got != tt.want {
			t.Errorf("formatLength(%q → %g) = %q, want %q", tt.in, x, got, tt.want)
		}
	}
}

// TestFormatRoundTrip checks that any length or frequency, not only those
// read from short decimals, is written so that it reads back exactly.
func TestFormatRoundTrip(t *testing.T) {
	r := rand.New(rand.NewSource(2))
	for i := 0; i < 20000; i++ {
		x := r.Float64() * math.Pow(10, float64(r.Intn(10)-9))
		s := formatLength(x)
		got, err := units.ParseLength(s)
		if err != nil || got != x {
			t.Fatalf("formatLength(%v) = %q reads back as %v, %v", x, s, got, err)
		}
		f := r.Float64() * math.Pow(10, float64(r.Intn(12)))
		s = formatFrequency(f)
		gotF, err := units.ParseFrequency(s)
		if err != nil || gotF != f {
			t.Fatalf("formatFrequency(%v) = %q reads back as %v, %v", f, s, gotF, err)
		}
	}
}

func TestFormatFrequency(t *testing.T) {
	tests := []struct {
		in, want string
	}{
		{"10GHz", "10GHz"}, {"2.45GHz", "2.45GHz"}, {"1GHz", "1GHz"}, {"100MHz", "100MHz"},
		{"433.92MHz", "433.92MHz"}, {"50kHz", "50kHz"}, {"50Hz", "50Hz"},
	}
	for _, tt := range tests {
		f, err := units.ParseFrequency(tt.in)
		if err != nil {
			t.Fatal(err)
		}
		if got := formatFrequency(f); got != tt.want {
			t.Errorf("formatFrequency(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestQuote(t *testing.T) {
	tests := []struct{ in, want string }{ // TOML 1.0 basic-string escapes
		{`plain`, `"plain"`},
		{`say "hi"`, `"say \"hi\""`},
		{`back\slash`, `"back\\slash"`},
		{"tab\tnew\nline", `"tab\tnew\nline"`},
		{"bell\a", `"bell\u0007"`},
		{"del\x7f", `"del\u007F"`},
		{"µm εr", `"µm εr"`},
	}
	for _, tt := range tests {
		if got := tomlx.Quote(tt.in); got != tt.want {
			t.Errorf("tomlx.Quote(%q) = %s, want %s", tt.in, got, tt.want)
		}
	}
}
