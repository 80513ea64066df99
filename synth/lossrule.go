package synth

import (
	"errors"
	"fmt"
	"math"
)

// The loss rule: a load that a passive network can only "match" by
// burning the power is refused unless the caller accepts the loss
// (BuildInput.AcceptLoss, --accept-loss on the command line). The limits
// are common practice, no source: half the power (3 dB) lost in the
// matching network, or a load reflecting more than 96 % of the power
// (|Γ| = 0.98, VSWR 99), is not a match worth etching.
const (
	MaxNetworkLossDB = 3.0
	MaxLoadGamma     = 0.98
)

// ErrTooLossy is wrapped by a LossError, for errors.Is.
var ErrTooLossy = errors.New("the load cannot be matched usefully")

// LossError refuses a load under the loss rule, with both figures.
type LossError struct {
	Gamma  float64 // |Γ| of the load against z0 (1 when not finite)
	LossDB float64 // the matched network's dissipation at f0, dB; NaN when unknown, +Inf when no network matches
	FreqHz float64 // the frequency of LossDB, Hz; 0 when unknown
}

// Error gives |Γ_load| and the dissipation against their limits, and the fix.
func (e *LossError) Error() string {
	var loss string
	switch {
	case math.IsInf(e.LossDB, 1):
		loss = "no passive network matches it without dissipating all the power"
	case math.IsNaN(e.LossDB):
		loss = "a matched network would dissipate most of the power (no stackup to compute the figure)"
	default:
		at := ""
		if e.FreqHz > 0 {
			at = " at " + FormatHz(e.FreqHz)
		}
		loss = fmt.Sprintf("the matched network would dissipate %.1f dB%s (limit %g dB)", e.LossDB, at, MaxNetworkLossDB)
	}
	return fmt.Sprintf("%v: |Γ_load| = %.6g (limit %g) and %s; check the load (a purely or nearly reactive load, an open or a short, cannot be matched usefully), or pass --accept-loss to build it anyway",
		ErrTooLossy, e.Gamma, MaxLoadGamma, loss)
}

// Unwrap returns ErrTooLossy.
func (e *LossError) Unwrap() error { return ErrTooLossy }

// LoadGamma returns |Γ| of zLoad against z0, 1 for a load that is not
// finite or gives no finite reflection.
func LoadGamma(zLoad complex128, z0 float64) float64 {
	g, _, _ := LoadReport(zLoad, z0)
	if math.IsNaN(g) || math.IsInf(g, 0) {
		return 1
	}
	return g
}

// CheckLoadGamma applies the loss rule where no line loss is known (the
// solve command): a passive load with |Γ| above MaxLoadGamma is refused.
func CheckLoadGamma(zLoad complex128, z0 float64) error {
	if real(zLoad) < 0 {
		return nil // an active load: the solver refuses it as such
	}
	if g := LoadGamma(zLoad, z0); g > MaxLoadGamma {
		return &LossError{Gamma: g, LossDB: math.NaN()}
	}
	return nil
}

// availableLossDB returns the share of the available power (what a z0
// source offers) that a network dissipates, as 10·log10(1/(1 − share)),
// from its |S11| and its own loss lossDB (dissipation of the power that
// enters, Sim.Loss): share = (1 − |S11|²)·(1 − 10^(−lossDB/10)). For a
// matched network it is lossDB; for one that reflects by design (a
// hand-entered notch: little power enters, and nearly all of that is
// lost, 18.7 dB "lost" of almost nothing) it is what the board burns.
func availableLossDB(s11 complex128, lossDB float64) float64 {
	accepted := 1 - real(s11)*real(s11) - imag(s11)*imag(s11)
	if !(accepted > 0) {
		return 0
	}
	lost := 1.0
	if !math.IsInf(lossDB, 1) {
		lost = 1 - math.Pow(10, -lossDB/10)
	}
	return -10 * math.Log10(1-accepted*lost)
}

// checkLoss applies the loss rule to a built network: |Γ_load| above
// MaxLoadGamma or a dissipation above MaxNetworkLossDB is refused.
func checkLoss(gamma, lossDB, f0 float64) error {
	if gamma > MaxLoadGamma || !(lossDB <= MaxNetworkLossDB) {
		return &LossError{Gamma: gamma, LossDB: lossDB, FreqHz: f0}
	}
	return nil
}
