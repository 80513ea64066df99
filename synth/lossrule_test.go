package synth

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// The loss rule (MaxLoadGamma, MaxNetworkLossDB; common practice, no
// source) refuses purely reactive, near-reactive and extreme loads alike,
// naming the load key and giving both figures; AcceptLoss lets the ones a
// network can reach through.
func TestLossRule(t *testing.T) {
	cases := []struct {
		load       string
		refused    bool // without AcceptLoss
		acceptable bool // builds with AcceptLoss
	}{
		{"31-j24", false, true},
		{"1e-9+j50", true, true},
		{"1e9+j0", true, true},
		{"1e-6-j1e-6", true, true},
		{"0.001+j1000", true, true},
		{"1e308+j1e308", true, false},
		{"0-j24", true, false},      // purely reactive: no network at all
		{"1e-300+j50", true, false}, // reactive to the last digit
		{"10+j0", false, true},      // |Γ| = 0.667: inside the rule
		{"2+j0", true, true},        // |Γ| = 0.923, but the network on FR-4 dissipates more than 3 dB
	}
	for _, c := range cases {
		design := strings.Replace(strings.Replace(fr4Open, "%s", "open", 1), "31-j24", c.load, 1)
		d, err := DecodeDesign(strings.NewReader(design), "t.toml", "")
		if err != nil {
			t.Errorf("%s: decode: %v", c.load, err)
			continue
		}
		in := BuildInput{Design: d, Stackup: preset(t, "fr4-1.6mm"), Load: ConstantLoad(d.Load.Impedance), SkipTolerance: true}
		r, err := Simulate(context.Background(), in)
		if c.refused {
			var le *LossError
			if !errors.As(err, &le) || !errors.Is(err, ErrTooLossy) {
				t.Errorf("%s: got %v, want a LossError", c.load, err)
				continue
			}
			msg := err.Error()
			for _, want := range []string{"load.impedance", "|Γ_load| = ", "limit 0.98", "--accept-loss"} {
				if !strings.Contains(msg, want) {
					t.Errorf("%s: %q does not say %q", c.load, msg, want)
				}
			}
			if !(le.Gamma > MaxLoadGamma || le.LossDB > MaxNetworkLossDB) {
				t.Errorf("%s: refused with |Γ| %g and loss %g dB, both inside the rule", c.load, le.Gamma, le.LossDB)
			}
		} else if err != nil {
			t.Errorf("%s: %v", c.load, err)
			continue
		} else if r.LossF0DB > MaxNetworkLossDB {
			t.Errorf("%s: built with %.2f dB of loss", c.load, r.LossF0DB)
		}
		in.AcceptLoss = true
		r, err = Simulate(context.Background(), in)
		if c.acceptable != (err == nil) {
			t.Errorf("%s with AcceptLoss: got %v, want success %v", c.load, err, c.acceptable)
		}
		if err == nil && (math.IsNaN(r.LossF0DB) || math.IsNaN(real(r.S11F0))) {
			t.Errorf("%s with AcceptLoss: NaN in the result", c.load)
		}
	}
}

// The loss rule weighs the share of the available power a network burns:
// P_diss/P_avail = (1 − |S11|²)·(1 − P_load/P_in), energy conservation of
// a passive two-port (exact). Matched, it is the network's own loss; a
// notch that reflects 93 % (|S11| −0.3 dB) and loses 18.7 dB of the 6.7 %
// that enters burns 6.6 % of the source's power, 0.30 dB (worked by hand:
// 0.0667 × 0.9865 = 0.0658, −10·log10(0.9342) = 0.296 dB).
func TestAvailableLossDB(t *testing.T) {
	for _, c := range []struct {
		name   string
		s11    complex128
		lossDB float64
		want   float64
	}{
		{"matched, 3 dB", 0, 3, 3},                                                        // exact
		{"matched, 0.5 dB", 0, 0.5, 0.5},                                                  // exact
		{"notch", complex(0, 0.9660), 18.7, 0.296},                                        // by hand, above
		{"total reflection", 1, math.Inf(1), 0},                                           // nothing enters
		{"all that enters is lost", complex(0.6, 0), math.Inf(1), -10 * math.Log10(0.36)}, // exact: 64 % burnt
	} {
		if got := availableLossDB(c.s11, c.lossDB); math.Abs(got-c.want) > 1e-3 {
			t.Errorf("%s: %.4f dB, want %.4f dB", c.name, got, c.want)
		}
	}
}
