package export_test

import (
	"bytes"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"stubcraft/export"
	"stubcraft/export/internal/gerberread"
)

// gerberArea returns the area of a parsed Gerber's regions and flashes,
// mm², each object counted once (as the DXF has one closed polyline per
// object).
func gerberArea(f *gerberread.File) float64 {
	var a float64
	for _, r := range f.Regions {
		a += math.Abs(r.Outline.Area()) * 1e-12
	}
	for _, fl := range f.Flashes {
		ap := f.Apertures[fl.D]
		if ap.Shape == "C" {
			a += math.Pi * math.Pow(float64(ap.W)*1e-6/2, 2)
		} else {
			a += float64(ap.W) * float64(ap.H) * 1e-12
		}
	}
	return a
}

// TestDXFAgainstGerber reads NAME.dxf with ezdxf (Debian python3-ezdxf,
// driven by testdata/dxf/dxf_areas.py), an independent DXF reader: the
// drawing is in millimetres ($INSUNITS 4), every copper, mask, outline and
// drill shape is a closed polyline, and the area per layer equals the area
// of the same objects in the parsed Gerber files (and the Excellon holes)
// within 0.1 %.
func TestDXFAgainstGerber(t *testing.T) {
	py := "/usr/bin/python3"
	if _, err := os.Stat(py); err != nil {
		t.Skip("Debian's /usr/bin/python3 is absent: the DXF is not checked")
	}
	if err := exec.Command(py, "-c", "import ezdxf").Run(); err != nil {
		t.Skip("python3-ezdxf is not installed (apt-get install python3-ezdxf): the DXF is not checked")
	}
	for _, c := range []struct{ name, path string }{
		{"demo", ""},
		{"shorted, legend, layer pair", "../testdata/designs/sensor-antenna-by-hand.toml"},
		{"edge launch, via fence", "../testdata/designs/edge-launch-fence.toml"},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, files := buildFiles(t, c.path)
			base := res.Layout.Name
			dxf := files[export.DXFFileName(base)]
			if len(dxf) == 0 {
				t.Fatal("the build wrote no DXF")
			}
			p := filepath.Join(t.TempDir(), "board.dxf")
			if err := os.WriteFile(p, dxf, 0o644); err != nil {
				t.Fatal(err)
			}
			out, err := exec.Command(py, "../testdata/dxf/dxf_areas.py", p).CombinedOutput()
			if err != nil {
				t.Fatalf("dxf_areas.py: %v\n%s", err, out)
			}
			got := map[string]float64{}
			closed := map[string]int{}
			for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
				f := strings.Fields(line)
				switch {
				case len(f) == 2 && f[0] == "units":
					if f[1] != "4" {
						t.Errorf("DXF units %s, want 4 (mm)", f[1])
					}
				case len(f) == 4:
					got[f[0]], _ = strconv.ParseFloat(f[3], 64)
					closed[f[0]], _ = strconv.Atoi(f[1])
					if f[0] != export.DXFLegendTop && f[2] != "0" {
						t.Errorf("layer %s has %s open polylines", f[0], f[2])
					}
				default:
					t.Errorf("dxf_areas.py: %q", line)
				}
			}
			read := func(ly export.Layer) *gerberread.File {
				f, err := gerberread.Read(bytes.NewReader(files[ly.FileName(base)]))
				if err != nil {
					t.Fatal(err)
				}
				return f
			}
			want := map[string]float64{
				export.DXFCopperTop:    gerberArea(read(export.CopperTop)),
				export.DXFCopperBottom: gerberArea(read(export.CopperBottom)),
				export.DXFMaskTop:      gerberArea(read(export.SoldermaskTop)),
			}
			lo, hi := res.Layout.Board.Bounds()
			want[export.DXFOutline] = float64(hi.X-lo.X) * float64(hi.Y-lo.Y) * 1e-12
			if len(res.Layout.Vias) > 0 {
				d, err := gerberread.ReadExcellon(bytes.NewReader(files[export.ExcellonFileName(base)]))
				if err != nil {
					t.Fatal(err)
				}
				var a float64
				for _, h := range d.Hits {
					a += math.Pi * math.Pow(float64(h.Drill)*1e-6/2, 2)
				}
				want[export.DXFDrill] = a
			}
			for layer, w := range want {
				if g := got[layer]; math.Abs(g-w) > 0.001*w {
					t.Errorf("%s: DXF %.6f mm², Gerber %.6f mm² (want within 0.1 %%)", layer, g, w)
				}
			}
			if closed[export.DXFCopperTop] != len(res.Layout.Copper)+len(res.Layout.Pads) {
				t.Errorf("%d closed top copper polylines, want %d", closed[export.DXFCopperTop], len(res.Layout.Copper)+len(res.Layout.Pads))
			}
		})
	}
}
