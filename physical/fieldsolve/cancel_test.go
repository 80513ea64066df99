package fieldsolve

import (
	"context"
	"errors"
	"testing"
)

// A cancelled context stops a solve before its first grid, with an error
// wrapping context.Canceled, through the cache and the line maker too.
func TestSolveContextCancelled(t *testing.T) {
	cs := CrossSection{Geometry: Microstrip, Width: 3e-3, Height: 1.6e-3, Thickness: 35e-6, Er: 4.3}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := SolveContext(ctx, cs, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("SolveContext: got %v, want context.Canceled", err)
	}
	if _, err := NewCache().SolveContext(ctx, cs, Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("Cache.SolveContext: got %v, want context.Canceled", err)
	}
}
