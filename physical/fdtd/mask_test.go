package fdtd

import (
	"context"
	"fmt"
	"math"
	"os"
	"testing"
	"time"

	"stubcraft/physical/fieldsolve"
)

// TestMaskedLineAgainstFieldSolver checks the sub-cell solder mask on a
// uniform line (coarse mesh): the full-wave εeff and Z0 of a masked line
// against the project's 2-D field solver (physical/fieldsolve, an
// independent finite-difference solution of Laplace's equation on the same
// cross-section: zero-thickness strip, a mask layer of the same thickness
// over strip and substrate), within the tolerances the bare lines meet
// against Hammerstad-Jensen and Kirschning-Jansen (εeff 0.5 %, Z0 1.5 %).
// The field solver's εeff carries Kirschning-Jansen's relative dispersion
// (its line model at f); its Z0 is static, as in TestUniformLine.
//
// The case is the thin-board stackup of testdata/designs (εr 4.06 at
// 2.45 GHz, 0.2 mm, 20 µm of εr 3.5 mask), a 50 Ω-class strip (W/h 1.9):
// the mask raises the field solver's εeff by 4.5 %, so a full-wave model
// that ignored it would miss by about that. testdata/fdtd/validate.sh
// (ONLY=MaskedLines) records more lines, bare and masked, on the coarse
// and normal meshes in mask.tsv, which TestRecordedMaskedLines holds.
func TestMaskedLineAgainstFieldSolver(t *testing.T) {
	const er, h, wh, mt, mer = 4.06, 0.2e-3, 1.9, 20e-6, 3.5
	ee, z, eeFS, zFS := maskedLineCase(t, er, h, wh, mt, mer, Coarse.Params())
	t.Logf("masked line: Z0 %.2f Ω (field solver %.2f), εeff %.4f (%.4f)", z, zFS, ee, eeFS)
	if e := ee/eeFS - 1; math.Abs(e) > 0.005 {
		t.Errorf("masked line: full-wave εeff %.4f, field solver %.4f: off by %+.2f %%, want within 0.5 %%", ee, eeFS, 100*e)
	}
	if e := z/zFS - 1; math.Abs(e) > 0.015 {
		t.Errorf("masked line: full-wave Z0 %.2f Ω, field solver %.2f Ω: off by %+.2f %%, want within 1.5 %%", z, zFS, 100*e)
	}
}

// maskedLineCase returns the full-wave εeff and Z0 of a strip W/h = wh on
// (er, h) under a mask (thickness mt, εr mer; mt = 0 for none) at
// f·h = 1 GHz·mm, beside the field solver's.
func maskedLineCase(t *testing.T, er, h, wh, mt, mer float64, mesh MeshParams) (ee, z, eeFS, zFS float64) {
	t.Helper()
	w := wh * h
	f := 1e9 * 1e-3 / h
	s := straight(er, h, w, 2*h, []float64{0.5 * f, f, 1.5 * f})
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.Microstrip, Width: w, Height: h, Er: er}
	if mt > 0 {
		s.Mask = Mask{Thickness: mt, Er: mer}
		cs.MaskThickness, cs.MaskEr = mt, mer
	}
	z, ee = measureLine(t, s, mesh)
	zFS, eeFS = fieldSolverLine(t, cs, f, 0.001)
	return ee, z, eeFS, zFS
}

// TestZeroMaskChangesNothing checks that a mask of zero thickness, whatever
// its εr and tanδ, leaves the mesh, the update coefficients and the fields
// of a run bitwise as without one.
func TestZeroMaskChangesNothing(t *testing.T) {
	bare := straight(4.35, 1.6e-3, 3e-3, 3.2e-3, []float64{5e9, 10e9, 15e9})
	bare.TanD, bare.F0 = 0.02, 10e9
	zero := bare
	zero.Mask = Mask{Thickness: 0, Er: 3.5, TanD: 0.03}
	// A 10 dB decay is enough to compare: the runs need not converge, only
	// take the same steps.
	o := Options{DecayDB: 10}.withDefaults()
	grids, sims, recs := runPair(t, bare, zero, o)
	same := func(name string, a, b []float64) {
		if len(a) != len(b) {
			t.Fatalf("%s: %d against %d values", name, len(a), len(b))
		}
		for i := range a {
			if a[i] != b[i] {
				t.Fatalf("%s[%d]: %v with a zero-thickness mask, %v without", name, i, b[i], a[i])
			}
		}
	}
	same("grid x", grids[0].X, grids[1].X)
	same("grid y", grids[0].Y, grids[1].Y)
	same("grid z", grids[0].Z, grids[1].Z)
	for _, c := range []struct {
		name string
		a, b []float32
	}{{"caT", sims[0].caT, sims[1].caT}, {"cbT", sims[0].cbT, sims[1].cbT}, {"caZ", sims[0].caZ, sims[1].caZ}, {"cbZ", sims[0].cbZ, sims[1].cbZ}} {
		same(c.name, widen(c.a), widen(c.b))
	}
	sameSpectra(t, recs, "with a zero-thickness mask")
}

// runPair meshes and runs structures a and b the same way (one worker, from
// step 0), for tests that compare the two bitwise; the sims are closed.
func runPair(t *testing.T, a, b Structure, o Options) (grids [2]*Grid, sims [2]*sim, recs [2][2]probeSet) {
	t.Helper()
	for i, s := range []Structure{a, b} {
		g, err := NewGrid(s, o.Mesh)
		if err != nil {
			t.Fatal(err)
		}
		grids[i] = g
		sims[i] = newSim(g, s, 1)
		sims[i].close()
		if recs[i], _, err = runOnce(context.Background(), g, s, o, 0, 0, 1, time.Now()); err != nil {
			t.Fatal(err)
		}
	}
	return grids, sims, recs
}

// sameSpectra fails t unless the two runs recorded bitwise the same port
// spectra; what names the difference between them.
func sameSpectra(t *testing.T, recs [2][2]probeSet, what string) {
	t.Helper()
	for p := range recs[0] {
		a, b := recs[0][p], recs[1][p]
		for f := range a.vf1 {
			if a.vf1[f] != b.vf1[f] || a.vb1[f] != b.vb1[f] || a.ifr[f] != b.ifr[f] || a.ib[f] != b.ib[f] {
				t.Fatalf("port %d, frequency %d: the recorded spectra differ %s", p+1, f, what)
			}
		}
	}
}

func widen(v []float32) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}

// TestMaskOfAirIsAir checks the sub-cell averaging's general path on a
// mask that is air (εr 1, no loss): every coefficient must be that of no
// mask, to float32 rounding, for masks thinner and thicker than the first
// air cell.
func TestMaskOfAirIsAir(t *testing.T) {
	bare := straight(4.35, 1.6e-3, 3e-3, 3.2e-3, []float64{0.5e9, 1e9, 1.5e9})
	bare.TanD, bare.F0 = 0.02, 1e9
	g, err := NewGrid(bare, Coarse.Params())
	if err != nil {
		t.Fatal(err)
	}
	erT0, sgT0, erZ0, sgZ0 := zMaterials(g, bare)
	for _, th := range []float64{20e-6, 0.3e-3, 1e-3} {
		s := bare
		s.Mask = Mask{Thickness: th, Er: 1}
		erT, sgT, erZ, sgZ := zMaterials(g, s)
		for k := range erT {
			for _, c := range []struct {
				name string
				a, b float64
			}{{"εr tangential", erT0[k], erT[k]}, {"σ tangential", sgT0[k], sgT[k]}, {"εr normal", erZ0[k], erZ[k]}, {"σ normal", sgZ0[k], sgZ[k]}} {
				if math.Abs(c.a-c.b) > 1e-12*math.Max(1, math.Abs(c.a)) {
					t.Errorf("mask of air %.0f µm, z index %d: %s %g, without a mask %g", th*1e6, k, c.name, c.b, c.a)
				}
			}
		}
	}
}

// maskSet is the masked-line record: (εr, h, W/h, mask thickness, mask εr).
// The thin board of the examples with its 20 µm mask and with 40 µm, a
// 0.51 mm board and the masked 1.6 mm FR-4 preset's section.
var maskSet = [][5]float64{
	{4.06, 0.2e-3, 1.9, 20e-6, 3.5},
	{4.06, 0.2e-3, 1.9, 40e-6, 3.5},
	{3.5, 0.51e-3, 2.2, 20e-6, 3.5},
	{4.35, 1.6e-3, 1.9, 20e-6, 3.5},
}

// TestRecordMaskedLines records maskSet on the coarse and normal meshes,
// bare and masked, beside the field solver
// (testdata/fdtd/validate.sh with ONLY=MaskedLines).
func TestRecordMaskedLines(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long: run ONLY=MaskedLines testdata/fdtd/validate.sh")
	}
	var rows []string
	for mi, mesh := range []MeshLevel{Coarse, Normal} {
		for _, c := range maskSet {
			eb, _, ebFS, _ := maskedLineCase(t, c[0], c[1], c[2], 0, 0, mesh.Params())
			ee, z, eeFS, zFS := maskedLineCase(t, c[0], c[1], c[2], c[3], c[4], mesh.Params())
			rows = append(rows, fmt.Sprintf("%d\t%g\t%g\t%g\t%g\t%g\t%.4f\t%.4f\t%.5f\t%.5f\t%.5f\t%.5f",
				mi, c[0], c[1]*1e3, c[2], c[3]*1e6, c[4], z, zFS, ee, eeFS, eb, ebFS))
			t.Log(rows[len(rows)-1])
		}
	}
	writeRecord(t, "mask.tsv", "mesh\ter\th_mm\tw_over_h\tmask_um\tmask_er\tz0_ohm\tz0_fieldsolve_ohm\teps_eff\teps_eff_fieldsolve\tbare_eps_eff\tbare_eps_eff_fieldsolve", rows)
}

// maskGaps are the recorded masked lines known to miss the 0.5 % on εeff,
// by mesh and section, with the recorded figure. They are logged, not
// held; one that meets it when re-recorded fails the test.
var maskGaps = map[string]string{
	"coarse 3.5/0.51": "εeff −0.51 % (the mask's rise +1.62 % against the field solver's +2.25 %); −0.36 % on the normal mesh",
}

// TestRecordedMaskedLines holds mask.tsv (mesh 0 coarse, 1 normal): every
// masked line's full-wave Z0 within 1.5 % of the field solver's
// (physical/fieldsolve on the same cross-section: zero-thickness strip,
// the mask a layer of its thickness over strip and substrate) and its
// εeff within 0.5 %, the tolerances the bare lines meet against
// Hammerstad-Jensen and Kirschning-Jansen. The log gives the share of the
// field solver's rise of εeff under the mask that the sub-cell average
// carries: on thick boards the mask is a small part of a first air cell
// many times taller, and the share falls (DEVELOPERS.md).
func TestRecordedMaskedLines(t *testing.T) {
	rows := readRecord(t, "mask.tsv")
	if len(rows) != 2*len(maskSet) {
		t.Fatalf("mask.tsv has %d rows, want %d", len(rows), 2*len(maskSet))
	}
	for _, r := range rows {
		mesh := []string{"coarse", "normal"}[int(r[0])]
		name := fmt.Sprintf("%s, εr %g h %g mm W/h %g, mask %g µm εr %g", mesh, r[1], r[2], r[3], r[4], r[5])
		share := (r[8]/r[10] - 1) / (r[9]/r[11] - 1)
		t.Logf("%s: εeff %+.2f %%, Z0 %+.2f %% against the field solver; the mask's rise of εeff %+.2f %% (field solver %+.2f %%, %.0f %% of it)",
			name, 100*(r[8]/r[9]-1), 100*(r[6]/r[7]-1), 100*(r[8]/r[10]-1), 100*(r[9]/r[11]-1), 100*share)
		if e := math.Abs(r[6]/r[7] - 1); e > 0.015 {
			t.Errorf("%s: Z0 %.2f Ω, field solver %.2f Ω: %.2f %% off, want within 1.5 %%", name, r[6], r[7], 100*e)
		}
		e := math.Abs(r[8]/r[9] - 1)
		key := fmt.Sprintf("%s %g/%g", mesh, r[1], r[2])
		if gap, known := maskGaps[key]; known {
			if e <= 0.005 {
				t.Errorf("%s meets the 0.5 %% on εeff now (%.2f %%): remove it from maskGaps", name, 100*e)
			} else {
				t.Logf("%s: known gap: %s", name, gap)
			}
			continue
		}
		if e > 0.005 {
			t.Errorf("%s: εeff %.4f, field solver %.4f: %.2f %% off, want within 0.5 %%", name, r[8], r[9], 100*e)
		}
	}
}
