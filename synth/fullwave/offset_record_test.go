package fullwave

import (
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"sort"
	"strings"
	"testing"
	"time"

	"stubcraft/physical"
	"stubcraft/physical/fdtd"
	"stubcraft/physical/fdtd/records"
	"stubcraft/physical/fieldsolve"
	"stubcraft/synth"
)

// The demo's full-wave offset study (issue 11 §5): where the full-wave best
// match's −0.5 … −1 % below f0 came from. testdata/fdtd/offset.sh runs
// TestRecordDemoOffset, which solves the demo's drawn copper on the meshes
// of offsetMeshes and records each run in testdata/fdtd/offset.tsv;
// TestRecordedDemoOffset holds the record.

const offsetRecord = "../../testdata/fdtd/offset.tsv"

// offsetMeshes are the meshes the study runs: the coarse mesh refined
// (fdtd.MeshParams.Refined) 1, 4/3 (the normal mesh exactly), 2 (the fine
// mesh with 8 absorbing cells instead of 10) and 8/3 times, then the normal
// mesh with one thing refined 2×: the cells along the copper (edge cell and
// substrate cells, so also the time step), or the largest cell (λ/40).
var offsetMeshes = func() (out []offsetMesh) {
	for _, r := range []float64{1, 4.0 / 3, 2, 8.0 / 3} {
		out = append(out, offsetMesh{"refined", r, fdtd.Coarse.Params().Refined(r)})
	}
	edge := fdtd.Normal.Params()
	edge.SubstrateCells *= 2
	edge.EdgeDivisions *= 2
	long := fdtd.Normal.Params()
	long.PerWavelength *= 2
	return append(out, offsetMesh{"normal-edge/2", 4.0 / 3, edge}, offsetMesh{"normal-largest/2", 4.0 / 3, long})
}()

type offsetMesh struct {
	variant    string
	refinement float64 // of the coarse mesh, the ladder's; the variants' base
	p          fdtd.MeshParams
}

// TestRecordDemoOffset writes testdata/fdtd/offset.tsv (slow: run it with
// testdata/fdtd/offset.sh).
func TestRecordDemoOffset(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long full-wave study: testdata/fdtd/offset.sh runs it")
	}
	in := demoInput(t)
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	s, err := Structure(res, res.Sweep.Freqs)
	if err != nil {
		t.Fatal(err)
	}
	f0 := res.Design.Freq
	rev, _ := exec.Command("git", "rev-parse", "--short", "HEAD").Output()
	var b strings.Builder
	fmt.Fprintf(&b, "# made by: testdata/fdtd/offset.sh (STUBCRAFT_FDTD_RECORD=1 go test ./synth/fullwave -run TestRecordDemoOffset, %s), %s\n",
		strings.TrimSpace(string(rev)), time.Now().UTC().Format("2006-01-02T15:04Z"))
	b.WriteString("variant\trefinement\tsubstrate_cells\tper_wavelength\tedge_divisions\tcells\tsteps\tbest_match_hz\tbest_match_offset_pct\ts11_db_f0\tport_eps_eff_f0\tport_z0_f0_ohm\n")
	k := sort.SearchFloat64s(res.Sweep.Freqs, f0)
	for _, m := range offsetMeshes {
		p := m.p
		r, err := fdtd.Solve(context.Background(), s, fdtd.Options{Mesh: p})
		if err != nil {
			t.Fatal(err)
		}
		rep, err := Compare(res, r.S)
		if err != nil {
			t.Fatal(err)
		}
		row := fmt.Sprintf("%s\t%.4f\t%d\t%g\t%g\t%d\t%d\t%.7g\t%.3f\t%.2f\t%.5f\t%.3f", m.variant, m.refinement, p.SubstrateCells, p.PerWavelength, p.EdgeDivisions,
			r.Cells, r.Steps, rep.BestMatchHz, 100*(rep.BestMatchHz/f0-1), rep.S11DBF0, real(r.EpsEff[0][k]), real(r.Z0[0][k]))
		t.Log(row)
		b.WriteString(row + "\n")
	}
	if err := os.WriteFile(offsetRecord, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

// thicknessShift returns how much higher, relatively, the εeff of the
// demo's line is with zero-thickness copper (as the full-wave draws it)
// than with the stackup's copper, by the 2-D field solver (static) and by
// the Hammerstad-Jensen thickness correction the circuit model uses.
func thicknessShift(t *testing.T, res *synth.Result) (solver, closedForm float64) {
	t.Helper()
	w, sub := res.Physical.Elements[0].Width, res.Physical.Board.Sub
	thin := sub
	thin.CopperThickness = 0
	var eps [2][2]float64 // [thin, thick][solver, closed form]
	for i, sb := range []physical.Substrate{thin, sub} {
		r, err := fieldsolve.Solve(fieldsolve.CrossSection{Geometry: fieldsolve.Microstrip, Width: w, Height: sb.Height,
			Thickness: sb.CopperThickness, Er: sb.Er}, fieldsolve.Options{Tolerance: 0.001})
		if err != nil {
			t.Fatal(err)
		}
		m, err := physical.NewMicrostrip(w, sb)
		if err != nil {
			t.Fatal(err)
		}
		eps[i] = [2]float64{r.EpsEff, m.At(1e6).EpsEff}
	}
	return eps[0][0]/eps[1][0] - 1, eps[0][1]/eps[1][1] - 1
}

// TestRecordedDemoOffset holds testdata/fdtd/offset.tsv, the demo's
// full-wave best match as the mesh is refined, and accounts for the offset
// of the normal mesh's best match from f0 (DEVELOPERS.md, "The demo's
// full-wave offset"):
//   - the zero-thickness copper of the full-wave: the 2-D field solver
//     (physical/fieldsolve, an independent finite-difference solution of
//     the cross-section) puts the demo line's static εeff with zero
//     thickness above the one with the stackup's 34.8 µm copper by the
//     Hammerstad-Jensen thickness correction's amount (Hammerstad and
//     Jensen 1980) within 0.1 %, so the circuit model's correction stands
//     and the full-wave lines are electrically longer than the drawn copper
//     by half that ratio;
//   - the mesh: the normal mesh lies within 0.5 % of the finest recorded;
//   - what remains when the finest mesh's best match is moved by the
//     thickness's share lies within ±0.5 % of f0, half the criterion;
//   - the normal row is the acceptance record's demo row (same solver).
func TestRecordedDemoOffset(t *testing.T) {
	rec := records.Read(t, offsetRecord, "testdata/fdtd/offset.sh")
	type row struct {
		variant          string
		ref, offset, s11 float64
	}
	var rows, variants []row
	for _, r := range rec.Rows {
		if len(r.Cells) != 12 {
			t.Fatalf("offset.tsv: %d columns in %q, want 12", len(r.Cells), r.Line)
		}
		v := row{r.Cells[0], r.Num(t, "refinement"), r.Num(t, "best_match_offset_pct"), r.Num(t, "s11_db_f0")}
		if v.variant == "refined" {
			rows = append(rows, v)
		} else {
			variants = append(variants, v)
		}
	}
	if len(rec.Made) == 0 || len(rows) < 3 {
		t.Fatalf("offset.tsv: want a '# made by:' line and at least 3 meshes, got %d rows", len(rows))
	}
	var normal *row
	for i := range rows {
		if math.Abs(rows[i].ref-4.0/3) < 1e-3 {
			normal = &rows[i]
		}
		t.Logf("coarse mesh × %.3f: best match %+.3f %% from f0, |S11| at f0 %.1f dB", rows[i].ref, rows[i].offset, rows[i].s11)
	}
	for _, v := range variants {
		t.Logf("%s: best match %+.3f %% from f0, |S11| at f0 %.1f dB", v.variant, v.offset, v.s11)
		if normal != nil && !(v.offset > normal.offset) {
			t.Errorf("%s: best match %+.3f %%, want above the normal mesh's %+.3f %% (a refinement moves it toward f0)", v.variant, v.offset, normal.offset)
		}
	}
	finest := rows[len(rows)-1]
	if normal == nil {
		t.Fatal("offset.tsv has no normal-mesh row (refinement 4/3)")
	}
	if d := finest.offset - normal.offset; math.Abs(d) > 0.5 {
		t.Errorf("refining the normal mesh %.2f× moves the best match by %+.2f %%, want within 0.5 %%", finest.ref/normal.ref, d)
	}

	res, err := synth.Build(context.Background(), demoInput(t))
	if err != nil {
		t.Fatal(err)
	}
	solver, closed := thicknessShift(t, res)
	t.Logf("zero-thickness copper raises the demo line's εeff by %.3f %% (field solver), %.3f %% (Hammerstad-Jensen)", 100*solver, 100*closed)
	if math.Abs(solver-closed) > 0.001 {
		t.Errorf("thickness effect on εeff: field solver %.3f %%, Hammerstad-Jensen %.3f %%, want within 0.1 %%", 100*solver, 100*closed)
	}
	rest := finest.offset + 100*solver/2
	t.Logf("finest mesh %+.3f %% + zero thickness's share %+.3f %% = %+.3f %%", finest.offset, 100*solver/2, rest)
	if math.Abs(rest) > 0.5 {
		t.Errorf("the finest mesh's best match %+.2f %%, with the thickness's share %+.2f %%, leaves %+.2f %% unexplained, want within ±0.5 %%", finest.offset, 100*solver/2, rest)
	}

	demoRows := 0
	for _, r := range records.Read(t, "../../testdata/fdtd/acceptance.tsv", "testdata/fdtd/acceptance.sh").Rows {
		if r.Cells[0] != "demo" || len(r.Cells) < 6 {
			continue
		}
		demoRows++
		f0, best := r.Num(t, "f0_hz"), r.Num(t, "fullwave_best_match_hz")
		if off := 100 * (best/f0 - 1); math.Abs(off-normal.offset) > 0.01 {
			t.Errorf("acceptance.tsv's demo %+.3f %% and offset.tsv's normal mesh %+.3f %% differ: one of the records is stale", off, normal.offset)
		}
	}
	if demoRows != 1 {
		t.Errorf("acceptance.tsv has %d demo rows, want 1 to compare with offset.tsv", demoRows)
	}
}
