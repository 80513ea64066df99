package units

import "testing"

// Expected strings written by hand (SI prefixes: BIPM SI Brochure, 9th
// edition, table 7).
func TestFormatFrequency(t *testing.T) {
	cases := []struct {
		hz   float64
		sig  int
		want string
	}{
		{2.45e9, 6, "2.45 GHz"},
		{5.8e9, 4, "5.8 GHz"},
		{433.92e6, 6, "433.92 MHz"},
		{433.92e6, 4, "433.9 MHz"},
		{915e6, 6, "915 MHz"},
		{999.5e6, 6, "999.5 MHz"},
		{1e9, 6, "1 GHz"},
		{13.56e6, 6, "13.56 MHz"},
		{125e3, 6, "125 kHz"},
		{50, 6, "50 Hz"},
	}
	for _, c := range cases {
		if got := FormatFrequency(c.hz, c.sig); got != c.want {
			t.Errorf("FormatFrequency(%g, %d) = %q, want %q", c.hz, c.sig, got, c.want)
		}
	}
	ranges := []struct {
		lo, hi float64
		want   string
	}{
		{2.244e9, 2.633e9, "2.244–2.633 GHz"},
		{360.2e6, 487.2e6, "360.2–487.2 MHz"},
		{0.9e9, 1.2e9, "0.9–1.2 GHz"},
	}
	for _, c := range ranges {
		if got := FormatFrequencyRange(c.lo, c.hi, 4); got != c.want {
			t.Errorf("FormatFrequencyRange(%g, %g) = %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
}
