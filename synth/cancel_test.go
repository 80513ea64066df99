package synth

import (
	"context"
	"errors"
	"fmt"
	"testing"

	"stubcraft/physical"
)

// Cancelling the context stops each long computation with an error that
// wraps context.Canceled: the field solves behind the line models, the
// re-centring and the Monte Carlo analysis. The cancellation is made
// deterministic by cancelling from inside the computation.
func TestCancelStopsLongComputations(t *testing.T) {
	d := decodeTestDesign(t, fmt.Sprintf(fr4Open, "open"))
	t.Run("field solves", func(t *testing.T) {
		// The masked stackup needs the 2-D field solver; the context is
		// cancelled once the first line model is made, so the next
		// solve must refuse.
		st := preset(t, "fr4-1.6mm-masked")
		ctx, cancel := context.WithCancel(context.Background())
		defer cancel()
		inner := LineMakerFor(ctx, st, nil)
		mk := func(w float64, sub physical.Substrate) (physical.LineModel, error) {
			m, err := inner(w, sub)
			cancel()
			return m, err
		}
		_, err := Simulate(ctx, BuildInput{Design: d, Stackup: st, Load: ConstantLoad(d.Load.Impedance), Lines: mk, SkipTolerance: true})
		if !errors.Is(err, context.Canceled) {
			t.Fatalf("got %v, want context.Canceled", err)
		}
	})
	r := build(t, fmt.Sprintf(fr4Open, "open"), "fr4-1.6mm", true)
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	mk := LineMakerFor(context.Background(), r.Stackup, nil)
	t.Run("re-centring", func(t *testing.T) {
		if _, err := r.recentre(cancelled, mk, r.LoadF0); !errors.Is(err, context.Canceled) {
			t.Fatalf("got %v, want context.Canceled", err)
		}
	})
	t.Run("Monte Carlo", func(t *testing.T) {
		sub, _ := SubstrateAt(r.Stackup, d.Freq)
		_, err := Analyse(cancelled, r.Physical.Board, sub, mk, r.LoadF0, d.Freq, d.Z0, d.Tolerance)
		if !errors.Is(err, context.Canceled) {
			t.Fatalf("got %v, want context.Canceled", err)
		}
	})
}
