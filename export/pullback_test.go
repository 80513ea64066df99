package export_test

import (
	"bytes"
	"testing"
	"time"

	"stubcraft/export"
	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// TestPullBackOnParsedGerber measures, on the parsed copper Gerbers of
// whole builds, the distance of every copper object from the routed
// outline (the Profile file's rectangle): the ground plane, a coplanar
// pour, the stitching and stub vias' pads and the stubs keep the design's
// edge_clearance (default 0.3 mm; fabs pull copper back about
// 0.2–0.25 mm by default, common practice, no source); only the signal
// line and its port pads reach the board edge, at the two ports, within
// the port line's width about its centre line.
func TestPullBackOnParsedGerber(t *testing.T) {
	for _, c := range []struct{ name, path string }{
		{"demo", ""},
		{"coplanar, shorted", "../testdata/designs/gcpw-probe.toml"},
		{"edge launch", "../testdata/designs/edge-launch-fence.toml"},
	} {
		t.Run(c.name, func(t *testing.T) {
			res := buildResult(t, c.path)
			clr := geom.Nanometres(res.Design.Layout.EdgeClearance)
			if clr != 300000 {
				t.Fatalf("edge clearance %d nm, want the 0.3 mm default", clr)
			}
			read := func(ly export.Layer) *gerberread.File {
				var b bytes.Buffer
				if err := export.WriteGerber(&b, res.Layout, ly, export.Meta{ProjectName: "p", Created: time.Unix(0, 0)}); err != nil {
					t.Fatal(err)
				}
				f, err := gerberread.Read(&b)
				if err != nil {
					t.Fatal(err)
				}
				return f
			}
			prof := read(export.Profile)
			var lo, hi geom.Point
			for i, d := range prof.Draws {
				for _, p := range []geom.Point{d.From, d.To} {
					if i == 0 && p == d.From {
						lo, hi = p, p
					}
					lo = geom.Point{X: min(lo.X, p.X), Y: min(lo.Y, p.Y)}
					hi = geom.Point{X: max(hi.X, p.X), Y: max(hi.Y, p.Y)}
				}
			}
			// The port line's half width, from the report's first element.
			halfW := geom.Nanometres(res.Physical.Elements[0].Width) / 2
			yc := res.Layout.Marks.CentreY
			check := func(what string, p geom.Point, signal bool) {
				t.Helper()
				d := min(p.X-lo.X, hi.X-p.X, p.Y-lo.Y, hi.Y-p.Y)
				if d >= clr {
					return
				}
				atPort := (p.X == lo.X || p.X == hi.X) && p.Y >= yc-halfW-1 && p.Y <= yc+halfW+1
				if signal && (atPort || p.Y-lo.Y >= clr && hi.Y-p.Y >= clr) {
					return // the signal line and its pads run to the port edges
				}
				t.Errorf("%s: copper at %v is %d nm from the outline, want ≥ %d nm", what, p, d, clr)
			}
			top := read(export.CopperTop)
			for i, r := range top.Regions {
				for _, p := range r.Outline {
					check("top region "+r.Attrs[".N"], p, i == 0)
				}
			}
			for _, f := range top.Flashes {
				a := top.Apertures[f.D]
				h := a.H
				if a.Shape == "C" {
					h = a.W
				}
				signal := a.Attrs[".AperFunction"] == geom.SMDPad
				for _, p := range []geom.Point{{X: f.At.X - a.W/2, Y: f.At.Y - h/2}, {X: f.At.X + a.W/2, Y: f.At.Y + h/2}} {
					check("pad "+a.Attrs[".AperFunction"], p, signal)
				}
			}
			bot := read(export.CopperBottom)
			for _, r := range bot.Regions {
				for _, p := range r.Outline {
					check("ground plane", p, false)
				}
			}
			if n := len(bot.Regions); n != 1 {
				t.Errorf("%d plane regions", n)
			}
		})
	}
}
