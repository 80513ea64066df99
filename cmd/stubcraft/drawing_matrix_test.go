package main

import (
	"bytes"
	"compress/zlib"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"
)

// drawingMatrix is the set of builds whose drawings are checked for
// readability: line widths from 0.2 to 3 mm, boards from a few mm at
// 5.8 GHz to a 433 MHz board drawn scaled and tiled, bent, shorted and
// coplanar stubs, a hand-worked double stub, calibration structures on
// the panel, a band match whose Bode-Fano limit is quoted, and
// edge-launch landings with a via fence (their detail view).
func drawingMatrix() []struct {
	name string
	args []string
} {
	td := filepath.Join("..", "..", "testdata")
	return []struct {
		name string
		args []string
	}{
		{"demo", nil},
		{"flex-thin", []string{filepath.Join(td, "drawing", "flex-thin.toml")}},
		{"wifi-5g8", []string{filepath.Join(td, "drawing", "wifi-5g8.toml")}},
		{"wifi-5g8-panel", []string{filepath.Join(td, "drawing", "wifi-5g8-panel.toml")}},
		{"ism-433-scaled", []string{filepath.Join(td, "drawing", "ism-433.toml")}},
		{"ism-433-tiled", []string{filepath.Join(td, "drawing", "ism-433.toml"), "--fit", "tile"}},
		{"shorted-stub", []string{filepath.Join(td, "drawing", "shorted-stub.toml")}},
		{"bent-stub", []string{filepath.Join(td, "designs", "compact-bent-stub.toml")}},
		{"coplanar", []string{filepath.Join(td, "designs", "gcpw-probe.toml")}},
		{"double-stub", []string{filepath.Join(td, "designs", "double-stub-sections.toml")}},
		{"mismatch", []string{filepath.Join(td, "designs", "sensor-antenna-sections.toml")}},
		{"band-double-stub", []string{filepath.Join(td, "designs", "band-double-stub.toml")}},
		{"band-quarter-wave", []string{filepath.Join(td, "designs", "band-quarter-wave.toml")}},
		{"band-limit", []string{filepath.Join(td, "drawing", "band-limit.toml")}},
		{"edge-launch-fence", []string{filepath.Join(td, "designs", "edge-launch-fence.toml")}},
	}
}

// pdfWord is a word as poppler reads it: its box in points, y down.
type pdfWord struct {
	text                   string
	xMin, yMin, xMax, yMax float64
}

var (
	pageRe = regexp.MustCompile(`<page width="([\d.]+)" height="([\d.]+)">`)
	wordRe = regexp.MustCompile(`<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)</word>`)
)

// pdfWords runs poppler's pdftotext -bbox-layout on path and returns the
// words of every page and the page heights in points.
func pdfWords(t *testing.T, path string) ([][]pdfWord, []float64) {
	t.Helper()
	tool, err := exec.LookPath("pdftotext")
	if err != nil {
		t.Skipf("pdftotext (Debian poppler-utils) is not installed: %v", err)
	}
	out, err := exec.Command(tool, "-bbox-layout", path, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext %s: %v", path, err)
	}
	var pages [][]pdfWord
	var heights []float64
	for _, chunk := range strings.Split(string(out), "</page>") {
		m := pageRe.FindStringSubmatch(chunk)
		if m == nil {
			continue
		}
		h, _ := strconv.ParseFloat(m[2], 64)
		heights = append(heights, h)
		var ws []pdfWord
		for _, w := range wordRe.FindAllStringSubmatch(chunk, -1) {
			f := func(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }
			ws = append(ws, pdfWord{strings.TrimSpace(w[5]), f(w[1]), f(w[2]), f(w[3]), f(w[4])})
		}
		pages = append(pages, ws)
	}
	return pages, heights
}

// minSheetFill is the least share of a sheet's content height (between
// the header band and the title block) its words must reach down to: a
// sheet filled less is near-empty and its content belongs on an earlier
// sheet. maxPairFill is the fill two following sheets after the first
// must reach together: below it, both would have fitted on one sheet with
// room for a heading between them. Both are our own choice for these
// drawings (common practice, no source); before the notes flowed into
// shared sheets the matrix had sheets filled 17–28 % and notes and fab
// notes sheets that together filled 60–92 %.
const (
	minSheetFill = 0.30
	maxPairFill  = 0.90
)

// checkSheetFill fails for every sheet whose lowest word inside the
// content area lies above minSheetFill of the area's height, and for
// every two following sheets after the first that would have fitted on
// one. The content area is the one export's contentBox uses: 24 mm below
// the paper's top edge (margin 10, header 11, gap 3) to 35 mm above its
// bottom edge (margin 10, title block 22, gap 3).
func checkSheetFill(t *testing.T, pages [][]pdfWord, heights []float64) {
	t.Helper()
	const ptPerMM = 72 / 25.4
	fills := make([]float64, len(pages))
	for p, words := range pages {
		top, bottom := 24*ptPerMM, heights[p]-35*ptPerMM
		low := top
		for _, w := range words {
			if w.yMin >= top && w.yMax <= bottom {
				low = math.Max(low, w.yMax)
			}
		}
		fills[p] = (low - top) / (bottom - top)
		if fills[p] < minSheetFill {
			t.Errorf("sheet %d of %d: words fill %.0f %% of the content height, want at least %.0f %%",
				p+1, len(pages), 100*fills[p], 100*minSheetFill)
		}
	}
	for p := 2; p < len(fills); p++ {
		if sum := fills[p-1] + fills[p]; sum < maxPairFill {
			t.Errorf("sheets %d and %d fill %.0f %% and %.0f %%: both fit on one sheet", p, p+1, 100*fills[p-1], 100*fills[p])
		}
	}
}

// overlapArea is the area two word boxes share, points².
func overlapArea(a, b pdfWord) float64 {
	w := math.Min(a.xMax, b.xMax) - math.Max(a.xMin, b.xMin)
	h := math.Min(a.yMax, b.yMax) - math.Max(a.yMin, b.yMin)
	if w <= 0 || h <= 0 {
		return 0
	}
	return w * h
}

// pagesContent returns the decompressed content stream of every page, in
// order (gofpdf writes one stream per page, before the fonts' streams).
func pagesContent(t *testing.T, pdf []byte, n int) []string {
	t.Helper()
	re := regexp.MustCompile(`(?s)/Filter /FlateDecode /Length \d+>>\nstream\n(.*?)\nendstream`)
	var out []string
	for _, m := range re.FindAllSubmatch(pdf, -1) {
		zr, err := zlib.NewReader(bytes.NewReader(m[1]))
		if err != nil {
			continue
		}
		b, err := io.ReadAll(zr)
		if err != nil {
			continue
		}
		if strings.Contains(string(b), " Tf") || strings.Contains(string(b), " re") {
			out = append(out, string(b))
		}
		if len(out) == n {
			break
		}
	}
	return out
}

// copperPaths returns the outlines drawn inside /Copper BMC … EMC in a
// page's content stream, in poppler's coordinates (points, y down from the
// top of a page of height h). A path with curves (a pad) is returned as
// its control points' bounding box.
func copperPaths(content string, h float64) [][][2]float64 {
	var paths [][][2]float64
	for _, blk := range regexp.MustCompile(`(?s)/Copper BMC\n(.*?)EMC`).FindAllStringSubmatch(content, -1) {
		var cur [][2]float64
		curved := false
		var nums []float64
		flush := func() {
			if len(cur) > 2 {
				if curved {
					lo, hi := [2]float64{math.Inf(1), math.Inf(1)}, [2]float64{math.Inf(-1), math.Inf(-1)}
					for _, p := range cur {
						lo = [2]float64{math.Min(lo[0], p[0]), math.Min(lo[1], p[1])}
						hi = [2]float64{math.Max(hi[0], p[0]), math.Max(hi[1], p[1])}
					}
					cur = [][2]float64{lo, {hi[0], lo[1]}, hi, {lo[0], hi[1]}}
				}
				paths = append(paths, cur)
			}
			cur, curved = nil, false
		}
		for _, tok := range strings.Fields(blk[1]) {
			if v, err := strconv.ParseFloat(tok, 64); err == nil {
				nums = append(nums, v)
				continue
			}
			switch tok {
			case "m":
				flush()
				fallthrough
			case "l", "c":
				for i := 0; i+1 < len(nums); i += 2 {
					cur = append(cur, [2]float64{nums[i], h - nums[i+1]})
				}
				curved = curved || tok == "c"
			case "h":
			default:
				flush()
			}
			nums = nil
		}
		flush()
	}
	return paths
}

// wordOnPolygon reports whether the word's box (shrunk by a hair) and the
// polygon share area: a polygon vertex inside the box, the box's centre
// inside the polygon, or an edge through the box.
func wordOnPolygon(w pdfWord, poly [][2]float64) bool {
	const hair = 0.3
	x0, y0, x1, y1 := w.xMin+hair, w.yMin+hair, w.xMax-hair, w.yMax-hair
	in := func(x, y float64) bool { return x > x0 && x < x1 && y > y0 && y < y1 }
	inside := false
	cx, cy := (x0+x1)/2, (y0+y1)/2
	for i, j := 0, len(poly)-1; i < len(poly); j, i = i, i+1 {
		a, b := poly[i], poly[j]
		if in(a[0], a[1]) {
			return true
		}
		if (a[1] > cy) != (b[1] > cy) && cx < (b[0]-a[0])*(cy-a[1])/(b[1]-a[1])+a[0] {
			inside = !inside
		}
		// Sample the edge: copper edges are long and straight, a few
		// hundred samples find any crossing of a word box.
		for k := 1; k < 200; k++ {
			s := float64(k) / 200
			if in(a[0]+s*(b[0]-a[0]), a[1]+s*(b[1]-a[1])) {
				return true
			}
		}
	}
	return inside
}

// runTogether matches a word made of two dimension values printed with no
// gap between them ("5.0007.326").
var runTogether = regexp.MustCompile(`\d\.\d{3}\d*\.\d`)

// TestDrawingMatrix builds each design of the matrix once and checks, with
// poppler's word boxes, that on every page of the drawing no two words
// overlap, no word runs into another value, and no word lies over copper.
func TestDrawingMatrix(t *testing.T) {
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skipf("pdftotext (Debian poppler-utils) is not installed: %v", err)
	}
	t.Setenv("SOURCE_DATE_EPOCH", "1767225600")
	for _, m := range drawingMatrix() {
		t.Run(m.name, func(t *testing.T) {
			t.Parallel()
			dir := filepath.Join(t.TempDir(), "out")
			argv := append([]string{"build"}, m.args...)
			argv = append(argv, "-o", dir, "--samples", "20", "--accept-mismatch")
			if out, err := runRoot(t, argv...); err != nil {
				t.Fatalf("%v\n%s", err, out)
			}
			path := filepath.Join(dir, "drawing.pdf")
			pages, heights := pdfWords(t, path)
			raw, err := os.ReadFile(path)
			if err != nil {
				t.Fatal(err)
			}
			contents := pagesContent(t, raw, len(pages))
			for p, words := range pages {
				for i := range words {
					if runTogether.MatchString(words[i].text) {
						t.Errorf("page %d: values run together: %q", p+1, words[i].text)
					}
					for j := i + 1; j < len(words); j++ {
						if a := overlapArea(words[i], words[j]); a > 0.5 {
							t.Errorf("page %d: %q and %q overlap (%.1f pt²)", p+1, words[i].text, words[j].text, a)
						}
					}
				}
				if p >= len(contents) {
					t.Fatalf("page %d: no content stream found", p+1)
				}
				copper := copperPaths(contents[p], heights[p])
				if p == 0 && len(copper) == 0 {
					t.Fatalf("page 1: no copper found in the content stream")
				}
				for _, poly := range copper {
					for _, w := range words {
						if wordOnPolygon(w, poly) {
							t.Errorf("page %d: %q lies over copper", p+1, w.text)
						}
					}
				}
			}
			checkSheetFill(t, pages, heights)
			checkSVGText(t, filepath.Join(dir, "layout.svg"))
			checkSheet1Names(t, dir)
			checkFrequencyTicks(t, dir)
			if os.Getenv("STUBCRAFT_DRAWING_DIR") != "" {
				_ = os.WriteFile(filepath.Join(os.Getenv("STUBCRAFT_DRAWING_DIR"), m.name+".pdf"), raw, 0o644)
			}
		})
	}
}

// svgText is a text element of layout.svg with the font size in force.
type svgText struct {
	X, Y   float64
	Anchor string
	Size   float64
	Text   string
}

// svgContent reads the text elements (font-size inherited from the
// enclosing groups) and the copper outlines (paths with id copper-N, pad
// circles) of layout.svg.
func svgContent(t *testing.T, path string) ([]svgText, [][][2]float64) {
	t.Helper()
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(bytes.NewReader(data))
	var texts []svgText
	var copper [][][2]float64
	sizes := []float64{16}
	attr := func(e xml.StartElement, name string) string {
		for _, a := range e.Attr {
			if a.Name.Local == name {
				return a.Value
			}
		}
		return ""
	}
	num := func(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }
	var cur *svgText
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("layout.svg: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			size := sizes[len(sizes)-1]
			if v := attr(e, "font-size"); v != "" {
				size = num(v)
			}
			sizes = append(sizes, size)
			switch {
			case e.Name.Local == "text":
				cur = &svgText{X: num(attr(e, "x")), Y: num(attr(e, "y")), Anchor: attr(e, "text-anchor"), Size: size}
			case e.Name.Local == "path" && strings.HasPrefix(attr(e, "id"), "copper-"):
				var poly [][2]float64
				f := strings.FieldsFunc(attr(e, "d"), func(r rune) bool { return r == 'M' || r == 'L' || r == 'Z' || r == ' ' })
				for i := 0; i+1 < len(f); i += 2 {
					poly = append(poly, [2]float64{num(f[i]), num(f[i+1])})
				}
				copper = append(copper, poly)
			case e.Name.Local == "circle" && attr(e, "class") == "pad":
				x, y, r := num(attr(e, "cx")), num(attr(e, "cy")), num(attr(e, "r"))
				copper = append(copper, [][2]float64{{x - r, y - r}, {x + r, y - r}, {x + r, y + r}, {x - r, y + r}})
			}
		case xml.CharData:
			if cur != nil {
				cur.Text += string(e)
			}
		case xml.EndElement:
			sizes = sizes[:len(sizes)-1]
			if e.Name.Local == "text" && cur != nil {
				texts = append(texts, *cur)
				cur = nil
			}
		}
	}
	return texts, copper
}

// checkSVGText checks that no two text elements of layout.svg overlap and
// none lies over copper, with each text's box from the metrics of the Go
// Regular font the SVG names (advance widths; ascent 0.9, descent 0.2 em).
func checkSVGText(t *testing.T, path string) {
	t.Helper()
	texts, copper := svgContent(t, path)
	if len(texts) == 0 || len(copper) == 0 {
		t.Fatalf("layout.svg: %d texts, %d copper shapes", len(texts), len(copper))
	}
	fnt, err := sfnt.Parse(goregular.TTF)
	if err != nil {
		t.Fatal(err)
	}
	var buf sfnt.Buffer
	upem := fnt.UnitsPerEm()
	var boxes []pdfWord
	for _, tx := range texts {
		w := 0.0
		for _, r := range tx.Text {
			g, err := fnt.GlyphIndex(&buf, r)
			if err != nil {
				t.Fatal(err)
			}
			adv, err := fnt.GlyphAdvance(&buf, g, fixed.I(int(upem)), font.HintingNone)
			if err != nil {
				t.Fatal(err)
			}
			w += float64(adv) / 64 / float64(upem) * tx.Size
		}
		x := tx.X
		switch tx.Anchor {
		case "middle":
			x -= w / 2
		case "end":
			x -= w
		}
		boxes = append(boxes, pdfWord{tx.Text, x, tx.Y - 0.9*tx.Size, x + w, tx.Y + 0.2*tx.Size})
	}
	for i := range boxes {
		for j := i + 1; j < len(boxes); j++ {
			if a := overlapArea(boxes[i], boxes[j]); a > 0.01 {
				t.Errorf("layout.svg: %q and %q overlap (%.2f mm²)", boxes[i].text, boxes[j].text, a)
			}
		}
		for _, poly := range copper {
			// wordOnPolygon shrinks the box by 0.3 (points on a page); in
			// millimetres grow it back to a hair of 0.05.
			b := boxes[i]
			b.xMin, b.yMin, b.xMax, b.yMax = b.xMin-0.25, b.yMin-0.25, b.xMax+0.25, b.yMax+0.25
			if wordOnPolygon(b, poly) {
				t.Errorf("layout.svg: %q lies over copper", boxes[i].text)
			}
		}
	}
}

// checkSheet1Names checks that the design name and the stackup name of
// the build in dir appear whole in the text of sheet 1 (a name wrapped
// after a hyphen or a space is joined again).
func checkSheet1Names(t *testing.T, dir string) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Name    string `json:"name"`
		Stackup struct {
			Name string `json:"name"`
		} `json:"stackup"`
		Summary struct {
			Verdict  string   `json:"verdict"`
			Warnings []string `json:"verdict_warnings"`
		} `json:"summary"`
		Tolerance *struct {
			P50 float64 `json:"p50_s11_db"`
			P90 float64 `json:"p90_s11_db"`
		} `json:"tolerance"`
	}
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	// Poppler's word boxes, in reading order, joined: a word ending in a
	// hyphen runs on into the next (plain pdftotext would drop the hyphen
	// as a hyphenation).
	pages, _ := pdfWords(t, filepath.Join(dir, "drawing.pdf"))
	var b strings.Builder
	for _, w := range pages[0] {
		b.WriteString(w.text)
		if !strings.HasSuffix(w.text, "-") {
			b.WriteString(" ")
		}
	}
	text := b.String()
	for _, name := range []string{rep.Name, rep.Stackup.Name} {
		if name == "" || !strings.Contains(text, name) {
			t.Errorf("sheet 1 does not name %q whole", name)
		}
	}
	// The as-built figures (tolerance median and 90th percentile, to
	// 0.1 dB with a true minus) and the verdict lead sheet 1; a verdict
	// other than a match is there in words.
	if rep.Tolerance == nil {
		t.Fatal("no tolerance analysis in the matrix build")
	}
	for _, v := range []float64{rep.Tolerance.P50, rep.Tolerance.P90} {
		if s := strings.ReplaceAll(fmt.Sprintf("%.1f dB", v), "-", "−"); !strings.Contains(text, s) {
			t.Errorf("sheet 1 lacks the as-built figure %s", s)
		}
	}
	if !strings.Contains(text, "verdict: "+rep.Summary.Verdict) {
		t.Errorf("sheet 1 lacks the verdict %q", rep.Summary.Verdict)
	}
}

// checkFrequencyTicks reads the x-axis tick labels of s11.svg (gonum's
// SVG: the row of numbers sharing one baseline) and checks that each
// label reads the value under it — the labels' centres (estimated with
// digit widths of half an em) lie on one straight line against their
// values — and that the label nearest f0 reads f0 in the axis's unit.
func checkFrequencyTicks(t *testing.T, dir string) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, "s11.svg"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		FrequencyHz float64 `json:"frequency_hz"`
	}
	raw, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, &rep); err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`<text x="([-\d.e]+)" y="([-\d.e]+)"[^>]*font-size:([\d.]+)px">([^<]*)</text>`)
	type lab struct{ x, y, size, v float64 }
	rows := map[string][]lab{}
	unit := ""
	for _, m := range re.FindAllStringSubmatch(string(data), -1) {
		text := m[4]
		if strings.HasPrefix(text, "frequency (") {
			unit = strings.TrimSuffix(strings.TrimPrefix(text, "frequency ("), ")")
			continue
		}
		v, err := strconv.ParseFloat(strings.ReplaceAll(text, "−", "-"), 64)
		if err != nil {
			continue
		}
		x, _ := strconv.ParseFloat(m[1], 64)
		size, _ := strconv.ParseFloat(m[3], 64)
		w := 0.0
		for _, r := range text {
			switch r {
			case '.':
				w += 0.25
			case '-', '−':
				w += 0.33
			default:
				w += 0.5
			}
		}
		rows[m[2]] = append(rows[m[2]], lab{x + w*size/2, 0, size, v})
	}
	var xs []lab
	for _, r := range rows {
		if len(r) > len(xs) {
			xs = r
		}
	}
	per := map[string]float64{"GHz": 1e9, "MHz": 1e6, "kHz": 1e3}[unit]
	if len(xs) < 3 || per == 0 {
		t.Fatalf("s11.svg: %d x tick labels, axis unit %q", len(xs), unit)
	}
	// Least-squares line centre = a + b·value.
	var sx, sy, sxx, sxy float64
	for _, l := range xs {
		sx, sy, sxx, sxy = sx+l.v, sy+l.x, sxx+l.v*l.v, sxy+l.v*l.x
	}
	n := float64(len(xs))
	b := (n*sxy - sx*sy) / (n*sxx - sx*sx)
	a := (sy - b*sx) / n
	for _, l := range xs {
		if d := math.Abs(a + b*l.v - l.x); d > 4 {
			t.Errorf("s11.svg: tick label %g is %.1f px off the position of its value", l.v, d)
		}
	}
	f0 := rep.FrequencyHz / per
	best := xs[0]
	for _, l := range xs {
		if math.Abs(l.x-(a+b*f0)) < math.Abs(best.x-(a+b*f0)) {
			best = l
		}
	}
	if math.Abs(best.v-f0) > 1e-9*f0 {
		t.Errorf("s11.svg: the tick label nearest f0 = %g %s reads %g", f0, unit, best.v)
	}
}
