package fdtd

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"strconv"
	"strings"
	"testing"

	"stubcraft/physical"
)

// viaBoard returns the board of a via case: a strip from port 1 that ends
// in the via (or via row) the build draws for a shorted stub, the strip
// running half a pad past the via centre, a round pad on the via when it
// overhangs the strip or ends a row (a row's outer pads flush with the
// strip's sides, physical.ViaRow), and port 2's strip 10 h beyond.
func viaBoard(c viaCase) Structure {
	freqs := linspace(c.fmax/5, c.fmax, 9)
	w, xv := nm(c.w), nm(viaLength)
	end := xv + nm(c.pad)/2
	p2 := end + nm(10*c.h)
	bmax := p2 + nm(2*math.Max(c.h, c.w))
	s := Structure{Er: c.er, H: c.h, BoardMinX: 0, BoardMaxX: bmax, Freqs: freqs,
		Copper: []Polygon{RectPolygon(0, -w/2, end, w-w/2), RectPolygon(p2, -w/2, bmax, w-w/2)},
		Ports:  [2]Port{{Side: Left, Width: w}, {Side: Right, Width: w}}}
	n, sp := physical.ViaRow(c.w, c.drill, c.pad, c.pitch)
	for i := 0; i < n; i++ {
		y := nm(-float64(n-1)*sp/2 + float64(i)*sp)
		ctr := Point{xv, y}
		s.Vias = append(s.Vias, Via{Center: ctr, Diameter: nm(c.drill)})
		if c.pad > c.w || n > 1 {
			s.Copper = append(s.Copper, roundPad(ctr, nm(c.pad)))
		}
	}
	return s
}

// lowFreqL returns X/ω (H) at the via centre averaged over the three
// lowest frequencies of r.
func lowFreqL(r *Result) float64 {
	L := 0.0
	for f := 0; f < 3; f++ {
		z0 := r.Z0[0][f]
		s := renormalise(r.S[f], [2]complex128{complex(r.Zref, 0), complex(r.Zref, 0)}, z0)
		beta := 2 * math.Pi * r.Freqs[f] * math.Sqrt(real(r.EpsEff[0][f])) / c0
		g := s[0][0] * cmplx.Exp(complex(0, 2*beta*viaLength))
		z := complex(real(z0), 0) * (1 + g) / (1 - g)
		L += imag(z) / (2 * math.Pi * r.Freqs[f]) / 3
	}
	return L
}

// viaColumnDivisions are the via drawings of the column study: 0 is the
// centre node alone (what verify drew before the thin-wire model), k > 0 puts grid lines at the
// centre and at i/k of the radius on each side, so that the column is
// every node within the radius on a locally uniform grid of r/k.
var viaColumnDivisions = []int{0, 1, 2, 4, 8}

// TestRecordViaColumn is the mesh study of the via column: each via case
// (viaCases) drawn with more and more nodes across the column
// (MeshParams.ViaDivisions), the rest of the mesh as the level has it.
// Each port line is calibrated on the board's own y grid lines
// (MeshParams.PortLinesOnBoardGrid). It records the raw S-parameters in
// via-column.tsv; package physical's TestViaColumnConverges reads them.
func TestRecordViaColumn(t *testing.T) {
	mesh := discRecording(t)
	divs := viaColumnDivisions
	if v := os.Getenv("DIVISIONS"); v != "" {
		divs = nil
		for _, f := range strings.Split(v, ",") {
			k, err := strconv.Atoi(strings.TrimSpace(f))
			if err != nil || k < 0 {
				t.Fatalf("DIVISIONS=%q: want a comma-separated list of counts ≥ 0", v)
			}
			divs = append(divs, k)
		}
	}
	var rows []string
	for ci, c := range viaCases {
		if !caseSelected(ci) {
			continue
		}
		s := viaBoard(c)
		for _, k := range divs {
			vm := mesh
			vm.ViaDivisions = k
			// The division lines run through the port strip's cross-section
			// too: calibrated on its own grid, a port line is not the board's
			// (seen as a drift of the open-ended port 2's S22 of up to 2° at
			// 1 GHz with a 0.8 mm drill in a 1 mm strip).
			vm.PortLinesOnBoardGrid = true
			// 0 divisions is the column drawn as its grid nodes alone, as
			// recorded before the thin-wire model (which verify now adds,
			// TestThinWireVia).
			vm.NodeVias = true
			r, err := Solve(context.Background(), s, Options{Mesh: vm})
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("via case %d, %d divisions: L %.1f pH at the via centre, %d cells, %d steps, %.0f s",
				ci, k, lowFreqL(r)*1e12, r.Cells, r.Steps, r.Seconds)
			pre := fmt.Sprintf("%d\t%d\t%g\t%g\t%g\t%g\t%g\t%g\t%g", ci, k, c.er, c.h*1e3, c.w*1e3, c.drill*1e3, c.pad*1e3, c.pitch*1e3, viaLength*1e3)
			rows = append(rows, portRows(pre, r)...)
			writeDiscRecord(t, "via-column.tsv", "case\tdivisions\ter\th_mm\tw_mm\tdrill_mm\tpad_mm\tpitch_mm\tvia_from_edge_mm\t"+sColumns, rows)
		}
	}
}

// columnRadius returns the effective radius, in lattice cells, of a via
// column drawn on a uniform square lattice as the solver draws it: every
// node within radius k cells is perfectly conducting (k = 0: the one node
// at the centre). In the static limit of a field uniform along the column
// (the TEM field between ground plane and copper) the Yee update of Ez,
// Hx, Hy in a plane is the five-point Laplacian on the Ez nodes, so the
// column's inductance is that of a round post of the radius a at which a
// continuum post between the same boundaries carries the same flux. The
// lattice is m cells each way from the centre, held at 1 on its border
// square; the flux Q out of the column gives a = R·e^(−2π/Q), with R =
// 1.0787·m the conformal radius of a square of side 2m at its centre (the
// 1.0787 of a round conductor in a square screen, from memory).
func columnRadius(k float64, m int) float64 {
	n := 2*m + 1
	at := func(i, j int) int { return i*n + j }
	pec := func(i, j int) bool { return math.Hypot(float64(i-m), float64(j-m)) <= k+1e-9 }
	border := func(i, j int) bool { return i == 0 || j == 0 || i == n-1 || j == n-1 }
	free := func(i, j int) bool { return !border(i, j) && !pec(i, j) }
	// Conjugate gradients on the free nodes for u with u = 1 on the border
	// and 0 on the column: A·w = b, u = w + (1 on the border).
	lap := func(v, out []float64) {
		for i := 1; i < n-1; i++ {
			for j := 1; j < n-1; j++ {
				if !free(i, j) {
					continue
				}
				out[at(i, j)] = 4*v[at(i, j)] - v[at(i+1, j)] - v[at(i-1, j)] - v[at(i, j+1)] - v[at(i, j-1)]
			}
		}
	}
	b := make([]float64, n*n)
	for i := 1; i < n-1; i++ {
		for j := 1; j < n-1; j++ {
			if !free(i, j) {
				continue
			}
			for _, q := range [][2]int{{i + 1, j}, {i - 1, j}, {i, j + 1}, {i, j - 1}} {
				if border(q[0], q[1]) {
					b[at(i, j)]++
				}
			}
		}
	}
	w := make([]float64, n*n)
	r := append([]float64(nil), b...)
	p := append([]float64(nil), r...)
	ap := make([]float64, n*n)
	dot := func(a, c []float64) float64 {
		s := 0.0
		for i := range a {
			s += a[i] * c[i]
		}
		return s
	}
	rr := dot(r, r)
	for it := 0; it < 10*n*n && rr > 1e-24; it++ {
		lap(p, ap)
		a := rr / dot(p, ap)
		for i := range w {
			w[i] += a * p[i]
			r[i] -= a * ap[i]
		}
		next := dot(r, r)
		for i := range p {
			p[i] = r[i] + next/rr*p[i]
		}
		rr = next
	}
	u := func(i, j int) float64 {
		if border(i, j) {
			return 1
		}
		return w[at(i, j)]
	}
	q := 0.0
	for i := 1; i < n-1; i++ {
		for j := 1; j < n-1; j++ {
			if pec(i, j) {
				q += u(i+1, j) + u(i-1, j) + u(i, j+1) + u(i, j-1)
			}
		}
	}
	return 1.0787 * float64(m) * math.Exp(-2*math.Pi/q)
}

// TestColumnRadius checks the lattice model of a drawn column against the
// exact result for one node, then states what the drawings give.
func TestColumnRadius(t *testing.T) {
	// One node: the lattice Green's function of the square lattice,
	// G(0) − G(r) → (ln r + γ + (3/2)·ln 2)/(2π) far out (the resistance
	// of the infinite square resistor network, from memory), is the
	// continuum's ln(r/a)/(2π) for a = e^(−γ)/(2√2) = 0.19851 cells.
	want := math.Exp(-0.5772156649015329) / (2 * math.Sqrt2)
	if a := columnRadius(0, 48); math.Abs(a/want-1) > 0.003 {
		t.Fatalf("one node: effective radius %.5f cells, want %.5f (exact)", a, want)
	}
	// A column of radius k cells drawn as every node within it: its
	// effective radius is within 12 % of k from one division on (0.88–0.96
	// k on lattices of 40–200 cells), so the column drawn with ViaDivisions
	// ≥ 1 is round enough in the plane; the one node of ViaDivisions 0 is
	// 0.2 of a cell, a column far too thin when the cell is near the drill.
	for _, k := range []float64{1, 2, 4, 8} {
		a := columnRadius(k, 48)
		t.Logf("%g divisions: effective radius %.3f of the drawn radius", k, a/k)
		if a/k < 0.86 || a/k > 1 {
			t.Errorf("%g divisions: effective radius %.3f of the drawn radius, want 0.86–1", k, a/k)
		}
	}
}

// TestViaDivisionsGrid checks the grid lines a via column gets: a via
// drawn with k divisions has lines at its centre and at i/k of its radius
// on each side in x and y; a stitching via has only its centre line.
func TestViaDivisionsGrid(t *testing.T) {
	s := viaBoard(viaCases[0])
	stitch := Via{Center: Point{X: s.Vias[0].Center.X, Y: nm(3e-3)}, Diameter: nm(0.4e-3), Stitch: true}
	s.Vias = append(s.Vias, stitch)
	m := Coarse.Params()
	m.ViaDivisions = 4
	g, err := NewGrid(s, m)
	if err != nil {
		t.Fatal(err)
	}
	has := func(lines []float64, x float64) bool {
		i := nearest(lines, x)
		return math.Abs(lines[i]-x) < 1e-9
	}
	v := s.Vias[0]
	cx, cy, r := float64(v.Center.X)*1e-9, float64(v.Center.Y)*1e-9, float64(v.Diameter)*1e-9/2
	for i := -4; i <= 4; i++ {
		d := r * float64(i) / 4
		if !has(g.X, cx+d) || !has(g.Y, cy+d) {
			t.Errorf("no grid line at %d/4 of the radius from the via centre", i)
		}
	}
	sy := float64(stitch.Center.Y) * 1e-9
	if !has(g.Y, sy) {
		t.Errorf("no grid line through the stitching via's centre")
	}
	for _, d := range []float64{r / 4, r / 2, r} {
		if has(g.Y, sy+d) || has(g.Y, sy-d) {
			t.Errorf("a grid line at %.3f mm from the stitching via's centre: it is drawn as one node", d*1e3)
		}
	}
}
