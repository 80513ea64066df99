package export

import (
	"bytes"
	"errors"
	"testing"

	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// Section numbers below are those of the Gerber Layer Format Specification
// revision 2023.08 (from memory of its table of contents): 5.6.10
// .AperFunction, 5.6.13 .N (net), 5.6.14 .P (pin).

// openSpec is refSpec with both stubs open: no hole joins the RF copper to
// the plane.
func openSpec() geom.Spec {
	s := refSpec()
	s.Name = "open"
	s.Stubs[0].Via = nil
	return s
}

// TestNetsOnParsedFiles reads the copper and drill files back and checks
// that objects joined by copper or plated holes carry one net name
// (5.6.13, from memory: the .N attribute names the net an object belongs to): every
// drill hit lands on a top flash and a bottom region of the same net, and
// a shorted stub makes the RF copper and the plane one DC net.
func TestNetsOnParsedFiles(t *testing.T) {
	tests := []struct {
		name        string
		spec        geom.Spec
		topRF, bot  string // net of the RF region and the port pads; of the plane
		pourNet     string // net of the coplanar pour, when there is one
		wantHoles   int
		wantDrillGb bool
	}{
		{"shorted stub", refSpec(), "RF_GND", "RF_GND", "", 1, true},
		{"open stubs", openSpec(), "RF", "GND", "", 0, false},
		{"coplanar, shorted", coplanarSpec(), "RF_GND", "RF_GND", "RF_GND", -1, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			l := build(t, tt.spec)
			top := parse(t, gerberBytes(t, l, CopperTop))
			bot := parse(t, gerberBytes(t, l, CopperBottom))
			if len(bot.Regions) != 1 || bot.Regions[0].Attrs[".N"] != tt.bot {
				t.Fatalf("plane regions %+v, want one of net %s", bot.Regions, tt.bot)
			}
			if n := top.Regions[0].Attrs[".N"]; n != tt.topRF {
				t.Errorf("RF copper on net %q, want %q", n, tt.topRF)
			}
			for _, r := range top.Regions[1:] {
				if r.Attrs[".N"] != tt.pourNet {
					t.Errorf("pour region on net %q, want %q", r.Attrs[".N"], tt.pourNet)
				}
			}
			pads := 0
			for _, fl := range top.Flashes {
				if top.Apertures[fl.D].Attrs[".AperFunction"] == geom.SMDPad {
					pads++
					if fl.Attrs[".N"] != tt.topRF {
						t.Errorf("port pad at %v on net %q, want %q", fl.At, fl.Attrs[".N"], tt.topRF)
					}
				}
			}
			if pads != 2 {
				t.Errorf("%d SMD port pads, want 2", pads)
			}
			var b bytes.Buffer
			err := WriteExcellon(&b, l, refMeta())
			if !tt.wantDrillGb {
				if !errors.Is(err, ErrEmptyLayer) || b.Len() != 0 {
					t.Errorf("no holes: Excellon wrote %d bytes, err %v", b.Len(), err)
				}
				if err := WriteGerber(&bytes.Buffer{}, l, DrillPTH, refMeta()); !errors.Is(err, ErrEmptyLayer) {
					t.Errorf("no holes: plated-drill Gerber err %v, want ErrEmptyLayer", err)
				}
				return
			}
			drill, err := gerberread.ReadExcellon(&b)
			if err != nil {
				t.Fatal(err)
			}
			if tt.wantHoles >= 0 && len(drill.Hits) != tt.wantHoles {
				t.Errorf("%d holes, want %d", len(drill.Hits), tt.wantHoles)
			}
			for _, h := range drill.Hits {
				found := false
				for _, fl := range top.Flashes {
					if fl.At == h.At {
						found = true
						if fl.Attrs[".N"] != bot.Regions[0].Attrs[".N"] {
							t.Errorf("hole at %v joins top net %q to plane net %q", h.At, fl.Attrs[".N"], bot.Regions[0].Attrs[".N"])
						}
					}
				}
				if !found {
					t.Errorf("hole at %v has no top pad", h.At)
				}
			}
		})
	}
}

// TestPortPadAttributes: the port pads are surface pads defined by their
// copper (5.6.10, from memory: "SMDPad,CuDef"; "ComponentPad" is for through-hole
// pads) and carry the connector pin (5.6.14, from memory: .P with reference descriptor
// and pin number): J1 pin 1 at the source port (the right edge), J2 pin 1
// at the load port (x = 0).
func TestPortPadAttributes(t *testing.T) {
	l := build(t, refSpec())
	top := parse(t, gerberBytes(t, l, CopperTop))
	_, bmax := l.Board.Bounds()
	got := map[string]geom.Point{}
	for _, fl := range top.Flashes {
		a := top.Apertures[fl.D]
		if a.Attrs[".AperFunction"] == "ComponentPad" {
			t.Errorf("pad at %v uses ComponentPad", fl.At)
		}
		if p := fl.Attrs[".P"]; p != "" {
			if a.Attrs[".AperFunction"] != "SMDPad,CuDef" {
				t.Errorf("pin %s on aperture function %q", p, a.Attrs[".AperFunction"])
			}
			got[p] = fl.At
		}
	}
	if len(got) != 2 || got["J2,1"].X != 0.5e6 || got["J1,1"].X != bmax.X-0.5e6 {
		t.Errorf("pins %v, want J2,1 at x = 0.5 mm and J1,1 at x = %d nm", got, bmax.X-0.5e6)
	}
}

// TestExcellonAttributes reads the X2 attribute comments of the drill file
// (XNC Format Specification, Ucamco: attributes as "; #@! " comments, from
// memory; values from 5.6.3 .FileFunction and 5.6.10 .AperFunction of the
// Gerber specification, section numbers from memory).
func TestExcellonAttributes(t *testing.T) {
	l := build(t, refSpec())
	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	d, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	for k, v := range map[string]string{
		".FileFunction":    "Plated,1,2,PTH",
		".FilePolarity":    "Positive",
		".SameCoordinates": "f205030f-a43b-5ed3-9ef1-747cc36142ae",
	} {
		if d.FileAttrs[k] != v {
			t.Errorf("%s = %q, want %q", k, d.FileAttrs[k], v)
		}
	}
	if len(d.Tools) != 1 || d.ToolAttrs[1][".AperFunction"] != "Plated,PTH,ViaDrill" {
		t.Errorf("tools %v with attributes %v, want T01 a plated via drill", d.Tools, d.ToolAttrs)
	}
}
