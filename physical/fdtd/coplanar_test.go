package fdtd

import (
	"math"
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
// Kirschning-Jansen; Z0 within 2 %, which is what this mesh reaches
// (+1.9 %), not the 1.5 % the microstrip lines meet against
// Hammerstad-Jensen: a 0.25 mm gap is two cells wide here. Recorded during
// the work (DEVELOPERS.md): normal mesh +1.8 %, and +1.1 % with the edge
// cell a quarter of the gap, which verify does not use (it would cost
// about three times the run). The section is gcpw-probe's (εr 3.5,
// 0.51 mm, strip 0.8467 mm, gaps 0.25 mm) at 5.8 GHz.
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
// substrate's z cell, on gcpw-probe's section (35 µm on 0.51 mm, gaps
// 0.25 mm; the coarse mesh's substrate cells are 85 µm): the line's εeff
// and Z0 must lie nearer the 2-D field solver with the 35 µm copper
// (physical/fieldsolve, an independent electrostatic solution of the
// cross-section) than the zero-thickness sheet's. Recorded: sheet εeff
// +4.35 %, Z0 +7.56 %; drawn +2.30 %, +4.98 % (normal mesh: +4.23/+7.46 %
// and +1.77/+4.36 %, one-off): with two or three cells across a gap the
// copper's facing walls carry about half the field solver's thickness
// effect, so the coarse mesh misses the at-most-half of the thin board's
// TestThickCopperAgainstFieldSolver by a hair (0.53) and the normal mesh
// meets it (0.42).
func TestThinCopperOnCoplanarLine(t *testing.T) {
	const er, h, w, gap, f, tc = 3.5, 0.51e-3, 0.8467e-3, 0.25e-3, 5.8e9, 35e-6
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.GCPW, Width: w, Height: h, Er: er, Gap: gap, Thickness: tc}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.002)
	var z, ee [2]float64
	for i, th := range []float64{0, tc} {
		s := gcpwLine(er, h, w, gap, 1.5e-3, f)
		s.CopperThickness = th
		g, err := NewGrid(s, Coarse.Params())
		if err != nil {
			t.Fatal(err)
		}
		if drawn := g.KT != g.KH; drawn != (th > 0) {
			t.Fatalf("copper %.0f µm on a coplanar line: drawn %v", th*1e6, drawn)
		}
		z[i], ee[i] = measureLine(t, s, Coarse.Params())
	}
	t.Logf("field solver (35 µm): εeff %.4f, Z0 %.2f Ω; sheet %+.2f %%, %+.2f %%; drawn %+.2f %%, %+.2f %%",
		eeFS, zFS, 100*(ee[0]/eeFS-1), 100*(z[0]/zFS-1), 100*(ee[1]/eeFS-1), 100*(z[1]/zFS-1))
	if es, et := math.Abs(ee[0]/eeFS-1), math.Abs(ee[1]/eeFS-1); et >= es {
		t.Errorf("εeff: drawn %.2f %% off the field solver, sheet %.2f %%: want nearer", 100*et, 100*es)
	}
	if zs, zt := math.Abs(z[0]/zFS-1), math.Abs(z[1]/zFS-1); zt >= zs {
		t.Errorf("Z0: drawn %.2f %% off the field solver, sheet %.2f %%: want nearer", 100*zt, 100*zs)
	}
}
