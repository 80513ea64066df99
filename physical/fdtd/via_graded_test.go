package fdtd

import (
	"math"
	"testing"
)

// TestViaColumnIsADiscOnGradedGrid: a via at the shorted end of a thin
// stub, laid out as sensor-antenna-by-hand's (0.2 mm board, 0.246 mm stub
// ending in a 0.6 mm pad, 0.3 mm drill). The grid round it is graded
// differently on its two sides: fine toward the pad's far edge, coarse back
// along the stub (344 µm to the first line on the coarse mesh). A drill is
// a round hole (its drawing, Excellon), so the column that stands for it
// is a disc of nodes round its centre: no node outside the column may lie
// nearer the centre than the column's farthest node, and every column
// node lies on the copper the via lands on. Growing the column by whole
// rings mirrored by grid index drew it 0.79 mm back along the stub on the
// coarse mesh (and on bare substrate beside the stub on the normal one),
// shorting the stub early: sensor-antenna-by-hand's best match was
// +2.05 % from f0 with it (coarse verify), +0.62 % with the column a disc.
func TestViaColumnIsADiscOnGradedGrid(t *testing.T) {
	cx, cy := int64(13030029), int64(33124517)
	var pad Polygon
	for k := 0; k < 16; k++ {
		a := 2 * math.Pi * float64(k) / 16
		pad = append(pad, Point{X: cx + int64(math.Round(300000*math.Cos(a))), Y: cy + int64(math.Round(300000*math.Sin(a)))})
	}
	s := Structure{
		Er: 4.06, TanD: 0.018, F0: 2.45e9, H: 0.2e-3,
		Mask:            Mask{Thickness: 20e-6, Er: 3.5},
		CopperThickness: 35e-6,
		Copper: []Polygon{
			{{0, 5000000}, {18030029, 5000000}, {18030029, 5355930}, {13153249, 5355930}, {13153249, 33424517}, {12906809, 33424517}, {12906809, 5355930}, {0, 5355930}},
			pad,
		},
		Vias:      []Via{{Center: Point{X: cx, Y: cy}, Diameter: 300000}},
		Ports:     [2]Port{{Side: Right, Y: 5177965, Width: 355930}, {Side: Left, Y: 5177965, Width: 355930}},
		BoardMaxX: 18030029,
		Freqs:     []float64{2.45e9},
		Zref:      50,
	}
	for _, lv := range []MeshLevel{Coarse, Normal} {
		g, err := NewGrid(s, lv.Params())
		if err != nil {
			t.Fatal(err)
		}
		if g.viaCols == nil {
			t.Fatalf("mesh %d: the via is not drawn with the thin-wire model", lv)
		}
		col := g.viaCols[0]
		x0, y0 := float64(cx)*1e-9, float64(cy)*1e-9
		in := map[[2]int]bool{}
		far := 0.0
		for _, c := range col {
			in[c] = true
			far = math.Max(far, math.Hypot(g.X[c[0]]-x0, g.Y[c[1]]-y0))
			if !s.inCopper(g.X[c[0]], g.Y[c[1]]) {
				t.Errorf("mesh %d: column node at (%+.0f, %+.0f) µm from the via's centre is off the copper", lv, (g.X[c[0]]-x0)*1e6, (g.Y[c[1]]-y0)*1e6)
			}
		}
		i0, j0 := nearest(g.X, x0), nearest(g.Y, y0)
		nearer, worst := 0, far
		for i := i0 - wireWindow; i <= i0+wireWindow; i++ {
			for j := j0 - wireWindow; j <= j0+wireWindow; j++ {
				if d := math.Hypot(g.X[i]-x0, g.Y[j]-y0); !in[[2]int{i, j}] && d < far*(1-1e-3) {
					nearer++
					worst = math.Min(worst, d)
				}
			}
		}
		if nearer > 0 {
			t.Errorf("mesh %d: the column reaches %.0f µm from the centre but leaves out %d nodes nearer it, the nearest %.0f µm", lv, far*1e6, nearer, worst*1e6)
		}
	}
}
