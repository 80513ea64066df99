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
// centre node alone (what verify draws), k > 0 puts grid lines at the
// centre and at i/k of the radius on each side, so that the column is
// every node within the radius on a locally uniform grid of r/k.
var viaColumnDivisions = []int{0, 1, 2, 4, 8}

// TestRecordViaColumn is the mesh study of the via column: each via case
// of TestRecordVia drawn with more and more nodes across the column
// (MeshParams.ViaDivisions), the rest of the mesh as the level has it.
// It records the raw S-parameters in via-column.tsv; package physical's
// TestViaColumnConverges reads them.
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
