package export

import (
	"bytes"
	"encoding/xml"
	"math"
	"strconv"
	"strings"
	"testing"
)

type svgRoot struct {
	Width   string      `xml:"width,attr"`
	Height  string      `xml:"height,attr"`
	ViewBox string      `xml:"viewBox,attr"`
	Rects   []svgRect   `xml:"rect"`
	Circles []svgCircle `xml:"circle"`
}

type svgRect struct {
	ID     string  `xml:"id,attr"`
	X      float64 `xml:"x,attr"`
	Y      float64 `xml:"y,attr"`
	Width  float64 `xml:"width,attr"`
	Height float64 `xml:"height,attr"`
}

type svgCircle struct {
	Class string  `xml:"class,attr"`
	CX    float64 `xml:"cx,attr"`
	CY    float64 `xml:"cy,attr"`
	R     float64 `xml:"r,attr"`
}

// layout.svg parses with encoding/xml; its size is in mm and equals its
// viewBox (1 user unit = 1 mm); the outline measures the hand-worked board
// size; y is flipped: the via of the downward stub sits at the right
// height above the outline's foot.
func TestSVGTrueSizeAndFlip(t *testing.T) {
	ds := drawingSpec{line: 7.345, stubW: 1.2, stubL: 8.5, via: true, side: -1}
	var buf bytes.Buffer
	if err := WriteSVG(&buf, fixtureReport(ds), fixtureLayout(t, ds)); err != nil {
		t.Fatal(err)
	}
	var s svgRoot
	if err := xml.Unmarshal(buf.Bytes(), &s); err != nil {
		t.Fatalf("layout.svg is not XML: %v", err)
	}
	vb := strings.Fields(s.ViewBox)
	if len(vb) != 4 {
		t.Fatalf("viewBox %q", s.ViewBox)
	}
	for i, a := range []string{s.Width, s.Height} {
		if !strings.HasSuffix(a, "mm") {
			t.Errorf("size %q is not in mm", a)
		}
		v, _ := strconv.ParseFloat(strings.TrimSuffix(a, "mm"), 64)
		box, _ := strconv.ParseFloat(vb[2+i], 64)
		if v != box {
			t.Errorf("size %v mm but viewBox %v units: not 1 unit = 1 mm", v, box)
		}
	}
	var outline *svgRect
	for i := range s.Rects {
		if s.Rects[i].ID == "board-outline" {
			outline = &s.Rects[i]
		}
	}
	if outline == nil {
		t.Fatal("no board-outline rect")
	}
	// By hand: 5 + 7.345 + 5 = 17.345; 2·5 + 2·1.4925 + 8.5 = 21.485.
	if math.Abs(outline.Width-17.345) > 1e-3 || math.Abs(outline.Height-21.485) > 1e-3 {
		t.Errorf("outline %v × %v mm, want 17.345 × 21.485", outline.Width, outline.Height)
	}
	// The via centre in board coordinates, by hand: x = 5 + 7.345 =
	// 12.345 (the stub's centre line); the downward stub's copper ends on
	// the 5 mm margin line (centre line at 5 + 1.4925 + 8.5, minus 1.4925
	// and 8.5), and the pad's far edge is on it, so y = 5 + 0.8/2 = 5.4.
	var drill *svgCircle
	for i := range s.Circles {
		if s.Circles[i].Class == "drill" {
			drill = &s.Circles[i]
		}
	}
	if drill == nil {
		t.Fatal("no drill circle")
	}
	bx := drill.CX - outline.X
	by := outline.Y + outline.Height - drill.CY // flipped back to y up
	if math.Abs(bx-12.345) > 1e-3 || math.Abs(by-5.4) > 1e-3 || math.Abs(drill.R-0.2) > 1e-4 {
		t.Errorf("drill at (%v, %v) r %v mm, want (12.345, 5.4) r 0.2", bx, by, drill.R)
	}
}
