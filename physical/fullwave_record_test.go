package physical

import (
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/optimize"

	"stubcraft/physical/fdtd/records"
)

// The full-wave records of testdata/discontinuities (made by run.sh there
// with the project's FDTD solver, physical/fdtd): raw S-parameters of
// boards built round one discontinuity, referred to each port line's own
// measured Z0 at the board edges. The tests here de-embed them with the
// lines' measured Z0 and εeff and compare the discontinuity with its model.

const discRecordDir = "../testdata/discontinuities"

// discRow is one frequency of one board: the leading text columns and the
// numbers after them.
type discRow struct {
	text []string
	num  []float64
}

// readDiscRecord reads a record whose first ntext columns are text (after
// the first, which is an index read as text too) and the rest numbers.
func readDiscRecord(t *testing.T, name string, ntext int) []discRow {
	t.Helper()
	path := filepath.Join(discRecordDir, name)
	if _, err := os.Stat(path); os.IsNotExist(err) {
		t.Fatalf("no record %s: run testdata/discontinuities/run.sh", name)
	}
	rec := records.Read(t, path, "testdata/discontinuities/run.sh")
	var rows []discRow
	for _, r := range rec.Rows {
		d := discRow{text: r.Cells[:ntext]}
		for _, c := range rec.Header[ntext:] {
			d.num = append(d.num, r.Num(t, c))
		}
		rows = append(rows, d)
	}
	return rows
}

// losslessLine is the chain matrix of a lossless line of impedance z,
// effective permittivity ee, length l at f (exact).
func losslessLine(z, ee, l, f float64) ABCD {
	bl := 2 * math.Pi * f * math.Sqrt(ee) / C0 * l
	c, s := complex(math.Cos(bl), 0), complex(0, math.Sin(bl))
	zc := complex(z, 0)
	return ABCD{{c, zc * s}, {s / zc, c}}
}

// sPort holds one frequency of a recorded board: the port line's Z0 and
// εeff as the solver measured them and S11, S21, S22 in that Z0.
type sPort struct {
	f, z0, ee     float64
	s11, s21, s22 complex128
}

func sPortOf(num []float64) sPort {
	return sPort{f: num[0], z0: num[1], ee: num[2],
		s11: complex(num[3], num[4]), s21: complex(num[5], num[6]), s22: complex(num[7], num[8])}
}

// sMisfit is |ΔS11|² + 2|ΔS21|² + |ΔS22|² between a model chain matrix and
// a recorded frequency.
func sMisfit(a ABCD, m sPort) float64 {
	s := a.S(m.z0)
	d := func(x, y complex128) float64 { v := cmplx.Abs(x - y); return v * v }
	return d(s[0][0], m.s11) + 2*d(s[1][0], m.s21) + d(s[1][1], m.s22)
}

// fitMin minimises f over x from x0 (Nelder-Mead, gonum/optimize).
func fitMin(t *testing.T, f func([]float64) float64, x0 []float64, size float64) []float64 {
	t.Helper()
	res, err := optimize.Minimize(optimize.Problem{Func: f}, x0,
		&optimize.Settings{FuncEvaluations: 4000, Converger: &optimize.FunctionConverge{Absolute: 1e-14, Iterations: 200}},
		&optimize.NelderMead{SimplexSize: size})
	if err != nil && res == nil {
		t.Fatal(err)
	}
	return res.X
}

// stepBoard is one recorded width-step board at every frequency.
type stepBoard struct {
	kind                  string // "nwn" or "wnw"
	wPort, wMid, lead, lm float64
	at                    []sPort
}

// stepFullWave is one step case of step.tsv with the step's series L and
// shunt C fitted to both of its boards and both middle lengths.
type stepFullWave struct {
	er, h, wn, ww float64
	boards        []stepBoard
	// Measured lines, per frequency: narrow (ports of nwn) and wide (ports of wnw).
	zn, en, zw, ew []float64
	L, C           float64 // fitted: total series inductance (H) and shunt C (F)
}

// readStepRecord groups step.tsv into cases.
func readStepRecord(t *testing.T, name string) []*stepFullWave {
	t.Helper()
	rows := readDiscRecord(t, name, 2)
	byCase := map[string]*stepFullWave{}
	var order []string
	for _, r := range rows {
		n := r.num
		c, ok := byCase[r.text[0]]
		if !ok {
			c = &stepFullWave{er: n[0], h: n[1] * 1e-3}
			byCase[r.text[0]] = c
			order = append(order, r.text[0])
		}
		b := stepBoard{kind: r.text[1], wPort: n[2] * 1e-3, wMid: n[3] * 1e-3, lead: n[4] * 1e-3, lm: n[5] * 1e-3}
		if k := len(c.boards); k == 0 || c.boards[k-1].kind != b.kind || c.boards[k-1].lm != b.lm {
			c.boards = append(c.boards, b)
		}
		bb := &c.boards[len(c.boards)-1]
		bb.at = append(bb.at, sPortOf(n[6:]))
		if b.kind == "nwn" {
			c.wn, c.ww = b.wPort, b.wMid
		}
	}
	var out []*stepFullWave
	for _, k := range order {
		c := byCase[k]
		for _, b := range c.boards {
			if b.lm != c.boards[0].lm || b.kind != c.boards[0].kind {
				continue
			}
		}
		for _, b := range c.boards {
			for i, m := range b.at {
				if b.kind == "nwn" && len(c.zn) <= i {
					c.zn, c.en = append(c.zn, m.z0), append(c.en, m.ee)
				}
				if b.kind == "wnw" && len(c.zw) <= i {
					c.zw, c.ew = append(c.zw, m.z0), append(c.ew, m.ee)
				}
			}
		}
		out = append(out, c)
	}
	return out
}

// stepChain is the chain matrix of a step from the narrow line (port 1) to
// the wide one at f: series L on each side split as the model splits it
// (by Z·√εeff), the shunt C at the junction.
func stepChain(L, C, zn, en, zw, ew, f float64) ABCD {
	w := 2 * math.Pi * f
	ln, lw := zn*math.Sqrt(en), zw*math.Sqrt(ew)
	return SeriesImpedance(complex(0, w*L*ln/(ln+lw))).
		Mul(ShuntAdmittance(complex(0, w*C))).
		Mul(SeriesImpedance(complex(0, w*L*lw/(ln+lw))))
}

// reversed is the chain matrix of the same two-port seen from port 2.
func reversed(a ABCD) ABCD { return ABCD{{a[1][1], a[0][1]}, {a[1][0], a[0][0]}} }

// misfit returns the summed S misfit of c's boards for a step of L and C.
func (c *stepFullWave) misfit(L, C float64, kinds string) (sum float64, n int) {
	for _, b := range c.boards {
		if !strings.Contains(kinds, b.kind) {
			continue
		}
		for i, m := range b.at {
			st := stepChain(L, C, c.zn[i], c.en[i], c.zw[i], c.ew[i], m.f)
			zm, em := c.zw[i], c.ew[i]
			if b.kind == "wnw" {
				st = reversed(st)
				zm, em = c.zn[i], c.en[i]
			}
			lead := losslessLine(m.z0, m.ee, b.lead, m.f)
			a := lead.Mul(st).Mul(losslessLine(zm, em, b.lm, m.f)).Mul(reversed(st)).Mul(lead)
			sum += sMisfit(a, m)
			n += 4
		}
	}
	return sum, n
}

// fit finds the L and C that best explain the boards of kinds.
func (c *stepFullWave) fit(t *testing.T, kinds string) (L, C, rms float64) {
	f := func(x []float64) float64 { s, _ := c.misfit(x[0]*1e-12, x[1]*1e-15, kinds); return s }
	x := fitMin(t, f, []float64{50, 50}, 20)
	x = fitMin(t, f, x, 5)
	s, n := c.misfit(x[0]*1e-12, x[1]*1e-15, kinds)
	return x[0] * 1e-12, x[1] * 1e-15, math.Sqrt(s / float64(n))
}

// TestStepAgainstFullWave holds the Step model to the full-wave record
// testdata/discontinuities/step.tsv (physical/fdtd, coarse mesh; the
// normal-mesh rows of step-normal.tsv, when present, too). For each step,
// a series L (split as the model splits it) and a shunt C are fitted to
// both of its boards (narrow–wide–narrow and wide–narrow–wide, two middle
// lengths each, nine frequencies up to f·h ≈ 4 GHz·mm), with the lines'
// own measured Z0 and εeff. Where the step is resolved (the fit's residual
// at most a third of the residual with no step), the model's L must lie
// within 20 % and its C within 25 % of the fit (the model's stated 15 %
// and 18 % on the coarse mesh, plus the 5 % the normal mesh moves them),
// and the model in place of the fit may leave at most twice the fit's
// residual in S (the fit's own is 0.003–0.007, the solver's noise). Where
// it is not (1.5:1), the model may leave at most 0.002 more than the fit:
// below the solver's noise. Gupta's forms as recalled, unfitted, fail this
// (L 0.54 of the full-wave at 1.5 → 4.5 mm on εr 2.2; C +61 % at 4:1).
func TestStepAgainstFullWave(t *testing.T) {
	cases := readStepRecord(t, "step.tsv")
	if len(cases) != 7 {
		t.Fatalf("step.tsv has %d cases, want 7", len(cases))
	}
	check := func(name string, c *stepFullWave) {
		L, C, rms := c.fit(t, "nwn wnw")
		s0, n := c.misfit(0, 0, "nwn wnw")
		none := math.Sqrt(s0 / float64(n))
		p := stepOn(t, c.ww, c.wn, Substrate{Er: c.er, Height: c.h}).Params()
		lm := p.LA + p.LB
		sm, _ := c.misfit(lm, p.C, "nwn wnw")
		model := math.Sqrt(sm / float64(n))
		t.Logf("%s εr %.2f h %.3f mm, %.2f → %.2f mm: full-wave L %.1f pH C %.1f fF (residual %.4f, no step %.4f); model L %.1f pH C %.1f fF (residual %.4f)",
			name, c.er, c.h*1e3, c.wn*1e3, c.ww*1e3, L*1e12, C*1e15, rms, none, lm*1e12, p.C*1e15, model)
		if none < 3*rms {
			if model > rms+0.002 {
				t.Errorf("%s %.2f → %.2f mm: model residual %.4f, fit %.4f: the model misses an unresolved step", name, c.wn*1e3, c.ww*1e3, model, rms)
			}
			return
		}
		if e := lm/L - 1; math.Abs(e) > 0.2 {
			t.Errorf("%s %.2f → %.2f mm: model L %.1f pH, full-wave %.1f pH (%+.0f %%, want within 20 %%)", name, c.wn*1e3, c.ww*1e3, lm*1e12, L*1e12, 100*e)
		}
		if e := p.C/C - 1; math.Abs(e) > 0.25 {
			t.Errorf("%s %.2f → %.2f mm: model C %.1f fF, full-wave %.1f fF (%+.0f %%, want within 25 %%)", name, c.wn*1e3, c.ww*1e3, p.C*1e15, C*1e15, 100*e)
		}
		if model > 2*rms {
			t.Errorf("%s %.2f → %.2f mm: model residual %.4f, %.1f× the fit's %.4f (want ≤ 2×)", name, c.wn*1e3, c.ww*1e3, model, model/rms, rms)
		}
	}
	for _, c := range cases {
		check("coarse", c)
	}
	if _, err := os.Stat(filepath.Join(discRecordDir, "step-normal.tsv")); err == nil {
		for _, c := range readStepRecord(t, "step-normal.tsv") {
			check("normal", c)
		}
	}
}
