package export

import (
	"bytes"
	"context"
	"math"
	"strings"
	"testing"

	"stubcraft/physical"
	"stubcraft/synth"
)

// The calibration structures read back from their own Gerber files: the
// thru is the two launches, the line is longer by a quarter wave at f0
// (λg/4 from the line model's β, the definition), the reflect is two open
// halves of one launch each, the coupon is CouponLength; each has its own
// outline and job file. Exact to the 1 nm grid, checked to 1 µm.
func TestStructuresInGerber(t *testing.T) {
	text := `
name = "kit"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "31-j24"
[match]
topology = "shunt-stub"
stub = "open"
[layout]
feed_length = "6mm"
[panel]
structures = ["reflect", "thru", "coupon", "line"]
`
	in, err := synth.ReadDesign(strings.NewReader(text), "kit.toml", "", synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Structures) != 4 {
		t.Fatalf("%d structures", len(res.Structures))
	}
	files := map[string][]byte{}
	for _, a := range StructureFiles(res, FileOptions{Version: "test", Created: refMeta().Created}) {
		var b bytes.Buffer
		if err := a.Write(&b); err != nil {
			t.Fatalf("%s: %v", a.Name, err)
		}
		files[a.Name] = b.Bytes()
	}
	port := res.Physical.Elements[0]
	line, err := physical.NewMicrostrip(port.Width, res.Physical.Board.Sub)
	if err != nil {
		t.Fatal(err)
	}
	quarter := math.Pi / 2 / line.At(2.45e9).Beta()
	want := map[string]struct {
		regions int
		spans   []float64 // copper x extents, mm
	}{
		"thru":    {1, []float64{12}},
		"line":    {1, []float64{12 + quarter*1e3}},
		"reflect": {2, []float64{6, 6}},
		"coupon":  {1, []float64{synth.CouponLength * 1e3}},
	}
	for _, s := range res.Structures {
		kind := s.Kind.String()
		name := "kit-cal-" + kind
		if files[name+".gbrjob"] == nil || files[name+"-outline.gbr"] == nil {
			t.Errorf("%s: no job or outline file", name)
		}
		top := parse(t, files[name+"-copper-top.gbr"])
		w := want[kind]
		if len(top.Regions) != w.regions {
			t.Fatalf("%s: %d copper regions, want %d", name, len(top.Regions), w.regions)
		}
		for i, r := range top.Regions {
			lo, hi := r.Outline.Bounds()
			if got := float64(hi.X-lo.X) * 1e-6; math.Abs(got-w.spans[i]) > 1e-3 {
				t.Errorf("%s region %d: %.4f mm long, want %.4f mm", name, i, got, w.spans[i])
			}
			if got := float64(hi.Y-lo.Y) * 1e-6; math.Abs(got-port.Width*1e3) > 1e-3 {
				t.Errorf("%s region %d: %.4f mm wide, want the port line's %.4f mm", name, i, got, port.Width*1e3)
			}
		}
		if s.TRL != nil {
			if math.Abs(s.TRL.DegF0-90) > 1e-9 || s.TRL.Lo >= 2.45e9 || s.TRL.Hi <= 2.45e9 {
				t.Errorf("%s: %+v", name, *s.TRL)
			}
		}
	}
}
