package export_test

import (
	"bytes"
	"context"
	"math"
	"sort"
	"strings"
	"testing"
	"time"

	"stubcraft/export"
	"stubcraft/export/internal/gerberread"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// A shorted stub on 1.6 mm FR-4 at 50 Ω is about 3 mm wide, far over 1.5
// via pads: built with via_pitch = 0.8 mm it must end in a row of vias
// across its width, which the Excellon file (read back by an independent
// reader) drills, each hole inside the stub's end.
func TestBuildWideShortedStubViaRow(t *testing.T) {
	const design = `name = "wide-short"
frequency = "915MHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "75+j40"
[match]
topology = "shunt-stub"
stub = "short"
pick = 2
[layout]
via_drill = "0.3mm"
via_pad = "0.6mm"
via_pitch = "0.8mm"
`
	in, err := synth.ReadDesign(strings.NewReader(design), "wide-short.toml", "", synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	var stub geom.Rect
	var width float64
	for _, e := range res.Physical.Elements {
		if e.Role == synth.RoleStub {
			width = e.Width
		}
	}
	for _, e := range res.Layout.Marks.Elements {
		if e.Kind == geom.KindStub {
			stub = e.Rect
		}
	}
	if !(width > 1.5*0.6e-3) {
		t.Fatalf("stub width %g mm: the design no longer tests a wide stub", width*1e3)
	}
	// By the rule in the design keys: outer pads flush with the stub's
	// sides, as few gaps as keep the spacing within 0.8 mm.
	span := width - 0.6e-3
	wantN := int(math.Ceil(span/0.8e-3)) + 1
	wantSp := span / float64(wantN-1)

	var b bytes.Buffer
	meta := export.Meta{ProjectName: "wide-short", Version: "test", Created: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}
	if err := export.WriteExcellon(&b, res.Layout, meta); err != nil {
		t.Fatal(err)
	}
	d, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	if len(d.Hits) != wantN {
		t.Fatalf("%d drill hits, want %d across the %.3f mm stub", len(d.Hits), wantN, width*1e3)
	}
	sort.Slice(d.Hits, func(i, j int) bool { return d.Hits[i].At.X < d.Hits[j].At.X })
	for i, h := range d.Hits {
		if h.Drill != 300000 {
			t.Errorf("hit %d: drill %d nm, want 0.3 mm", i, h.Drill)
		}
		// Every pad inside the stub's copper (Excellon coordinates are
		// rounded to 1 µm: allow that).
		const eps = 1000
		if h.At.X-300000 < stub.Min.X-eps || h.At.X+300000 > stub.Max.X+eps || h.At.Y < stub.Min.Y || h.At.Y > stub.Max.Y {
			t.Errorf("hit %d at %v: pad leaves the stub %v", i, h.At, stub)
		}
		if i > 0 {
			if dx := float64(h.At.X-d.Hits[i-1].At.X) * 1e-9; math.Abs(dx-wantSp) > 2e-6 {
				t.Errorf("hits %d–%d %.4f mm apart, want %.4f mm", i-1, i, dx*1e3, wantSp*1e3)
			}
			if h.At.Y != d.Hits[0].At.Y {
				t.Errorf("hit %d at y %d, want the row's %d", i, h.At.Y, d.Hits[0].At.Y)
			}
		}
	}
	found := false
	for _, n := range res.Notes {
		found = found || strings.Contains(n, "row of") && strings.Contains(n, "mutual inductance")
	}
	if !found {
		t.Errorf("no build note on the via row and its model: %q", res.Notes)
	}
}
