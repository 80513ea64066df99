package main

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"stubcraft/export"
	"stubcraft/physical"
	"stubcraft/synth"
	"stubcraft/synth/tune"
)

// writeMeasured writes the simulated S11 of the demo board in state s
// between lo and hi as a Touchstone file, as if measured, and returns the
// demo design's path.
func writeMeasured(t *testing.T, dir string, s tune.State, lo, hi float64) (design, measured string) {
	t.Helper()
	design = filepath.Join(dir, "probe.toml")
	if err := os.WriteFile(design, synth.DemoTOML(), 0o644); err != nil {
		t.Fatal(err)
	}
	in, err := synth.LoadDesign(design, synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	r, err := res.BenchModel().Simulate(s)
	if err != nil {
		t.Fatal(err)
	}
	ts := &physical.Touchstone{Ports: 1, Z0: 50}
	for i := 0; i <= 150; i++ {
		f := lo + (hi-lo)*float64(i)/150
		g, err := r.S11(f)
		if err != nil {
			t.Fatal(err)
		}
		ts.Freqs = append(ts.Freqs, f)
		ts.S = append(ts.S, []complex128{g})
	}
	var b bytes.Buffer
	if err := export.WriteTouchstone(&b, ts, []string{"synthetic measurement for a test"}); err != nil {
		t.Fatal(err)
	}
	measured = filepath.Join(dir, "board.s1p")
	if err := os.WriteFile(measured, b.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return design, measured
}

func TestTuneRecoversBoardAndWritesDrawing(t *testing.T) {
	dir := t.TempDir()
	truth := tune.State{ErRatio: 1.04, Etch: 15e-6, LoadScale: 1}
	design, measured := writeMeasured(t, dir, truth, 2.2e9, 2.7e9)
	out := filepath.Join(dir, "trimmed")
	text, err := runRoot(t, "tune", design, measured, "--json", "-o", out)
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		FittedEr      *float64 `json:"fitted_er"`
		FittedErRatio float64  `json:"fitted_er_ratio"`
		FittedEtchUM  float64  `json:"fitted_etch_um"`
		ResidualDB    *float64 `json:"residual_db"`
		Trims         []struct {
			ID     string  `json:"id"`
			TrimMM float64 `json:"trim_mm"`
		} `json:"trims"`
		PredictedBestMatchHz float64 `json:"predicted_best_match_hz"`
	}
	if err := json.Unmarshal([]byte(text), &rep); err != nil {
		t.Fatalf("%v\n%s", err, text)
	}
	if rep.FittedEr == nil || rep.ResidualDB == nil {
		t.Fatalf("missing keys:\n%s", text)
	}
	// Noise-free synthetic data: the fit must land on the truth closely.
	if math.Abs(rep.FittedErRatio-truth.ErRatio) > 0.002 || math.Abs(rep.FittedEtchUM-15) > 1 {
		t.Errorf("fitted εr ratio %.4f, etch %.2f µm; truth 1.04, 15 µm", rep.FittedErRatio, rep.FittedEtchUM)
	}
	// A higher εr lowers the match: the open stub must be cut shorter.
	if len(rep.Trims) != 1 || rep.Trims[0].ID != "stub1" || !(rep.Trims[0].TrimMM > 0) {
		t.Errorf("trims %+v: want one positive cut of stub1", rep.Trims)
	}
	if math.Abs(rep.PredictedBestMatchHz/2.45e9-1) > 0.003 {
		t.Errorf("predicted best match %.4f GHz", rep.PredictedBestMatchHz/1e9)
	}
	for _, name := range []string{"tune.json", "drawing.pdf", "layout.svg"} {
		if _, err := os.Stat(filepath.Join(out, name)); err != nil {
			t.Errorf("%s not written: %v", name, err)
		}
	}
}

func TestTuneRefusals(t *testing.T) {
	dir := t.TempDir()
	design, low := writeMeasured(t, dir, tune.Nominal(), 1.8e9, 2.3e9)
	lowText, err := runRoot(t, "tune", design, low)
	if err == nil || !strings.Contains(err.Error(), "board.s1p") || !strings.Contains(err.Error(), "does not include f0") {
		t.Errorf("a measurement below f0: got %v\n%s", err, lowText)
	}
	// A board of another design: a fully reflecting short stands in for it.
	other := filepath.Join(dir, "other.s1p")
	if err := os.WriteFile(other, []byte("# GHz S RI R 50\n2.2 -0.9 0.1\n2.4 -0.9 0.2\n2.45 -0.9 0.25\n2.5 -0.9 0.3\n2.7 -0.9 0.35\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := runRoot(t, "tune", design, other); err == nil || !strings.Contains(err.Error(), "other.s1p") || !strings.Contains(err.Error(), "explains") {
		t.Errorf("a measurement of another board: got %v", err)
	}
	if _, err := runRoot(t, "tune", design, filepath.Join(dir, "missing.s1p")); err == nil || !strings.Contains(err.Error(), "missing.s1p") {
		t.Errorf("a missing file: got %v", err)
	}
}

// With a trim allowance the etched open stub is longer than its design
// length, so a board whose εr came out a little low (which raises the
// match, within what the 1.5 mm allowance covers: about 7 MHz here) or
// high is still fixed by a cut, never by growing the stub.
func TestTuneWithTrimAllowance(t *testing.T) {
	dir := t.TempDir()
	design := filepath.Join("..", "..", "testdata", "designs", "trim-allowance.toml")
	in, err := synth.LoadDesign(design, synth.LoadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	in.SkipTolerance = true
	res, err := synth.Build(context.Background(), in)
	if err != nil {
		t.Fatal(err)
	}
	for _, truth := range []tune.State{{ErRatio: 0.99, LoadScale: 1}, {ErRatio: 1.03, Etch: -10e-6, LoadScale: 1}} {
		r, err := res.BenchModel().Simulate(truth)
		if err != nil {
			t.Fatal(err)
		}
		ts := &physical.Touchstone{Ports: 1, Z0: 50}
		for i := 0; i <= 120; i++ {
			f := 0.8e9 + 0.25e9*float64(i)/120
			g, err := r.S11(f)
			if err != nil {
				t.Fatal(err)
			}
			ts.Freqs, ts.S = append(ts.Freqs, f), append(ts.S, []complex128{g})
		}
		var b bytes.Buffer
		if err := export.WriteTouchstone(&b, ts, nil); err != nil {
			t.Fatal(err)
		}
		measured := filepath.Join(dir, "meter.s1p")
		if err := os.WriteFile(measured, b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		text, err := runRoot(t, "tune", design, measured, "--json")
		if err != nil {
			t.Fatal(err)
		}
		var rep struct {
			Trims []struct {
				TrimMM float64 `json:"trim_mm"`
				CanCut bool    `json:"can_cut"`
			} `json:"trims"`
			PredictedBestMatchHz float64 `json:"predicted_best_match_hz"`
		}
		if err := json.Unmarshal([]byte(text), &rep); err != nil {
			t.Fatal(err)
		}
		if len(rep.Trims) != 1 || !rep.Trims[0].CanCut || rep.Trims[0].TrimMM <= 0 {
			t.Errorf("εr ratio %.2f: trims %+v, want one cut", truth.ErRatio, rep.Trims)
		}
		if math.Abs(rep.PredictedBestMatchHz/915e6-1) > 0.003 {
			t.Errorf("εr ratio %.2f: predicted best match %.4f MHz", truth.ErRatio, rep.PredictedBestMatchHz/1e6)
		}
	}
}
