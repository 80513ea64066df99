package physical

import (
	"math"
	"math/cmplx"
	"testing"
)

// bendFullWave is one bend case of bend.tsv.
type bendFullWave struct {
	er, h, w, leg, board float64
	rises                []float64
	at                   [][]sPort // per rise
}

func readBendRecord(t *testing.T) []*bendFullWave {
	t.Helper()
	var out []*bendFullWave
	idx := map[string]*bendFullWave{}
	for _, r := range readDiscRecord(t, "bend.tsv", 1) {
		n := r.num
		c, ok := idx[r.text[0]]
		if !ok {
			c = &bendFullWave{er: n[0], h: n[1] * 1e-3, w: n[2] * 1e-3, leg: n[3] * 1e-3, board: n[4] * 1e-3}
			idx[r.text[0]] = c
			out = append(out, c)
		}
		rise := n[5] * 1e-3
		if k := len(c.rises); k == 0 || c.rises[k-1] != rise {
			c.rises = append(c.rises, rise)
			c.at = append(c.at, nil)
		}
		k := len(c.rises) - 1
		c.at[k] = append(c.at[k], sPortOf(n[6:]))
	}
	return out
}

// excess returns, for rise k at frequency i, the full-wave S21's phase
// lag beyond that of a straight line of the centre-line length (rad, for
// both bends together; positive when the bends are electrically longer).
func (c *bendFullWave) excess(k, i int) float64 {
	m := c.at[k][i]
	beta := 2 * math.Pi * m.f * math.Sqrt(m.ee) / C0
	ideal := cmplx.Exp(complex(0, -beta*(c.board+c.rises[k])))
	return -cmplx.Phase(m.s21 / ideal)
}

// shortening returns the full-wave per-bend shortening (m) of case c
// at each of its two leg lengths (the excess averaged over frequency,
// halved) and extrapolated to a leg of zero length, which removes the
// solver's difference between legs along y and along x.
func (c *bendFullWave) shortening() (raw [2]float64, zeroLeg float64) {
	var e [2]float64
	for k := range c.rises[:2] {
		for i, m := range c.at[k] {
			beta := 2 * math.Pi * m.f * math.Sqrt(m.ee) / C0
			e[k] -= c.excess(k, i) / beta / float64(len(c.at[k]))
		}
		raw[k] = e[k] / 2
	}
	r1, r2 := c.rises[0], c.rises[1]
	return raw, (e[0]*r2 - e[1]*r1) / (2 * (r2 - r1))
}

// TestMitredBendAgainstFullWave holds MitredBendShortening to the
// full-wave record testdata/discontinuities/bend.tsv (physical/fdtd,
// coarse mesh, made by testdata/discontinuities/run.sh Bend): within
// 0.08·W of the zero-leg shortening of every case (the fit's own spread
// is 0.04·W), and within 0.2·W of each leg's own (the legs differ by up
// to 0.1·W through the solver's x/y anisotropy); and the mitred pair
// reflects |S11| ≤ 0.06 (measured 0.009–0.056, the largest at W/h 3 and
// f·h 4 GHz·mm), so that a length is the whole of the model. The same record shows the build's former rule,
// counting a mitred bend at its centre-line length (δ = 0), off by
// 0.48–1.03 W: that rule fails this test.
func TestMitredBendAgainstFullWave(t *testing.T) {
	cases := readBendRecord(t)
	if len(cases) != 6 {
		t.Fatalf("bend.tsv has %d cases, want 6", len(cases))
	}
	for _, c := range cases {
		raw, d := c.shortening()
		m := MitredBendShortening(c.w, c.h)
		t.Logf("εr %.2f h %.3f mm W/h %.2f: full-wave shortening per bend %.3f W (legs %.3f, %.3f W), model %.3f W; |S11| of the pair ≤ %.4f",
			c.er, c.h*1e3, c.w/c.h, d/c.w, raw[0]/c.w, raw[1]/c.w, m/c.w, c.maxS11())
		if math.Abs(m-d) > 0.08*c.w {
			t.Errorf("W/h %.2f: model %.3f W, full-wave %.3f W (want within 0.08 W)", c.w/c.h, m/c.w, d/c.w)
		}
		for _, r := range raw {
			if math.Abs(m-r) > 0.2*c.w {
				t.Errorf("W/h %.2f: model %.3f W, full-wave leg %.3f W (want within 0.2 W)", c.w/c.h, m/c.w, r/c.w)
			}
		}
		if c.maxS11() > 0.06 {
			t.Errorf("W/h %.2f: the mitred pair reflects |S11| %.3f: not a pure length", c.w/c.h, c.maxS11())
		}
	}
}

func (c *bendFullWave) maxS11() float64 {
	m := 0.0
	for _, at := range c.at {
		for _, p := range at {
			m = math.Max(m, cmplx.Abs(p.s11))
		}
	}
	return m
}
