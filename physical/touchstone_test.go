package physical

import (
	"errors"
	"math"
	"math/cmplx"
	"os"
	"strconv"
	"strings"
	"testing"
)

// Every expected value below is worked by hand from the Touchstone File
// Format Specification 1.1 (EIA/IBIS, 2002): MA is magnitude and angle in
// degrees, DB is 20·log10 magnitude and angle in degrees, RI is real and
// imaginary part; two-port data are in the order S11 S21 S12 S22.

func TestReadTouchstone(t *testing.T) {
	tests := []struct {
		name  string
		ports int
		text  string
		z0    float64
		freqs []float64
		s     [][]complex128 // row-major
	}{
		{"MA GHz", 1, "# GHz S MA R 50\n1 0.5 90\n2.5 0.25 -180\n", 50,
			[]float64{1e9, 2.5e9}, [][]complex128{{complex(0, 0.5)}, {-0.25}}},
		// 20·log10(0.5) = −6.020599913 dB.
		{"DB kHz lower case", 1, "# khz s db r 75\n100 -6.020599913279624 180\n", 75,
			[]float64{1e5}, [][]complex128{{-0.5}}},
		{"RI Hz", 1, "# Hz S RI R 50\n1000 0.3 -0.4\n2000 -0.1 0.2\n", 50,
			[]float64{1000, 2000}, [][]complex128{{complex(0.3, -0.4)}, {complex(-0.1, 0.2)}}},
		// Missing fields take the defaults GHz, S, MA, R 50.
		{"MHz, defaults", 1, "# MHz\n10 1 0\n", 50, []float64{10e6}, [][]complex128{{1}}},
		{"bare option line", 1, "#\n3 0.1 0\n", 50, []float64{3e9}, [][]complex128{{0.1}}},
		{"fields in any order", 1, "#R 25 ri HZ S\n7 0.5 0.5\n", 25, []float64{7}, [][]complex128{{complex(0.5, 0.5)}}},
		{"comments", 1, "! header line\n!another\n# GHz S RI R 50 ! trailing comment\n\n1.0 0.1 0.2 ! data comment\n   ! indented comment\n2.0 0.3 0.4\n", 50,
			[]float64{1e9, 2e9}, [][]complex128{{complex(0.1, 0.2)}, {complex(0.3, 0.4)}}},
		{"two-port order", 2, "# GHz S RI R 50\n1 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n", 50,
			[]float64{1e9}, [][]complex128{{complex(0.1, 0.2), complex(0.5, 0.6), complex(0.3, 0.4), complex(0.7, 0.8)}}},
		{"two-port wrapped", 2, "# GHz S RI R 50\n1 0.1 0.2 0.3 0.4\n  0.5 0.6\n 0.7 0.8\n2 1 0 0 1 0 1 1 0\n", 50,
			[]float64{1e9, 2e9}, [][]complex128{
				{complex(0.1, 0.2), complex(0.5, 0.6), complex(0.3, 0.4), complex(0.7, 0.8)},
				{1, complex(0, 1), complex(0, 1), 1}}},
		// DB 2-port: 0 dB at 0°, −20 dB (0.1) at 90°, −40 dB (0.01) at −90°, 6.0206 dB (2) at 180°.
		{"two-port DB MHz", 2, "# MHz S DB R 50\n900 0 0 -20 90 -40 -90 6.020599913279624 180\n", 50,
			[]float64{900e6}, [][]complex128{{1, complex(0, -0.01), complex(0, 0.1), -2}}},
		// A two-port's noise block starts with a frequency that does not
		// increase and has five values per line; it is skipped.
		{"two-port noise block", 2, "# GHz S MA R 50\n1 0.5 0 0.9 0 0.9 0 0.5 0\n2 0.5 0 0.9 0 0.9 0 0.5 0\n1 1.2 0.3 40 0.25\n2 1.5 0.3 50 0.3\n", 50,
			[]float64{1e9, 2e9}, [][]complex128{{0.5, 0.9, 0.9, 0.5}, {0.5, 0.9, 0.9, 0.5}}},
		// Three ports, row by row (S11 S12 S13 / S21 ...), each row on its own line.
		{"three-port rows", 3, "# Hz S RI R 50\n5 1 0 2 0 3 0\n 4 0 5 0 6 0\n 7 0 8 0 9 0\n", 50,
			[]float64{5}, [][]complex128{{1, 2, 3, 4, 5, 6, 7, 8, 9}}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			ts, err := ReadTouchstone(strings.NewReader(tt.text), "test", tt.ports)
			if err != nil {
				t.Fatal(err)
			}
			if ts.Ports != tt.ports || ts.Z0 != tt.z0 {
				t.Errorf("ports %d Z0 %g, want %d and %g", ts.Ports, ts.Z0, tt.ports, tt.z0)
			}
			if len(ts.Freqs) != len(tt.freqs) || len(ts.S) != len(tt.s) {
				t.Fatalf("%d frequencies, %d matrices, want %d", len(ts.Freqs), len(ts.S), len(tt.freqs))
			}
			for k := range tt.freqs {
				if math.Abs(ts.Freqs[k]-tt.freqs[k]) > 1e-9*tt.freqs[k] {
					t.Errorf("freq %d = %g, want %g", k, ts.Freqs[k], tt.freqs[k])
				}
				for i, want := range tt.s[k] {
					if !near(ts.S[k][i], want, 1e-12) {
						t.Errorf("freq %d S[%d] = %v, want %v", k, i, ts.S[k][i], want)
					}
				}
			}
		})
	}
}

func TestReadTouchstoneRejects(t *testing.T) {
	tests := []struct {
		name  string
		ports int
		text  string
		line  int
		msg   string
	}{
		{"R without value", 1, "# GHz S MA R\n1 0.5 0\n", 1, "R needs"},
		{"bad R value", 1, "# GHz S MA R fifty\n", 1, "reference impedance"},
		{"unknown format", 1, "! c\n# GHz S XY R 50\n", 2, "unknown field"},
		{"unknown unit", 1, "# THz S MA R 50\n", 1, "unknown field"},
		{"Z parameters", 1, "# GHz Z MA R 50\n", 1, "only S"},
		{"bad number", 1, "# GHz S MA R 50\n1 0.5 0\n2 0.5 abc\n", 3, `"abc"`},
		{"too few on a one-port line", 1, "# GHz S MA R 50\n1 0.5\n2 0.5 10\n", 2, "values"},
		{"too many on a one-port line", 1, "# GHz S MA R 50\n1 0.5 10 7\n", 2, "values"},
		{"truncated two-port", 2, "# GHz S RI R 50\n1 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n2 0.1 0.2 0.3\n", 3, "ends with"},
		{"decreasing frequency", 1, "# GHz S MA R 50\n1 0.5 0\n3 0.5 0\n2 0.5 0\n", 4, "does not increase"},
		{"repeated frequency", 1, "# GHz S MA R 50\n1 0.5 0\n1 0.5 0\n", 3, "does not increase"},
		{"decreasing two-port, not noise", 2, "# GHz S RI R 50\n2 0 0 0 0 0 0 0 0\n1 0 0 0 0 0 0 0 0\n", 3, "does not increase"},
		{"data before options", 1, "1 0.5 0\n# GHz S MA R 50\n", 1, "before the option line"},
		{"second option line", 1, "# GHz S MA R 50\n# MHz\n", 2, "second option line"},
		{"no data", 1, "! only a comment\n# GHz S MA R 50\n", 2, "no data"},
		{"negative frequency", 1, "# GHz S MA R 50\n-1 0.5 0\n", 2, "negative"},
		{"dB beyond float64", 1, "# GHz S DB R 50\n1 -10 0\n2 7000 20\n", 3, "not a finite S parameter"},
		{"negative magnitude", 1, "# GHz S MA R 50\n1 -0.5 0\n", 2, "negative"},
		{"frequency beyond float64 once scaled", 1, "# GHz S MA R 50\n1e305 0.5 0\n", 2, "not a finite number of hertz"},
		{"a 2 MB line", 1, "# GHz S MA R 50\n1 0.5 0\n! " + strings.Repeat("x", 2<<20) + "\n", 3, "longer than"},
		{"bad noise line", 2, "# GHz S MA R 50\n2 0.5 0 0.9 0 0.9 0 0.5 0\n1 1.2 0.3 40 0.25\n2 1.5 0.3\n", 4, "noise"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, err := ReadTouchstone(strings.NewReader(tt.text), "bad.s1p", tt.ports)
			var te *TouchstoneError
			if !errors.As(err, &te) {
				t.Fatalf("error %v, want a *TouchstoneError", err)
			}
			if te.Source != "bad.s1p" || te.Line != tt.line || !strings.Contains(te.Msg, tt.msg) {
				t.Errorf("error %q (line %d), want line %d mentioning %q", err, te.Line, tt.line, tt.msg)
			}
			if !strings.HasPrefix(err.Error(), "bad.s1p:") {
				t.Errorf("error %q does not name the source", err)
			}
		})
	}
}

func TestTouchstoneInterpolation(t *testing.T) {
	ts := &Touchstone{Ports: 1, Z0: 50, Freqs: []float64{1e9, 2e9, 3e9},
		S: [][]complex128{{0.2}, {complex(0, 0.4)}, {complex(1.0/3, 0)}}}
	tests := []struct {
		freq  float64
		s11   complex128
		z     complex128
		fails bool
	}{
		// Linear in re/im: halfway between 0.2 and 0.4j is 0.1 + 0.2j (exact).
		{1.5e9, complex(0.1, 0.2), 50 * complex(1.1, 0.2) / complex(0.9, -0.2), false},
		// At a listed frequency the value itself; Γ = 1/3 is 100 Ω in 50 Ω (exact).
		{3e9, complex(1.0/3, 0), 100, false},
		{1e9, 0.2, 75, false}, // 50·1.2/0.8 = 75 Ω (exact)
		{0.5e9, 0, 0, true},
		{3.1e9, 0, 0, true},
	}
	for _, tt := range tests {
		g, err := ts.Reflection(tt.freq)
		z, zerr := ts.LoadImpedance(tt.freq)
		if tt.fails {
			if err == nil || zerr == nil {
				t.Errorf("%g Hz outside the data: no error", tt.freq)
			}
			continue
		}
		if err != nil || zerr != nil {
			t.Fatalf("%g Hz: %v, %v", tt.freq, err, zerr)
		}
		if !near(g, tt.s11, 1e-12) || !near(z, tt.z, 1e-12) {
			t.Errorf("%g Hz: S11 %v Z %v, want %v and %v (exact)", tt.freq, g, z, tt.s11, tt.z)
		}
	}
	open := &Touchstone{Ports: 1, Z0: 50, Freqs: []float64{1e9}, S: [][]complex128{{1}}}
	if _, err := open.LoadImpedance(1e9); err == nil {
		t.Errorf("S11 = 1: no error for an infinite impedance")
	}
}

func TestTouchstoneFromScikitRF(t *testing.T) {
	// The files written by scikit-rf 0.15.4's own Touchstone writer (DB
	// two-port, MA one-port, frequencies in GHz) must decode to the values
	// the generator printed in RI with 17 digits (testdata/touchstone/
	// gen_skrf.py, command and version in each file's header).
	read := func(name string, ports int) *Touchstone {
		f, err := os.Open("../testdata/touchstone/" + name)
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		ts, err := ReadTouchstone(f, name, ports)
		if err != nil {
			t.Fatal(err)
		}
		return ts
	}
	ri := read("skrf_cascade.s2p", 2)
	db := read("skrf_cascade_db.s2p", 2)
	ma := read("skrf_s11_ma.s1p", 1)
	if len(db.Freqs) != len(ri.Freqs) || len(ma.Freqs) != len(ri.Freqs) {
		t.Fatalf("frequency counts %d, %d, %d differ", len(ri.Freqs), len(db.Freqs), len(ma.Freqs))
	}
	for k := range ri.Freqs {
		if math.Abs(db.Freqs[k]-ri.Freqs[k]) > 1e-6 || math.Abs(ma.Freqs[k]-ri.Freqs[k]) > 1e-6 {
			t.Errorf("frequency %d: %g, %g, %g", k, ri.Freqs[k], db.Freqs[k], ma.Freqs[k])
		}
		for i := 0; i < 4; i++ {
			if !near(db.S[k][i], ri.S[k][i], 1e-12) {
				t.Errorf("DB file, %g Hz, S[%d] = %v, RI file %v", ri.Freqs[k], i, db.S[k][i], ri.S[k][i])
			}
		}
		if !near(ma.S[k][0], ri.S[k][0], 1e-12) {
			t.Errorf("MA file, %g Hz, S11 = %v, RI file %v", ri.Freqs[k], ma.S[k][0], ri.S[k][0])
		}
	}
	if cmplx.IsNaN(ri.S[0][0]) {
		t.Errorf("NaN read")
	}
}

func TestTouchstonePorts(t *testing.T) {
	tests := []struct {
		name string
		want int
		ok   bool
	}{
		{"load.s1p", 1, true}, {"dir/amp.S2P", 2, true}, {"x.s10p", 10, true},
		{"x.txt", 0, false}, {"x.sp", 0, false}, {"x.s0p", 0, false}, {"x.sxp", 0, false},
	}
	for _, tt := range tests {
		n, err := TouchstonePorts(tt.name)
		if (err == nil) != tt.ok || n != tt.want {
			t.Errorf("TouchstonePorts(%q) = %d, %v; want %d, ok %v", tt.name, n, err, tt.want, tt.ok)
		}
	}
}

func BenchmarkReadTouchstone(b *testing.B) {
	// A 1001-point two-port sweep in RI.
	var data strings.Builder
	data.WriteString("# Hz S RI R 50\n")
	for k := 1; k <= 1001; k++ {
		data.WriteString(strconv.Itoa(k * 1000000))
		data.WriteString(" 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n")
	}
	text := data.String()
	b.SetBytes(int64(len(text)))
	for i := 0; i < b.N; i++ {
		if _, err := ReadTouchstone(strings.NewReader(text), "bench", 2); err != nil {
			b.Fatal(err)
		}
	}
}
