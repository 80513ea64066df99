package gerberread

import (
	"strings"
	"testing"
)

func TestParseMM(t *testing.T) {
	tests := []struct {
		in   string
		want int64 // exact: 1 mm = 1e6 nm
		ok   bool
	}{
		{"1.8", 1800000, true},
		{"0.000001", 1, true},
		{"-2.5", -2500000, true},
		{".4", 400000, true},
		{"3", 3000000, true},
		{"1.0000000", 1000000, true},
		{"1.0000001", 0, false}, // below a nanometre
		{"", 0, false},
		{"x", 0, false},
	}
	for _, tt := range tests {
		got, err := ParseMM(tt.in)
		if (err == nil) != tt.ok || (tt.ok && got != tt.want) {
			t.Errorf("ParseMM(%q) = %d, %v; want %d, ok %v", tt.in, got, err, tt.want, tt.ok)
		}
	}
}

// TestReadRefuses: the reader must reject what export must not write, so
// that a straying writer fails its tests.
func TestReadRefuses(t *testing.T) {
	const head = "%FSLAX46Y46*%\n%MOMM*%\n%ADD10C,0.1*%\nD10*\nG01*\n"
	tests := []struct{ name, body string }{
		{"no M02", head},
		{"open contour", head + "G36*\nX0Y0D02*\nX10Y0D01*\nX10Y10D01*\nG37*\nM02*\n"},
		{"inch units", "%FSLAX46Y46*%\n%MOIN*%\nM02*\n"},
		{"undefined aperture", head + "D11*\nM02*\n"},
		{"operation before format", "X0Y0D03*\nM02*\n"},
		{"arc", head + "G75*\nM02*\n"},
	}
	for _, tt := range tests {
		if _, err := Read(strings.NewReader(tt.body)); err == nil {
			t.Errorf("%s: no error", tt.name)
		}
	}
	ok := head + "G36*\nX0Y0D02*\nX10Y0D01*\nX10Y10D01*\nX0Y0D01*\nG37*\nX5Y5D03*\nM02*\n"
	f, err := Read(strings.NewReader(ok))
	if err != nil || len(f.Regions) != 1 || len(f.Regions[0].Outline) != 3 || len(f.Flashes) != 1 {
		t.Errorf("valid file: %+v, %v", f, err)
	}
}
