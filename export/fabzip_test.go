package export_test

import (
	"archive/zip"
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"stubcraft/export"
)

// TestFabZip: NAME-fab.zip holds exactly the Gerbers, the drill files, the
// job file and the fab notes of the build, byte for byte, each dated the
// build's creation time (the zip's MS-DOS date has 2 s resolution, APPNOTE
// 4.4.6, from memory); two builds give the same bytes; Info-ZIP's unzip
// (Debian package unzip), an independent reader, tests the archive when
// installed.
func TestFabZip(t *testing.T) {
	_, files := buildFiles(t, "../testdata/designs/sensor-antenna-by-hand.toml")
	_, again := buildFiles(t, "../testdata/designs/sensor-antenna-by-hand.toml")
	name := export.FabZipFileName("sensor-antenna-by-hand")
	data := files[name]
	if !bytes.Equal(data, again[name]) || len(data) == 0 {
		t.Fatal("two builds give different (or empty) fab archives")
	}
	z, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	var want []string
	for n := range files {
		if strings.HasSuffix(n, ".gbr") || strings.HasSuffix(n, ".drl") || strings.HasSuffix(n, ".gbrjob") || n == export.FabNotesFileName {
			want = append(want, n)
		}
	}
	if len(z.File) != len(want) || len(want) != 9 {
		t.Errorf("%d entries, want the %d fab files (7 Gerber and drill, job, notes)", len(z.File), len(want))
	}
	for _, f := range z.File {
		r, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		var b bytes.Buffer
		if _, err := b.ReadFrom(r); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(b.Bytes(), files[f.Name]) {
			t.Errorf("%s differs from the build's file", f.Name)
		}
		if !f.Modified.Equal(time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC)) && !f.Modified.UTC().Equal(time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC)) {
			t.Errorf("%s dated %v, want the build's time (1970, clamped to the zip epoch 1980-01-01)", f.Name, f.Modified)
		}
	}
	bin, err := exec.LookPath("unzip")
	if err != nil {
		t.Skip("unzip not on PATH (apt-get install unzip): the archive is not tested by an independent reader")
	}
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
	if out, err := exec.Command(bin, "-t", p).CombinedOutput(); err != nil || !strings.Contains(string(out), "No errors detected") {
		t.Errorf("unzip -t: %v\n%s", err, out)
	}
}
