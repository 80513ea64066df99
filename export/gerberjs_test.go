package export

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"stubcraft/export/internal/gerberread"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// The checks in this file read our Gerber files with a second independent
// reader: the npm packages gerber-parser 4.2.7 and gerber-plotter 4.2.8
// (tracespace project, MIT licence), readers of the Gerber Layer Format
// Specification, driven by testdata/gerberjs/area.js which paints the
// plotter's image objects and prints the dark area. That area is compared
// with the project's own reading of the same file (package gerberread,
// painted on the same 5 µm pixel by paintArea below). The checks skip when
// node or the installed modules (npm ci --prefix testdata/gerberjs, run by
// .ci/run) are absent.

// x2Ignored is the warning gerber-parser 4.2.7 gives for an X2 attribute
// command (%TF, %TA, %TO, %TD), which it does not know.
var x2Ignored = regexp.MustCompile(`^parser: block "%T[FAOD][^"]*" was not recognized and was ignored$`)

// gerberjsPixelMM is area.js's pixel, mm.
const gerberjsPixelMM = 0.005

// gerberjsResult is the part of area.js's JSON the checks use.
type gerberjsResult struct {
	Reader   string         `json:"reader"`
	AreaMM2  float64        `json:"areaMM2"`
	BoxMM    [4]float64     `json:"boxMM"`
	Objects  map[string]int `json:"objects"`
	Warnings []string       `json:"warnings"`
}

// gerberjsScript returns the script's path, or skips the test when node or
// the modules are missing.
func gerberjsScript(t *testing.T) (node, script string) {
	t.Helper()
	node, err := exec.LookPath("node")
	if err != nil {
		t.Skip("node not on PATH: skipping the gerber-parser/gerber-plotter check")
	}
	dir, err := filepath.Abs(filepath.Join("..", "testdata", "gerberjs"))
	if err != nil {
		t.Fatal(err)
	}
	for _, m := range []string{"gerber-parser", "gerber-plotter"} {
		if _, err := os.Stat(filepath.Join(dir, "node_modules", m, "package.json")); err != nil {
			t.Skipf("%s not installed (npm ci --prefix testdata/gerberjs): skipping the gerber-parser/gerber-plotter check", m)
		}
	}
	return node, filepath.Join(dir, "area.js")
}

// gerberjsArea writes data to a file and returns area.js's reading of it.
func gerberjsArea(t *testing.T, name string, data []byte) gerberjsResult {
	t.Helper()
	node, script := gerberjsScript(t)
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(node, script, p, "0.005")
	out, err := cmd.Output()
	if err != nil {
		msg := ""
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			msg = string(ee.Stderr)
		}
		t.Fatalf("node %s %s: %v\n%s", script, name, err, msg)
	}
	var r gerberjsResult
	if err := json.Unmarshal(out, &r); err != nil {
		t.Fatalf("area.js output %q: %v", out, err)
	}
	return r
}

// demoLayout builds the demo design's layout.
func demoLayout(t *testing.T) geom.Layout {
	t.Helper()
	in, err := synth.LoadDemo(synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	return res.Layout
}

// TestGerberjsArea compares, layer by layer, the area the npm reader paints
// with the area gerbv renders, for the demo, a layout with a via-shorted
// stub and a coplanar one: within 0.5 %.
func TestGerberjsArea(t *testing.T) {
	gerberjsScript(t)
	layouts := []struct {
		name   string
		layout func(t *testing.T) geom.Layout
	}{
		{"demo", demoLayout},
		{"shorted stub", func(t *testing.T) geom.Layout { return build(t, refSpec()) }},
		{"coplanar", func(t *testing.T) geom.Layout { return build(t, coplanarSpec()) }},
	}
	for _, lt := range layouts {
		t.Run(lt.name, func(t *testing.T) {
			l := lt.layout(t)
			files := gerberFiles(t, l)
			for _, ly := range []Layer{CopperTop, CopperBottom, SoldermaskTop, Profile} {
				if !ly.Has(l) {
					continue
				}
				name := ly.FileName(l.Name)
				js := gerberjsArea(t, name, files[name])
				for _, w := range js.Warnings {
					// The parser predates Gerber X2 and ignores each
					// attribute command with a warning; anything else
					// fails.
					if !x2Ignored.MatchString(w) {
						t.Errorf("%s: %s warned: %s", name, js.Reader, w)
					}
				}
				own := paintArea(t, parse(t, files[name]), gerberjsPixelMM*1e6)
				diff := (js.AreaMM2 - own) / own
				t.Logf("%s: %s %.4f mm², gerberread %.4f mm², difference %+.3f %%", name, js.Reader, js.AreaMM2, own, 100*diff)
				if math.Abs(diff) > 0.005 {
					t.Errorf("%s: %s paints %.4f mm², gerberread %.4f mm²: %+.2f %%, want within 0.5 %%", name, js.Reader, js.AreaMM2, own, 100*diff)
				}
			}
		})
	}
}

// paintArea paints a file as gerberread reads it on a square pixel of px nm
// (a pixel is dark when its centre is inside a region, a flashed pad or a
// draw's sweep of its circular aperture) and returns the dark area, mm².
func paintArea(t *testing.T, f *gerberread.File, px float64) float64 {
	t.Helper()
	var x0, y0, x1, y1 = math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	grow := func(x, y, r float64) {
		x0, y0 = math.Min(x0, x-r), math.Min(y0, y-r)
		x1, y1 = math.Max(x1, x+r), math.Max(y1, y+r)
	}
	for _, r := range f.Regions {
		for _, p := range r.Outline {
			grow(float64(p.X), float64(p.Y), 0)
		}
	}
	for _, fl := range f.Flashes {
		a := f.Apertures[fl.D]
		grow(float64(fl.At.X), float64(fl.At.Y), float64(max(a.W, a.H)))
	}
	for _, d := range f.Draws {
		a := f.Apertures[d.D]
		if a.Shape != "C" {
			t.Fatalf("draw with aperture %s: paintArea knows circular draws only", a.Shape)
		}
		grow(float64(d.From.X), float64(d.From.Y), float64(a.W))
		grow(float64(d.To.X), float64(d.To.Y), float64(a.W))
	}
	nx, ny := int(math.Ceil((x1-x0)/px)), int(math.Ceil((y1-y0)/px))
	img := make([]bool, nx*ny)
	cx := func(i int) float64 { return x0 + (float64(i)+0.5)*px }
	cy := func(j int) float64 { return y0 + (float64(j)+0.5)*px }
	box := func(xa, ya, xb, yb float64, in func(x, y float64) bool) {
		ia, ib := max(0, int((xa-x0)/px)-1), min(nx-1, int((xb-x0)/px)+1)
		ja, jb := max(0, int((ya-y0)/px)-1), min(ny-1, int((yb-y0)/px)+1)
		for j := ja; j <= jb; j++ {
			for i := ia; i <= ib; i++ {
				if in(cx(i), cy(j)) {
					img[j*nx+i] = true
				}
			}
		}
	}
	for _, r := range f.Regions {
		p := r.Outline
		xa, ya, xb, yb := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
		for _, q := range p {
			xa, ya = math.Min(xa, float64(q.X)), math.Min(ya, float64(q.Y))
			xb, yb = math.Max(xb, float64(q.X)), math.Max(yb, float64(q.Y))
		}
		box(xa, ya, xb, yb, func(x, y float64) bool {
			in := false // even–odd crossing test
			for k := range p {
				a, b := p[k], p[(k+1)%len(p)]
				ay, by := float64(a.Y), float64(b.Y)
				if (ay <= y) != (by <= y) && x < float64(a.X)+(y-ay)*float64(b.X-a.X)/(by-ay) {
					in = !in
				}
			}
			return in
		})
	}
	for _, fl := range f.Flashes {
		a := f.Apertures[fl.D]
		ox, oy := float64(fl.At.X), float64(fl.At.Y)
		w, h := float64(a.W)/2, float64(a.H)/2
		switch a.Shape {
		case "C":
			box(ox-w, oy-w, ox+w, oy+w, func(x, y float64) bool { return (x-ox)*(x-ox)+(y-oy)*(y-oy) <= w*w })
		case "R":
			box(ox-w, oy-h, ox+w, oy+h, func(x, y float64) bool { return math.Abs(x-ox) <= w && math.Abs(y-oy) <= h })
		default:
			t.Fatalf("flash with aperture %s: paintArea knows C and R only", a.Shape)
		}
	}
	for _, d := range f.Draws {
		r := float64(f.Apertures[d.D].W) / 2
		ax, ay, bx, by := float64(d.From.X), float64(d.From.Y), float64(d.To.X), float64(d.To.Y)
		dx, dy := bx-ax, by-ay
		box(math.Min(ax, bx)-r, math.Min(ay, by)-r, math.Max(ax, bx)+r, math.Max(ay, by)+r, func(x, y float64) bool {
			s := 0.0
			if l2 := dx*dx + dy*dy; l2 > 0 {
				s = math.Max(0, math.Min(1, ((x-ax)*dx+(y-ay)*dy)/l2))
			}
			ex, ey := x-ax-s*dx, y-ay-s*dy
			return ex*ex+ey*ey <= r*r
		})
	}
	n := 0
	for _, v := range img {
		if v {
			n++
		}
	}
	return float64(n) * px * px * 1e-12
}

// TestGerberjsAlteredFile shows the check can fail: the npm reader, given
// the shorted-stub layout's top copper with stub s1 drawn 1 mm longer
// (1.2 mm², 3 %), disagrees with gerberread's reading of the file as
// written by more than 0.5 %. It also anchors the reader to the hand-worked
// copper area of that layout, 39.6 mm² (see TestGerbvCopperArea).
func TestGerberjsAlteredFile(t *testing.T) {
	gerberjsScript(t)
	l := build(t, refSpec())
	data := gerberBytes(t, l, CopperTop)
	own := paintArea(t, parse(t, data), gerberjsPixelMM*1e6)
	js := gerberjsArea(t, "ref-copper-top.gbr", data)
	if math.Abs(js.AreaMM2-39.6) > 0.005*39.6 {
		t.Errorf("%s paints %.4f mm² of the shorted-stub layout's copper, hand-worked 39.6 mm² ± 0.5 %%", js.Reader, js.AreaMM2)
	}
	altered := string(data)
	for _, v := range []string{"X8800000Y12800000D01*", "X7600000Y12800000D01*"} {
		if !strings.Contains(altered, v) {
			t.Fatalf("the stub's end vertex %s is not in the file; the alteration needs updating", v)
		}
		altered = strings.Replace(altered, v, strings.Replace(v, "Y12800000", "Y13800000", 1), 1)
	}
	alt := gerberjsArea(t, "ref-copper-top-altered.gbr", []byte(altered))
	diff := (alt.AreaMM2 - own) / own
	t.Logf("altered file: %s %.4f mm², gerberread of the written file %.4f mm², difference %+.3f %%", alt.Reader, alt.AreaMM2, own, 100*diff)
	if math.Abs(diff) <= 0.005 {
		t.Errorf("a stub 1 mm longer passes the 0.5 %% check (%+.3f %%): the check cannot fail", 100*diff)
	}
}
