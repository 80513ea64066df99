package physical

import (
	"errors"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// FuzzReadTouchstone feeds the reader arbitrary text: it must not panic or
// hang, a refusal must be a *TouchstoneError or name the source, and what
// it accepts must have increasing, finite frequencies and finite S values.
func FuzzReadTouchstone(f *testing.F) {
	for _, s := range []string{
		"# GHz S MA R 50\n1 0.5 30\n2 0.4 20\n",
		"# MHz S DB R 75\n100 -10 30 ! c\n200 -12 20\n",
		"# Hz S RI R 50\n1e9 0.1 0.2\n",
		"#GHz S RI\n1 0.1 0.2 0.3 0.4 0.5 0.6 0.7 0.8\n2 0.1 0.2 0.3 0.4\n0.5 0.6 0.7 0.8\n1 1.2 0.3 40 0.25\n",
		"# GHz S DB R 50\n1 7000 0\n", "1 2 3\n", "# R\n", "", "#\n\n\n1e400 1 1\n", "# KHZ S MA R 1e-300\n1 1e308 1\n",
	} {
		f.Add(s, 1)
		f.Add(s, 2)
	}
	f.Fuzz(func(t *testing.T, text string, ports int) {
		if ports < 1 || ports > 4 {
			ports = 1
		}
		ts, err := ReadTouchstone(strings.NewReader(text), "fuzz.s1p", ports)
		if err != nil {
			var te *TouchstoneError
			if !errors.As(err, &te) && !strings.HasPrefix(err.Error(), "fuzz.s1p") {
				t.Fatalf("error %v names no source", err)
			}
			return
		}
		for i, fr := range ts.Freqs {
			if math.IsNaN(fr) || math.IsInf(fr, 0) || fr < 0 || (i > 0 && fr <= ts.Freqs[i-1]) {
				t.Fatalf("frequency %d = %g", i, fr)
			}
			for _, v := range ts.S[i] {
				if cmplx.IsNaN(v) || cmplx.IsInf(v) {
					t.Fatalf("S at %g Hz = %v", fr, v)
				}
			}
		}
		if !(ts.Z0 > 0) || math.IsInf(ts.Z0, 0) {
			t.Fatalf("Z0 = %g", ts.Z0)
		}
	})
}
