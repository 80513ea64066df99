package export

import (
	"bytes"
	"image"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"stubcraft/synth/geom"
)

// The checks in this file render our files with gerbv (Debian package
// gerbv 2.9.6), an independent reader of the Gerber and Excellon formats,
// and measure the pictures. They skip when gerbv is not on PATH.

const dpi = 2000

// gerbvNoise is the one message gerbv 2.9 is expected to print: it predates
// Gerber X2 and reports every attribute command as unknown.
var gerbvNoise = regexp.MustCompile(`^\*\* \(process:\d+\): CRITICAL \*\*: [0-9:.]+: Unknown RS-274X extension found %T[FAOD]% at line \d+ in file `)

// render writes the named files into a temporary directory, renders them
// with gerbv in one picture (black background; the layers red, green, blue
// in order) and returns it. It fails the test on a non-zero exit status or
// on any output line other than one unknown-attribute notice per X2
// attribute command in the files.
func render(t *testing.T, files map[string][]byte, order ...string) image.Image {
	t.Helper()
	return renderDPI(t, dpi, files, order...)
}

// renderDPI is render at the given resolution, dots per inch.
func renderDPI(t *testing.T, dpi int, files map[string][]byte, order ...string) image.Image {
	t.Helper()
	bin, err := exec.LookPath("gerbv")
	if err != nil {
		t.Skip("gerbv not on PATH (apt-get install gerbv): skipping the independent-reader check")
	}
	dir := t.TempDir()
	args := []string{"-x", "png", "--dpi=" + strconv.Itoa(dpi), "--border=0", "-b", "#000000"}
	colours := []string{"#FF0000FF", "#00FF00FF", "#0000FFFF"}
	var paths []string
	attrs := 0
	for i, name := range order {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, files[name], 0o644); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, p)
		args = append(args, "-f", colours[i])
		for _, line := range strings.Split(string(files[name]), "\n") {
			for _, cmd := range []string{"%TF.", "%TA.", "%TO.", "%TD"} {
				attrs += strings.Count(line, cmd)
			}
		}
	}
	out := filepath.Join(dir, "out.png")
	args = append(append(args, "-o", out), paths...)
	cmd := exec.Command(bin, args...)
	cmd.Env = append(os.Environ(), "DISPLAY=") // -x png needs no X display
	msg, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("gerbv %v: %v\n%s", args, err, msg)
	}
	notices := 0
	for _, line := range strings.Split(string(msg), "\n") {
		line = strings.TrimSpace(line)
		switch {
		case line == "":
		case gerbvNoise.MatchString(line):
			notices++
		default:
			t.Errorf("gerbv said: %s", line)
		}
	}
	if notices != attrs {
		t.Errorf("gerbv reported %d unknown attribute commands, the files have %d", notices, attrs)
	}
	f, err := os.Open(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	return img
}

// lit counts the pixels whose channel c (0 red, 1 green, 2 blue) is over
// half, and returns their count and the centroid in image pixels.
func lit(img image.Image, c int) (n int, cx, cy float64) {
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			v := [3]uint32{r, g, bl}[c]
			if v > 0x8000 {
				n++
				cx += float64(x) + 0.5
				cy += float64(y) + 0.5
			}
		}
	}
	if n > 0 {
		cx, cy = cx/float64(n), cy/float64(n)
	}
	return n, cx, cy
}

const pixelMM = 25.4 / dpi // one pixel, mm

func gerberFiles(t *testing.T, l geom.Layout) map[string][]byte {
	files := map[string][]byte{}
	for _, ly := range LayersOf(l) {
		files[ly.FileName(l.Name)] = gerberBytes(t, l, ly)
	}
	if len(l.Vias) == 0 {
		return files
	}
	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	files[ExcellonFileName(l.Name)] = b.Bytes()
	return files
}

// circleOutsideStrip is the exact area of a circle of radius r outside the
// strip |x| ≤ a through its centre: πr² − 2(a√(r²−a²) + r² asin(a/r)).
func circleOutsideStrip(r, a float64) float64 {
	return math.Pi*r*r - 2*(a*math.Sqrt(r*r-a*a)+r*r*math.Asin(a/r))
}

func TestGerbvCopperArea(t *testing.T) {
	overhang := refSpec()
	overhang.Name = "overhang"
	overhang.Stubs[1].Via = &geom.ViaSpec{Drill: 0.6e-3, Pad: 1.6e-3}
	tests := []struct {
		name   string
		spec   geom.Spec
		areaMM float64 // copper area, mm², worked by hand
	}{
		// 39.2 mm² of line and stubs (see geom's TestBuildReference) plus
		// two port pads 1 × 2 mm over a 1.8 mm feed: 2 × 1 × 0.2 mm².
		// The 0.8 mm via pad lies inside the 1.2 mm stub.
		{"reference", refSpec(), 39.6},
		// A 1.6 mm via pad on the 1.0 mm stub s2 adds the circle outside
		// the stub's strip (exact geometry).
		{"via pad wider than stub", overhang, 39.6 + circleOutsideStrip(0.8, 0.5)},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			l := build(t, tt.spec)
			files := gerberFiles(t, l)
			top := CopperTop.FileName(l.Name)
			n, _, _ := lit(render(t, files, top), 0)
			got := float64(n) * pixelMM * pixelMM
			t.Logf("rendered copper %.4f mm², geometry %.4f mm²", got, tt.areaMM)
			if math.Abs(got-tt.areaMM) > 0.02*tt.areaMM {
				t.Errorf("rendered copper %.3f mm², want %.3f mm² ± 2 %%", got, tt.areaMM)
			}
		})
	}
}

// TestGerbvLayers renders the other layers and compares the lit area with
// the geometry's exact area, and the outline's size with the board.
func TestGerbvLayers(t *testing.T) {
	l := build(t, refSpec())
	files := gerberFiles(t, l)
	_, bmax := l.Board.Bounds()
	boardArea := float64(bmax.X) * float64(bmax.Y) * 1e-12
	var maskArea float64
	for _, p := range l.MaskOpenings {
		maskArea += p.Area() * 1e-12
	}
	d := float64(l.Vias[0].Drill) * 1e-6
	for _, tt := range []struct {
		layer  Layer
		areaMM float64
	}{
		{CopperBottom, boardArea},
		{SoldermaskTop, maskArea},
		{DrillPTH, math.Pi * d * d / 4},
	} {
		t.Run(tt.layer.String(), func(t *testing.T) {
			n, _, _ := lit(render(t, files, tt.layer.FileName(l.Name)), 0)
			got := float64(n) * pixelMM * pixelMM
			t.Logf("rendered %.4f mm², geometry %.4f mm²", got, tt.areaMM)
			if math.Abs(got-tt.areaMM) > 0.02*tt.areaMM {
				t.Errorf("rendered %.4f mm², want %.4f mm² ± 2 %%", got, tt.areaMM)
			}
		})
	}
	t.Run("profile", func(t *testing.T) {
		img := render(t, files, Profile.FileName(l.Name))
		// The picture spans the outline's draw: the board plus one line width.
		lw := float64(ProfileLineWidth) * 1e-6
		for _, c := range []struct {
			what    string
			px      int
			boardMM float64
		}{
			{"x", img.Bounds().Dx(), float64(bmax.X) * 1e-6},
			{"y", img.Bounds().Dy(), float64(bmax.Y) * 1e-6},
		} {
			t.Logf("board %s: %d px = %.4f mm, board %.4f mm + line", c.what, c.px, float64(c.px)*pixelMM, c.boardMM)
			if got := float64(c.px) * pixelMM; math.Abs(got-(c.boardMM+lw)) > 2*pixelMM {
				t.Errorf("rendered board %s = %.3f mm, want %.3f mm + %.3f mm line", c.what, got, c.boardMM, lw)
			}
		}
	})
}

// TestGerbvExcellon renders the outline (red) with the Excellon file
// (green): gerbv's own Excellon reader must put the hole where the layout
// has the via, relative to the board.
func TestGerbvExcellon(t *testing.T) {
	l := build(t, refSpec())
	files := gerberFiles(t, l)
	img := render(t, files, Profile.FileName(l.Name), ExcellonFileName(l.Name))
	n, cx, cy := lit(img, 1)
	d := float64(l.Vias[0].Drill) * 1e-6
	if got, want := float64(n)*pixelMM*pixelMM, math.Pi*d*d/4; math.Abs(got-want) > 0.05*want {
		t.Errorf("hole area %.4f mm², want %.4f mm² ± 5 %%", got, want)
	}
	// Image (0, 0) is the top-left of the outline's draw, half a line
	// width outside the board corner.
	half := float64(ProfileLineWidth) * 1e-6 / 2
	x := cx*pixelMM - half
	y := float64(img.Bounds().Dy())*pixelMM - cy*pixelMM - half
	v := l.Vias[0].Center
	t.Logf("hole %d px at (%.4f, %.4f) mm, layout (%.4f, %.4f) mm", n, x, y, float64(v.X)*1e-6, float64(v.Y)*1e-6)
	if math.Abs(x-float64(v.X)*1e-6) > 2*pixelMM || math.Abs(y-float64(v.Y)*1e-6) > 2*pixelMM {
		t.Errorf("hole at (%.3f, %.3f) mm, want (%.3f, %.3f) mm", x, y, float64(v.X)*1e-6, float64(v.Y)*1e-6)
	}
}

// TestGerbvLegend: gerbv reads the legend file without any message other
// than its unknown-attribute notices, and draws ink.
func TestGerbvLegend(t *testing.T) {
	s := refSpec()
	s.EdgeClearance, s.LegendTitle, s.LegendNote = 0.3e-3, "ref", "F0 2.45GHZ"
	l := build(t, s)
	if len(l.Legend) == 0 {
		t.Fatal("no legend on the reference board")
	}
	files := gerberFiles(t, l)
	if n, _, _ := lit(render(t, files, LegendTop.FileName(l.Name)), 0); n == 0 {
		t.Error("gerbv drew no legend ink")
	}
}
