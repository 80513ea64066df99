package main

import (
	"encoding/json"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"stubcraft/export"
	"stubcraft/physical"
	"stubcraft/synth"
)

// TestBuildFullwaveCentreRefusals: the full-wave options without
// --fullwave-centre, a bad mesh or memory figure, a grid above the memory
// limit and a band match are each refused with a message naming the
// option, and leave no output directory.
func TestBuildFullwaveCentreRefusals(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	cases := []struct {
		name string
		args []string
		want []string
	}{
		{"mesh alone", []string{"build", "-o", out, "--mesh", "coarse"}, []string{"--mesh", "--fullwave-centre"}},
		{"memory alone", []string{"build", "-o", out, "--memory", "64"}, []string{"--memory", "--fullwave-centre"}},
		{"bad mesh", []string{"build", "-o", out, "--fullwave-centre", "--mesh", "medium"}, []string{"--mesh", "coarse, normal or fine"}},
		{"bad memory", []string{"build", "-o", out, "--fullwave-centre", "--memory", "0"}, []string{"--memory"}},
		{"memory limit", []string{"build", "-o", out, "--fullwave-centre", "--mesh", "coarse", "--memory", "1", "--no-tolerance"}, []string{"MiB", "coarse", "--memory"}},
		{"band match", []string{"build", "../../testdata/designs/band-double-stub.toml", "-o", out, "--fullwave-centre", "--no-tolerance"}, []string{"band", "match.band"}},
		{"trim allowance", []string{"build", "../../testdata/designs/trim-allowance.toml", "-o", out, "--fullwave-centre", "--no-tolerance"}, []string{"trim", "layout.trim", "trim-allowance.toml"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := runRoot(t, c.args...)
			if err == nil {
				t.Fatal("no refusal")
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%q does not mention %q", err, w)
				}
			}
			if _, err := os.Stat(out); !os.IsNotExist(err) {
				t.Errorf("output directory exists after a refusal (stat: %v)", err)
			}
		})
	}
}

// TestBuildFullwaveCentreCoarse builds the demo with --fullwave-centre on
// the coarse mesh (one or two coarse full-wave runs, about 20 s each on an idle
// machine): the summary says it converged, report.json carries the record
// with the kept run within 0.3 % of f0 and each element's mapping, and the
// full-wave records are written beside the build's files. The best match is
// re-read here from fullwave-matched.s1p, independently of the record.
func TestBuildFullwaveCentreCoarse(t *testing.T) {
	if testing.Short() {
		t.Skip("two coarse full-wave runs; skipped with -short")
	}
	out := filepath.Join(t.TempDir(), "out")
	stdout, err := runRoot(t, "build", "-o", out, "--fullwave-centre", "--mesh", "coarse", "--no-tolerance")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(stdout, "full-wave centring (coarse mesh): converged") {
		t.Errorf("summary does not say it converged:\n%s", stdout)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		FrequencyHz float64 `json:"frequency_hz"`
		Elements    []struct {
			ID            string   `json:"id"`
			FullwaveMapMM *float64 `json:"fullwave_map_mm"`
		} `json:"elements"`
		FullwaveCentre *struct {
			Mesh      string `json:"mesh"`
			Converged bool   `json:"converged"`
			KeptRun   int    `json:"kept_run"`
			Runs      []struct {
				BestMatchHz float64 `json:"best_match_hz"`
				S11DBF0     float64 `json:"s11_db_f0"`
				NextMap     *struct {
					OffsetsMM map[string]float64 `json:"offsets_mm"`
				} `json:"next_map"`
			} `json:"runs"`
		} `json:"fullwave_centre"`
	}
	if err := json.Unmarshal(b, &rep); err != nil {
		t.Fatal(err)
	}
	c := rep.FullwaveCentre
	if c == nil || !c.Converged || c.Mesh != "coarse" || c.KeptRun < 1 || c.KeptRun > len(c.Runs) || len(c.Runs) > 3 {
		t.Fatalf("fullwave_centre %+v: want converged on the coarse mesh within 3 runs", c)
	}
	// Since the FDTD's z cells were halved at the copper plane (issue 11
	// (a)), the demo's coarse full-wave best match is +0.17 %, within
	// 0.3 % on the first run, so the command maps nothing here; the mapping
	// itself is tested in synth/fullwave (the demo drawn 3 % short). When a
	// second run is made, its mapping must be recorded.
	if len(c.Runs) < 2 {
		t.Logf("converged on run 1 (%.4f GHz): no mapping to check at the command", c.Runs[0].BestMatchHz/1e9)
	} else {
		if c.Runs[0].NextMap == nil {
			t.Errorf("%d runs but run 1 records no mapping", len(c.Runs))
		}
		for _, e := range rep.Elements {
			if e.ID == "stub1" && e.FullwaveMapMM == nil {
				t.Errorf("stub1 has no fullwave_map_mm")
			}
		}
	}
	ts, err := physical.ReadTouchstoneFile(filepath.Join(out, "fullwave-matched.s1p"), 1)
	if err != nil {
		t.Fatal(err)
	}
	best, mag := 0.0, math.Inf(1)
	for k, fr := range ts.Freqs {
		if m := cmplx.Abs(ts.S[k][0]); m < mag {
			best, mag = fr, m
		}
	}
	f0 := rep.FrequencyHz
	step := ts.Freqs[1] - ts.Freqs[0]
	if d := best - f0; d > 0.003*f0+step/2 || d < -0.003*f0-step/2 {
		t.Errorf("fullwave-matched.s1p: best match %.4f GHz (%+.2f %% from f0), want within 0.3 %%", best/1e9, 100*(best/f0-1))
	}
	for _, name := range []string{"fullwave.s2p", "fullwave-s11.png", "fullwave-smith.svg", "stubcraft-manifest.sha256"} {
		if _, err := os.Stat(filepath.Join(out, name)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
	man, err := os.ReadFile(filepath.Join(out, "stubcraft-manifest.sha256"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(man), "fullwave.s2p") {
		t.Errorf("manifest does not list fullwave.s2p")
	}
}

// printCentring leads with NOT CONVERGED, names the kept run, when no run
// came within the tolerance.
func TestPrintCentringNotConverged(t *testing.T) {
	c := &export.ReportFullwaveCentre{Mesh: "coarse", TolerancePct: 0.3, MaxRuns: 3, KeptRun: 2,
		Runs: []export.ReportFullwaveRun{{Run: 1, BestMatchOffsetPct: 1.2}, {Run: 2, BestMatchOffsetPct: -0.5}, {Run: 3, BestMatchOffsetPct: 0.9}}}
	rec := &synth.FullwaveCentring{Runs: make([]synth.FullwaveRun, 3)}
	var b strings.Builder
	if err := printCentring(&b, c, rec); err != nil {
		t.Fatal(err)
	}
	first := strings.SplitN(b.String(), "\n", 2)[0]
	for _, want := range []string{"NOT CONVERGED", "after 3 runs", "run 2's"} {
		if !strings.Contains(first, want) {
			t.Errorf("first line %q does not say %q", first, want)
		}
	}
}
