package physical

import (
	"math"
	"strings"
	"testing"
)

const mm, um, GHz = 1e-3, 1e-6, 1e9

func mustMicrostrip(t *testing.T, width float64, sub Substrate) *MicrostripModel {
	t.Helper()
	m, err := NewMicrostrip(width, sub)
	if err != nil {
		t.Fatalf("NewMicrostrip(%g, %+v): %v", width, sub, err)
	}
	return m
}

func relErr(got, want float64) float64 { return math.Abs(got/want - 1) }

// TestMicrostripHandbook checks the static model against handbook worked
// examples and practice.
func TestMicrostripHandbook(t *testing.T) {
	for _, c := range []struct {
		source        string
		width         float64
		sub           Substrate
		z0, e0, tolZ0 float64
		tolE0         float64
	}{
		// Pozar, Microwave Engineering 4th ed., Example 3.7 (from memory):
		// εr 2.20, h 1.27 mm, W 3.91 mm is 50 Ω with εeff 1.87. The example
		// uses simpler static formulas, hence 1.5 % on Z0 and 1 % on εeff.
		{"Pozar 4th ed. Example 3.7", 3.91 * mm, Substrate{Er: 2.2, Height: 1.27 * mm}, 50, 1.87, 0.015, 0.01},
	} {
		m := mustMicrostrip(t, c.width, c.sub)
		z0, e0 := m.Static()
		if relErr(z0, c.z0) > c.tolZ0 || relErr(e0, c.e0) > c.tolE0 {
			t.Errorf("%s: static Z0 %.3f Ω, εeff %.4f; want %.3g Ω (±%g %%), %.3g (±%g %%)",
				c.source, z0, e0, c.z0, 100*c.tolZ0, c.e0, 100*c.tolE0)
		}
	}
}

// TestMicrostripAir: in air (εr = 1) the line is TEM in a homogeneous
// medium, so εeff is exactly 1 and Z0 does not disperse (exact result).
func TestMicrostripAir(t *testing.T) {
	for _, c := range []struct {
		width float64
		sub   Substrate
	}{
		{1 * mm, Substrate{Er: 1, Height: 1 * mm}},
		{0.2 * mm, Substrate{Er: 1, Height: 1 * mm, CopperThickness: 35 * um}},
		{30 * mm, Substrate{Er: 1, Height: 0.5 * mm, CopperThickness: 70 * um, LossTangent: 0.01}},
	} {
		m := mustMicrostrip(t, c.width, c.sub)
		z0, e0 := m.Static()
		if e0 != 1 {
			t.Errorf("W %g: static εeff = %.17g, want exactly 1", c.width, e0)
		}
		for _, f := range []float64{0, 1e6, 1 * GHz, 10 * GHz, 100 * GHz, 1000 * GHz} {
			p := m.At(f)
			if p.EpsEff != 1 {
				t.Errorf("W %g, %g Hz: εeff = %.17g, want exactly 1", c.width, f, p.EpsEff)
			}
			if relErr(p.Z0, z0) > 1e-12 {
				t.Errorf("W %g, %g Hz: Z0 = %.12g, static %.12g; want no dispersion", c.width, f, p.Z0, z0)
			}
		}
	}
}

// TestMicrostripDispersionMonotonic: εeff(f) rises monotonically from the
// static value towards εr (physics of the hybrid mode; the
// Kirschning-Jansen form tends to εr as f → ∞), checked over a fine sweep.
func TestMicrostripDispersionMonotonic(t *testing.T) {
	for _, c := range []struct {
		width float64
		sub   Substrate
	}{
		{0.025 * mm, Substrate{Er: 2.2, Height: 0.254 * mm}},
		{3 * mm, Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um}},
		{0.6 * mm, Substrate{Er: 10, Height: 0.635 * mm, CopperThickness: 17 * um}},
		{16 * mm, Substrate{Er: 3.5, Height: 1.6 * mm, CopperThickness: 70 * um}},
		{0.16 * mm, Substrate{Er: 18, Height: 1.6 * mm}},
	} {
		m := mustMicrostrip(t, c.width, c.sub)
		_, e0 := m.Static()
		prev := e0
		// f·h from 1e-4 to 39 GHz·mm (h/λ0 = 0.13), 20,000 steps.
		fmax := 39e6 / c.sub.Height
		const n = 20000
		for i := 1; i <= n; i++ {
			f := fmax * math.Pow(1e-4/39, float64(n-i)/n)
			ef := m.At(f).EpsEff
			if !(ef >= prev) || !(ef < c.sub.Er) {
				t.Fatalf("W %g, εr %g: εeff(%g Hz) = %.12g after %.12g; want non-decreasing and below εr", c.width, c.sub.Er, f, ef, prev)
			}
			prev = ef
		}
		if hi := m.At(1e6 * 1e4 / c.sub.Height).EpsEff; (c.sub.Er-hi)/(c.sub.Er-e0) > 0.01 {
			t.Errorf("W %g, εr %g: εeff at f·h = 10^4 GHz·mm is %.6g; want within 1 %% of εr − εeff(0) of εr", c.width, c.sub.Er, hi)
		}
	}
}

// TestMicrostripZ0FallsWithWidth: a wider strip has more capacitance and
// less inductance per length, so Z0 falls (physics), static and at 5 GHz.
func TestMicrostripZ0FallsWithWidth(t *testing.T) {
	for _, sub := range []Substrate{
		{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um},
		{Er: 2.2, Height: 0.254 * mm},
		{Er: 10, Height: 0.635 * mm, CopperThickness: 70 * um},
	} {
		for _, f := range []float64{0, 5 * GHz} {
			prev := math.Inf(1)
			for i := 0; i <= 400; i++ {
				w := sub.Height * math.Pow(10, -2+4*float64(i)/400) // W/h 0.01..100
				z := mustMicrostrip(t, w, sub).At(f).Z0
				if !(z < prev) {
					t.Fatalf("εr %g, f %g: Z0(W %g) = %.9g not below %.9g", sub.Er, f, w, z, prev)
				}
				prev = z
			}
		}
	}
}

// TestMicrostripConductorLoss: with smooth copper well above the skin
// depth, conductor loss follows Rs ∝ √f (exact skin-effect result), and
// very rough copper doubles it (the Hammerstad-Bekkadal factor tends to 2).
func TestMicrostripConductorLoss(t *testing.T) {
	// Thin substrate at low f·h, so that Z0(f) moves by < 0.05 %.
	sub := Substrate{Er: 3.5, Height: 0.254 * mm, CopperThickness: 35 * um}
	m := mustMicrostrip(t, 0.55*mm, sub)
	a1, a4 := m.At(1*GHz).AlphaConductor, m.At(4*GHz).AlphaConductor
	if r := a4 / a1; math.Abs(r-2) > 0.002 {
		t.Errorf("αc(4 GHz)/αc(1 GHz) = %.5f, want 2 (√f)", r)
	}
	rough := sub
	rough.Roughness = 20 * um // ≈ 30 skin depths at 10 GHz
	mr := mustMicrostrip(t, 0.55*mm, rough)
	if r := mr.At(10*GHz).AlphaConductor / m.At(10*GHz).AlphaConductor; math.Abs(r-2) > 1e-3 {
		t.Errorf("αc(rough)/αc(smooth) at 10 GHz = %.5f, want → 2", r)
	}
}

// TestMicrostripDielectricLossScales: αd is proportional to f and tanδ
// (Pozar 4th ed. eq. 3.198) and zero for a loss-free dielectric.
func TestMicrostripDielectricLossScales(t *testing.T) {
	sub := Substrate{Er: 4.4, Height: 1.6 * mm, LossTangent: 0.02}
	m := mustMicrostrip(t, 3*mm, sub)
	_, e0 := m.Static()
	// Pozar eq. 3.198 written out: k0·εr(εeff−1)tanδ/(2√εeff(εr−1)).
	f := 2.45 * GHz
	k0 := 2 * math.Pi * f / C0
	want := k0 * 4.4 * (e0 - 1) * 0.02 / (2 * math.Sqrt(e0) * 3.4)
	if got := m.At(f).AlphaDielectric; relErr(got, want) > 1e-12 {
		t.Errorf("αd = %.10g Np/m, Pozar eq. 3.198 gives %.10g", got, want)
	}
	sub.LossTangent = 0
	if got := mustMicrostrip(t, 3*mm, sub).At(f).AlphaDielectric; got != 0 {
		t.Errorf("αd with tanδ 0 = %g, want 0", got)
	}
}

// TestMicrostripNearAir: just above εr = 1 the Kirschning-Jansen Z0(f)
// ratio R13/R14 turns negative (found by sweeping the formula); the model
// must stay finite and keep the static Z0 there.
func TestMicrostripNearAir(t *testing.T) {
	m := mustMicrostrip(t, 10*mm, Substrate{Er: 1.0235, Height: 1 * mm})
	z0, _ := m.Static()
	for f := 0.1 * GHz; f < 15*GHz; f *= 1.05 {
		p := m.At(f)
		if math.IsNaN(p.Z0) || math.IsInf(p.Z0, 0) || math.IsNaN(p.AlphaConductor) {
			t.Fatalf("At(%g) = %+v, want finite", f, p)
		}
	}
	if p := m.At(9.35 * GHz); p.Z0 != z0 {
		t.Errorf("At(9.35 GHz).Z0 = %.10g, want the static %.10g where the form fails", p.Z0, z0)
	}
}

func TestMicrostripStaticAtZeroFrequency(t *testing.T) {
	m := mustMicrostrip(t, 3*mm, Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um, LossTangent: 0.02})
	z0, e0 := m.Static()
	p := m.At(0)
	if p.Z0 != z0 || p.EpsEff != e0 || p.Alpha() != 0 {
		t.Errorf("At(0) = %+v, want static Z0 %g, εeff %g, no loss", p, z0, e0)
	}
	// Continuity: 1 Hz is the static value to 1e-9.
	if q := m.At(1); relErr(q.Z0, z0) > 1e-9 || relErr(q.EpsEff, e0) > 1e-9 {
		t.Errorf("At(1 Hz) = %+v, far from static %g, %g", q, z0, e0)
	}
}

func TestMicrostripErrors(t *testing.T) {
	good := Substrate{Er: 4.4, Height: 1.6 * mm}
	for _, c := range []struct {
		name  string
		width float64
		sub   Substrate
		want  string
	}{
		{"zero width", 0, good, "width"},
		{"negative width", -1 * mm, good, "width"},
		{"NaN width", math.NaN(), good, "width"},
		{"zero height", 1 * mm, Substrate{Er: 4.4}, "height"},
		{"er below 1", 1 * mm, Substrate{Er: 0.5, Height: 1 * mm}, "permittivity"},
		{"negative copper", 1 * mm, Substrate{Er: 4.4, Height: 1 * mm, CopperThickness: -1}, "copper"},
		{"negative tanδ", 1 * mm, Substrate{Er: 4.4, Height: 1 * mm, LossTangent: -0.1}, "loss tangent"},
		{"negative σ", 1 * mm, Substrate{Er: 4.4, Height: 1 * mm, Conductivity: -1}, "conductivity"},
		{"negative roughness", 1 * mm, Substrate{Er: 4.4, Height: 1 * mm, Roughness: -1}, "roughness"},
	} {
		_, err := NewMicrostrip(c.width, c.sub)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
	}
}

func TestMicrostripWarnings(t *testing.T) {
	fr4 := Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um}
	for _, c := range []struct {
		name  string
		width float64
		sub   Substrate
		freq  float64
		want  []string // substrings, one per expected warning
	}{
		{"in range", 3 * mm, fr4, 2.45 * GHz, nil},
		{"static only, narrow", 0.08 * mm, fr4, 0, nil},
		{"narrow for KJ", 0.08 * mm, fr4, 1 * GHz, []string{"W/h = 0.05 is below 0.1, the Kirschning-Jansen dispersion range"}},
		{"too narrow for HJ", 0.01 * mm, fr4, 0, []string{"Hammerstad-Jensen static range", "narrower than thick"}},
		{"narrower than thick", 0.03 * mm, fr4, 0, []string{"30 µm wide on 35 µm copper, narrower than thick"}}, // outside the thickness correction (Hammerstad-Jensen 1980)
		{"wide for KJ Z0", 32 * mm, fr4, 1 * GHz, []string{"W/h = 20 is above 10, the Kirschning-Jansen impedance-dispersion range"}},
		{"high εr", 0.5 * mm, Substrate{Er: 25, Height: 0.5 * mm}, 1 * GHz, []string{"εr = 25 is above 20"}},
		{"high f·h", 3 * mm, fr4, 12 * GHz, []string{"f·h = 19.2 GHz·mm is above 15"}},
		{"very high f·h", 3 * mm, fr4, 30 * GHz, []string{"h/λ0 = 0.16", "f·h = 48 GHz·mm"}},
		{"mask", 3 * mm, Substrate{Er: 4.4, Height: 1.6 * mm, MaskThickness: 20 * um, MaskEr: 3.5}, 1 * GHz, []string{"20 µm solder mask is ignored"}},
		{"εr near 1", 10 * mm, Substrate{Er: 1.0235, Height: 1 * mm}, 10 * GHz, []string{"ill-conditioned"}},
		{"thin copper", 3 * mm, Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 9 * um}, 10e6, []string{"thinner than 2 skin depths"}},
	} {
		got := mustMicrostrip(t, c.width, c.sub).Warnings(c.freq)
		if len(got) != len(c.want) {
			t.Errorf("%s: warnings %q, want %d", c.name, got, len(c.want))
			continue
		}
		for i, w := range c.want {
			if !strings.Contains(got[i], w) {
				t.Errorf("%s: warning %q, want it to contain %q", c.name, got[i], w)
			}
		}
	}
}

// TestLnConstants checks the hand-entered logarithms (exact values).
func TestLnConstants(t *testing.T) {
	for _, c := range []struct{ got, x float64 }{{ln38p7, 38.7}, {ln18p365, 18.365}, {ln12p3, 12.3}, {ln0p0514, 0.0514}, {ln30p666, 30.666}} {
		if want := math.Log(c.x); math.Abs(c.got-want) > 1e-15 {
			t.Errorf("ln %g = %.17g, want %.17g", c.x, c.got, want)
		}
	}
}

func TestMicrostripSweep(t *testing.T) {
	m := mustMicrostrip(t, 3*mm, Substrate{Er: 4.4, Height: 1.6 * mm, CopperThickness: 35 * um, Roughness: 1 * um, LossTangent: 0.02})
	for _, n := range []int{0, 1, 7, 5000, 10001} {
		freqs := make([]float64, n)
		for i := range freqs {
			freqs[i] = 0.1*GHz + 19.9*GHz*float64(i)/float64(max(n-1, 1))
		}
		head := []LineParams{{Freq: -1}}
		got := m.Sweep(freqs, head)
		if len(got) != n+1 || got[0].Freq != -1 {
			t.Fatalf("n %d: Sweep returned %d elements (first %+v), want %d after the existing one", n, len(got), got[0], n+1)
		}
		for i, f := range freqs {
			if got[i+1] != m.At(f) {
				t.Fatalf("n %d: Sweep[%d] = %+v, At = %+v", n, i, got[i+1], m.At(f))
			}
		}
	}
}

func TestRoughnessAndSkin(t *testing.T) {
	// Exact identities: Rs = 1/(σδ); δ = √(2/(ωμ0σ)).
	for _, f := range []float64{1e6, 1 * GHz, 10 * GHz} {
		d := SkinDepth(f, CopperConductivity)
		if want := math.Sqrt(2 / (2 * math.Pi * f * Mu0 * CopperConductivity)); relErr(d, want) > 1e-14 {
			t.Errorf("δ(%g) = %g, want %g", f, d, want)
		}
		if rs := SurfaceResistance(f, CopperConductivity); relErr(rs, 1/(CopperConductivity*d)) > 1e-14 {
			t.Errorf("Rs(%g) = %g, want 1/(σδ) = %g", f, rs, 1/(CopperConductivity*d))
		}
	}
	// Copper at 10 GHz: δ ≈ 0.66 µm (Pozar 4th ed., skin-depth discussion, from memory).
	if d := SkinDepth(10*GHz, CopperConductivity); math.Abs(d-0.66e-6) > 0.01e-6 {
		t.Errorf("copper δ at 10 GHz = %.4g µm, want 0.66", d*1e6)
	}
	for _, c := range []struct{ ratio, want, tol float64 }{
		{0, 1, 0},                                // smooth: no increase (exact)
		{1, 1 + 2/math.Pi*math.Atan(1.4), 1e-15}, // formula at Δ = δ
		{100, 2, 1e-4},                           // Δ ≫ δ: tends to 2 (Hammerstad-Bekkadal)
	} {
		if got := RoughnessFactor(c.ratio*1e-6, 1e-6); math.Abs(got-c.want) > c.tol {
			t.Errorf("Kr(Δ/δ = %g) = %.8g, want %.8g", c.ratio, got, c.want)
		}
	}
}

// TestExpFast holds expFast to math.Exp (the reference) within 4 ulp over
// the whole range it handles itself, and to exact values where they exist.
func TestExpFast(t *testing.T) {
	for _, c := range []struct{ x, want float64 }{
		{0, 1}, {1, math.E}, {math.Ln2, 2}, {-math.Ln2, 0.5}, {10 * math.Ln2, 1024},
		{math.Inf(-1), 0}, {-800, 0}, {800, math.Inf(1)},
	} {
		if got := expFast(c.x); got != c.want && math.Abs(got/c.want-1) > 4*0x1p-52 {
			t.Errorf("expFast(%g) = %.17g, want %.17g", c.x, got, c.want)
		}
	}
	if got := expFast(math.NaN()); !math.IsNaN(got) {
		t.Errorf("expFast(NaN) = %g, want NaN", got)
	}
	worst := 0.0
	for i := 0; i <= 2000000; i++ {
		x := -707.9 + 1416.8*float64(i)/2000000
		got, want := expFast(x), math.Exp(x)
		rel := math.Abs(got/want - 1)
		worst = math.Max(worst, rel)
		if rel > 4*0x1p-52 {
			t.Fatalf("expFast(%.17g) = %.17g, math.Exp %.17g (rel %.2e)", x, got, want, rel)
		}
	}
	t.Logf("worst relative difference from math.Exp: %.2e", worst)
}
