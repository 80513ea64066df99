package export

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"stubcraft/synth/geom"
)

// The checks in this file measure bent stubs (a stub laid out as an L with
// Douville and James's optimal miter because it did not fit the board
// limit straight) from the parsed Gerber and Excellon files, from gerbv's
// rendering and from the drawing's text.

// bentShort is refSpec on a 12.6 mm board limit: s1 (1.2 mm wide, up,
// shorted by a 0.8 mm via pad) bends toward the source port. By hand (see
// geom's bentSpec): first leg 4.2 mm from line1's edge to the bend centre,
// second leg 1.8 mm to the pad's far edge, via centre 0.4 mm before it.
func bentShort() geom.Spec {
	s := refSpec()
	s.Name = "bent-short"
	s.MaxBoard = [2]float64{0, 12.6e-3}
	return s
}

// bentOpen is an open 1 mm stub, 8 mm long, down, on a 7 mm board limit,
// that bends toward the load port: 7 − 2 × 1 mm margin leaves 5 mm, 0.5 mm
// above the line, so 4.5 mm below: second leg's centre line 4.0 mm down,
// first leg 4.0 − 0.5 = 3.5 mm, second leg 8 − 3.5 = 4.5 mm; toward the
// source it would end at 15.5 mm, past the 13 mm board.
func bentOpen() geom.Spec {
	return geom.Spec{
		Name:     "bent-open",
		Segments: []geom.Segment{{ID: "f1", Width: 1e-3, Length: 5e-3}, {ID: "l", Width: 1e-3, Length: 6e-3}, {ID: "f2", Width: 1e-3, Length: 2e-3}},
		Stubs:    []geom.Stub{{ID: "s", At: 1, Width: 1e-3, Length: 8e-3, Side: -1}},
		Margin:   1e-3, Height: 0.5e-3, MaxBoard: [2]float64{0, 7e-3},
	}
}

// cross returns the intervals where the line x = c (vertical) or y = c
// crosses the polygon, from every edge, diagonal ones included, as the
// other coordinate in nm (float: a diagonal edge crosses between grid
// points).
func cross(p geom.Polygon, c int64, vertical bool) [][2]float64 {
	var at []float64
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		ua, ub, va, vb := a.X, b.X, a.Y, b.Y
		if !vertical {
			ua, ub, va, vb = a.Y, b.Y, a.X, b.X
		}
		if (ua <= c) == (ub <= c) {
			continue // no crossing, or an edge along the line
		}
		t := float64(c-ua) / float64(ub-ua)
		at = append(at, float64(va)+t*float64(vb-va))
	}
	sort.Float64s(at)
	var iv [][2]float64
	for i := 0; i+1 < len(at); i += 2 {
		iv = append(iv, [2]float64{at[i], at[i+1]})
	}
	return iv
}

// containing is the interval of iv that contains v.
func containing(t *testing.T, iv [][2]float64, v float64) [2]float64 {
	t.Helper()
	for _, r := range iv {
		if r[0] <= v && v <= r[1] {
			return r
		}
	}
	t.Fatalf("no copper interval of %v contains %.0f nm", iv, v)
	return [2]float64{}
}

func TestBentStubInGerber(t *testing.T) {
	tests := []struct {
		name string
		spec geom.Spec
		// By hand, mm: the stub's width; 2mW; the x at which to probe the
		// through line's edge at the tee; how far out from the through
		// line's centre line to probe the first leg; the second leg's
		// probe x; the first and second legs' centre-line
		// lengths (the second to the copper's end) and, for a shorted
		// stub, the second leg to the via centre.
		w, chamferLeg         float64
		edgeX, leg1Off, leg2X float64
		leg1, leg2, leg2ToVia float64
		side, toward          float64
		copperMM2             float64 // for gerbv
	}{
		// 2mW = 2 × (0.52 + 0.65·e^(−1.35·1.2/0.8)) × 1.2 mm = 1.453910 mm
		// (Douville and James 1978; python3). Copper: 39.2 mm² of line and
		// stubs (geom's TestBuildReference), the L has the straight stub's
		// area, + 0.4 mm² of port pads beyond the 1.8 mm feed (gerbv_test's
		// reference) − (2mW)²/2 = 1.056927 mm².
		{name: "shorted, up, toward the source", spec: bentShort(),
			w: 1.2, chamferLeg: 1.453910, edgeX: 6.5, leg1Off: 2.5, leg2X: 9.4,
			leg1: 4.2, leg2: 1.8, leg2ToVia: 1.4, side: 1, toward: 1, copperMM2: 39.6 - 1.453910*1.453910/2},
		// 2mW = 2 × (0.52 + 0.65·e^(−2.7)) × 1 mm = 1.127367 mm. Copper:
		// 13 × 1 mm² of line + 1 × 8 mm² of stub − (2mW)²/2 = 0.635478 mm².
		{name: "open, down, toward the load", spec: bentOpen(),
			w: 1, chamferLeg: 1.127367, edgeX: 3, leg1Off: 2.5, leg2X: 8.5,
			leg1: 3.5, leg2: 4.5, side: -1, toward: -1, copperMM2: 21 - 1.127367*1.127367/2},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			l := build(t, tt.spec)
			top := parse(t, gerberBytes(t, l, CopperTop))
			if len(top.Regions) != 1 {
				t.Fatalf("%d copper regions, want one merged net", len(top.Regions))
			}
			poly := top.Regions[0].Outline
			near := func(what string, gotNM, wantMM float64) {
				t.Helper()
				if math.Abs(gotNM*1e-6-wantMM) > 1e-3 {
					t.Errorf("%s: %.6f mm in the Gerber, want %.6f mm", what, gotNM*1e-6, wantMM)
				}
			}
			nm := func(mm float64) int64 { return geom.Nanometres(mm * 1e-3) }
			// The through line's edge at the tee, from a probe across line1
			// (or l) clear of the stub, and the line's centre.
			_, bmax := l.Board.Bounds()
			line := cross(poly, nm(tt.edgeX), true)[0]
			centre := (line[0] + line[1]) / 2
			edge := line[1]
			if tt.side < 0 {
				edge = line[0]
			}
			// First leg: its width across it, halfway up; its centre line.
			probe := int64(math.Round(centre + tt.side*float64(nm(tt.leg1Off))))
			leg1 := containing(t, cross(poly, probe, false), float64(l.Marks.Tees[0].Center.X))
			near("first leg's width", leg1[1]-leg1[0], tt.w)
			stubX := (leg1[0] + leg1[1]) / 2
			// Second leg: its width across it, beyond the first leg; its
			// centre line is the bend's.
			var leg2 [2]float64
			for _, r := range cross(poly, nm(tt.leg2X), true) {
				if tt.side*((r[0]+r[1])/2-centre) > 0 { // not the through line

					leg2 = r
				}
			}
			near("second leg's width", leg2[1]-leg2[0], tt.w)
			bendY := (leg2[0] + leg2[1]) / 2
			near("first leg, through line's edge to the bend centre line", tt.side*(bendY-edge), tt.leg1)
			// Along the second leg's centre line: from the stub's centre
			// line to the copper's end. (With m > 0.5 the miter cuts the
			// bend's centre point itself away, so the probe starts a width
			// further along.)
			along := containing(t, cross(poly, int64(math.Round(bendY)), false), stubX+tt.toward*float64(nm(tt.w)))
			end := along[1]
			if tt.toward < 0 {
				end = along[0]
			}
			near("second leg, bend centre line to the end", tt.toward*(end-stubX), tt.leg2)
			// The miter: the one diagonal edge, its legs 2mW.
			var diag int
			for i := range poly {
				a, b := poly[i], poly[(i+1)%len(poly)]
				if a.X != b.X && a.Y != b.Y {
					diag++
					near("miter's x leg", math.Abs(float64(b.X-a.X)), tt.chamferLeg)
					near("miter's y leg", math.Abs(float64(b.Y-a.Y)), tt.chamferLeg)
				}
			}
			if diag != 1 {
				t.Errorf("%d diagonal edges, want the one miter", diag)
			}
			// A shorted stub's via: on the second leg's centre line, its
			// drawn length ending there (the Excellon file's hit).
			drill := readDrill(t, l)
			if tt.leg2ToVia > 0 {
				if len(drill.Hits) != 1 {
					t.Fatalf("%d drill hits", len(drill.Hits))
				}
				h := drill.Hits[0].At
				near("via off the second leg's centre line", float64(h.Y)-bendY, 0)
				near("second leg, bend centre line to the via centre", tt.toward*(float64(h.X)-stubX), tt.leg2ToVia)
			} else if len(drill.Hits) != 0 {
				t.Errorf("%d drill hits for an open stub", len(drill.Hits))
			}
			if bmax.Y > geom.Nanometres(tt.spec.MaxBoard[1]) {
				t.Errorf("board %d nm tall, above the limit", bmax.Y)
			}
			// gerbv renders the copper (region and flashed pads): the lit
			// area is the polygon's area worked by hand, within 2 %.
			files := gerberFiles(t, l)
			n, _, _ := lit(render(t, files, CopperTop.FileName(l.Name)), 0)
			got := float64(n) * pixelMM * pixelMM
			t.Logf("rendered copper %.4f mm², geometry %.4f mm²", got, tt.copperMM2)
			if math.Abs(got-tt.copperMM2) > 0.02*tt.copperMM2 {
				t.Errorf("rendered copper %.3f mm², want %.3f mm² ± 2 %%", got, tt.copperMM2)
			}
		})
	}
}

// Straight layouts keep their Gerber byte for byte whatever the board
// limit, as long as the stubs fit: no limit, and the limit at the board's
// exact size (13.8 mm, geom's TestBuildAccepts).
func TestStraightGerberUnchangedByLimit(t *testing.T) {
	free := refSpec()
	tight := refSpec()
	tight.MaxBoard = [2]float64{17.2e-3, 13.8e-3}
	a, b := gerberFiles(t, build(t, free)), gerberFiles(t, build(t, tight))
	for name, data := range a {
		if !bytes.Equal(data, b[name]) {
			t.Errorf("%s differs between no limit and a limit the stubs fit", name)
		}
	}
}

// bentFixture is the drawing fixture's open stub (fixtureLayout(openStub()))
// on a board limited to 21.0015 mm: by hand, 21.0015 − 2 × 5 mm margin
// leaves 11.0015 mm, 1.4925 mm below the line, so the stub may reach
// 9.509 mm above it: second leg's centre line at 9.509 − 1.4925 = 8.0165
// mm, first leg 8.0165 − 1.4925 = 6.524 mm from the line's edge, second
// leg 9.876 − 6.524 = 3.352 mm toward the source port (to x = 15.697 mm,
// short of the port pad at 16.345 mm). W/h = 2.985/1.6: m = 0.52 +
// 0.65·e^(−2.5186) = 0.5724, "57 %" (python3).
func bentFixture(t *testing.T) geom.Layout {
	t.Helper()
	s := geom.Spec{
		Name: "fixture",
		Segments: []geom.Segment{
			{ID: "feed-load", Width: 2.985e-3, Length: 5e-3},
			{ID: "line-1", Width: 2.985e-3, Length: 7.345e-3},
			{ID: "feed-source", Width: 2.985e-3, Length: 5e-3},
		},
		Stubs:         []geom.Stub{{ID: "stub-1", At: 1, Width: 2.985e-3, Length: 9.876e-3, Side: 1}},
		PortPad:       geom.PadSpec{Width: 2.985e-3, Length: 1e-3},
		Margin:        5e-3,
		Height:        1.6e-3,
		Mask:          "open",
		MaskExpansion: 50e-6,
		MaxBoard:      [2]float64{0, 21.0015e-3},
	}
	l := build(t, s)
	if len(l.Marks.Bends) != 1 {
		t.Fatalf("bends %+v, want the stub bent", l.Marks.Bends)
	}
	return l
}

// The drawing dimensions both legs of a bent stub and labels its miter;
// pdftotext reads them back (values by hand, see bentFixture).
func TestPDFBentStub(t *testing.T) {
	var buf bytes.Buffer
	if err := WritePDF(&buf, fixtureReport(openStub()), bentFixture(t), fixtureOptions("a4", "scale")); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "drawing.pdf")
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("STUBCRAFT_DRAWING_DIR"); dir != "" {
		_ = os.WriteFile(filepath.Join(dir, "bent-stub.pdf"), buf.Bytes(), 0o644)
	}
	text := pdfText(t, path)
	for _, w := range []string{
		"6.524",      // first leg, through line's edge to the bend centre line
		"3.352",      // second leg, bend centre line to the open end
		"2.985",      // the stub's width
		"miter 57 %", // Douville and James's fraction
		"1st leg", "2nd leg", "open end",
	} {
		if !strings.Contains(text, w) {
			t.Errorf("pdftotext does not find %q", w)
		}
	}
}

// layout.svg dimensions both legs and names the miter too.
func TestSVGBentStub(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteSVG(&buf, fixtureReport(openStub()), bentFixture(t)); err != nil {
		t.Fatal(err)
	}
	svg := buf.String()
	for _, w := range []string{
		">6.524<", "first leg stub-1, through line&#39;s edge to bend centre",
		">3.352<", "second leg stub-1, bend centre to end",
		"miter 57 %",
	} {
		if !strings.Contains(svg, w) {
			t.Errorf("layout.svg lacks %q", w)
		}
	}
}
