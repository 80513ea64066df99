package export_test

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"stubcraft/export"
	"stubcraft/synth"
)

// buildResult builds a design (the demo when path is "") without its
// tolerance analysis.
func buildResult(t *testing.T, path string) *synth.Result {
	t.Helper()
	var in synth.BuildInput
	var err error
	if path == "" {
		in, err = synth.LoadDemo(synth.LoadOptions{})
	} else {
		in, err = synth.LoadDesign(path, synth.LoadOptions{})
	}
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	return res
}

// buildFiles builds a design (the demo when path is "") and writes every
// artefact into a map by name.
func buildFiles(t *testing.T, path string) (*synth.Result, map[string][]byte) {
	t.Helper()
	res := buildResult(t, path)
	out := map[string][]byte{}
	for _, a := range export.Files(res, export.FileOptions{Version: "test", Page: "a4", Fit: "scale", Created: time.Unix(0, 0)}) {
		if strings.HasSuffix(a.Name, ".png") || strings.HasSuffix(a.Name, ".svg") && a.Name != "layout.svg" {
			continue
		}
		var b bytes.Buffer
		if err := a.Write(&b); err != nil {
			t.Fatalf("%s: %v", a.Name, err)
		}
		out[a.Name] = b.Bytes()
	}
	return res, out
}

// impedanceRows parses the controlled-impedance table of fab-notes.txt.
func impedanceRows(t *testing.T, notes string) [][]string {
	t.Helper()
	_, after, ok := strings.Cut(notes, export.ImpedanceTableHeader+"\n")
	if !ok {
		t.Fatalf("no impedance table in\n%s", notes)
	}
	var rows [][]string
	for _, line := range strings.Split(after, "\n") {
		if line == "" {
			break
		}
		rows = append(rows, strings.Split(line, "\t"))
	}
	return rows
}

// TestFabNotesMatchReport: the fab notes' impedance table, read back from
// fab-notes.txt, has one row per distinct width of report.json's elements,
// each with the width, the target Z0 of the elements drawn at it, ±10 %,
// layer L1 and the reference plane; every element is in exactly one row.
// The drill table counts the Excellon file's hits; the edge clearance,
// the finish and the DC net are stated; the PDF carries the same sheet
// (pdftotext, when installed).
func TestFabNotesMatchReport(t *testing.T) {
	for _, c := range []struct{ name, path, net string }{
		{"demo, open stub", "", "are not connected"},
		{"by hand, shorted, layer pair", "../testdata/designs/sensor-antenna-by-hand.toml", "one DC net, RF_GND"},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, files := buildFiles(t, c.path)
			notes := string(files[export.FabNotesFileName])
			var rep struct {
				Elements []struct {
					ID      string  `json:"id"`
					Z0Ohm   float64 `json:"z0_ohm"`
					WidthMM float64 `json:"width_mm"`
				} `json:"elements"`
			}
			if err := json.Unmarshal(files["report.json"], &rep); err != nil {
				t.Fatal(err)
			}
			rows := impedanceRows(t, notes)
			seen := map[string]int{}
			widths := map[string]bool{}
			for _, e := range rep.Elements {
				widths[strconv.FormatFloat(e.WidthMM, 'f', 3, 64)] = true
			}
			if len(rows) != len(widths) {
				t.Errorf("%d impedance rows, report.json has %d distinct widths", len(rows), len(widths))
			}
			for _, r := range rows {
				if len(r) != 6 || r[2] != "±10 %" || r[3] != "L1 (top)" || !strings.Contains(r[4], "ground plane") {
					t.Errorf("row %q", r)
					continue
				}
				w, _ := strconv.ParseFloat(r[0], 64)
				z, _ := strconv.ParseFloat(r[1], 64)
				for _, id := range strings.Split(r[5], ", ") {
					seen[id]++
					for _, e := range rep.Elements {
						if e.ID == id && (math.Abs(e.WidthMM-w) > 0.0005 || math.Abs(e.Z0Ohm-z) > 0.005) {
							t.Errorf("%s: notes %.3f mm %.2f Ω, report %.6f mm %.4f Ω", id, w, z, e.WidthMM, e.Z0Ohm)
						}
					}
				}
			}
			for _, e := range rep.Elements {
				if seen[e.ID] != 1 {
					t.Errorf("element %s in %d rows", e.ID, seen[e.ID])
				}
			}
			for _, want := range []string{"pulled back 0.3 mm", "finish:          ENIG", c.net} {
				if !strings.Contains(notes, want) {
					t.Errorf("notes do not say %q:\n%s", want, notes)
				}
			}
			if n := len(res.Layout.Vias); n > 0 && !strings.Contains(notes, "T01\t0.300\t"+strconv.Itoa(n)+"\tyes") {
				t.Errorf("drill table does not count %d plated 0.3 mm holes:\n%s", n, notes)
			}
			bin, err := exec.LookPath("pdftotext")
			if err != nil {
				t.Skip("pdftotext not on PATH (apt-get install poppler-utils): the PDF sheet is not checked")
			}
			dir := t.TempDir()
			pdf := filepath.Join(dir, "d.pdf")
			if err := os.WriteFile(pdf, files["drawing.pdf"], 0o644); err != nil {
				t.Fatal(err)
			}
			out, err := exec.Command(bin, "-layout", pdf, "-").Output()
			if err != nil {
				t.Fatal(err)
			}
			text := string(out)
			if !strings.Contains(text, "Fabrication notes") {
				t.Fatal("no fab-notes sheet in the PDF")
			}
			for _, r := range rows {
				if !strings.Contains(text, r[0]) || !strings.Contains(text, r[1]) {
					t.Errorf("the PDF sheet lacks the row %s mm %s Ω", r[0], r[1])
				}
			}
		})
	}
}
