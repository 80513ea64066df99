package fdtd

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"testing"
)

// The published case of validation (e): the line-fed rectangular patch of
// D. M. Sheen, S. M. Ali, M. D. Abouzahra and J. A. Kong, "Application of
// the three-dimensional finite-difference time-domain method to the
// analysis of planar microstrip circuits", IEEE Trans. Microwave Theory
// Tech. 38(7), 1990. Everything below is from memory of the paper, not
// looked up: substrate εr 2.2, h 0.794 mm; patch 12.45 mm across the feed
// by 16.0 mm along it; a 2.46 mm feed line whose edge lies 2.09 mm in from
// the patch's side; the return loss has its deep minimum near 7.5 GHz, in
// the paper's FDTD and in its measurement alike.
const (
	patchEr, patchH         = 2.2, 0.794e-3
	patchAcross, patchAlong = 12.45e-3, 16.0e-3
	patchFeedW, patchFeedIn = 2.46e-3, 2.09e-3
	patchFeedLen            = 4e-3  // board edge (port 1's reference plane) to patch
	patchGap                = 10e-3 // patch to port 2's strip, which only closes the two-port
	patchRecalledHz         = 7.5e9 // from memory of the paper's plot
	// patchTolerance is wide because the figure is recalled, not looked
	// up: about ±0.2 GHz of a plot read from memory.
	patchTolerance = 0.03
)

// sheenPatch returns the patch board swept at freqs: port 1 feeds the patch
// from the left; port 2 is a strip of the feed's width on the right edge,
// patchGap beyond the patch, so that the solver's two-port has its second
// port (its coupling to the patch is small and moves S11 little).
func sheenPatch(freqs []float64) Structure {
	n := func(v float64) int64 { return int64(math.Round(v * 1e9)) }
	w := n(patchFeedW)
	x0 := n(patchFeedLen)
	x1 := x0 + n(patchAlong)
	y0 := -n(patchAcross) / 2
	yFeed := y0 + n(patchFeedIn) + w/2 // the feed's centre line
	end := x1 + n(patchGap)
	return Structure{Er: patchEr, H: patchH, BoardMinX: 0, BoardMaxX: end, Freqs: freqs,
		Copper: []Polygon{
			RectPolygon(0, yFeed-w/2, x0, yFeed-w/2+w),
			RectPolygon(x0, y0, x1, y0+n(patchAcross)),
		},
		Ports: [2]Port{{Side: Left, Y: yFeed, Width: w}, {Side: Right, Y: 0, Width: w}}}
}

// patchMinimum solves the patch on mesh and returns the frequency and
// depth (dB) of the deepest |S11| in the sweep, refined by a parabola
// through the three samples round it.
func patchMinimum(t *testing.T, mesh MeshParams) (hz, db float64, r *Result) {
	t.Helper()
	freqs := linspace(5e9, 10e9, 101)
	r, err := Solve(context.Background(), sheenPatch(freqs), Options{Mesh: mesh})
	if err != nil {
		t.Fatal(err)
	}
	best := 0
	mag := make([]float64, len(freqs))
	for f := range freqs {
		mag[f] = 20 * math.Log10(cmplx.Abs(r.S[f][0][0]))
		if mag[f] < mag[best] {
			best = f
		}
	}
	hz, db = freqs[best], mag[best]
	if best > 0 && best < len(freqs)-1 {
		a, b, c := mag[best-1], mag[best], mag[best+1]
		if den := a - 2*b + c; den > 0 {
			off := 0.5 * (a - c) / den
			hz += off * (freqs[1] - freqs[0])
			db = b - 0.25*(a-c)*off
		}
	}
	t.Logf("%d cells, %d steps, %.1f s: deepest |S11| %.1f dB at %.4f GHz", r.Cells, r.Steps, r.Seconds, db, hz/1e9)
	return hz, db, r
}

// TestRecordPatch runs the patch on the coarse mesh and records the deepest
// return loss.
func TestRecordPatch(t *testing.T) {
	if os.Getenv("STUBCRAFT_FDTD_RECORD") == "" {
		t.Skip("long: run testdata/fdtd/validate.sh")
	}
	var rows []string
	for _, m := range []float64{1} { // refinement of the coarse mesh
		hz, db, r := patchMinimum(t, Coarse.Params().Refined(m))
		rows = append(rows, fmt.Sprintf("%g\t%d\t%.6g\t%.2f", m, r.Cells, hz, db))
	}
	writeRecord(t, "patch.tsv", "mesh_refinement\tcells\tmin_s11_hz\tmin_s11_db", rows)
}

// patchTestMesh is coarser than Coarse, so that the published case runs in
// go test: two cells across the substrate's edge cell, λ/10.
var patchTestMesh = MeshParams{SubstrateCells: 2, PerWavelength: 10, EdgeDivisions: 2, Grading: 1.3, PMLCells: 8}

// TestPatch checks (e) in go test: the deepest return loss of the patch
// lies within patchTolerance of the recalled 7.5 GHz, and is a real dip
// (below −10 dB).
func TestPatch(t *testing.T) {
	if testing.Short() {
		t.Skip("a full-wave run of about 10 CPU seconds")
	}
	hz, db, _ := patchMinimum(t, patchTestMesh)
	checkPatch(t, hz, db)
}

// TestRecordedPatch holds the coarse-mesh record of testdata/fdtd/validate.sh
// to the same figure.
func TestRecordedPatch(t *testing.T) {
	rows := readRecord(t, "patch.tsv")
	if len(rows) == 0 {
		t.Fatal("patch.tsv has no rows")
	}
	for _, r := range rows {
		checkPatch(t, r[2], r[3])
	}
}

func checkPatch(t *testing.T, hz, db float64) {
	t.Helper()
	if e := math.Abs(hz/patchRecalledHz - 1); !(e <= patchTolerance) {
		t.Errorf("deepest |S11| at %.3f GHz, the paper's about %.1f GHz (from memory): %.1f %% off, want ≤ %.0f %%", hz/1e9, patchRecalledHz/1e9, 100*e, 100*patchTolerance)
	}
	if !(db < -10) {
		t.Errorf("deepest |S11| only %.1f dB: no resonance where the paper has one", db)
	}
}
