package fdtd

import (
	"context"
	"errors"
	"testing"
)

// TestSolveStops checks the two ways a solve ends without a result: a run
// that reaches its step limit before the field energy has decayed by the
// 50 dB the issue asks for is ErrNotConverged, and a cancelled context
// ends the solve with the context's error. Neither returns a result.
func TestSolveStops(t *testing.T) {
	s := straight(4.35, 1.6e-3, 3.0e-3, 20e-3, []float64{1e9, 2e9, 3e9})
	cancelled, cancel := context.WithCancel(context.Background())
	cancel()
	for _, c := range []struct {
		name string
		ctx  context.Context
		o    Options
		want error
	}{
		{"200 steps", context.Background(), Options{MaxSteps: 200}, ErrNotConverged},
		{"cancelled", cancelled, Options{}, context.Canceled},
	} {
		r, err := Solve(c.ctx, s, c.o)
		if !errors.Is(err, c.want) {
			t.Errorf("%s: error %v, want %v", c.name, err, c.want)
		}
		if r != nil {
			t.Errorf("%s: a result came back with the error", c.name)
		}
	}
}
