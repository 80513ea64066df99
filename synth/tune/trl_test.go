package tune_test

import (
	"math"
	"testing"

	"stubcraft/physical"
	"stubcraft/synth/tune"
)

// The line standard is a quarter wave at f0, and its band edges are where
// the phase βΔL reaches 20° and 160° (Engen and Hoer 1979). Without
// dispersion these are f0·20/90 and f0·160/90 exactly; the check uses the
// microstrip model's own β at each edge.
func TestTRLLine(t *testing.T) {
	for _, c := range []struct {
		name  string
		width float64
		sub   physical.Substrate
		f0    float64
	}{
		{"fr4 2.45 GHz", 3.0e-3, physical.Substrate{Er: 4.4, Height: 1.6e-3, LossTangent: 0.02, CopperThickness: 35e-6}, 2.45e9},
		{"ptfe 5.8 GHz", 2.2e-3, physical.Substrate{Er: 2.2, Height: 0.79e-3, LossTangent: 0.001, CopperThickness: 35e-6}, 5.8e9},
		{"air 1 GHz", 5e-3, physical.Substrate{Er: 1, Height: 1e-3}, 1e9},
	} {
		t.Run(c.name, func(t *testing.T) {
			m, err := physical.NewMicrostrip(c.width, c.sub)
			if err != nil {
				t.Fatal(err)
			}
			l, err := tune.NewTRLLine(m, c.f0)
			if err != nil {
				t.Fatal(err)
			}
			deg := func(f float64) float64 { return m.At(f).Beta() * l.Extra * 180 / math.Pi }
			for _, p := range []struct {
				f, want float64
			}{{c.f0, 90}, {l.Lo, 20}, {l.Hi, 160}} {
				if got := deg(p.f); math.Abs(got-p.want) > 1e-6 {
					t.Errorf("phase at %.6g GHz = %.6f°, want %g°", p.f/1e9, got, p.want)
				}
			}
			// Quarter wave: ΔL = c/(4 f0 √εeff(f0)) (exact definition).
			want := physical.C0 / (4 * c.f0 * math.Sqrt(m.At(c.f0).EpsEff))
			if math.Abs(l.Extra-want) > 1e-12 {
				t.Errorf("extra length %.6f mm, want %.6f mm", l.Extra*1e3, want*1e3)
			}
			// Dispersion raises εeff with f, so the edges sit within a few
			// per cent of the dispersion-free ratios 2/9 and 16/9 (exact for
			// air, where εeff = 1 at every frequency).
			tol := 0.03
			if c.sub.Er == 1 {
				tol = 1e-6
			}
			if math.Abs(l.Lo/c.f0-20.0/90) > tol*20/90 || math.Abs(l.Hi/c.f0-160.0/90) > tol*160/90 {
				t.Errorf("band %.4g–%.4g GHz, dispersion-free %.4g–%.4g GHz", l.Lo/1e9, l.Hi/1e9, c.f0*20/90/1e9, c.f0*160/90/1e9)
			}
		})
	}
}
