package fdtd

import (
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"stubcraft/physical/fdtd/records"
)

// The discontinuity records of testdata/discontinuities (width step, via,
// mitred bend): testdata/discontinuities/run.sh sets
// STUBCRAFT_DISC_RECORD and runs the tests below, which simulate the
// boards and write the raw full-wave S-parameters (referred to each port
// line's own measured Z0, at the board edges) beside the port line's
// measured Z0 and εeff. The de-embedding and the comparison with the
// models are done by the tests of package physical that read the records,
// so the records hold measurements only.

const discDir = "../../testdata/discontinuities"

func discRecording(t *testing.T) MeshParams {
	t.Helper()
	if os.Getenv("STUBCRAFT_DISC_RECORD") == "" {
		t.Skip("long: run testdata/discontinuities/run.sh")
	}
	switch os.Getenv("MESH") {
	case "normal":
		return Normal.Params()
	case "fine":
		return Fine.Params()
	}
	return Coarse.Params()
}

func writeDiscRecord(t *testing.T, name, header string, rows []string) {
	t.Helper()
	var b strings.Builder
	mesh := os.Getenv("MESH")
	if mesh == "" {
		mesh = "coarse"
	}
	if mesh != "coarse" { // a refined run is a record of its own
		name = strings.TrimSuffix(name, ".tsv") + "-" + mesh + ".tsv"
	}
	if v := os.Getenv("RECORD_FILE"); v != "" { // a run beside another on the same record, merged by hand
		name = filepath.Base(v)
	}
	path := filepath.Join(discDir, name)
	// With CASES set, the rows of the other cases already recorded stay,
	// under their own "made by" lines.
	var keep, made []string
	if _, err := os.Stat(path); err == nil && os.Getenv("CASES") != "" {
		old := records.Read(t, path, "testdata/discontinuities/run.sh")
		made = old.Made
		for _, r := range old.Rows {
			var ci int
			if _, err := fmt.Sscan(r.Cells[0], &ci); err == nil && !caseSelected(ci) {
				keep = append(keep, r.Line)
			}
		}
	}
	sel := ""
	if v := os.Getenv("CASES"); v != "" {
		sel = " CASES=" + v
	}
	if v := os.Getenv("DIVISIONS"); v != "" {
		sel += " DIVISIONS=" + v
	}
	this := fmt.Sprintf("# made by: MESH=%s%s testdata/discontinuities/run.sh (STUBCRAFT_DISC_RECORD=1 go test ./physical/fdtd -run %s)", mesh, sel, t.Name())
	for _, l := range made {
		if !strings.HasPrefix(l, this+" at ") { // the same run's earlier line is replaced
			b.WriteString(l + "\n")
		}
	}
	fmt.Fprintf(&b, "%s at %s, %s\n", this, os.Getenv("STUBCRAFT_COMMIT"), time.Now().UTC().Format("2006-01-02T15:04Z"))
	b.WriteString(header + "\n")
	rows = append(keep, rows...)
	sort.SliceStable(rows, func(i, j int) bool { return caseIndex(rows[i]) < caseIndex(rows[j]) })
	for _, r := range rows {
		b.WriteString(r + "\n")
	}
	if err := os.MkdirAll(discDir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

// caseIndex is the case number that starts a record row.
func caseIndex(row string) int {
	var ci int
	fmt.Sscan(strings.SplitN(row, "\t", 2)[0], &ci)
	return ci
}

// caseSelected reports whether case i is in $CASES (a comma-separated
// list of indices; empty means all).
func caseSelected(i int) bool {
	v := os.Getenv("CASES")
	if v == "" {
		return true
	}
	for _, f := range strings.Split(v, ",") {
		if strings.TrimSpace(f) == fmt.Sprint(i) {
			return true
		}
	}
	return false
}

// nm converts metres to the structure's nanometres.
func nm(v float64) int64 { return int64(math.Round(v * 1e9)) }

// steppedStrip returns one polygon of strip sections sharing the centre
// line y = 0: section i runs from xs[i] to xs[i+1] with width ws[i] (nm).
// One polygon, so that every shoulder of a step is an edge of its own and
// gets the one-third/two-thirds grid lines.
func steppedStrip(xs, ws []int64) Polygon {
	var lo, hi Polygon
	for i, w := range ws {
		lo = append(lo, Point{xs[i], -w / 2}, Point{xs[i+1], -w / 2})
		hi = append(hi, Point{xs[i], w - w/2}, Point{xs[i+1], w - w/2})
	}
	p := append(Polygon(nil), lo...)
	for i := len(hi) - 1; i >= 0; i-- {
		p = append(p, hi[i])
	}
	return dedupe(p)
}

// dedupe drops consecutive repeated vertices.
func dedupe(p Polygon) Polygon {
	var out Polygon
	for i, v := range p {
		if i > 0 && v == p[i-1] {
			continue
		}
		out = append(out, v)
	}
	if len(out) > 1 && out[0] == out[len(out)-1] {
		out = out[:len(out)-1]
	}
	return out
}

// portRows returns the record rows of one two-port run: for each
// frequency, the port line's measured Z0 and εeff (real parts) and S11,
// S21, S22 referred to that Z0 (both ports are the same line).
func portRows(prefix string, r *Result) []string {
	var rows []string
	for f, fr := range r.Freqs {
		z0 := r.Z0[0][f]
		s := renormalise(r.S[f], [2]complex128{complex(r.Zref, 0), complex(r.Zref, 0)}, z0)
		rows = append(rows, fmt.Sprintf("%s\t%.6g\t%.5f\t%.5f\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f\t%.6f",
			prefix, fr, real(z0), real(r.EpsEff[0][f]),
			real(s[0][0]), imag(s[0][0]), real(s[1][0]), imag(s[1][0]), real(s[1][1]), imag(s[1][1])))
	}
	return rows
}

const sColumns = "f_hz\tz0_port_ohm\teps_eff_port\ts11_re\ts11_im\ts21_re\ts21_im\ts22_re\ts22_im"

// stepCases are the width-step boards: substrate (εr, h), the narrow and
// wide widths, and the highest frequency (f·h about 4 GHz·mm). Each
// shoulder is at least 1.5 edge cells wide: a narrower one lets the
// one-third/two-thirds grid lines of its two edges merge, which moves the
// wide strip's effective edge away from where its port calibration has it
// (seen on 1.6 → 2.4 mm on 0.8 mm, a 0.4 mm shoulder: the two boards
// disagreed and the fit left a residual six times the others').
var stepCases = []struct {
	er, h, wn, ww, fmax float64
}{
	{3.66, 0.8e-3, 2.0e-3, 3.0e-3, 5e9}, // W/h 2.5, ratio 1.5
	{3.66, 0.8e-3, 1.6e-3, 3.2e-3, 5e9}, // W/h 2, ratio 2
	{3.66, 0.8e-3, 1.6e-3, 4.8e-3, 5e9}, // ratio 3
	{3.66, 0.8e-3, 0.8e-3, 3.2e-3, 5e9}, // W/h 1, ratio 4
	{10.2, 0.635e-3, 0.6e-3, 1.5e-3, 5e9},
	{10.2, 0.635e-3, 0.6e-3, 2.4e-3, 5e9},
	{2.2, 0.508e-3, 1.5e-3, 4.5e-3, 7e9},
}

// TestRecordStep simulates, for each step case, a narrow–wide–narrow and a
// wide–narrow–wide board (equal port lines at both edges), each with two
// lengths of the middle section, and records their S-parameters.
func TestRecordStep(t *testing.T) {
	mesh := discRecording(t)
	var rows []string
	for ci, c := range stepCases {
		if !caseSelected(ci) {
			continue
		}
		freqs := linspace(c.fmax/5, c.fmax, 9)
		for _, cfg := range []struct {
			name       string
			wport, mid float64
		}{{"nwn", c.wn, c.ww}, {"wnw", c.ww, c.wn}} {
			lead := 2 * math.Max(c.h, c.wn)
			// Middle sections: long enough that the two steps' higher-order
			// fields do not meet, and a second one λg/8 longer at fmax.
			l1 := math.Max(2*c.ww, 4*c.h)
			lg := 299792458.0 / (c.fmax * math.Sqrt((c.er+1)/2))
			for _, lm := range []float64{l1, l1 + lg/8} {
				xs := []int64{0, nm(lead), nm(lead) + nm(lm), 2*nm(lead) + nm(lm)}
				ws := []int64{nm(cfg.wport), nm(cfg.mid), nm(cfg.wport)}
				s := Structure{Er: c.er, H: c.h, BoardMinX: 0, BoardMaxX: xs[3], Freqs: freqs,
					Copper: []Polygon{steppedStrip(xs, ws)},
					Ports:  [2]Port{{Side: Left, Width: ws[0]}, {Side: Right, Width: ws[0]}}}
				r, err := Solve(context.Background(), s, Options{Mesh: mesh})
				if err != nil {
					t.Fatal(err)
				}
				t.Logf("case %d %s middle %.3f mm: %d cells, %d steps, %.0f s", ci, cfg.name, lm*1e3, r.Cells, r.Steps, r.Seconds)
				pre := fmt.Sprintf("%d\t%s\t%g\t%g\t%g\t%g\t%g\t%g", ci, cfg.name, c.er, c.h*1e3, cfg.wport*1e3, cfg.mid*1e3, lead*1e3, float64(nm(lm))*1e-6)
				rows = append(rows, portRows(pre, r)...)
			}
		}
		// Written after every case so that a stopped run keeps what it has.
		writeDiscRecord(t, "step.tsv", "case\tboard\ter\th_mm\tw_port_mm\tw_middle_mm\tlead_mm\tmiddle_mm\t"+sColumns, rows)
	}
}

// viaCase is one shorted-stub board: substrate, strip width, drill, pad
// and the via row's largest pitch, and the highest frequency.
type viaCase struct{ er, h, w, drill, pad, pitch, fmax float64 }

// viaCases are the shorted-stub boards: substrate, strip width, drill,
// pad and the via row's largest pitch (as [layout] via_pitch; the build's
// default is twice the pad), and the highest frequency.
var viaCases = []viaCase{
	{3.66, 0.8e-3, 1.0e-3, 0.4e-3, 0.8e-3, 1.6e-3, 5e9},  // one via, pad inside the strip
	{3.66, 0.8e-3, 1.0e-3, 0.8e-3, 1.2e-3, 2.4e-3, 5e9},  // one via, pad overhangs
	{4.4, 1.6e-3, 1.2e-3, 0.6e-3, 1.0e-3, 2.0e-3, 2.5e9}, // one via, thick board
	{10.2, 0.635e-3, 0.6e-3, 0.3e-3, 0.6e-3, 1.2e-3, 6e9},
	{3.66, 0.8e-3, 1.6e-3, 0.4e-3, 0.8e-3, 1.6e-3, 5e9},  // a row of two
	{4.4, 1.6e-3, 3.0e-3, 0.4e-3, 0.8e-3, 1.6e-3, 2.5e9}, // a row of three
}

// viaLength is the drawn length of the shorted line, from the port edge to
// the via centre.
const viaLength = 4e-3

// roundPad returns a 32-gon of diameter d (nm) centred at c, its vertices
// on the circle.
func roundPad(c Point, d int64) Polygon {
	var p Polygon
	for i := 0; i < 32; i++ {
		a := 2 * math.Pi * float64(i) / 32
		p = append(p, Point{c.X + nm(float64(d)*1e-9/2*math.Cos(a)), c.Y + nm(float64(d)*1e-9/2*math.Sin(a))})
	}
	return p
}

// bendCases are the mitred-bend boards: substrate, strip width and the
// highest frequency.
var bendCases = []struct {
	er, h, w, fmax float64
}{
	{3.66, 0.8e-3, 0.4e-3, 5e9}, // W/h 0.5
	{3.66, 0.8e-3, 0.8e-3, 5e9}, // W/h 1
	{3.66, 0.8e-3, 1.6e-3, 5e9}, // W/h 2
	{3.66, 0.8e-3, 2.4e-3, 5e9}, // W/h 3
	{4.4, 1.6e-3, 3.0e-3, 2.5e9},
	{10.2, 0.635e-3, 0.6e-3, 6e9},
}

// miterFraction is Douville and James's optimal miter (R. J. P. Douville
// and D. S. James, IEEE Trans. MTT 26(3), 1978), as synth/geom draws it:
// the cut removes an isosceles right triangle of legs 2·m·W from the outer
// corner.
func miterFraction(w, h float64) float64 { return 0.52 + 0.65*math.Exp(-1.35*w/h) }

// zBoard returns a strip of width w (nm) that runs from the left edge at
// y = 0 east to x = xc, north to y = rise, and east to the right edge at x
// = xEnd: two 90° bends whose outer corners are cut by legs a (nm). Its
// centre-line length is xEnd + rise.
func zBoard(w, xc, rise, xEnd, a int64) Polygon {
	lo, hi := -w/2, w-w/2
	return Polygon{
		{0, lo}, {xc + hi - a, lo}, {xc + hi, lo + a}, {xc + hi, rise + lo}, {xEnd, rise + lo},
		{xEnd, rise + hi}, {xc + lo + a, rise + hi}, {xc + lo, rise + hi - a}, {xc + lo, hi}, {0, hi},
	}
}

// TestRecordBend simulates, for each bend case, a strip with two mitred
// 90° bends (a Z, left then right turn) between the two ports, with two
// lengths of the middle leg, and records the S-parameters. The circuit
// model counts each bend at its centre-line length.
func TestRecordBend(t *testing.T) {
	mesh := discRecording(t)
	var rows []string
	for ci, c := range bendCases {
		if !caseSelected(ci) {
			continue
		}
		freqs := linspace(c.fmax/5, c.fmax, 9)
		w := nm(c.w)
		lead := nm(2*math.Max(c.h, c.w)) + w/2
		a := nm(2 * miterFraction(c.w, c.h) * c.w)
		for _, rise := range []float64{3 * math.Max(c.w, c.h), 6 * math.Max(c.w, c.h)} {
			r0 := nm(rise)
			xEnd := 2 * lead
			s := Structure{Er: c.er, H: c.h, BoardMinX: 0, BoardMaxX: xEnd, Freqs: freqs,
				Copper: []Polygon{zBoard(w, lead, r0, xEnd, a)},
				Ports:  [2]Port{{Side: Left, Width: w}, {Side: Right, Y: r0, Width: w}}}
			r, err := Solve(context.Background(), s, Options{Mesh: mesh})
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("bend case %d rise %.2f mm: %d cells, %d steps, %.0f s", ci, rise*1e3, r.Cells, r.Steps, r.Seconds)
			pre := fmt.Sprintf("%d\t%g\t%g\t%g\t%g\t%g\t%g", ci, c.er, c.h*1e3, c.w*1e3, float64(a)*1e-6, float64(xEnd)*1e-6, float64(r0)*1e-6)
			rows = append(rows, portRows(pre, r)...)
		}
		writeDiscRecord(t, "bend.tsv", "case\ter\th_mm\tw_mm\tmiter_leg_mm\tboard_mm\trise_mm\t"+sColumns, rows)
	}
}
