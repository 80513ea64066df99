package export

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"stubcraft/synth/geom"
)

// The landing detail of a grounded-coplanar board draws the ground pour
// in its own fill (the pour colour of sheet 1 and layout.svg), not as
// signal copper, and its key names both fills; a microstrip board's
// detail has no pour and no key. The fills are read from the page's
// content stream (PDF 32000-1 §8.6.8: "r g b rg" sets the fill colour,
// from memory) inside the detail's copper section, the key's words by
// poppler.
func TestLandingDetailPourFill(t *testing.T) {
	pour := fmt.Sprintf("%.3f %.3f %.3f rg", 0xe2/255.0, 0xbf/255.0, 0x8e/255.0)   // colPour
	copper := fmt.Sprintf("%.3f %.3f %.3f rg", 0xc9/255.0, 0x8a/255.0, 0x3e/255.0) // colCopper
	cpw := coplanarSpec()
	cpw.EdgeClearance = 0.3e-3
	cpw.Launch = &geom.LaunchSpec{PadWidth: 1e-3, PadLength: 1e-3, Gap: 0.4e-3, GroundWidth: 1.5e-3, GroundLength: 2e-3,
		ViaDrill: 0.3e-3, ViaPad: 0.6e-3, ViaPitch: 1.2e-3}
	cases := []struct {
		name     string
		spec     geom.Spec
		wantPour bool
	}{
		{"grounded coplanar", cpw, true},
		{"microstrip", launchOpenSpec(), false},
	}
	for _, c := range cases {
		lay, err := geom.Build(c.spec)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var buf bytes.Buffer
		if err := WritePDF(&buf, fixtureReport(openStub()), lay, fixtureOptions("a4", "scale")); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		detail := detailCopper(t, buf.Bytes())
		if detail == "" {
			t.Fatalf("%s: no landing detail with copper in the drawing", c.name)
		}
		if got := strings.Contains(detail, pour); got != c.wantPour || !strings.Contains(detail, copper) {
			t.Errorf("%s: the detail's copper fills the pour colour %v (want %v) and the copper colour %v (want true)", c.name, got, c.wantPour, strings.Contains(detail, copper))
		}
		path := filepath.Join(t.TempDir(), "drawing.pdf")
		if dir := os.Getenv("STUBCRAFT_DRAWING_DIR"); dir != "" {
			path = filepath.Join(dir, "landing-"+strings.ReplaceAll(c.name, " ", "-")+".pdf") // for a person to look at
		}
		if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		text := ""
		for _, page := range strings.Split(pdfText(t, path), "\f") {
			if strings.Contains(page, "Edge-launch landing") {
				text = strings.Join(strings.Fields(page), " ")
			}
		}
		if got := strings.Contains(text, "coplanar ground pour (GND)") && strings.Contains(text, "copper (line, stubs, pads)"); got != c.wantPour {
			t.Errorf("%s: the detail's key names the pour and the copper: %v, want %v", c.name, got, c.wantPour)
		}
	}
}

// detailCopper is the copper section (/Copper BMC … EMC) of the landing
// detail's content stream, the one after its caption.
func detailCopper(t *testing.T, pdf []byte) string {
	t.Helper()
	for _, s := range markedStreams(t, pdf, "/LandingDetail BMC") {
		s = s[strings.Index(s, "/LandingDetail BMC"):]
		j := strings.Index(s, "/Copper BMC")
		if j < 0 {
			continue
		}
		if k := strings.Index(s[j:], "EMC"); k >= 0 {
			return s[j : j+k]
		}
	}
	return ""
}

// Sheet 1 of a grounded-coplanar board fills its pads (the shorted stub's
// via pad, the stitching vias' pads) in copper, as layout.svg does, and
// not in the pour's fill, which the last copper polygon drawn (the pour)
// had left set: every circle in the board views' copper sections is drawn
// while the copper colour is the fill (PDF 32000-1 §8.5.2: "c" appends a
// Bézier curve, from memory; the drawing's circles are made of them).
func TestSheet1PadsInCopper(t *testing.T) {
	copper := fmt.Sprintf("%.3f %.3f %.3f rg", 0xc9/255.0, 0x8a/255.0, 0x3e/255.0) // colCopper
	lay, err := geom.Build(coplanarSpec())
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WritePDF(&buf, fixtureReport(openStub()), lay, fixtureOptions("a4", "scale")); err != nil {
		t.Fatal(err)
	}
	fill := regexp.MustCompile(`[\d.]+ [\d.]+ [\d.]+ rg|\sc\n`)
	circles := 0
	for _, s := range markedStreams(t, buf.Bytes(), "/Copper BMC") {
		for _, sec := range regexp.MustCompile(`(?s)/Copper BMC\n(.*?)EMC`).FindAllStringSubmatch(s, -1) {
			now := ""
			for _, op := range fill.FindAllString(sec[1], -1) {
				if strings.HasSuffix(op, "rg") {
					now = op
					continue
				}
				circles++
				if now != copper {
					t.Fatalf("a pad's curve drawn with fill %q, want the copper's %q", now, copper)
				}
			}
		}
	}
	if circles == 0 {
		t.Fatal("no round pads drawn in the board views' copper")
	}
}
