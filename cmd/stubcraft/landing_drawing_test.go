package main

import (
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// The drawing of edge-launch-fence.toml has a detail sheet of the source
// port's landing and the via fence with the sizes a fab and a bench check.
// Each expected value comes from the design file, from the defaults the
// README gives for the keys it leaves out, or from the stackup preset;
// only the signal pad's width (by default the port line's) is read from
// report.json. The demo, with plain port pads, has no such sheet.
func TestDrawingLandingFenceDetail(t *testing.T) {
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skipf("pdftotext (Debian poppler-utils) is not installed: %v", err)
	}
	t.Setenv("SOURCE_DATE_EPOCH", "1767225600")
	dir := filepath.Join(t.TempDir(), "out")
	if out, err := runRoot(t, "build", filepath.Join("..", "..", "testdata", "designs", "edge-launch-fence.toml"), "-o", dir, "--samples", "20"); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	raw, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Elements []struct {
			ID      string  `json:"id"`
			WidthMM float64 `json:"width_mm"`
		} `json:"elements"`
	}
	if err := json.Unmarshal(raw, &rep); err != nil {
		t.Fatal(err)
	}
	portW := 0.0
	for _, e := range rep.Elements {
		if e.ID == "feed-source" {
			portW = e.WidthMM
		}
	}
	const h, viaPad = 0.7874, 0.6 // ptfe-glass-0.79mm's thickness; the default via_pad
	cases := []struct{ what, want string }{
		{"launch_pad_length (default 1.5 mm)", "pad length 1.500"},
		{"launch_pad_width (default the port line's width)", fmt.Sprintf("pad width %.3f", portW)},
		{"launch_gap = 0.4mm", "gap 0.400"},
		{"launch_ground_width = 2mm", "ground pad width 2.000"},
		{"launch_ground_length (default 2.5 mm)", "ground pad length 2.500"},
		{"edge_clearance (default 0.3 mm)", "pull-back 0.300"},
		{"launch_via_drill (default via_drill 0.3 mm)", "ground via: drill Ø0.300"},
		{"fence_pitch = 1.5mm", "fence pitch 1.500"},
		{"fence_offset (default 3 h plus half a via pad)", fmt.Sprintf("fence offset %.3f", 3*h+viaPad/2)},
		{"via_drill (default 0.3 mm)", "fence via: drill Ø0.300"},
		{"the caption", "DETAIL 10:1"},
	}
	detail := ""
	for _, page := range strings.Split(pdfTextOf(t, filepath.Join(dir, "drawing.pdf")), "\f") {
		if strings.Contains(page, "Edge-launch landing and via fence") {
			detail = strings.Join(strings.Fields(page), " ")
		}
	}
	if detail == "" {
		t.Fatal("no sheet titled Edge-launch landing and via fence")
	}
	for _, c := range cases {
		if !strings.Contains(detail, c.want) {
			t.Errorf("%s: the detail sheet does not read %q", c.what, c.want)
		}
	}
	demo := filepath.Join(t.TempDir(), "demo")
	if out, err := runRoot(t, "build", "-o", demo, "--samples", "20"); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if text := pdfTextOf(t, filepath.Join(demo, "drawing.pdf")); strings.Contains(text, "landing") || strings.Contains(text, "DETAIL") {
		t.Error("the demo's drawing has a landing detail")
	}
}

// pdfTextOf is the text poppler's pdftotext reads from the file, pages
// apart by form feeds.
func pdfTextOf(t *testing.T, path string) string {
	t.Helper()
	out, err := exec.Command("pdftotext", "-enc", "UTF-8", path, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext %s: %v", path, err)
	}
	return string(out)
}
