package export_test

import (
	"bytes"
	"math"
	"testing"

	"stubcraft/export"
	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// distToPolygon returns the distance from p to a polygon's area: 0 inside
// (even-odd ray casting), else to the nearest edge.
func distToPolygon(p geom.Point, poly geom.Polygon) float64 {
	in := false
	best := math.Inf(1)
	x, y := float64(p.X), float64(p.Y)
	for i := range poly {
		a, b := poly[i], poly[(i+1)%len(poly)]
		ax, ay, bx, by := float64(a.X), float64(a.Y), float64(b.X), float64(b.Y)
		if (ay > y) != (by > y) && x < ax+(y-ay)*(bx-ax)/(by-ay) {
			in = !in
		}
		dx, dy := bx-ax, by-ay
		t := 0.0
		if l := dx*dx + dy*dy; l > 0 {
			t = math.Max(0, math.Min(1, ((x-ax)*dx+(y-ay)*dy)/l))
		}
		best = math.Min(best, math.Hypot(x-ax-t*dx, y-ay-t*dy))
	}
	if in {
		return 0
	}
	return best
}

// TestLegendOffPadsAndOpenings reads back the legend Gerber (file function
// Legend,Top: Gerber Layer Format Specification 2023.08, 5.6.3, from
// memory) of whole builds and walks every stroke in 20 µm steps: the ink
// (the pen's half width around the stroke) stays LegendClearance clear of
// every mask opening (parsed from the mask Gerber: exposed copper) and
// every flashed pad (parsed from the top copper), and inside the board
// less the edge clearance. The legend carries the board name and f0, the
// port names and the arrow (at least the title's and ports' strokes).
func TestLegendOffPadsAndOpenings(t *testing.T) {
	for _, c := range []struct{ name, path string }{
		{"demo", ""},
		{"shorted, masked", "../testdata/designs/sensor-antenna-by-hand.toml"},
		{"coplanar", "../testdata/designs/gcpw-probe.toml"},
		{"edge launch, via fence", "../testdata/designs/edge-launch-fence.toml"},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, files := buildFiles(t, c.path)
			base := res.Layout.Name
			read := func(ly export.Layer) *gerberread.File {
				f, err := gerberread.Read(bytes.NewReader(files[ly.FileName(base)]))
				if err != nil {
					t.Fatalf("%s: %v", ly, err)
				}
				return f
			}
			leg := read(export.LegendTop)
			if leg.FileAttrs[".FileFunction"] != "Legend,Top" {
				t.Errorf("file function %q", leg.FileAttrs[".FileFunction"])
			}
			if len(leg.Draws) < 20 {
				t.Fatalf("%d legend draws: no text", len(leg.Draws))
			}
			var keep []geom.Polygon
			for _, r := range read(export.SoldermaskTop).Regions {
				keep = append(keep, r.Outline)
			}
			top := read(export.CopperTop)
			for _, fl := range top.Flashes {
				a := top.Apertures[fl.D]
				h := a.H
				if a.Shape == "C" {
					h = a.W
				}
				keep = append(keep, geom.Rect{Min: geom.Point{X: fl.At.X - a.W/2, Y: fl.At.Y - h/2}, Max: geom.Point{X: fl.At.X + a.W/2, Y: fl.At.Y + h/2}}.Polygon())
			}
			blo, bhi := res.Layout.Board.Bounds()
			edge := float64(geom.Nanometres(res.Design.Layout.EdgeClearance))
			for _, d := range leg.Draws {
				r := float64(leg.Apertures[d.D].W) / 2
				n := int(math.Hypot(float64(d.To.X-d.From.X), float64(d.To.Y-d.From.Y))/20000) + 1
				for k := 0; k <= n; k++ {
					p := geom.Point{X: d.From.X + (d.To.X-d.From.X)*int64(k)/int64(n), Y: d.From.Y + (d.To.Y-d.From.Y)*int64(k)/int64(n)}
					for _, poly := range keep {
						if dist := distToPolygon(p, poly); dist < r+geom.LegendClearance-1 {
							t.Fatalf("legend ink at %v is %.0f nm from a pad or opening, want ≥ %d nm", p, dist-r, geom.LegendClearance)
						}
					}
					if m := math.Min(math.Min(float64(p.X-blo.X), float64(bhi.X-p.X)), math.Min(float64(p.Y-blo.Y), float64(bhi.Y-p.Y))); m < edge+r {
						t.Fatalf("legend ink at %v within the edge clearance", p)
					}
				}
			}
		})
	}
}
