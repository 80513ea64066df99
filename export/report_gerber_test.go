package export

import (
	"bytes"
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"stubcraft/export/internal/gerberread"
	"stubcraft/stackups"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// buildReport runs the pipeline on an invented load and returns the
// report, the layout and the parsed top copper and drill files.
func buildReport(t *testing.T, stub, side, trim string) (Report, *gerberread.File, *gerberread.Drill) {
	t.Helper()
	text := `
name = "check"
frequency = "2.45GHz"
z0 = 50
stackup = "hydrocarbon-ceramic-0.51mm"
[load]
impedance = "27-j35"
[match]
topology = "shunt-stub"
stub = "` + stub + `"
pick = "shortest"
[layout]
stub_side = "` + side + `"
trim = "` + trim + `"
`
	d, err := synth.DecodeDesign(strings.NewReader(text), "check.toml", "")
	if err != nil {
		t.Fatal(err)
	}
	st, _ := stackups.Preset("hydrocarbon-ceramic-0.51mm")
	res, err := synth.Simulate(context.Background(), synth.BuildInput{Design: d, Stackup: st, Load: synth.ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	lay, err := geom.Build(res.GeomSpec())
	if err != nil {
		t.Fatal(err)
	}
	top := parse(t, gerberBytes(t, lay, CopperTop))
	drill := readDrill(t, lay)
	return NewReport(res, "test"), top, drill
}

// Every width_mm and drawn_length_mm of the report is found back in the
// Gerber copper within 1 µm, measured from the parsed file: through
// widths across the line, through lengths between the board edges and the
// stub's centre line, the stub's width across it, and its length from the
// through line's edge to its end (open) or to its via's drill centre
// (short, read from the Excellon file). An open stub drawn with a trim
// allowance reaches the allowance beyond its drawn length.
func TestReportDimensionsInGerber(t *testing.T) {
	for _, c := range []struct{ stub, side, trim string }{{"open", "up", "0mm"}, {"short", "down", "0mm"}, {"open", "down", "1.25mm"}} {
		t.Run(c.stub+"-"+c.side+"-trim-"+c.trim, func(t *testing.T) {
			rep, top, drill := buildReport(t, c.stub, c.side, c.trim)
			if len(top.Regions) != 1 {
				t.Fatalf("%d copper regions, want one merged net", len(top.Regions))
			}
			poly := top.Regions[0].Outline
			near := func(what string, gotNM int64, wantMM float64) {
				t.Helper()
				if math.Abs(float64(gotNM)*1e-6-wantMM) > 1e-3 {
					t.Errorf("%s: %.6f mm in the Gerber, %.6f mm in the report", what, float64(gotNM)*1e-6, wantMM)
				}
			}
			minX, maxX := poly.Bounds()
			var through []ReportElement
			var stub ReportElement
			for _, e := range rep.Elements {
				if e.Role == "stub" {
					stub = e
				} else {
					through = append(through, e)
				}
			}
			total := 0.0
			for _, e := range through {
				total += e.DrawnLengthMM
			}
			near("through line from port to port", maxX.X-minX.X, total)
			// Widths, halfway along each element (clear of the stub).
			x := 0.0
			var centre int64
			for _, e := range through {
				probe := geom.Nanometres((x + 0.5*e.DrawnLengthMM) * 1e-3)
				iv := crossings(poly, probe, true)
				if len(iv) != 1 {
					t.Fatalf("%s: %d copper intervals", e.ID, len(iv))
				}
				near("width of "+e.ID, iv[0][1]-iv[0][0], e.WidthMM)
				centre = (iv[0][0] + iv[0][1]) / 2
				x += e.DrawnLengthMM
			}
			sign := int64(1)
			if c.side == "down" {
				sign = -1
			}
			edge := centre + sign*geom.Nanometres(through[0].WidthMM*1e-3)/2
			across := crossings(poly, edge+sign*geom.Nanometres(stub.DrawnLengthMM*1e-3/2), false)
			if len(across) != 1 {
				t.Fatalf("stub: %d intervals", len(across))
			}
			near("width of "+stub.ID, across[0][1]-across[0][0], stub.WidthMM)
			stubX := (across[0][0] + across[0][1]) / 2
			// The stub's centre line sits at the sum of the through lengths
			// on its load side.
			load := 0.0
			for _, e := range through {
				if e.ID == stub.AttachedTo {
					load += e.DrawnLengthMM
					break
				}
				load += e.DrawnLengthMM
			}
			near("stub position from the load port", stubX-minX.X, load)
			if len(rep.StubFromLoadMM) != 1 || math.Abs(rep.StubFromLoadMM[0]-load) > 1e-9 {
				t.Errorf("stub_from_load_port_mm %v, want %.6f", rep.StubFromLoadMM, load)
			}
			if c.stub == "open" {
				along := crossings(poly, stubX+geom.Nanometres(stub.WidthMM*1e-3/4), true)
				end := along[0][1]
				if sign < 0 {
					end = along[0][0]
				}
				if want := map[string]float64{"0mm": 0, "1.25mm": 1.25}[c.trim]; stub.TrimAllowanceMM != want {
					t.Errorf("trim_allowance_mm %g, want %g", stub.TrimAllowanceMM, want)
				}
				near("drawn length of "+stub.ID+" with its trim allowance", sign*(end-edge), stub.DrawnLengthMM+stub.TrimAllowanceMM)
			} else {
				// One via, or a row across a wide stub (physical.ViaRow):
				// every hole on the same line, the row centred on the stub.
				if len(drill.Hits) == 0 {
					t.Fatalf("no drill hits")
				}
				var sumX int64
				for i, h := range drill.Hits {
					sumX += h.At.X
					if h.At.Y != drill.Hits[0].At.Y {
						t.Errorf("hit %d at y %d, off the row at %d", i, h.At.Y, drill.Hits[0].At.Y)
					}
				}
				near("via row centre x", sumX/int64(len(drill.Hits))-stubX, 0)
				near("drawn length of "+stub.ID+" to the via centre", sign*(drill.Hits[0].At.Y-edge), stub.DrawnLengthMM)
			}
		})
	}
}

// readDrill writes and parses the layout's Excellon file; a layout without
// holes must get no file (ErrEmptyLayer) and reads as no hits.
func readDrill(t *testing.T, l geom.Layout) *gerberread.Drill {
	t.Helper()
	var b bytes.Buffer
	err := WriteExcellon(&b, l, refMeta())
	if len(l.Vias) == 0 {
		if !errors.Is(err, ErrEmptyLayer) || b.Len() > 0 {
			t.Fatalf("no holes: WriteExcellon wrote %d bytes, err %v; want nothing and ErrEmptyLayer", b.Len(), err)
		}
		return &gerberread.Drill{}
	}
	if err != nil {
		t.Fatal(err)
	}
	drill, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	return drill
}
