package export

import (
	"bytes"
	"math"
	"testing"

	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// coplanarSpec is geom's hand-worked grounded-coplanar network: a 1 mm
// line of two 6 mm segments on a 12 × 8.3 mm board, centre line at
// y = 2.8 mm; a 0.5 mm stub 3 mm long up at x = 6 mm, shorted by a via
// with a 1.2 mm pad centred at y = 5.7 mm; 1 × 1.6 mm port pads; a 0.4 mm
// gap. Its pour is 71.02 mm² by inclusion–exclusion (see geom's
// TestCoplanarPourArea).
func coplanarSpec() geom.Spec {
	return geom.Spec{
		Name:     "cpw",
		Segments: []geom.Segment{{ID: "a", Width: 1e-3, Length: 6e-3}, {ID: "b", Width: 1e-3, Length: 6e-3}},
		Stubs: []geom.Stub{
			{ID: "s", At: 0, Width: 0.5e-3, Length: 3e-3, Side: 1, Via: &geom.ViaSpec{Drill: 0.3e-3, Pad: 1.2e-3}},
		},
		PortPad:       geom.PadSpec{Width: 1.6e-3, Length: 1e-3},
		Margin:        2e-3,
		Height:        0.5e-3,
		MaskExpansion: 0.05e-3,
		CoplanarGap:   0.4e-3,
		StitchDrill:   0.3e-3,
		StitchPad:     0.6e-3,
		StitchPitch:   1e-3,
	}
}

// netRegions splits the parsed regions into the RF copper and the ground
// pour by their .N attribute. When a shorted via joins the two, every
// region carries the one DC net RF_GND, and the RF copper is the first
// region (the writer's order, Layout.Copper).
func netRegions(t *testing.T, f *gerberread.File) (rf geom.Polygon, gnd []geom.Polygon) {
	t.Helper()
	for i, r := range f.Regions {
		if r.Attrs[".AperFunction"] != "Conductor" {
			t.Errorf("region without the Conductor function: %+v", r.Attrs)
		}
		switch n := r.Attrs[".N"]; {
		case n == geom.NetRF, n == geom.NetRFGround && i == 0:
			if rf != nil {
				t.Fatal("two RF regions")
			}
			rf = r.Outline
		case n == geom.NetGround, n == geom.NetRFGround:
			gnd = append(gnd, r.Outline)
		default:
			t.Errorf("region of net %q", r.Attrs[".N"])
		}
	}
	if rf == nil || len(gnd) == 0 {
		t.Fatalf("want an RF region and GND regions, got %d regions", len(f.Regions))
	}
	return rf, gnd
}

// rfVia returns the centre of the layout's first via on the RF copper.
func rfVia(t *testing.T, l geom.Layout) geom.Point {
	t.Helper()
	for _, v := range l.Vias {
		if v.Net == geom.NetRF {
			return v.Center
		}
	}
	t.Fatal("no RF via")
	return geom.Point{}
}

// intervals returns the inside intervals of all polygons along a line.
func intervals(ps []geom.Polygon, c int64, vertical bool) [][2]int64 {
	var iv [][2]int64
	for _, p := range ps {
		iv = append(iv, crossings(p, c, vertical)...)
	}
	return iv
}

// clearance returns the distances from the span [lo, hi] of RF copper on a
// line to the nearest pour below lo and above hi on the same line (−1 when
// there is none).
func clearance(pour [][2]int64, lo, hi int64) (before, after int64) {
	before, after = -1, -1
	for _, p := range pour {
		if p[1] <= lo && (before < 0 || lo-p[1] < before) {
			before = lo - p[1]
		}
		if p[0] >= hi && (after < 0 || p[0]-hi < after) {
			after = p[0] - hi
		}
	}
	return before, after
}

// TestGerberCoplanarClearance measures the gap between the RF copper and
// the ground pour on the parsed top-copper Gerber, at several places, and
// wants the Spec's gap within 1 nm (the file's coordinates are whole
// nanometres).
func TestGerberCoplanarClearance(t *testing.T) {
	s := coplanarSpec()
	l := build(t, s)
	top := parse(t, gerberBytes(t, l, CopperTop))
	rf, gnd := netRegions(t, top)
	if len(gnd) != 2 {
		t.Errorf("%d GND regions, want 2 (below and above the line)", len(gnd))
	}
	gap := geom.Nanometres(s.CoplanarGap)
	var viaPad, portPad *gerberread.Flash
	for i, fl := range top.Flashes {
		a := top.Apertures[fl.D]
		switch {
		case fl.At == rfVia(t, l) && a.Attrs[".AperFunction"] == "ViaPad":
			viaPad = &top.Flashes[i]
		case a.Attrs[".AperFunction"] == geom.SMDPad && portPad == nil:
			portPad = &top.Flashes[i]
		}
	}
	if viaPad == nil || portPad == nil {
		t.Fatal("no RF via pad or port pad flash")
	}
	vp, pp := top.Apertures[viaPad.D], top.Apertures[portPad.D]
	tests := []struct {
		name     string
		at       int64 // nm: x of a vertical line, or y of a horizontal one
		vertical bool
		// the RF span on the line; zero: the RF region's own interval
		lo, hi int64
	}{
		// Beside the through line, x = 3 mm: copper 2.3..3.3 mm.
		{"beside the line", 3e6, true, 0, 0},
		// Beside the stub's sides, y = 4.3 mm (below the via pad's square).
		{"beside the stub", 4.3e6, false, 0, 0},
		// Along the stub's centre line: copper 2.3..6.3 mm, the pour
		// beyond the stub's end (the via pad's far edge is the stub end).
		{"beyond the stub's end", 6e6, true, 0, 0},
		{"beyond the stub's end, off centre", 5.9e6, true, 0, 0},
		// Across the via pad's centre: its flash spans centre ± pad/2.
		{"beside the via pad", viaPad.At.Y, false, viaPad.At.X - vp.W/2, viaPad.At.X + vp.W/2},
		// Across the load port pad: its flash spans centre ± height/2.
		{"beside the port pad", portPad.At.X, true, portPad.At.Y - pp.H/2, portPad.At.Y + pp.H/2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			lo, hi := tt.lo, tt.hi
			if lo == 0 && hi == 0 {
				iv := crossings(rf, tt.at, tt.vertical)
				if len(iv) != 1 {
					t.Fatalf("%d RF intervals %v on the line, want 1", len(iv), iv)
				}
				lo, hi = iv[0][0], iv[0][1]
			}
			before, after := clearance(intervals(gnd, tt.at, tt.vertical), lo, hi)
			t.Logf("RF %d..%d nm, clearances %d and %d nm", lo, hi, before, after)
			for _, d := range []int64{before, after} {
				if d < 0 || math.Abs(float64(d-gap)) > 1 {
					t.Errorf("clearance %d nm, want the gap %d nm ± 1", d, gap)
				}
			}
		})
	}
	// Edge launch: the pour reaches both board ends beside the port pads.
	for _, x := range []int64{0, 12e6} {
		var n int
		for _, p := range gnd {
			if lo, hi := p.Bounds(); lo.X == x || hi.X == x {
				n++
			}
		}
		if n != 2 {
			t.Errorf("%d GND regions reach x = %d nm, want 2", n, x)
		}
	}
}

// TestGerberCoplanarStitching counts the stitching vias in the files of
// geom's hand-counted open-stub network (23 vias, see geom's
// TestCoplanarStitchCount): as GND ViaPad flashes on the top copper, as
// hits in the Excellon file and in the Gerber drill layer, and wants each
// on the pour and off the RF copper.
func TestGerberCoplanarStitching(t *testing.T) {
	s := geom.Spec{
		Name:     "stub",
		Segments: []geom.Segment{{ID: "a", Width: 1e-3, Length: 10e-3}, {ID: "b", Width: 1e-3, Length: 10e-3}},
		Stubs:    []geom.Stub{{ID: "s", At: 0, Width: 1e-3, Length: 4e-3, Side: 1}},
		Margin:   3e-3, CoplanarGap: 0.5e-3,
		StitchPitch: 2e-3, StitchDrill: 0.3e-3, StitchPad: 0.6e-3,
	}
	const want = 23 // by hand in geom's TestCoplanarStitchCount
	l := build(t, s)
	top := parse(t, gerberBytes(t, l, CopperTop))
	rf, gnd := netRegions(t, top)
	var flashes []geom.Point
	for _, fl := range top.Flashes {
		a := top.Apertures[fl.D]
		if fl.Attrs[".N"] != geom.NetGround {
			continue
		}
		if a.Attrs[".AperFunction"] != "ViaPad" || a.Shape != "C" || a.W != 600000 {
			t.Errorf("GND flash %+v with aperture %+v, want a 0.6 mm round ViaPad", fl, a)
		}
		flashes = append(flashes, fl.At)
		inside := func(ps []geom.Polygon) bool {
			for _, iv := range intervals(ps, fl.At.X, true) {
				if iv[0] < fl.At.Y && fl.At.Y < iv[1] {
					return true
				}
			}
			return false
		}
		if !inside(gnd) || inside([]geom.Polygon{rf}) {
			t.Errorf("stitching via at %v: on the pour %v, on RF copper %v", fl.At, inside(gnd), inside([]geom.Polygon{rf}))
		}
	}
	if len(flashes) != want {
		t.Errorf("%d GND via pads, want %d", len(flashes), want)
	}

	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	d, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	drill := parse(t, gerberBytes(t, l, DrillPTH))
	if len(d.Hits) != want || len(drill.Flashes) != want {
		t.Fatalf("%d Excellon hits, %d drill-layer flashes, want %d", len(d.Hits), len(drill.Flashes), want)
	}
	at := map[geom.Point]bool{}
	for _, p := range flashes {
		at[p] = true
	}
	for i, h := range d.Hits {
		if !at[h.At] || h.Drill != 300000 || !at[drill.Flashes[i].At] {
			t.Errorf("hit %d %+v (drill layer %v) is not on a 0.3 mm GND via pad", i, h, drill.Flashes[i].At)
		}
	}
}

// TestGerbvCoplanar renders the top copper of the coplanar network with
// gerbv: exit 0, only the known unknown-attribute notices, and the lit
// area within 2 % of the RF copper plus the pour, both by hand.
func TestGerbvCoplanar(t *testing.T) {
	l := build(t, coplanarSpec())
	files := gerberFiles(t, l)
	n, _, _ := lit(render(t, files, CopperTop.FileName(l.Name)), 0)
	got := float64(n) * pixelMM * pixelMM
	// RF, mm²: line 12 × 1 + stub 0.5 × 3 + port pads 2 × 1 × 0.6 beside
	// the line, + the 1.2 mm via pad outside the stub's 0.5 mm strip (exact
	// geometry); pour 71.02 (geom's inclusion–exclusion); the stitching
	// pads lie on the pour and add nothing.
	want := 12 + 1.5 + 1.2 + circleOutsideStrip(0.6, 0.25) + 71.02
	t.Logf("rendered copper %.4f mm², geometry %.4f mm²", got, want)
	if math.Abs(got-want) > 0.02*want {
		t.Errorf("rendered copper %.3f mm², want %.3f mm² ± 2 %%", got, want)
	}
	// The pour alone would fail the check: without the gap the board is
	// 99.6 mm², 15 % more.
	if math.Abs(99.6-want) <= 0.02*want {
		t.Fatal("the check cannot tell a missing gap")
	}
}
