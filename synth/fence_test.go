package synth

import (
	"context"
	"fmt"
	"strings"
	"testing"
)

// TestFenceWarnings builds the demo (FR-4 class, h = 1.6 mm, εr 4.4 at
// the 3.185 GHz top of its ±30 % sweep around 2.45 GHz) with a fence and
// checks the two rules of thumb (common practice, no source): the pitch
// against a tenth of the wavelength in the dielectric at the highest
// frequency, c0/(3.185 GHz·√4.4)/10 = 4.49 mm (εr as the stackup gives it;
// the check allows 4.2–4.8 mm), and the
// via pads at least 3 h = 4.8 mm from the copper. The default offset
// (3 h plus half the 0.6 mm pad) keeps the second; 1 mm does not.
func TestFenceWarnings(t *testing.T) {
	for _, c := range []struct {
		name          string
		pitch, offset float64
		lambda, near  bool
	}{
		{"3 mm, default offset", 3e-3, 0, false, false},
		{"6 mm", 6e-3, 0, true, false},
		{"3 mm, 1 mm offset", 3e-3, 1e-3, false, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			in, err := LoadDemo(LoadOptions{})
			if err != nil {
				t.Fatal(err)
			}
			in.SkipTolerance = true
			in.Design.Layout.FencePitch, in.Design.Layout.FenceOffset = c.pitch, c.offset
			r, err := Build(context.Background(), in)
			if err != nil {
				t.Fatal(err)
			}
			if FenceViaCount(r.Layout) == 0 {
				t.Fatal("no fence vias")
			}
			var lambda, near bool
			for _, w := range r.Warnings {
				lambda = lambda || strings.Contains(w, "λ/10")
				near = near || strings.Contains(w, "closer than 3 dielectric heights")
			}
			if lambda != c.lambda || near != c.near {
				t.Errorf("λ/10 warning %v (want %v), 3 h warning %v (want %v): %q", lambda, c.lambda, near, c.near, r.Warnings)
			}
			found := false
			for _, n := range r.Notes {
				found = found || strings.Contains(n, "via fence:") && strings.Contains(n, "not in the circuit model")
			}
			if !found {
				t.Errorf("no fence note in %q", r.Notes)
			}
		})
	}
	// The λ/10 figure itself, at 3.185 GHz on the demo's stackup.
	in, err := LoadDemo(LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	in.Design.Layout.FencePitch = 6e-3
	r, err := Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range r.Warnings {
		if i := strings.Index(w, "λ/10 = "); i >= 0 {
			var mm float64
			if _, err := fmt.Sscan(w[i+len("λ/10 = "):], &mm); err != nil || mm < 4.2 || mm > 4.8 {
				t.Errorf("λ/10 = %g mm (%v), want 4.2–4.8 mm: %s", mm, err, w)
			}
		}
	}
}
