package fdtd

import (
	"math"
	"slices"
	"testing"

	"stubcraft/physical"
	"stubcraft/physical/fieldsolve"
)

// TestThickCopperAgainstFieldSolver checks the drawn copper thickness on a
// uniform 50 Ω-class line (W/h 1.9) of 35 µm copper on a 0.2 mm board of
// εr 4.35, coarse mesh: the full-wave εeff and Z0 with the thickness drawn
// must lie off the 2-D field solver (physical/fieldsolve, an independent
// electrostatic computation on the cross-section with the 35 µm strip) by
// at most half what the copper drawn as a sheet is off. Recorded: sheet
// εeff +3.64 %, Z0 +5.34 %; drawn εeff +0.95 %, Z0 +2.08 % (the coarse
// mesh's own bias on a sheet against a zero-thickness field solver is
// within the 0.5 % and 1.5 % of TestMaskedLineAgainstFieldSolver).
func TestThickCopperAgainstFieldSolver(t *testing.T) {
	const er, h, wh, tc = 4.35, 0.2e-3, 1.9, 35e-6
	w := wh * h
	f := 1e9 * 1e-3 / h
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.Microstrip, Width: w, Height: h, Er: er, Thickness: tc}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.001)
	var ee, z [2]float64
	for i, th := range []float64{0, tc} {
		s := straight(er, h, w, 2*h, []float64{0.5 * f, f, 1.5 * f})
		s.CopperThickness = th
		if th > 0 {
			g, err := NewGrid(s, Coarse.Params())
			if err != nil {
				t.Fatal(err)
			}
			if g.KT != g.KH+1 || math.Abs(g.Z[g.KT]-h-tc) > 1e-12 {
				t.Fatalf("35 µm copper on 0.2 mm: top face index %d (plane %d), z %g m: want a line at h + t", g.KT, g.KH, g.Z[g.KT])
			}
		}
		z[i], ee[i] = measureLine(t, s, Coarse.Params())
	}
	t.Logf("field solver (35 µm): εeff %.4f, Z0 %.2f Ω; sheet: εeff %.4f (%+.2f %%), Z0 %.2f Ω (%+.2f %%); drawn: εeff %.4f (%+.2f %%), Z0 %.2f Ω (%+.2f %%)",
		eeFS, zFS, ee[0], 100*(ee[0]/eeFS-1), z[0], 100*(z[0]/zFS-1), ee[1], 100*(ee[1]/eeFS-1), z[1], 100*(z[1]/zFS-1))
	atMostHalfTheSheet(t, "drawn copper", [2]float64{eeFS, zFS}, ee, z)
}

// TestThinCopperChangesNothing checks that copper thinner than the
// substrate's z cell (35 µm on 1.6 mm, not drawn) leaves the mesh, the
// conductor marks and the fields of a run bitwise as copper of zero
// thickness, and that thick copper under a mask is drawn.
func TestThinCopperChangesNothing(t *testing.T) {
	bare := straight(4.35, 1.6e-3, 3e-3, 3.2e-3, []float64{5e9, 10e9, 15e9})
	o := Options{DecayDB: 10}.withDefaults()
	thin := bare
	thin.CopperThickness = 35e-6
	grids, sims, recs := runPair(t, bare, thin, o)
	if grids[1].KT != grids[1].KH {
		t.Fatalf("35 µm copper on 1.6 mm drawn (top face index %d, plane %d): want a sheet", grids[1].KT, grids[1].KH)
	}
	// Under a mask thick copper is drawn too, the mask following it
	// (conformalFixes).
	masked := straight(4.35, 0.2e-3, 0.38e-3, 0.4e-3, []float64{2.5e9, 5e9, 7.5e9})
	masked.CopperThickness, masked.Mask = 35e-6, Mask{Thickness: 20e-6, Er: 3.5}
	if g, err := NewGrid(masked, o.Mesh); err != nil {
		t.Fatal(err)
	} else if g.KT != g.KH+1 {
		t.Fatalf("35 µm copper on 0.2 mm under a mask: top face index %d, plane %d: want it drawn", g.KT, g.KH)
	}
	for _, c := range []struct {
		name string
		a, b []float64
	}{{"grid x", grids[0].X, grids[1].X}, {"grid y", grids[0].Y, grids[1].Y}, {"grid z", grids[0].Z, grids[1].Z}} {
		if !slices.Equal(c.a, c.b) {
			t.Fatalf("%s differs with thin copper", c.name)
		}
	}
	if !slices.Equal(sims[0].pecX, sims[1].pecX) || !slices.Equal(sims[0].pecY, sims[1].pecY) || !slices.Equal(sims[0].pecZ, sims[1].pecZ) {
		t.Fatal("the conductor marks differ with thin copper")
	}
	sameSpectra(t, recs, "with thin copper")
}

// TestConformalMaskAgainstFieldSolver checks the solder mask that follows
// thick copper on a uniform line: 35 µm copper on a 0.2 mm board of εr 4.1
// (W/h 1.9) under 20 µm of εr 3.5, coarse mesh, against the 2-D field
// solver (physical/fieldsolve, an independent electrostatic computation of
// the cross-section with the 35 µm strip and the mask over the top face,
// down the walls and on the substrate). The criterion is that of
// TestThickCopperAgainstFieldSolver: the copper drawn under the conformal
// mask must lie off the field solver by at most half what the sheet under
// the layered mask is off, in εeff and in Z0.
func TestConformalMaskAgainstFieldSolver(t *testing.T) {
	const er, h, wh, tc, mt, mer = 4.1, 0.2e-3, 1.9, 35e-6, 20e-6, 3.5
	w := wh * h
	f := 1e9 * 1e-3 / h
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.Microstrip, Width: w, Height: h, Er: er, Thickness: tc, MaskThickness: mt, MaskEr: mer}
	zFS, eeFS := fieldSolverLine(t, cs, f, 0.001)
	var ee, z [2]float64
	for i, th := range []float64{0, tc} {
		s := straight(er, h, w, 2*h, []float64{0.5 * f, f, 1.5 * f})
		s.CopperThickness, s.Mask = th, Mask{Thickness: mt, Er: mer}
		z[i], ee[i] = measureLine(t, s, Coarse.Params())
	}
	t.Logf("field solver (35 µm, conformal mask): εeff %.4f, Z0 %.2f Ω; sheet: εeff %.4f (%+.2f %%), Z0 %.2f Ω (%+.2f %%); drawn: εeff %.4f (%+.2f %%), Z0 %.2f Ω (%+.2f %%)",
		eeFS, zFS, ee[0], 100*(ee[0]/eeFS-1), z[0], 100*(z[0]/zFS-1), ee[1], 100*(ee[1]/eeFS-1), z[1], 100*(z[1]/zFS-1))
	atMostHalfTheSheet(t, "drawn copper under the conformal mask", [2]float64{eeFS, zFS}, ee, z)
}

// TestConformalAverage checks the cell average of the conformal mask
// against exact results: far from copper it must be zMaterials' layered
// average (the same rule, so to rounding), and in a cell that the wall
// band's vertical face cuts in half, between the mask's faces, the
// components parallel to the face must see the arithmetic mean and the
// one across it the harmonic mean (Farjadpour et al. 2006; exact for a
// field uniform across the cell).
func TestConformalAverage(t *testing.T) {
	s := straight(4.1, 0.2e-3, 0.38e-3, 0.4e-3, []float64{2e9, 3e9})
	s.CopperThickness, s.Mask = 35e-6, Mask{Thickness: 20e-6, Er: 3.5}
	g, err := NewGrid(s, Normal.Params())
	if err != nil {
		t.Fatal(err)
	}
	h := g.Z[g.KH]
	l := conformalLayers{h: h, t: g.Z[g.KT] - h, m: s.Mask.Thickness, sub: complex(s.Er, 0), msk: complex(s.Mask.Er, 0)}
	erT, _, erZ, _ := zMaterials(g, s)
	far := [][]int{{colFar}}
	for k := g.KH; k < g.KT+3; k++ {
		lo, hi := dualSpan(g.Z, k)
		et, _ := l.average(far, 0, lo, hi)
		ez, _ := l.average(far, 2, g.Z[k], g.Z[k+1])
		if math.Abs(real(et)-erT[k]) > 1e-12 || math.Abs(real(ez)-erZ[k]) > 1e-12 {
			t.Errorf("z index %d far from copper: tangential %.15g, normal %.15g; zMaterials %.15g, %.15g", k, real(et), real(ez), erT[k], erZ[k])
		}
	}
	// A cell from h+m to h+t (mask in the band, air beyond it), the band's
	// face across y at the middle.
	n := conformalSamples
	split := make([][]int, n) // [x][y]
	for a := range split {
		split[a] = make([]int, n)
		for b := range split[a] {
			split[a][b] = colFar
			if b < n/2 {
				split[a][b] = colNear
			}
		}
	}
	lo, hi := h+l.m, h+l.t
	arith, harm := (3.5+1)/2, 2/(1/3.5+1)
	for _, c := range []struct {
		name  string
		kinds [][]int
		axis  int
		want  float64
	}{
		{"Ex along the face", split, 0, arith},
		{"Ey across the face", transpose(split), 1, harm},
		{"Ez along the face", split, 2, arith},
	} {
		e, ok := l.average(c.kinds, c.axis, lo, hi)
		if !ok || math.Abs(real(e)-c.want) > 1e-12 {
			t.Errorf("%s: εr %.15g, want %.15g", c.name, real(e), c.want)
		}
	}
}

// transpose returns k with its two indices swapped.
func transpose(k [][]int) [][]int {
	out := make([][]int, len(k[0]))
	for b := range out {
		out[b] = make([]int, len(k))
		for a := range k {
			out[b][a] = k[a][b]
		}
	}
	return out
}

// TestFixesAreTheirOwnUpdate checks the kernel's corrections against an
// exact statement of what they must do: giving every E component of one
// z index (absorbing layers included; Ex, Ey and Ez, which have their own
// layer coefficients and CPML terms) the coefficients of another material
// through fixes must give the fields of a run whose z layer itself has
// those coefficients, to float32 rounding, on two workers (the
// corrections are split by slab like the update).
func TestFixesAreTheirOwnUpdate(t *testing.T) {
	s := straight(4.35, 0.8e-3, 1.5e-3, 4e-3, []float64{5e9, 10e9, 15e9})
	g, err := NewGrid(s, Coarse.Params())
	if err != nil {
		t.Fatal(err)
	}
	layer, fixed := newSim(g, s, 2), newSim(g, s, 2)
	defer layer.close()
	defer fixed.close()
	k := g.KH + 1
	ca, cb := eCoef(2.5, 0.3, layer.dt)
	layer.caT[k], layer.cbT[k] = ca, cb
	layer.caZ[k], layer.cbZ[k] = ca, cb
	for i := 0; i < fixed.nx-1; i++ {
		for j := 1; j < fixed.ny-1; j++ {
			c := int32((i*fixed.ny+j)*fixed.nz + k)
			f := fix{cell: c, ca: ca, cbr: cb / fixed.cbT[k], ca0: fixed.caT[k]}
			fixed.fixes[0] = append(fixed.fixes[0], f)
			if i >= 1 {
				fixed.fixes[1] = append(fixed.fixes[1], f)
				fixed.fixes[2] = append(fixed.fixes[2], fix{cell: c, ca: ca, cbr: cb / fixed.cbZ[k], ca0: fixed.caZ[k]})
			}
		}
	}
	// The same kick in both: Ez under the strip in the middle of the line.
	n := (fixed.nx/2*fixed.ny+nearest(g.Y, 0))*fixed.nz + g.KH - 1
	for _, m := range []*sim{layer, fixed} {
		m.ez[n] = 1
		for range 300 {
			m.step()
		}
	}
	peak, diff := 0.0, 0.0
	for _, a := range [][2][]float32{{layer.ex, fixed.ex}, {layer.ey, fixed.ey}, {layer.ez, fixed.ez}, {layer.hx, fixed.hx}} {
		for q := range a[0] {
			peak = math.Max(peak, math.Abs(float64(a[0][q])))
			diff = math.Max(diff, math.Abs(float64(a[0][q]-a[1][q])))
		}
	}
	t.Logf("largest field %.3g, largest difference %.3g", peak, diff)
	if !(peak > 0) || diff > 1e-4*peak {
		t.Errorf("fixes against the layer's own coefficients: largest difference %.3g of a largest field %.3g, want within 1e-4", diff, peak)
	}
}

// fieldSolverLine returns the 2-D field solver's static Z0 (ohm) and its
// εeff at f for cross-section cs (physical/fieldsolve, an independent
// electrostatic computation), solved to the relative tolerance tol.
func fieldSolverLine(t *testing.T, cs fieldsolve.CrossSection, f, tol float64) (z0, epsEff float64) {
	t.Helper()
	m, err := fieldsolve.NewLineModelOptions(cs, physical.Substrate{Er: cs.Er, Height: cs.Height}, nil, fieldsolve.Options{Tolerance: tol})
	if err != nil {
		t.Fatal(err)
	}
	z0, _ = m.Static()
	return z0, m.At(f).EpsEff
}

// atMostHalfTheSheet fails t unless the full-wave εeff and Z0 of the copper
// drawn (ee[1], z[1]) lie off the field solver's (ref: εeff, Z0) by at most
// half what those of the copper as a sheet (ee[0], z[0]) do.
func atMostHalfTheSheet(t *testing.T, drawn string, ref, ee, z [2]float64) {
	t.Helper()
	for _, c := range []struct {
		name         string
		sheet, thick float64
		ref          float64
	}{{"εeff", ee[0], ee[1], ref[0]}, {"Z0", z[0], z[1], ref[1]}} {
		es, et := math.Abs(c.sheet/c.ref-1), math.Abs(c.thick/c.ref-1)
		if et > es/2 {
			t.Errorf("%s: %s %.2f %% off the field solver, the sheet %.2f %%: want at most half", c.name, drawn, 100*et, 100*es)
		}
	}
}
