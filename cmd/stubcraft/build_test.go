package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strings"
	"stubcraft/synth"
	"testing"

	"stubcraft/stackups"
)

func runRoot(t *testing.T, args ...string) (string, error) {
	t.Helper()
	cmd := newRootCmd()
	var out bytes.Buffer
	cmd.SetArgs(args)
	cmd.SetOut(&out)
	cmd.SetErr(&out)
	err := cmd.Execute()
	return out.String(), err
}

type reportFile struct {
	FrequencyHz float64 `json:"frequency_hz"`
	Z0Ohm       float64 `json:"z0_ohm"`
	Stackup     struct {
		Name string  `json:"name"`
		Er   float64 `json:"er"`
	} `json:"stackup"`
	Elements []struct {
		ID            string  `json:"id"`
		Role          string  `json:"role"`
		Feed          bool    `json:"port_feed"`
		End           string  `json:"end"`
		Z0Ohm         float64 `json:"z0_ohm"`
		WidthMM       float64 `json:"width_mm"`
		ElectricalDeg float64 `json:"electrical_deg"`
		LineLengthMM  float64 `json:"line_length_mm"`
		DrawnLengthMM float64 `json:"drawn_length_mm"`
		OpenEndMM     float64 `json:"open_end_mm"`
		TeeMM         float64 `json:"tee_mm"`
	} `json:"elements"`
	S11DBF0       float64 `json:"s11_db_f0"`
	S11DBF0Uncorr float64 `json:"s11_db_f0_uncorrected"`
	Recentring    struct {
		Before float64 `json:"s11_db_before"`
	} `json:"recentring"`
	Bandwidth10DBHz float64 `json:"bandwidth_10db_hz"`
	Tolerance       *struct {
		P50   float64 `json:"p50_s11_db"`
		P90   float64 `json:"p90_s11_db"`
		Yield float64 `json:"yield"`
	} `json:"tolerance"`
	Warnings []string `json:"warnings"`
	Cautions []string `json:"cautions"`
}

// The embedded demo builds, matches to −25 dB at f0 in the full model with
// the corrections alone (before re-centring), is measurably worse without
// them, and writes every artefact.
func TestBuildDemo(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	out, err := runRoot(t, "build", "-o", dir, "--samples", "200")
	if err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	for _, want := range []string{"stub1", "drawn (mm)", "RF safety", "network analyser"} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q", want)
		}
	}
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep reportFile
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if rep.FrequencyHz != 2.45e9 || rep.Z0Ohm != 50 || rep.Stackup.Name != "fr4-1.6mm" {
		t.Errorf("report header %+v", rep)
	}
	if rep.Recentring.Before > -25 || rep.S11DBF0 > -25 {
		t.Errorf("|S11| at f0: %.1f dB corrected, %.1f dB re-centred; want ≤ −25 dB", rep.Recentring.Before, rep.S11DBF0)
	}
	if rep.S11DBF0Uncorr < rep.Recentring.Before+3 {
		t.Errorf("uncorrected %.1f dB is not measurably worse than corrected %.1f dB", rep.S11DBF0Uncorr, rep.Recentring.Before)
	}
	roles := map[string]int{}
	for _, e := range rep.Elements {
		roles[e.Role]++
		if e.Feed {
			roles["feed"]++
		}
		if e.WidthMM <= 0 || e.DrawnLengthMM <= 0 {
			t.Errorf("element %+v", e)
		}
	}
	// The roles are line and stub; the two port feeds are lines.
	if roles["stub"] != 1 || roles["line"] != 3 || roles["feed"] != 2 || len(roles) != 3 {
		t.Errorf("roles %v", roles)
	}
	if rep.Tolerance == nil || rep.Tolerance.P50 > rep.Tolerance.P90 || len(rep.Cautions) < 4 || rep.Bandwidth10DBHz <= 0 {
		t.Errorf("tolerance %+v, cautions %d, bandwidth %g", rep.Tolerance, len(rep.Cautions), rep.Bandwidth10DBHz)
	}
	names, _ := os.ReadDir(dir)
	var got []string
	for _, n := range names {
		got = append(got, n.Name())
	}
	for _, want := range []string{"report.json", "network.s2p", "matched.s1p", ".gbrjob", "copper-top.gbr"} {
		if !strings.Contains(strings.Join(got, " "), want) {
			t.Errorf("no %s among %v", want, got)
		}
	}
	// The demo's stub is open: no holes, so no drill files at all.
	for _, unwanted := range []string{"drill.drl", "drill-plated.gbr"} {
		if strings.Contains(strings.Join(got, " "), unwanted) {
			t.Errorf("an open-stub build wrote %s: %v", unwanted, got)
		}
	}
}

// Bad design files: a clear error naming the file and key, and nothing
// written to the output directory.
func TestBuildBadDesignWritesNothing(t *testing.T) {
	cases := []struct{ file, want string }{
		{"bad-unknown-key.toml", "bad-unknown-key.toml:"},
		{"bad-zero-frequency.toml", "frequency"},
		{"bad-negative-resistance.toml", "load.impedance"},
		{"bad-reactive-load.toml", "load"},
		{"bad-topology.toml", "topology"},
		{"bad-two-loads.toml", "load"},
		{"bad-section-kind.toml", "kind"},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			parent := t.TempDir()
			dir := filepath.Join(parent, "out")
			_, err := runRoot(t, "build", filepath.Join("..", "..", "testdata", "designs", c.file), "-o", dir)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("want an error with %q, got %v", c.want, err)
			}
			entries, _ := os.ReadDir(parent)
			if len(entries) != 0 {
				t.Errorf("something was written: %v", entries)
			}
		})
	}
}

func TestTraceJSONKeys(t *testing.T) {
	out, err := runRoot(t, "trace", "--stackup", "fr4-1.6mm", "--freq", "2.45GHz", "--z0", "50", "--length", "90deg", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal([]byte(out), &m); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"width_mm", "z0_ohm", "eps_eff", "guided_wavelength_mm", "length_mm", "warnings"} {
		if _, ok := m[k]; !ok {
			t.Errorf("no %q in %s", k, out)
		}
	}
	// Common practice, no source: 50 Ω on 1.6 mm FR-4 (εr 4.4, 35 µm) is
	// about 3.0 mm wide (2.8–3.2 mm).
	if w := m["width_mm"].(float64); w < 2.8 || w > 3.2 {
		t.Errorf("width %.3f mm", w)
	}
}

func TestCommandErrors(t *testing.T) {
	cases := [][]string{
		{"trace", "--freq", "2.45GHz"},
		{"trace", "--freq", "2.45", "--z0", "50"},
		{"trace", "--freq", "2.45GHz", "--z0", "-5"},
		{"trace", "--freq", "2.45GHz", "--z0", "50", "--stackup", "no-such-board"},
		{"trace", "--freq", "2.45GHz", "--width", "3 furlongs"},
		{"trace", "--freq", "2.45GHz", "--z0", "1000"},
		{"build", "--page", "a3", "-o", "x"},
		{"stackups", "show", "no-such"},
		{"compare", "--stackups", "nope"},
	}
	for _, args := range cases {
		if _, err := runRoot(t, args...); err == nil {
			t.Errorf("%v: no error", args)
		}
	}
}

func TestBuildHelpCarriesCautions(t *testing.T) {
	out, err := runRoot(t, "build", "--help")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"network analyser", "burns", "heat", "Radio regulations", "Local codes"} {
		if !strings.Contains(out, want) {
			t.Errorf("build --help lacks %q", want)
		}
	}
}

// A stackup with solder mask, or with grounded coplanar lines, is sized by
// the field solver and says so. Common practice, no source: mask over a
// microstrip lowers its Z0, so the 50 Ω strip under mask is narrower; a
// narrow-gap GCPW has lower Z0 than the same strip as microstrip, so its
// 50 Ω strip is narrower still than the bare one.
func TestTraceUsesFieldSolver(t *testing.T) {
	width := func(args ...string) (float64, string) {
		t.Helper()
		out, err := runRoot(t, append([]string{"trace", "--freq", "2.45GHz", "--z0", "50", "--json"}, args...)...)
		if err != nil {
			t.Fatalf("%v: %v", args, err)
		}
		var m struct {
			Width float64 `json:"width_mm"`
			Z0    float64 `json:"z0_ohm"`
			Model string  `json:"model"`
		}
		if err := json.Unmarshal([]byte(out), &m); err != nil {
			t.Fatal(err)
		}
		if m.Z0 < 49.99 || m.Z0 > 50.01 {
			t.Errorf("%v: Z0 %.4f", args, m.Z0)
		}
		return m.Width, m.Model
	}
	bare, bareModel := width("--stackup", "fr4-1.6mm")
	masked, maskedModel := width("--stackup", "fr4-1.6mm-masked")
	if strings.Contains(bareModel, "field") || !strings.Contains(maskedModel, "field solver") {
		t.Errorf("models: bare %q, masked %q", bareModel, maskedModel)
	}
	if !(masked < bare) {
		t.Errorf("masked width %.4f mm is not below bare %.4f mm", masked, bare)
	}
	ms, _ := width("--stackup", "hydrocarbon-ceramic-0.51mm")
	cpw, cpwModel := width("--stackup", filepath.Join("..", "..", "testdata", "stackups", "gcpw-hydrocarbon.toml"))
	if !strings.Contains(cpwModel, "field solver") || !(cpw < ms) {
		t.Errorf("gcpw %.4f mm (%s) vs microstrip %.4f mm", cpw, cpwModel, ms)
	}
}

// The same input gives byte-identical files when SOURCE_DATE_EPOCH fixes
// the date (reproducible-builds convention).
func TestBuildReproducible(t *testing.T) {
	t.Setenv("SOURCE_DATE_EPOCH", "1767225600")
	parent := t.TempDir()
	var dirs []string
	for _, name := range []string{"a", "b"} {
		dir := filepath.Join(parent, name)
		if out, err := runRoot(t, "build", "-o", dir, "--samples", "100"); err != nil {
			t.Fatalf("%v\n%s", err, out)
		}
		dirs = append(dirs, dir)
	}
	entries, err := os.ReadDir(dirs[0])
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) < 10 {
		t.Fatalf("only %d files", len(entries))
	}
	for _, e := range entries {
		a, _ := os.ReadFile(filepath.Join(dirs[0], e.Name()))
		b, err := os.ReadFile(filepath.Join(dirs[1], e.Name()))
		if err != nil {
			t.Errorf("%s: %v", e.Name(), err)
			continue
		}
		if !bytes.Equal(a, b) {
			t.Errorf("%s differs between two builds", e.Name())
		}
	}
	top, err := os.ReadFile(filepath.Join(dirs[0], "soil-probe-match-copper-top.gbr"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(top), "%TF.CreationDate,2026-01-01T00:00:00") {
		t.Errorf("creation date not from SOURCE_DATE_EPOCH:\n%s", string(top[:min(len(top), 600)]))
	}
}

// A board limit smaller than the network is refused before anything is
// written (stubs are laid out straight).
func TestBuildBoardTooSmall(t *testing.T) {
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "designs", "sensor-antenna.toml"))
	if err != nil {
		t.Fatal(err)
	}
	parent := t.TempDir()
	design := filepath.Join(parent, "small.toml")
	text := strings.Replace(string(src), `max_board = ["60mm", "40mm"]`, `max_board = ["30mm", "12mm"]`, 1)
	if text == string(src) {
		t.Fatal("the example design no longer has the max_board line this test edits")
	}
	if err := os.WriteFile(design, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(parent, "out")
	_, err = runRoot(t, "build", design, "-o", dir)
	if err == nil || !strings.Contains(err.Error(), "does not fit") {
		t.Fatalf("want a refusal, got %v", err)
	}
	if _, err := os.Stat(dir); err == nil {
		t.Error("an output directory was written")
	}
}

// A width below the fab's minimum is refused, with nothing written.
func TestBuildBelowFabMinimum(t *testing.T) {
	parent := t.TempDir()
	design := filepath.Join(parent, "thin.toml")
	text := `name = "thin"
frequency = "2.45GHz"
z0 = 50
stackup = "polyimide-flex-0.1mm"
[load]
impedance = "31-j24"
[match]
topology = "shunt-stub"
stub = "open"
[fab]
min_width = "0.3mm"
`
	if err := os.WriteFile(design, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(parent, "out")
	_, err := runRoot(t, "build", design, "-o", dir, "--no-tolerance")
	if err == nil || !strings.Contains(err.Error(), "below the fab minimum 0.300 mm") {
		t.Fatalf("want a refusal, got %v", err)
	}
	if _, err := os.Stat(dir); err == nil {
		t.Error("an output directory was written")
	}
}

// pdftotext (Debian poppler-utils) finds every element value of the real
// demo's report.json in its drawing, as printed with three decimals (mm)
// and two (degrees).
func TestBuildDrawingCarriesReport(t *testing.T) {
	pdftotext, err := exec.LookPath("pdftotext")
	if err != nil {
		t.Skip("pdftotext (poppler-utils) not installed: drawing text check skipped")
	}
	dir := filepath.Join(t.TempDir(), "out")
	if out, err := runRoot(t, "build", "-o", dir, "--samples", "50"); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	text, err := exec.Command(pdftotext, "-layout", filepath.Join(dir, "drawing.pdf"), "-").Output()
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep reportFile
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	signed := func(v float64) string {
		s := fmt.Sprintf("%+.3f", v)
		return strings.Replace(s, "-", "−", 1)
	}
	for _, e := range rep.Elements {
		for _, want := range []string{
			fmt.Sprintf("%.3f", e.WidthMM), fmt.Sprintf("%.3f", e.DrawnLengthMM), fmt.Sprintf("%.3f", e.LineLengthMM),
			fmt.Sprintf("%.2f", e.ElectricalDeg), signed(e.OpenEndMM), signed(e.TeeMM), e.ID,
		} {
			if !strings.Contains(string(text), want) {
				t.Errorf("%s: %q not in the drawing's text", e.ID, want)
			}
		}
	}
}

// A grounded-coplanar design: widths from the field solver, a top ground
// pour in the Gerber, a shorted stub's via in the drill file.
func TestBuildGCPW(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	out, err := runRoot(t, "build", filepath.Join("..", "..", "testdata", "designs", "gcpw-probe.toml"), "-o", dir)
	if err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Model   string  `json:"line_model"`
		S11     float64 `json:"s11_db_f0"`
		Stackup struct {
			Line  string  `json:"line"`
			GapMM float64 `json:"gcpw_gap_mm"`
		} `json:"stackup"`
	}
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(rep.Model, "field solver") || rep.Stackup.Line != "gcpw" || rep.Stackup.GapMM != 0.25 || rep.S11 > -25 {
		t.Errorf("report: %+v", rep)
	}
	top, err := os.ReadFile(filepath.Join(dir, "gcpw-probe-match-copper-top.gbr"))
	if err != nil {
		t.Fatal(err)
	}
	// The shorted stub joins the RF copper to the plane, and the stitching
	// vias join the pour to it: every top region is on the one DC net.
	if strings.Count(string(top), "%TO.N,RF_GND*%") < 2 || strings.Contains(string(top), "%TO.N,GND*%") {
		t.Error("the top copper is not all on net RF_GND")
	}
	drill, err := os.ReadFile(filepath.Join(dir, "gcpw-probe-match-drill.drl"))
	if err != nil {
		t.Fatal(err)
	}
	if strings.Count(string(drill), "\nX") < 5 {
		t.Errorf("too few drill hits for a stitched pour:\n%s", drill)
	}
}

// A network that does not match is refused unless asked for; an absurd
// frequency that would draw a board kilometres long is refused whatever.
func TestBuildRefusesMismatchAndHugeBoards(t *testing.T) {
	parent := t.TempDir()
	write := func(name, text string) string {
		p := filepath.Join(parent, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	wrong := write("wrong.toml", `name = "wrong"
frequency = "2.45GHz"
z0 = 50
stackup = "fr4-1.6mm"
[load]
impedance = "60-j80"
[[section]]
kind = "line"
z0 = 50
length = "36deg"
[[section]]
kind = "stub"
end = "open"
z0 = 50
length = "36deg"
`)
	out := filepath.Join(parent, "out")
	if _, err := runRoot(t, "build", wrong, "-o", out, "--no-tolerance"); err == nil || !strings.Contains(err.Error(), "does not match") {
		t.Fatalf("want a refusal, got %v", err)
	}
	if _, err := os.Stat(out); err == nil {
		t.Fatal("written despite the refusal")
	}
	if _, err := runRoot(t, "build", wrong, "-o", out, "--no-tolerance", "--accept-mismatch"); err != nil {
		t.Fatalf("--accept-mismatch: %v", err)
	}
	demo := synth.DemoTOML()
	slow := write("slow.toml", strings.Replace(string(demo), `frequency = "2.45GHz"`, `frequency = "1MHz"`, 1))
	huge := filepath.Join(parent, "huge")
	if _, err := runRoot(t, "build", slow, "-o", huge, "--no-tolerance", "--accept-mismatch"); err == nil || !strings.Contains(err.Error(), "larger than 500 mm") {
		t.Fatalf("want a board-size refusal, got %v", err)
	}
	if _, err := os.Stat(huge); err == nil {
		t.Fatal("a huge board was written")
	}
}

// A stub that does not fit the board's height bends with a mitred corner,
// and the report says so.
func TestBuildBentStub(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	out, err := runRoot(t, "build", filepath.Join("..", "..", "testdata", "designs", "compact-bent-stub.toml"), "-o", dir, "--no-tolerance")
	if err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if !strings.Contains(out, "bends 90°") || !strings.Contains(out, "Douville and James") {
		t.Errorf("no bend note in the summary:\n%s", out)
	}
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(data), "bends 90°") || !strings.Contains(string(data), "the bend is compensated") {
		t.Error("no note of the compensated bend in report.json")
	}
	// The bent stub is drawn longer than its electrical length by one
	// bend's shortening (about half its width, physical.MitredBendShortening).
	var rep struct {
		Elements []struct {
			Role    string  `json:"role"`
			WidthMM float64 `json:"width_mm"`
			BendMM  float64 `json:"bend_mm"`
		} `json:"elements"`
	}
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	for _, e := range rep.Elements {
		if e.Role == "stub" && !(e.BendMM > 0.45*e.WidthMM && e.BendMM < 0.9*e.WidthMM) {
			t.Errorf("stub bend_mm %.4f, want 0.45–0.9 × its width %.4f mm", e.BendMM, e.WidthMM)
		}
	}
}

// "stackups show" prints TOML that decodes back to the same preset.
func TestStackupsShowRoundTrip(t *testing.T) {
	for _, name := range presetNames() {
		out, err := runRoot(t, "stackups", "show", name)
		if err != nil {
			t.Fatal(err)
		}
		got, err := stackups.Decode(strings.NewReader(out), name+".toml")
		if err != nil {
			t.Fatalf("%s: %v\n%s", name, err, out)
		}
		want, _ := stackups.Preset(name)
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s: shown %+v, preset %+v", name, got, want)
		}
	}
}

// Every example design builds; the decoder fixture whose arbitrary
// lengths do not match is refused as a mismatch.
func TestExampleDesignsBuild(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "..", "testdata", "designs", "*.toml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no example designs: %v", err)
	}
	for _, file := range files {
		base := filepath.Base(file)
		if strings.HasPrefix(base, "bad-") {
			continue
		}
		t.Run(base, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "out")
			_, err := runRoot(t, "build", file, "-o", dir, "--samples", "50")
			if base == "sensor-antenna-sections.toml" {
				if err == nil || !strings.Contains(err.Error(), "does not match") {
					t.Errorf("want a mismatch refusal, got %v", err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
		})
	}
}
