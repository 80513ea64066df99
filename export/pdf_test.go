package export

import (
	"bytes"
	"compress/zlib"
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
)

// poppler returns the path of a poppler-utils tool, or skips the test.
func poppler(t *testing.T, tool string) string {
	t.Helper()
	p, err := exec.LookPath(tool)
	if err != nil {
		t.Skipf("%s (Debian poppler-utils) is not installed: %v", tool, err)
	}
	return p
}

// writeDrawing writes the drawing of ds to a temporary file and returns
// its path and bytes.
func writeDrawing(t *testing.T, ds drawingSpec, page, fit string) (string, []byte) {
	t.Helper()
	return writeReportDrawing(t, fixtureReport(ds), ds, page, fit)
}

// writeReportDrawing is writeDrawing with a report of the test's own.
func writeReportDrawing(t *testing.T, rep Report, ds drawingSpec, page, fit string) (string, []byte) {
	t.Helper()
	var buf bytes.Buffer
	if err := WritePDF(&buf, rep, fixtureLayout(t, ds), fixtureOptions(page, fit)); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "drawing.pdf")
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	if dir := os.Getenv("STUBCRAFT_DRAWING_DIR"); dir != "" {
		// For a person to look at: pdftoppm -png the files written here.
		name := fmt.Sprintf("%s-%s-%s.pdf", strings.ReplaceAll(t.Name(), "/", "_"), page, fit)
		_ = os.WriteFile(filepath.Join(dir, name), buf.Bytes(), 0o644)
	}
	return path, buf.Bytes()
}

func run(t *testing.T, name string, args ...string) string {
	t.Helper()
	out, err := exec.Command(name, args...).CombinedOutput()
	if err != nil {
		t.Fatalf("%s %v: %v\n%s", name, args, err, out)
	}
	return string(out)
}

// pdfText is the text poppler's pdftotext reads from the file.
func pdfText(t *testing.T, path string) string {
	return run(t, poppler(t, "pdftotext"), "-enc", "UTF-8", path, "-")
}

// Expected strings are written out by hand from the fixture's values (in
// mm with three decimals for widths and lengths, U+2212 for a minus), not
// taken from the code under test.
func TestPDFTextHasEveryValue(t *testing.T) {
	cases := []struct {
		name string
		ds   drawingSpec
		want []string
	}{
		{"open stub", openStub(), []string{
			"2.985",           // every segment and stub width
			"5.000",           // feed drawn lengths; stub centre to the source edge (17.345 − 12.345)
			"7.345",           // line-1 drawn length
			"9.876",           // stub drawn length
			"12.345",          // stub centre from the load port / board edge: 5 + 7.345
			"17.345",          // board length: 5 + 7.345 + 5
			"22.861",          // board height: 2·5 margin + 1.4925 + 1.4925 + 9.876
			"7.999", "10.609", // line lengths before the corrections
			"−0.512", "−0.221", "−0.789", "+0.135", // corrections
			"50.00", "41.27", "58.36", "3.337", "0.1146", // Z0, degrees, εeff, 41.27°/360 in λ
			"−31.4 dB", "−10 dB", "f0 2.45 GHz",
			"Ω", "εr = 4.30", "µm", "(°)", "(λ)", "±", "tan δ = 0.0200",
			"fr4-1.6mm", "2024-05-17", "stubcraft 0.0.0-test", "sheet", "1 of 2", "2 of 2",
			"ref. plane", "Print at 100 %, no fit-to-page",
			"Verify the etched board with a network analyser", // export.Cautions()[0]
			"re-centred line-1", "extrapolated",
		}},
		{"shorted stub down", drawingSpec{line: 7.345, stubW: 1.2, stubL: 8.5, via: true, side: -1}, []string{
			"1.200", // stub width
			"8.100", // drawn length to the via centre: 8.5 − 0.8/2
			"Ø0.400", "Ø0.800",
			"21.485", // board height: 2·5 + 1.4925 + 1.4925 + 8.5
			"to via centre",
		}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path, _ := writeDrawing(t, c.ds, "a4", "scale")
			text := pdfText(t, path)
			for _, w := range c.want {
				if !strings.Contains(text, w) {
					t.Errorf("pdftotext does not find %q", w)
				}
			}
			for _, c := range Cautions() {
				first := strings.Join(strings.Fields(c)[:5], " ")
				if !strings.Contains(strings.Join(strings.Fields(text), " "), first) {
					t.Errorf("caution %q missing", first)
				}
			}
			if strings.Contains(text, "NOT TO SCALE") {
				t.Error("a board that fits is marked NOT TO SCALE")
			}
		})
	}
}

// Page sizes from ISO 216 (A4 210 × 297 mm = 595.28 × 841.89 pt) and
// ANSI/ASME Y14.1 (Letter 8.5 × 11 in = 612 × 792 pt), as pdfinfo prints
// them.
func TestPDFPageSizeAndRender(t *testing.T) {
	for _, c := range []struct{ page, want string }{
		{"a4", "595.28 x 841.89 pts"},
		{"letter", "612 x 792 pts"},
	} {
		t.Run(c.page, func(t *testing.T) {
			path, _ := writeDrawing(t, openStub(), c.page, "scale")
			info := run(t, poppler(t, "pdfinfo"), path)
			if !strings.Contains(info, c.want) {
				t.Errorf("pdfinfo page size: want %q in\n%s", c.want, info)
			}
			if !strings.Contains(info, "May 17 08:30:00 2024") {
				t.Errorf("pdfinfo creation date: want 2024-05-17 08:30:00 in\n%s", info)
			}
			pages := pageCount(t, info)
			dir := t.TempDir()
			run(t, poppler(t, "pdftoppm"), "-r", "40", "-png", path, filepath.Join(dir, "p"))
			got, _ := filepath.Glob(filepath.Join(dir, "p*.png"))
			if len(got) != pages || pages < 2 {
				t.Errorf("pdftoppm rendered %d pages of %d", len(got), pages)
			}
		})
	}
}

func pageCount(t *testing.T, info string) int {
	t.Helper()
	m := regexp.MustCompile(`Pages:\s+(\d+)`).FindStringSubmatch(info)
	if m == nil {
		t.Fatalf("no page count in pdfinfo output:\n%s", info)
	}
	n, _ := strconv.Atoi(m[1])
	return n
}

// contentStreams inflates every Flate stream of the file and returns the
// page content streams that draw a scale bar, in file order (gofpdf writes
// the pages in order).
func contentStreams(t *testing.T, pdf []byte) []string {
	t.Helper()
	return markedStreams(t, pdf, "/ScaleBar BMC")
}

// markedStreams is contentStreams for the streams that hold marked
// content tag (a "/Name BMC" line).
func markedStreams(t *testing.T, pdf []byte, tag string) []string {
	t.Helper()
	var out []string
	re := regexp.MustCompile(`(?s)stream\r?\n(.*?)\r?\nendstream`)
	for _, m := range re.FindAllSubmatch(pdf, -1) {
		zr, err := zlib.NewReader(bytes.NewReader(m[1]))
		if err != nil {
			continue
		}
		b, err := io.ReadAll(zr)
		if err != nil {
			continue
		}
		if s := string(b); strings.Contains(s, tag) {
			out = append(out, s)
		}
	}
	return out
}

const mmPerPt = 25.4 / 72 // 1 pt in mm (PDF 32000-1 §8.3.2.3: user space unit 1/72 in)

// scaleBarMM reads the scale bar's length in mm from a content stream:
// the line "x1 y1 m x2 y2 l S" in its marked-content section.
func scaleBarMM(t *testing.T, s string) float64 {
	t.Helper()
	m := regexp.MustCompile(`/ScaleBar BMC\n(?:[^\n]*\n)*?([-\d.]+) ([-\d.]+) m ([-\d.]+) ([-\d.]+) l S`).FindStringSubmatch(s)
	if m == nil {
		t.Fatal("no scale bar line in the content stream")
	}
	v := floats(t, m[1:])
	return math.Hypot(v[2]-v[0], v[3]-v[1]) * mmPerPt
}

// outlineMM reads the board outline's size in mm: the "x y w h re" in its
// marked-content section.
func outlineMM(t *testing.T, s string) (w, h float64) {
	t.Helper()
	m := regexp.MustCompile(`/BoardOutline BMC\n(?:[^\n]*\n)*?([-\d.]+) ([-\d.]+) ([-\d.]+) ([-\d.]+) re`).FindStringSubmatch(s)
	if m == nil {
		t.Fatal("no board outline in the content stream")
	}
	v := floats(t, m[1:])
	return math.Abs(v[2]) * mmPerPt, math.Abs(v[3]) * mmPerPt
}

func floats(t *testing.T, ss []string) []float64 {
	t.Helper()
	v := make([]float64, len(ss))
	for i, s := range ss {
		f, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		v[i] = f
	}
	return v
}

// The drawing is at true scale: the scale bar measures 50 mm and the
// board outline the board's hand-worked size, within 0.05 mm, read back
// in points from the PDF itself.
func TestPDFTrueScale(t *testing.T) {
	for _, page := range []string{"a4", "letter"} {
		t.Run(page, func(t *testing.T) {
			_, pdf := writeDrawing(t, openStub(), page, "scale")
			cs := contentStreams(t, pdf)
			if len(cs) != 1 {
				t.Fatalf("%d sheets with a scale bar, want 1", len(cs))
			}
			if got := scaleBarMM(t, cs[0]); math.Abs(got-50) > 0.05 {
				t.Errorf("scale bar %.3f mm, want 50 ± 0.05 mm", got)
			}
			w, h := outlineMM(t, cs[0])
			if math.Abs(w-17.345) > 0.05 || math.Abs(h-22.861) > 0.05 {
				t.Errorf("board outline %.3f × %.3f mm, want 17.345 × 22.861 mm (by hand) ± 0.05", w, h)
			}
		})
	}
}

// A board too long for the page at 1:1: a 200 mm line gives a 210 mm board
// (5 + 200 + 5), wider than an A4 sheet; at 1:2 it is 105 mm, which fits
// with room for the dimensions.
func bigBoard() drawingSpec { return drawingSpec{line: 200, stubW: 2.985, stubL: 9.876, side: 1} }

func TestPDFBigBoardScaled(t *testing.T) {
	path, pdf := writeDrawing(t, bigBoard(), "a4", "scale")
	text := pdfText(t, path)
	for _, w := range []string{"NOT TO SCALE 1:1", "drawn at 1:2", "210.000"} {
		if !strings.Contains(text, w) {
			t.Errorf("pdftotext does not find %q", w)
		}
	}
	cs := contentStreams(t, pdf)
	if len(cs) != 1 {
		t.Fatalf("%d board sheets, want 1", len(cs))
	}
	// At 1:2 (ISO 5455) the bar for 50 mm of board is 25 mm of paper and
	// the outline half the board.
	if got := scaleBarMM(t, cs[0]); math.Abs(got-25) > 0.05 {
		t.Errorf("scale bar %.3f mm on paper, want 25 (50 mm at 1:2)", got)
	}
	if w, h := outlineMM(t, cs[0]); math.Abs(w-105) > 0.05 || math.Abs(h-22.861/2) > 0.05 {
		t.Errorf("outline %.3f × %.3f mm, want 105 × 11.431 (210 × 22.861 at 1:2)", w, h)
	}
}

func TestPDFBigBoardTiled(t *testing.T) {
	small, _ := writeDrawing(t, openStub(), "a4", "tile")
	path, pdf := writeDrawing(t, bigBoard(), "a4", "tile")
	text := pdfText(t, path)
	if strings.Contains(text, "NOT TO SCALE") {
		t.Error("a tiled 1:1 drawing says NOT TO SCALE")
	}
	if !strings.Contains(text, "tile 1 of 2") {
		t.Error("no tile note")
	}
	cs := contentStreams(t, pdf)
	if len(cs) < 2 {
		t.Fatalf("%d board sheets, want at least 2 tiles", len(cs))
	}
	for i, s := range cs {
		if got := scaleBarMM(t, s); math.Abs(got-50) > 0.05 {
			t.Errorf("tile %d: scale bar %.3f mm, want 50 ± 0.05", i+1, got)
		}
		if w, h := outlineMM(t, s); math.Abs(w-210) > 0.05 || math.Abs(h-22.861) > 0.05 {
			t.Errorf("tile %d: outline %.3f × %.3f mm, want 210 × 22.861 at 1:1", i+1, w, h)
		}
	}
	info := func(p string) int { return pageCount(t, run(t, poppler(t, "pdfinfo"), p)) }
	if nb, ns := info(path), info(small); nb <= ns {
		t.Errorf("tiled big board has %d pages, the small one %d: want more", nb, ns)
	}
	dir := t.TempDir()
	run(t, poppler(t, "pdftoppm"), "-r", "30", "-png", path, filepath.Join(dir, "p"))
}

func TestPDFDeterministic(t *testing.T) {
	_, a := writeDrawing(t, openStub(), "a4", "scale")
	_, b := writeDrawing(t, openStub(), "a4", "scale")
	if !bytes.Equal(a, b) {
		t.Error("the same input gave different bytes")
	}
	var c bytes.Buffer
	opt := fixtureOptions("a4", "scale")
	opt.Created = opt.Created.Add(86400e9)
	if err := WritePDF(&c, fixtureReport(openStub()), fixtureLayout(t, openStub()), opt); err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(a, c.Bytes()) {
		t.Error("a different creation date gave the same bytes")
	}
}

func TestPDFRefusesBadOptions(t *testing.T) {
	for _, opt := range []DrawingOptions{{Page: "a3"}, {Fit: "shrink"}} {
		var buf bytes.Buffer
		if err := WritePDF(&buf, fixtureReport(openStub()), fixtureLayout(t, openStub()), opt); err == nil {
			t.Errorf("%+v: no error", opt)
		}
	}
}

func BenchmarkWritePDF(b *testing.B) {
	rep, lay := fixtureReport(openStub()), fixtureLayout(b, openStub())
	opt := fixtureOptions("a4", "scale")
	for b.Loop() {
		if err := WritePDF(io.Discard, rep, lay, opt); err != nil {
			b.Fatal(err)
		}
	}
}
