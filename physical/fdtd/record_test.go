package fdtd

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"stubcraft/physical/fdtd/records"
)

// The long validations run from testdata/fdtd/validate.sh, which sets
// STUBCRAFT_FDTD_RECORD and records their figures; the tests below read
// the records and hold them to the criteria, so that go test stays
// fast while the figures stay checked.

const recordDir = "../../testdata/fdtd"

// lineSet is the full set of (a): W/h 0.3–3 and εr 2.2–10, h = 0.8 mm.
var lineSet = func() (out [][2]float64) {
	for _, er := range []float64{2.2, 4.35, 10} {
		for _, wh := range []float64{0.3, 1, 3} {
			out = append(out, [2]float64{er, wh})
		}
	}
	return out
}()

func writeRecord(t *testing.T, name, header string, rows []string) {
	t.Helper()
	var b strings.Builder
	fmt.Fprintf(&b, "# made by: testdata/fdtd/validate.sh (STUBCRAFT_FDTD_RECORD=1 go test ./physical/fdtd -run %s), %s\n", t.Name(), time.Now().UTC().Format("2006-01-02T15:04Z"))
	b.WriteString(header + "\n")
	for _, r := range rows {
		b.WriteString(r + "\n")
	}
	if err := os.WriteFile(filepath.Join(recordDir, name), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

// readRecord returns the rows of testdata/fdtd/NAME, which
// testdata/fdtd/validate.sh writes, as numbers (every column is one); the
// test is skipped when it has not run yet.
func readRecord(t *testing.T, name string) [][]float64 {
	t.Helper()
	path := filepath.Join(recordDir, name)
	if _, err := os.Stat(path); os.IsNotExist(err) {
		t.Skipf("no record %s yet: run testdata/fdtd/validate.sh", name)
	}
	rec := records.Read(t, path, "testdata/fdtd/validate.sh")
	var rows [][]float64
	for _, r := range rec.Rows {
		var row []float64
		for _, name := range rec.Header {
			row = append(row, r.Num(t, name))
		}
		rows = append(rows, row)
	}
	return rows
}

// TestRecordLines runs the full line set of (a) and records it.
func TestRecordLines(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long: run testdata/fdtd/validate.sh")
	}
	var rows []string
	for _, c := range lineSet {
		z, zHJ, ee, eeKJ := lineCase(t, c[0], 0.8e-3, c[1], Coarse.Params())
		rows = append(rows, fmt.Sprintf("%g\t%g\t%.4f\t%.4f\t%.5f\t%.5f", c[0], c[1], z, zHJ, ee, eeKJ))
		t.Log(rows[len(rows)-1])
	}
	writeRecord(t, "lines.tsv", "er\tw_over_h\tz0_ohm\tz0_hj_ohm\teps_eff\teps_eff_kj", rows)
}

// TestRecordConvergence runs (b): the open-end board at the coarse mesh and
// refined 1.5×, and records the λ/4 stub notch each gives.
func TestRecordConvergence(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long: run testdata/fdtd/validate.sh")
	}
	want, _ := kjkNotch(t)
	freqs := linspace(0.9*want, 1.1*want, 11)
	var rows []string
	for _, m := range []float64{1, 1.5} {
		got, _ := openEndNotch(t, freqs, Coarse.Params().Refined(m))
		rows = append(rows, fmt.Sprintf("%g\t%.6g\t%.6g", m, got, want))
	}
	writeRecord(t, "convergence.tsv", "mesh_refinement\tnotch_hz\tkjk_notch_hz", rows)
}

// TestRecordedLines holds the recorded line set to (a): Z0 within 1.5 % of
// Hammerstad-Jensen and εeff within 1.5 % of Kirschning-Jansen.
func TestRecordedLines(t *testing.T) {
	rows := readRecord(t, "lines.tsv")
	if len(rows) != len(lineSet) {
		t.Fatalf("lines.tsv has %d rows, want %d", len(rows), len(lineSet))
	}
	for _, r := range rows {
		if e := math.Abs(r[4]/r[5] - 1); e > 0.015 {
			t.Errorf("εr %g W/h %g: εeff %.4f vs Kirschning-Jansen %.4f, %.2f %% off", r[0], r[1], r[4], r[5], 100*e)
		}
		if e := math.Abs(r[2]/r[3] - 1); e > 0.015 {
			t.Errorf("εr %g W/h %g: Z0 %.2f Ω vs Hammerstad-Jensen %.2f Ω, %.2f %% off", r[0], r[1], r[2], r[3], 100*e)
		}
	}
}

// TestRecordedConvergence holds (b): refining the mesh 1.5× moves the
// notch by less than 0.5 %.
func TestRecordedConvergence(t *testing.T) {
	rows := readRecord(t, "convergence.tsv")
	if len(rows) != 2 {
		t.Fatalf("convergence.tsv has %d rows, want 2", len(rows))
	}
	if e := math.Abs(rows[1][1]/rows[0][1] - 1); e > 0.005 {
		t.Errorf("refining 1.5× moves the notch from %.5g to %.5g GHz, %.2f %%, want < 0.5 %%", rows[0][1]/1e9, rows[1][1]/1e9, 100*e)
	}
}
