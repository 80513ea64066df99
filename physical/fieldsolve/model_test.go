package fieldsolve

import (
	"math"
	"testing"

	"stubcraft/physical"
)

func TestLineModel(t *testing.T) {
	sub := physical.Substrate{Er: 4.4, Height: 1.6e-3, LossTangent: 0.02}
	cache := NewCache()
	mk := Maker(Microstrip, 0, cache)
	lm, err := mk(3e-3, sub)
	if err != nil {
		t.Fatal(err)
	}
	if cache.Len() != 1 {
		t.Errorf("cache holds %d results, want 1", cache.Len())
	}
	if _, err := mk(3e-3, sub); err != nil || cache.Len() != 1 {
		t.Errorf("second build: err %v, cache %d (want a hit)", err, cache.Len())
	}
	ref, err := physical.NewMicrostrip(3e-3, sub)
	if err != nil {
		t.Fatal(err)
	}
	prev := 0.0
	for _, f := range []float64{0, 1e9, 5e9, 10e9, 20e9} {
		p, q := lm.At(f), ref.At(f)
		// Source: Hammerstad-Jensen 1980 + Kirschning-Jansen 1982/1984 for
		// a bare zero-thickness strip, which the field solution should
		// match within the static agreement (1 %, see
		// TestMicrostripHammerstadJensen).
		if relDiff(p.Z0, q.Z0) > 0.01 || relDiff(p.EpsEff, q.EpsEff) > 0.01 {
			t.Errorf("f=%g: Z0 %.3f εeff %.4f, closed forms %.3f %.4f", f, p.Z0, p.EpsEff, q.Z0, q.EpsEff)
		}
		if f > 0 && relDiff(p.AlphaDielectric, q.AlphaDielectric) > 0.02 {
			t.Errorf("f=%g: αd %.4g, closed form %.4g Np/m", f, p.AlphaDielectric, q.AlphaDielectric)
		}
		// Exact: εeff rises with frequency towards εr (the field moves
		// into the dielectric) and stays below it.
		if p.EpsEff < prev || p.EpsEff >= sub.Er {
			t.Errorf("f=%g: εeff %.4f not in [%.4f, εr)", f, p.EpsEff, prev)
		}
		prev = p.EpsEff
	}
	if _, ok := lm.(*Model); !ok {
		t.Errorf("Maker built %T, want *Model", lm)
	}
}

func TestStriplineLoss(t *testing.T) {
	// Source: exact TEM result, αd = π f √εr tanδ / c0 (Pozar, Microwave
	// Engineering, eq. 3.30 with a homogeneous dielectric); no dispersion.
	sub := physical.Substrate{Er: 3.5, Height: 1e-3, LossTangent: 0.004, CopperThickness: 17e-6}
	lm, err := Maker(Stripline, 0, nil)(0.5e-3, sub)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []float64{1e9, 10e9} {
		p := lm.At(f)
		want := math.Pi * f * math.Sqrt(3.5) * 0.004 / physical.C0
		if relDiff(p.AlphaDielectric, want) > 1e-9 {
			t.Errorf("f=%g: αd %.6g, want %.6g", f, p.AlphaDielectric, want)
		}
		if p.EpsEff != 3.5 {
			t.Errorf("f=%g: εeff %g, want 3.5", f, p.EpsEff)
		}
		if !(p.AlphaConductor > 0) {
			t.Errorf("f=%g: no conductor loss", f)
		}
	}
	if len(lm.Warnings(1e9)) == 0 {
		t.Error("no warning about the approximate stripline conductor loss")
	}
}

func TestSynthesizeWidth(t *testing.T) {
	// Source: Cohn 1954 (exact). The impedance of W/b = 0.8 is the target;
	// the synthesized width must recover W within 1 % (|d ln Z/d ln W| < 1
	// here, and Z0 is solved to 0.5 %).
	b := 1e-3
	target := cohnStripline(0.8*b, b, 2.2)
	cs := CrossSection{Geometry: Stripline, Width: 0.3 * b, Spacing: b, Er: 2.2}
	got, r, err := SynthesizeWidth(cs, target, Options{}, NewCache())
	if err != nil {
		t.Fatal(err)
	}
	if d := relDiff(got.Width, 0.8*b); d > 0.01 {
		t.Errorf("width %.4g m for %.3f Ω, want %.4g m (%.2f %%); solved Z0 %.3f", got.Width, target, 0.8*b, 100*d, r.Z0)
	}
}
