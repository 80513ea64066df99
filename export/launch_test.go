package export

import (
	"bytes"
	"math"
	"testing"

	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// launchOpenSpec is openSpec (no hole joins RF and ground) with an
// edge-launch landing and a 0.3 mm pull-back: signal pads 1.5 × 2 mm,
// ground pads 2 × 1.5 mm at 0.5 mm, three 0.3 mm vias each.
func launchOpenSpec() geom.Spec {
	s := openSpec()
	s.Name = "launch"
	s.EdgeClearance = 0.3e-3
	s.Launch = &geom.LaunchSpec{PadWidth: 2e-3, PadLength: 1.5e-3, Gap: 0.5e-3, GroundWidth: 1.5e-3, GroundLength: 2e-3,
		ViaDrill: 0.3e-3, ViaPad: 0.6e-3, ViaPitch: 1.2e-3}
	return s
}

// TestLaunchOnParsedFiles reads back the copper, drill and mask files of a
// board with edge-launch landings and checks them against each other and
// against the landing's sizes: the connector pins (.P, Gerber X2 5.6.14,
// from memory) J1 and J2 pins 1–3 once each on SMD pads (.AperFunction
// SMDPad,CuDef, 5.6.10, from memory), pin 1 on net RF and pins 2 and 3 on
// net GND (.N, 5.6.13, from memory) with the plane; every hole on a top
// pad of the plane's net, three holes inside each ground pad and no other
// hole; each ground pad the gap (0.5 mm) from its signal pad and the
// pull-back (0.3 mm) from the outline; every landing pad open in the mask.
func TestLaunchOnParsedFiles(t *testing.T) {
	l := build(t, launchOpenSpec())
	top := parse(t, gerberBytes(t, l, CopperTop))
	bot := parse(t, gerberBytes(t, l, CopperBottom))
	mask := parse(t, gerberBytes(t, l, SoldermaskTop))
	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	drill, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	if len(bot.Regions) != 1 || bot.Regions[0].Attrs[".N"] != geom.NetGround {
		t.Fatalf("plane regions %+v, want one on GND", bot.Regions)
	}
	_, bmax := l.Board.Bounds()
	type rect struct{ lo, hi geom.Point }
	pins := map[string]rect{}
	for _, fl := range top.Flashes {
		a := top.Apertures[fl.D]
		p := fl.Attrs[".P"]
		if p == "" {
			continue
		}
		if a.Attrs[".AperFunction"] != geom.SMDPad || a.Shape != "R" {
			t.Errorf("pin %s on a %s aperture %q", p, a.Shape, a.Attrs[".AperFunction"])
		}
		if _, dup := pins[p]; dup {
			t.Errorf("pin %s twice", p)
		}
		pins[p] = rect{geom.Point{X: fl.At.X - a.W/2, Y: fl.At.Y - a.H/2}, geom.Point{X: fl.At.X + a.W/2, Y: fl.At.Y + a.H/2}}
		want := geom.NetGround
		if p[3] == '1' {
			want = geom.NetRF
		}
		if fl.Attrs[".N"] != want {
			t.Errorf("pin %s on net %q, want %q", p, fl.Attrs[".N"], want)
		}
	}
	for _, ref := range []string{"J1", "J2"} {
		sig, ok := pins[ref+",1"]
		if !ok {
			t.Errorf("no pin %s,1", ref)
			continue
		}
		// The signal pad runs to its board edge.
		if (ref == "J2" && sig.lo.X != 0) || (ref == "J1" && sig.hi.X != bmax.X) {
			t.Errorf("%s signal pad x %d..%d does not reach its edge", ref, sig.lo.X, sig.hi.X)
		}
		for _, pin := range []string{",2", ",3"} {
			g, ok := pins[ref+pin]
			if !ok {
				t.Errorf("no pin %s%s", ref, pin)
				continue
			}
			gap := max(g.lo.Y-sig.hi.Y, sig.lo.Y-g.hi.Y)
			if gap != 0.5e6 {
				t.Errorf("%s%s: %d nm from the signal pad, want 0.5 mm", ref, pin, gap)
			}
			if d := min(g.lo.X, bmax.X-g.hi.X, g.lo.Y, bmax.Y-g.hi.Y); d < 0.3e6 {
				t.Errorf("%s%s: %d nm from the outline, want ≥ 0.3 mm", ref, pin, d)
			}
			holes := 0
			for _, h := range drill.Hits {
				if h.At.X > g.lo.X && h.At.X < g.hi.X && h.At.Y > g.lo.Y && h.At.Y < g.hi.Y {
					holes++
				}
			}
			if holes != 3 {
				t.Errorf("%s%s: %d holes, want 3", ref, pin, holes)
			}
			in := false
			for _, m := range mask.Regions {
				if contains(m.Outline, geom.Point{X: (g.lo.X + g.hi.X) / 2, Y: (g.lo.Y + g.hi.Y) / 2}) {
					in = true
				}
			}
			if !in {
				t.Errorf("%s%s under mask", ref, pin)
			}
		}
	}
	if len(pins) != 6 {
		t.Errorf("%d pins, want 6", len(pins))
	}
	if len(drill.Hits) != 12 {
		t.Errorf("%d holes, want 12 (three in each of four ground pads)", len(drill.Hits))
	}
	for _, h := range drill.Hits {
		ok := false
		for _, fl := range top.Flashes {
			if fl.At == h.At && fl.Attrs[".N"] == bot.Regions[0].Attrs[".N"] {
				ok = true
			}
		}
		if !ok {
			t.Errorf("hole at %v has no top pad on the plane's net", h.At)
		}
	}
}

// contains is the even-odd rule on a rectilinear polygon.
func contains(p geom.Polygon, q geom.Point) bool {
	in := false
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		if (a.Y > q.Y) != (b.Y > q.Y) && float64(q.X) < float64(a.X)+float64(q.Y-a.Y)*float64(b.X-a.X)/float64(b.Y-a.Y) {
			in = !in
		}
	}
	return in
}

// TestFenceOnParsedFiles reads back the copper and drill files of a board
// with landings and a via fence (1 mm from the copper, 2 mm pitch): every
// hole lands on a top pad of net GND (.N, Gerber X2 5.6.13, from memory)
// over the GND plane, none on RF; every hole outside the landings' ground
// pads (a fence hole) lies at least the 1 mm offset from the parsed RF
// copper (regions and pads of net RF), and some exactly at it (the rows).
func TestFenceOnParsedFiles(t *testing.T) {
	s := launchOpenSpec()
	s.Fence = &geom.FenceSpec{Pitch: 2e-3, Offset: 1e-3, Drill: 0.3e-3, Pad: 0.6e-3}
	l := build(t, s)
	top := parse(t, gerberBytes(t, l, CopperTop))
	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	drill, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	var rf []geom.Polygon
	var ground []geom.Polygon
	for _, r := range top.Regions {
		if r.Attrs[".N"] == geom.NetRF {
			rf = append(rf, r.Outline)
		}
	}
	for _, fl := range top.Flashes {
		a := top.Apertures[fl.D]
		if a.Shape != "R" {
			continue
		}
		p := geom.Rect{Min: geom.Point{X: fl.At.X - a.W/2, Y: fl.At.Y - a.H/2}, Max: geom.Point{X: fl.At.X + a.W/2, Y: fl.At.Y + a.H/2}}.Polygon()
		if fl.Attrs[".N"] == geom.NetRF {
			rf = append(rf, p)
		} else {
			ground = append(ground, p)
		}
	}
	fenceHoles, onRow := 0, 0
	for _, h := range drill.Hits {
		net := ""
		for _, fl := range top.Flashes {
			if fl.At == h.At && top.Apertures[fl.D].Shape == "C" {
				net = fl.Attrs[".N"]
			}
		}
		if net != geom.NetGround {
			t.Errorf("hole at %v on a top pad of net %q, want GND", h.At, net)
		}
		inLanding := false
		for _, g := range ground {
			inLanding = inLanding || contains(g, h.At)
		}
		if inLanding {
			continue
		}
		fenceHoles++
		d := 1e18
		for _, p := range rf {
			if contains(p, h.At) {
				d = 0
			}
			for i := range p {
				d = min(d, segDist(h.At, p[i], p[(i+1)%len(p)]))
			}
		}
		if d < 1e6-1 {
			t.Errorf("fence hole at %v is %.0f nm from the RF copper, want ≥ 1 mm", h.At, d)
		}
		if d < 1e6+1 {
			onRow++
		}
	}
	if fenceHoles < 10 || onRow < 4 {
		t.Errorf("%d fence holes, %d of them exactly 1 mm from the copper", fenceHoles, onRow)
	}
}

// segDist is the Euclidean distance from p to the axis-aligned segment ab.
func segDist(p, a, b geom.Point) float64 {
	cx := min(max(p.X, min(a.X, b.X)), max(a.X, b.X))
	cy := min(max(p.Y, min(a.Y, b.Y)), max(a.Y, b.Y))
	return math.Hypot(float64(p.X-cx), float64(p.Y-cy))
}
