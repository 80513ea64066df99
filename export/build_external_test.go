package export_test

import (
	"bytes"
	"context"
	"strings"
	"testing"
	"time"

	"stubcraft/export"
	"stubcraft/export/internal/gerberread"
	"stubcraft/synth"
)

// The demo design goes to Gerber artwork in a buffer through exported API
// only: load, build, write. The artwork is read back with an independent
// reader of the Gerber format (Gerber Layer Format Specification rev.
// 2023.08): a top copper file with the file function the standard gives,
// regions for the copper, and its end of file.
func TestDemoToGerberWithExportedAPI(t *testing.T) {
	in, err := synth.LoadDemo(synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	meta := export.Meta{ProjectName: res.Design.Name, Version: "test", Created: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}
	if err := export.WriteGerber(&buf, res.Layout, export.CopperTop, meta); err != nil {
		t.Fatal(err)
	}
	f, err := gerberread.Read(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if got := f.FileAttrs[".FileFunction"]; got != "Copper,L1,Top" {
		t.Errorf("file function %q, want Copper,L1,Top", got)
	}
	if len(f.Regions) == 0 || !f.Ended {
		t.Errorf("%d regions, end of file %v: want copper regions and M02", len(f.Regions), f.Ended)
	}
	// Every file of the build writes without error, under its own name.
	names := map[string]bool{}
	for _, a := range export.Files(res, export.FileOptions{Version: "test", Page: "a4", Fit: "scale"}) {
		if names[a.Name] {
			t.Errorf("%s listed twice", a.Name)
		}
		names[a.Name] = true
		if strings.HasSuffix(a.Name, ".pdf") || strings.HasSuffix(a.Name, ".png") {
			continue // the drawing and the plots are checked in their own tests
		}
		var b bytes.Buffer
		if err := a.Write(&b); err != nil || b.Len() == 0 {
			t.Errorf("%s: %d bytes, %v", a.Name, b.Len(), err)
		}
	}
}
