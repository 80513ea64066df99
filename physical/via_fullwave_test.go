package physical

import (
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"testing"
)

// viaFullWave is one via case of via.tsv: the termination at the via
// centre as the full-wave run sees it, per frequency.
type viaFullWave struct {
	er, h, w, drill, pad, pitch, xv float64
	// divisions is how finely the solver drew the via column
	// (MeshParams.ViaDivisions) in via-column.tsv; −1 in the other records.
	divisions int
	at        []sPort
}

// readViaRecord reads via.tsv or via-normal.tsv (ntext 1: the case) or
// via-column.tsv (ntext 2: the case and the column's divisions).
func readViaRecord(t *testing.T, name string, ntext int) []*viaFullWave {
	t.Helper()
	var out []*viaFullWave
	idx := map[string]*viaFullWave{}
	for _, r := range readDiscRecord(t, name, ntext) {
		n := r.num
		key := strings.Join(r.text, "/")
		c, ok := idx[key]
		if !ok {
			c = &viaFullWave{er: n[0], h: n[1] * 1e-3, w: n[2] * 1e-3, drill: n[3] * 1e-3, pad: n[4] * 1e-3, pitch: n[5] * 1e-3, xv: n[6] * 1e-3, divisions: -1}
			if ntext == 2 {
				k, err := strconv.Atoi(r.text[1])
				if err != nil {
					t.Fatalf("%s: divisions %q: %v", name, r.text[1], err)
				}
				c.divisions = k
			}
			idx[key] = c
			out = append(out, c)
		}
		c.at = append(c.at, sPortOf(n[7:]))
	}
	return out
}

// reactance returns the full-wave termination's reactance (ohm) at the via
// centre at frequency i: S11 moved from the board edge to the via centre
// along the port line (measured Z0 and εeff), then Z = Z0·(1+Γ)/(1−Γ).
func (c *viaFullWave) reactance(i int) float64 {
	m := c.at[i]
	beta := 2 * math.Pi * m.f * math.Sqrt(m.ee) / C0
	g := m.s11 * cmplx.Exp(complex(0, 2*beta*c.xv))
	return imag(complex(m.z0, 0) * (1 + g) / (1 - g))
}

// model returns the build's model of the same termination: Board.ViaToGround.
func (c *viaFullWave) model(f float64) complex128 {
	b := Board{Sub: Substrate{Er: c.er, Height: c.h}, Via: Via{Drill: c.drill, Pad: c.pad, Pitch: c.pitch}}
	return b.ViaToGround(f, c.w)
}

// lowL returns the full-wave and the model's inductance (H) of the
// termination at the via centre, X/ω averaged over the three lowest
// frequencies (f·h ≤ 1.6 GHz·mm, where the pad's capacitance is least).
func (c *viaFullWave) lowL() (fw, model float64) {
	for i, m := range c.at[:3] {
		w := 2 * math.Pi * m.f
		fw += c.reactance(i) / w / 3
		model += imag(c.model(m.f)) / w / 3
	}
	return fw, model
}

// TestViaAgainstFullWave compares the build's via model (Board.ViaToGround:
// Goldfarb and Pucel 1991 per via, a row's mutual inductance, the pad's
// overhang) with the full-wave record testdata/discontinuities/via.tsv
// (coarse) and via-normal.tsv (three cases on the normal mesh): a strip
// ending in the via or via row the build draws, the termination's
// reactance at the via centre after de-embedding the strip with its
// measured Z0 and εeff. The record does not settle the via: the solver's
// via column is staircased (with grid lines through the via's edges it is
// five nodes; without them, a one-off coarse run, not recorded, gave one
// node and 2.5× the model on case 0, 1.6× what the edge lines give), so
// its inductance rests on how the
// solver draws a round column, not on the via. What the record does show,
// and this test holds: (a) coarse to normal mesh moves the full-wave L by
// under 10 % with the edge lines; (b) the full-wave L is 1.3–2.4× the
// model's on every case (the gap pinned, so that a change to the model or
// the solver shows up). The model is unchanged (see DEVELOPERS.md, "Via").
func TestViaAgainstFullWave(t *testing.T) {
	coarse := readViaRecord(t, "via.tsv", 1)
	if len(coarse) != 6 {
		t.Fatalf("via.tsv has %d cases, want 6", len(coarse))
	}
	byKey := map[[3]float64]float64{}
	for _, c := range coarse {
		fw, m := c.lowL()
		byKey[[3]float64{c.h, c.w, c.drill}] = fw
		n, _ := ViaRow(c.w, c.drill, c.pad, c.pitch)
		t.Logf("coarse εr %.2f h %.3f mm W %.2f mm, %d × drill %.2f mm pad %.2f mm: full-wave L %.1f pH, model %.1f pH (%.2f×)",
			c.er, c.h*1e3, c.w*1e3, n, c.drill*1e3, c.pad*1e3, fw*1e12, m*1e12, fw/m)
		if r := fw / m; r < 1.3 || r > 2.4 {
			t.Errorf("h %.3f mm drill %.2f mm: full-wave / model L = %.2f, recorded gap 1.3–2.4: it changed", c.h*1e3, c.drill*1e3, r)
		}
	}
	for _, c := range readViaRecord(t, "via-normal.tsv", 1) {
		fw, _ := c.lowL()
		fc, ok := byKey[[3]float64{c.h, c.w, c.drill}]
		if !ok {
			t.Fatalf("via-normal.tsv: case h %g w %g drill %g not in via.tsv", c.h, c.w, c.drill)
		}
		t.Logf("normal h %.3f mm W %.2f mm drill %.2f mm: full-wave L %.1f pH (coarse %.1f pH, %+.1f %%)", c.h*1e3, c.w*1e3, c.drill*1e3, fw*1e12, fc*1e12, 100*(fw/fc-1))
		if e := math.Abs(fw/fc - 1); e > 0.1 {
			t.Errorf("h %.3f mm drill %.2f mm: normal mesh moves the full-wave L by %.1f %%, want < 10 %%", c.h*1e3, c.drill*1e3, 100*e)
		}
	}
}
