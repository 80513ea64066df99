package fdtd

import (
	"fmt"
	"math"
	"os"
	"testing"

	"stubcraft/physical/fieldsolve"
)

// gcpwLine returns a straight grounded-coplanar line: strip w, gaps gap,
// side grounds gw wide (m) on (er, h), its ports coplanar, swept round f.
func gcpwLine(er, h, w, gap, gw, f float64) Structure {
	s := straight(er, h, w, 2*h, []float64{0.5 * f, f, 1.5 * f})
	for i := range s.Ports {
		s.Ports[i].Gap, s.Ports[i].GroundWidth = int64(math.Round(gap*1e9)), int64(math.Round(gw*1e9))
	}
	return s
}

// TestEdgeCellKeptWhole checks the mesh across a narrow coplanar gap: with
// the edge cell h/4 on the gcpw-probe section (0.51 mm, strip 0.8467 mm,
// gaps 0.25 mm), the cell across each copper edge must not be split, so
// that every Ey cell whose middle lies in copper lies wholly in copper
// (the copper on the mesh ends inside the drawn copper, by the
// one-third/two-thirds rule: common practice, no source). Splitting it put the strip
// 30 µm beyond its edge on the mesh and raised the line's εeff by 19 %.
func TestEdgeCellKeptWhole(t *testing.T) {
	const h, w, gap = 0.51e-3, 0.8467e-3, 0.25e-3
	s := gcpwLine(3.5, h, w, gap, 1e-3, 5.8e9)
	g, err := newGrid(s, Normal.Params(), h/4, nil)
	if err != nil {
		t.Fatal(err)
	}
	edges := []float64{-w/2 - gap, -w / 2, w / 2, w/2 + gap}
	for j := 0; j+1 < len(g.Y); j++ {
		lo, hi := g.Y[j], g.Y[j+1]
		mid := (lo + hi) / 2
		if !g.ext.inCopper(-1e-3, mid) { // on the left port line's extension
			continue
		}
		for _, e := range edges {
			if lo < e && e < hi {
				t.Errorf("the Ey cell %.1f–%.1f µm counts as copper but straddles the copper edge at %.1f µm", lo*1e6, hi*1e6, e*1e6)
			}
		}
	}
}

// TestCoplanarLineAgainstFieldSolver checks a coplanar port line (side
// grounds held to the plane) on the coarse mesh: its full-wave εeff and
// Z0 against the project's 2-D field solver (physical/fieldsolve, GCPW with
// wide side grounds at ground potential, zero-thickness copper: an
// independent finite-difference solution of the same cross-section).
// εeff within 0.5 %, the tolerance the microstrip lines meet against
// Kirschning-Jansen; Z0 within 2 %, not the 1.5 % the microstrip lines
// meet against Hammerstad-Jensen: recorded +1.55 % (εeff +0.21 %) with
// the edge cell a third of the gap, +1.9 % (+0.24 %) with the gap in two
// cells, before the gap bounded the edge cell. The section is
// gcpw-probe's (εr 3.5, 0.51 mm, strip 0.8467 mm, gaps 0.25 mm) at
// 5.8 GHz.
func TestCoplanarLineAgainstFieldSolver(t *testing.T) {
	const er, h, w, gap, f = 3.5, 0.51e-3, 0.8467e-3, 0.25e-3, 5.8e9
	z, ee := measureLine(t, gcpwLine(er, h, w, gap, 1.5e-3, f), Coarse.Params())
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.GCPW, Width: w, Height: h, Er: er, Gap: gap}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.002)
	t.Logf("coplanar line: Z0 %.2f Ω (field solver %.2f), εeff %.4f (%.4f)", z, zFS, ee, eeFS)
	if e := ee/eeFS - 1; math.Abs(e) > 0.005 {
		t.Errorf("εeff %.4f, field solver %.4f: off by %+.2f %%, want within 0.5 %%", ee, eeFS, 100*e)
	}
	if e := z/zFS - 1; math.Abs(e) > 0.02 {
		t.Errorf("Z0 %.2f Ω, field solver %.2f Ω: off by %+.2f %%, want within 2 %%", z, zFS, 100*e)
	}
}

// TestThinCopperOnCoplanarLine checks the copper a grounded-coplanar
// board draws with its thickness even where it is thinner than the
// substrate's z cell, and the edge cell a coplanar gap bounds like a
// strip's width (at most gap/EdgeDivisions), on gcpw-probe's section
// (35 µm on 0.51 mm, gaps 0.25 mm; coarse mesh, its substrate cells 39 µm)
// against the 2-D field solver with the 35 µm copper (physical/fieldsolve,
// an independent electrostatic solution of the cross-section):
//   - the drawn copper's εeff and Z0 lie off it by at most half what the
//     zero-thickness sheet's do, the rule of the microstrip's
//     TestThickCopperAgainstFieldSolver;
//   - the drawn copper's εeff lies within 1.5 % of it ((a)'s tolerance for
//     the microstrip lines), and its εeff and Z0 nearer it than with the
//     edge cell the strip and substrate alone set (h/3, 170 µm: the gap in
//     about two cells).
//
// Recorded: sheet εeff +4.33 %, Z0 +7.17 %; drawn +1.32 %, +3.35 % (0.30
// and 0.47 of the sheet's); drawn with the strip's edge cell, as before
// the gap bounded it, +2.30 %, +4.98 % (0.53 of the sheet's in εeff). The
// convergence on the normal mesh is TestRecordedCoplanarLines.
func TestThinCopperOnCoplanarLine(t *testing.T) {
	const er, h, w, gap, f, tc = 3.5, 0.51e-3, 0.8467e-3, 0.25e-3, 5.8e9, 35e-6
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.GCPW, Width: w, Height: h, Er: er, Gap: gap, Thickness: tc}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.002)
	p := Coarse.Params()
	var z, ee [2]float64 // sheet, drawn
	var s Structure
	for i, th := range []float64{0, tc} {
		s = gcpwLine(er, h, w, gap, 1.5e-3, f)
		s.CopperThickness = th
		g, err := NewGrid(s, p)
		if err != nil {
			t.Fatal(err)
		}
		if drawn := g.KT != g.KH; drawn != (th > 0) {
			t.Fatalf("copper %.0f µm on a coplanar line: drawn %v", th*1e6, drawn)
		}
		z[i], ee[i] = measureLine(t, s, p)
	}
	stripCell := math.Min(h/float64(p.SubstrateCells), w/p.EdgeDivisions)
	zStrip, eeStrip := measureLineEdge(t, s, p, stripCell)
	t.Logf("field solver (35 µm): εeff %.4f, Z0 %.2f Ω; sheet %+.2f %%, %+.2f %%; drawn %+.2f %%, %+.2f %%; drawn with the strip's edge cell (%.0f µm) %+.2f %%, %+.2f %%",
		eeFS, zFS, 100*(ee[0]/eeFS-1), 100*(z[0]/zFS-1), 100*(ee[1]/eeFS-1), 100*(z[1]/zFS-1), stripCell*1e6, 100*(eeStrip/eeFS-1), 100*(zStrip/zFS-1))
	atMostHalfTheSheet(t, "drawn coplanar copper", [2]float64{eeFS, zFS}, ee, z)
	if e := ee[1]/eeFS - 1; math.Abs(e) > 0.015 {
		t.Errorf("drawn copper: εeff %.4f, field solver %.4f: off by %+.2f %%, want within 1.5 %%", ee[1], eeFS, 100*e)
	}
	for _, c := range []struct {
		name               string
		gapCell, stripCell float64
		ref                float64
	}{{"εeff", ee[1], eeStrip, eeFS}, {"Z0", z[1], zStrip, zFS}} {
		if eg, es := math.Abs(c.gapCell/c.ref-1), math.Abs(c.stripCell/c.ref-1); eg >= es {
			t.Errorf("%s: %.2f %% off the field solver with the gap in the edge cell, %.2f %% with the strip's: want nearer", c.name, 100*eg, 100*es)
		}
	}
}

// coplanarGapCells are the edge cells of the coplanar-line record, as
// divisions of the gap: 2 is about the normal mesh's cell before the gap
// counted (h/4 = 127.5 µm on 0.51 mm), 4 the normal mesh's now.
var coplanarGapCells = []float64{2, 3, 4, 6}

// TestRecordCoplanarLines records gcpw-probe's section with its 35 µm
// copper on the normal mesh at the edge cells of coplanarGapCells, beside
// the field solver (testdata/fdtd/validate.sh with ONLY=CoplanarLines).
func TestRecordCoplanarLines(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long: run ONLY=CoplanarLines testdata/fdtd/validate.sh")
	}
	const er, h, w, gap, f, tc = 3.5, 0.51e-3, 0.8467e-3, 0.25e-3, 5.8e9, 35e-6
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.GCPW, Width: w, Height: h, Er: er, Gap: gap, Thickness: tc}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.0005)
	s := gcpwLine(er, h, w, gap, 1.5e-3, f)
	s.CopperThickness = tc
	var rows []string
	for _, k := range coplanarGapCells {
		z, ee := measureLineEdge(t, s, Normal.Params(), gap/k)
		rows = append(rows, fmt.Sprintf("%g\t%.2f\t%.4f\t%.4f\t%.5f\t%.5f", k, gap/k*1e6, z, zFS, ee, eeFS))
		t.Log(rows[len(rows)-1])
	}
	writeRecord(t, "coplanar.tsv", "gap_divisions\tedge_cell_um\tz0_ohm\tz0_fieldsolve_ohm\teps_eff\teps_eff_fieldsolve", rows)
}

// TestRecordedCoplanarLines holds coplanar.tsv, gcpw-probe's line with
// its 35 µm copper on the normal mesh with the edge cell refined across
// the gap (and with it the substrate cells, half its height): each
// refinement must bring εeff and Z0 nearer the 2-D field solver
// (physical/fieldsolve, thick copper), and the line extrapolated to a zero
// cell from the two finest, linearly in the cell, must lie within 0.5 % of
// it in εeff and 1 % in Z0, tighter than (a)'s 1.5 % because the
// extrapolation removes the cell's share. The steps are near first order,
// not exactly: the εeff error per µm of cell grows from 0.011 to 0.016 %
// down the record, so the two-finest extrapolation leans low (−0.01 %),
// and a straight line through all four rows gives +0.14 %. This is the
// independent check of the field solver's thick-copper coplanar line,
// which the circuit model uses on grounded-coplanar boards.
func TestRecordedCoplanarLines(t *testing.T) {
	rows := readRecord(t, "coplanar.tsv")
	if len(rows) != len(coplanarGapCells) {
		t.Fatalf("coplanar.tsv has %d rows, want %d", len(rows), len(coplanarGapCells))
	}
	for i, r := range rows {
		t.Logf("edge cell gap/%g (%.1f µm): εeff %+.2f %%, Z0 %+.2f %% against the field solver", r[0], r[1], 100*(r[4]/r[5]-1), 100*(r[2]/r[3]-1))
		if i == 0 {
			continue
		}
		p := rows[i-1]
		for _, c := range []struct {
			name      string
			now, prev float64
			ref       float64
		}{{"εeff", r[4], p[4], r[5]}, {"Z0", r[2], p[2], r[3]}} {
			if math.Abs(c.now/c.ref-1) >= math.Abs(c.prev/c.ref-1) {
				t.Errorf("%s: refining the edge cell %.1f → %.1f µm moved it no nearer the field solver (%+.2f → %+.2f %%)",
					c.name, p[1], r[1], 100*(c.prev/c.ref-1), 100*(c.now/c.ref-1))
			}
		}
	}
	a, b := rows[len(rows)-2], rows[len(rows)-1]
	// The line through (cell a, va) and (cell b, vb), at a zero cell.
	extrapolate := func(va, vb float64) float64 { return vb - (va-vb)*b[1]/(a[1]-b[1]) }
	for _, c := range []struct {
		name     string
		va, vb   float64
		ref, tol float64
	}{{"εeff", a[4], b[4], b[5], 0.005}, {"Z0", a[2], b[2], b[3], 0.01}} {
		x := extrapolate(c.va, c.vb)
		t.Logf("%s extrapolated to a zero cell: %.4f, field solver %.4f (%+.2f %%)", c.name, x, c.ref, 100*(x/c.ref-1))
		if e := x/c.ref - 1; math.Abs(e) > c.tol {
			t.Errorf("%s extrapolated to a zero cell %.4f, field solver %.4f: off by %+.2f %%, want within %.1f %%", c.name, x, c.ref, 100*e, 100*c.tol)
		}
	}
}
