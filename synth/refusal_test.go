package synth_test

import (
	"context"
	"errors"
	"strings"
	"testing"

	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// demoWith returns the embedded demo design with the given text replaced.
func demoWith(t *testing.T, old, new string) synth.BuildInput {
	t.Helper()
	text := string(synth.DemoTOML())
	if !strings.Contains(text, old) {
		t.Fatalf("the demo has no %q", old)
	}
	in, err := synth.ReadDesign(strings.NewReader(strings.Replace(text, old, new, 1)), "demo-variant.toml", "", synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	return in
}

// Each refusal of Build is a typed error carrying its figures, found with
// errors.As through the *DesignError that names the file. The limits are
// the package's own constants; the figures are checked for the condition
// that caused the refusal, not for values Build computed.
func TestBuildRefusals(t *testing.T) {
	ctx := context.Background()
	t.Run("already matched", func(t *testing.T) {
		// A 50 ohm load on 50 ohm reflects nothing (exact: Γ = 0).
		// The decoder solves the match, so the refusal comes at loading.
		text := strings.Replace(string(synth.DemoTOML()), `impedance = "31-j24"`, `impedance = "50"`, 1)
		_, err := synth.ReadDesign(strings.NewReader(text), "demo-variant.toml", "", synth.LoadOptions{})
		var me *synth.MatchedError
		if !errors.As(err, &me) || !errors.Is(err, synth.ErrMatched) || me.Gamma >= synth.MatchedGamma || me.Z0 != 50 {
			t.Fatalf("got %v (%+v), want a MatchedError with |Γ| < %g", err, me, synth.MatchedGamma)
		}
	})
	t.Run("mismatch", func(t *testing.T) {
		// Arbitrary sections that leave 60−j80 ohm far from 50 ohm.
		in := demoWith(t, "impedance = \"31-j24\"\n\n[match]\ntopology = \"shunt-stub\"\nstub = \"open\"\npick = \"shortest\"\n",
			"impedance = \"60-j80\"\n\n[[section]]\nkind = \"line\"\nz0 = 50\nlength = \"36deg\"\n[[section]]\nkind = \"stub\"\nend = \"open\"\nz0 = 50\nlength = \"36deg\"\n")
		_, err := synth.Build(ctx, in)
		var mm *synth.MismatchError
		var de *synth.DesignError
		if !errors.As(err, &mm) || !errors.As(err, &de) || de.Source != "demo-variant.toml" {
			t.Fatalf("got %v, want a MismatchError inside a DesignError naming the file", err)
		}
		if !(mm.S11DB > synth.MismatchLimitDB) || mm.FreqHz != 2.45e9 || !(mm.ElectricalGamma > 0.3) {
			t.Errorf("figures %+v: want |S11| above %v dB at 2.45 GHz and a clearly mismatched network", mm, synth.MismatchLimitDB)
		}
		in.AcceptMismatch = true
		if _, err := synth.Build(ctx, in); err != nil {
			t.Errorf("AcceptMismatch: %v", err)
		}
	})
	t.Run("fab minimum", func(t *testing.T) {
		// A 50 ohm line on 1.6 mm FR-4 is about 3 mm wide: 5 mm is too much.
		in := demoWith(t, `min_width = "0.15mm"`, `min_width = "5mm"`)
		_, err := synth.Build(ctx, in)
		var fe *synth.FabMinimumError
		if !errors.As(err, &fe) || fe.MinWidth != 5e-3 || len(fe.Narrow) == 0 {
			t.Fatalf("got %v, want a FabMinimumError at 5 mm", err)
		}
		for _, n := range fe.Narrow {
			if !(n.Width < fe.MinWidth) || n.ID == "" {
				t.Errorf("%+v is listed but not below %g m", n, fe.MinWidth)
			}
		}
	})
	t.Run("board size", func(t *testing.T) {
		// At 1 MHz a quarter wave on FR-4 is some 40 m long.
		in := demoWith(t, `frequency = "2.45GHz"`, `frequency = "1MHz"`)
		in.AcceptMismatch = true
		_, err := synth.Build(ctx, in)
		var be *synth.BoardSizeError
		if !errors.As(err, &be) || be.Max != synth.MaxBoardSize || !(be.Width > be.Max || be.Height > be.Max) {
			t.Fatalf("got %v, want a BoardSizeError above %g m", err, synth.MaxBoardSize)
		}
	})
	t.Run("cancelled", func(t *testing.T) {
		in := demoWith(t, `seed = 7`, `seed = 7`)
		c, cancel := context.WithCancel(ctx)
		cancel()
		if _, err := synth.Build(c, in); !errors.Is(err, context.Canceled) {
			t.Fatalf("got %v, want context.Canceled", err)
		}
	})
}

// A size the layout itself refuses (the landing's via holes would touch)
// comes back as a *DesignKeyError naming the design key that set it, and
// still unwraps to the layout's *geom.SpecError and its reason.
func TestLayoutRefusalNamesDesignKey(t *testing.T) {
	for _, c := range []struct{ layout, key string }{
		{"port = \"edge\"\nlaunch_via_pitch = \"0.2mm\"\n", "layout.launch_via_pitch"},
		{"port = \"edge\"\nlaunch_via_pad = \"9mm\"\n", "layout.launch_via_pad"},
	} {
		in := demoWith(t, "[layout]\n", "[layout]\n"+c.layout)
		_, err := synth.Build(context.Background(), in)
		var ke *synth.DesignKeyError
		if !errors.As(err, &ke) || !strings.HasPrefix(ke.Key, c.key) || !strings.Contains(err.Error(), c.key) {
			t.Errorf("%q: got %v, want a DesignKeyError naming %s", c.layout, err, c.key)
			continue
		}
		if !errors.Is(err, geom.ErrVia) {
			t.Errorf("%q: %v does not unwrap to geom.ErrVia", c.layout, err)
		}
	}
}
