package export

import (
	"bytes"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"stubcraft/physical"
)

// network returns a deterministic ports-port network with values that do
// not print short (thirds, square roots), over a few frequencies.
func network(ports int, z0 float64) *physical.Touchstone {
	t := &physical.Touchstone{Ports: ports, Z0: z0}
	for k := 0; k < 5; k++ {
		t.Freqs = append(t.Freqs, 1e9/3*float64(k+1)+0.1)
		s := make([]complex128, ports*ports)
		for i := range s {
			x := float64(k*ports*ports + i + 1)
			s[i] = cmplx.Rect(1/math.Sqrt(x+1), x/7) * complex(1, -1e-17*x)
		}
		t.S = append(t.S, s)
	}
	return t
}

func TestWriteTouchstoneRoundTrip(t *testing.T) {
	// Write then read with physical.ReadTouchstone: every float64 must come
	// back bit for bit (exact: shortest round-trip formatting).
	for _, ports := range []int{1, 2, 3, 4, 5} {
		want := network(ports, 50.0/3)
		var buf bytes.Buffer
		if err := WriteTouchstone(&buf, want, []string{"made by a test", "second\nand third line"}); err != nil {
			t.Fatal(err)
		}
		got, err := physical.ReadTouchstone(&buf, "roundtrip", ports)
		if err != nil {
			t.Fatalf("%d ports: %v", ports, err)
		}
		if got.Ports != ports || got.Z0 != want.Z0 || len(got.Freqs) != len(want.Freqs) {
			t.Fatalf("%d ports: got %d ports, Z0 %g, %d freqs", ports, got.Ports, got.Z0, len(got.Freqs))
		}
		for k := range want.Freqs {
			if got.Freqs[k] != want.Freqs[k] {
				t.Errorf("%d ports: freq %d = %v, want %v", ports, k, got.Freqs[k], want.Freqs[k])
			}
			for i := range want.S[k] {
				if got.S[k][i] != want.S[k][i] {
					t.Errorf("%d ports: S[%d][%d] = %v, want %v", ports, k, i, got.S[k][i], want.S[k][i])
				}
			}
		}
	}
}

func TestWriteTouchstoneLayout(t *testing.T) {
	// The layout the Touchstone 1.1 specification asks for: comments with
	// "!", the option line, a two-port record on one line in the order
	// S11 S21 S12 S22, and rows of at most four pairs for more ports.
	two := &physical.Touchstone{Ports: 2, Z0: 50, Freqs: []float64{2.45e9},
		S: [][]complex128{{complex(0.1, 0.2), complex(0.5, 0.6), complex(0.3, 0.4), complex(0.7, 0.8)}}}
	var buf bytes.Buffer
	if err := WriteTouchstone(&buf, two, []string{"stub match"}); err != nil {
		t.Fatal(err)
	}
	want := "! stub match\n# Hz S RI R 50\n2450000000 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n"
	if buf.String() != want {
		t.Errorf("two-port file\n%q\nwant\n%q", buf.String(), want)
	}

	five := network(5, 50)
	buf.Reset()
	if err := WriteTouchstone(&buf, five, nil); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(buf.String()), "\n")
	if lines[0] != "# Hz S RI R 50" {
		t.Errorf("option line %q", lines[0])
	}
	// 5 ports: each row is 4 pairs + 1 pair = 2 lines, 10 lines a record.
	if n := len(lines) - 1; n != 10*len(five.Freqs) {
		t.Errorf("%d data lines, want %d", n, 10*len(five.Freqs))
	}
	for i, l := range lines[1:] {
		f := strings.Fields(l)
		pairs := len(f) / 2
		if i%10 == 0 {
			pairs = (len(f) - 1) / 2
		}
		if pairs > 4 || pairs < 1 {
			t.Errorf("line %q has %d pairs", l, pairs)
		}
	}
}

func TestWriteTouchstoneRejects(t *testing.T) {
	good := func() *physical.Touchstone { return network(2, 50) }
	tests := []struct {
		name string
		mod  func(*physical.Touchstone)
	}{
		{"no ports", func(t *physical.Touchstone) { t.Ports = 0 }},
		{"zero Z0", func(t *physical.Touchstone) { t.Z0 = 0 }},
		{"no frequencies", func(t *physical.Touchstone) { t.Freqs, t.S = nil, nil }},
		{"short matrix", func(t *physical.Touchstone) { t.S[1] = t.S[1][:3] }},
		{"decreasing", func(t *physical.Touchstone) { t.Freqs[2] = t.Freqs[0] }},
		{"NaN", func(t *physical.Touchstone) { t.S[0][0] = cmplx.NaN() }},
		{"count mismatch", func(t *physical.Touchstone) { t.S = t.S[:2] }},
	}
	for _, tt := range tests {
		n := good()
		tt.mod(n)
		var buf bytes.Buffer
		if err := WriteTouchstone(&buf, n, nil); err == nil {
			t.Errorf("%s: written without error", tt.name)
		}
		if buf.Len() != 0 {
			t.Errorf("%s: %d bytes written before the error", tt.name, buf.Len())
		}
	}
	if err := WriteTouchstone(&bytes.Buffer{}, nil, nil); err == nil {
		t.Errorf("nil network written")
	}
}

func BenchmarkWriteTouchstone(b *testing.B) {
	t := &physical.Touchstone{Ports: 2, Z0: 50}
	for k := 0; k < 1001; k++ {
		t.Freqs = append(t.Freqs, 1e9+float64(k)*1e6)
		t.S = append(t.S, []complex128{complex(0.1, 0.2) / complex(float64(k+1), 3), 0.9i, 0.9i, complex(0.3, -0.1)})
	}
	var buf bytes.Buffer
	for i := 0; i < b.N; i++ {
		buf.Reset()
		if err := WriteTouchstone(&buf, t, nil); err != nil {
			b.Fatal(err)
		}
	}
	b.SetBytes(int64(buf.Len()))
}
