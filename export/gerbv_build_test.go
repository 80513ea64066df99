package export

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"stubcraft/synth"
)

// TestGerbvEveryFileOfABuild writes whole builds into a directory and
// hands every Gerber and Excellon file found there (not a chosen few) to
// gerbv, one at a time: each must read without any message other than its
// notices about X2 attributes, and draw something. The builds cover an
// open stub (no drill files), a grounded-coplanar pour, and edge-launch
// landings with a via fence, a via row and TRL structures with their own
// files.
func TestGerbvEveryFileOfABuild(t *testing.T) {
	if testing.Short() {
		t.Skip("renders every file of three builds")
	}
	for _, c := range []struct{ name, path string }{
		{"demo", ""},
		{"coplanar", "../testdata/designs/gcpw-probe.toml"},
		{"edge launch, via fence, structures", "../testdata/designs/edge-launch-fence.toml"},
	} {
		t.Run(c.name, func(t *testing.T) {
			var in synth.BuildInput
			var err error
			if c.path == "" {
				in, err = synth.LoadDemo(synth.LoadOptions{})
			} else {
				in, err = synth.LoadDesign(c.path, synth.LoadOptions{})
			}
			if err != nil {
				t.Fatal(err)
			}
			in.SkipTolerance = true
			res, err := synth.Build(context.Background(), in)
			if err != nil {
				t.Fatal(err)
			}
			dir := t.TempDir()
			for _, a := range Files(res, FileOptions{Version: "test", Page: "a4", Fit: "scale", Created: time.Unix(0, 0)}) {
				if strings.HasSuffix(a.Name, ".pdf") || strings.HasSuffix(a.Name, ".png") {
					continue // not fabrication files, and slow to draw
				}
				var b bytes.Buffer
				if err := a.Write(&b); err != nil {
					t.Fatalf("%s: %v", a.Name, err)
				}
				if err := os.WriteFile(filepath.Join(dir, a.Name), b.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			entries, err := os.ReadDir(dir)
			if err != nil {
				t.Fatal(err)
			}
			read := 0
			for _, e := range entries {
				name := e.Name()
				if ext := filepath.Ext(name); ext != ".gbr" && ext != ".drl" {
					continue
				}
				data, err := os.ReadFile(filepath.Join(dir, name))
				if err != nil {
					t.Fatal(err)
				}
				t.Run(name, func(t *testing.T) {
					if n, _, _ := lit(renderDPI(t, 200, map[string][]byte{name: data}, name), 0); n == 0 {
						t.Errorf("gerbv drew nothing of %s", name)
					}
				})
				read++
			}
			t.Logf("%d Gerber and drill files read by gerbv", read)
			if read < 5 {
				t.Errorf("only %d Gerber and drill files in the build", read)
			}
		})
	}
}
