package stackups

import (
	"bytes"
	"errors"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strconv"
	"strings"
	"testing"
)

func TestPresetsDecodeAndValidate(t *testing.T) {
	entries, err := fs.ReadDir(presetFiles, "presets")
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) < 7 {
		t.Errorf("%d preset files, want at least 7", len(entries))
	}
	for _, e := range entries {
		data, err := presetFiles.ReadFile("presets/" + e.Name())
		if err != nil {
			t.Fatal(err)
		}
		s, err := Decode(bytes.NewReader(data), e.Name())
		if err != nil {
			t.Errorf("%s: %v", e.Name(), err)
			continue
		}
		if err := s.Validate(); err != nil {
			t.Errorf("%s: %v", e.Name(), err)
		}
		if want := strings.TrimSuffix(e.Name(), ".toml"); s.Name != want {
			t.Errorf("%s: name %q, want the file name %q", e.Name(), s.Name, want)
		}
		text := string(data)
		if !strings.Contains(text, "from memory, not a datasheet") {
			t.Errorf("%s: the comment does not say its values are from memory", e.Name())
		}
		if s.Spread.ErRel == 0 || s.Spread.ThicknessRel == 0 || s.Description == "" {
			t.Errorf("%s: a preset carries a description and both spreads", e.Name())
		}
	}
}

// TestPresetValues checks each required preset against the material-class
// values of the task brief (typical values, from memory; no datasheet).
func TestPresetValues(t *testing.T) {
	tests := []struct {
		name           string
		erLo, erHi     float64
		tanD           float64 // the brief's value, or the class's from memory
		thicknessM     float64
		copperLo, copH float64
		mask           bool
	}{
		{"fr4-1.6mm", 4.2, 4.7, 0.02, 1.6e-3, 34e-6, 36e-6, false},
		{"fr4-1.6mm-masked", 4.2, 4.7, 0.02, 1.6e-3, 34e-6, 36e-6, true},
		{"fr4-prepreg-0.2mm", 4.0, 4.2, 0.02, 0.2e-3, 34e-6, 36e-6, false},
		{"fr4-prepreg-0.1mm", 3.8, 4.2, 0.02, 0.1e-3, 34e-6, 36e-6, false},
		{"ptfe-glass-0.79mm", 2.17, 2.6, 0.002, 0.787e-3, 17e-6, 36e-6, false},
		{"ptfe-glass-0.51mm", 2.17, 2.6, 0.002, 0.508e-3, 17e-6, 36e-6, false},
		// Class-typical and rounded (the class spans about 3.3-3.7, from
		// memory), not one product's figures.
		{"hydrocarbon-ceramic-0.51mm", 3.3, 3.7, 0.004, 0.51e-3, 17e-6, 36e-6, false},
		{"alumina-0.635mm", 9.6, 9.9, 0.0001, 0.635e-3, 3e-6, 5e-6, false},
		{"polyimide-flex-0.1mm", 3.2, 3.5, 0.002, 0.1e-3, 17e-6, 18e-6, false},
	}
	for _, tt := range tests {
		s, ok := Preset(tt.name)
		if !ok {
			t.Errorf("no preset %q", tt.name)
			continue
		}
		d := s.Dielectric
		if d.Er < tt.erLo || d.Er > tt.erHi || d.LossTangent != tt.tanD ||
			!(d.Thickness > tt.thicknessM*0.999 && d.Thickness < tt.thicknessM*1.001) ||
			s.Copper.Thickness < tt.copperLo || s.Copper.Thickness > tt.copH || (s.Mask != nil) != tt.mask {
			t.Errorf("%s = %+v, mask %v; want εr %g-%g, tanδ %g, h %g m, copper %g-%g m, mask %v",
				tt.name, s, s.Mask, tt.erLo, tt.erHi, tt.tanD, tt.thicknessM, tt.copperLo, tt.copH, tt.mask)
		}
	}
	if s, _ := Preset("alumina-0.635mm"); s.Copper.Conductivity != 4.1e7 {
		t.Errorf("alumina conductor %g S/m, want gold 4.1e7 (from memory)", s.Copper.Conductivity)
	}
	// The FR-4 spread covers the usual 4.2-4.7 (from memory) to within 0.05.
	if s, _ := Preset("fr4-1.6mm"); s.Dielectric.Er*(1-s.Spread.ErRel) > 4.2 || s.Dielectric.Er*(1+s.Spread.ErRel) < 4.65 {
		t.Errorf("fr4-1.6mm spread %g around %g does not cover 4.2-4.65", s.Spread.ErRel, s.Dielectric.Er)
	}
}

// TestPresetsTypicalRounded: every preset marks its values typical and
// rounds εr to 0.05 and tanδ to one significant digit, so that no preset
// reproduces the figures of one product's datasheet; the layer-pair
// presets of multilayer boards say so and give the board's layer count and
// total thickness (a usual 1.6 mm, from memory), which the board thickness
// reports.
func TestPresetsTypicalRounded(t *testing.T) {
	for _, s := range Presets() {
		d := s.Dielectric
		if r := d.Er * 20; math.Abs(r-math.Round(r)) > 1e-9 {
			t.Errorf("%s: εr %g not rounded to 0.05", s.Name, d.Er)
		}
		if e := math.Pow(10, math.Floor(math.Log10(d.LossTangent))); math.Abs(d.LossTangent/e-math.Round(d.LossTangent/e)) > 1e-9 {
			t.Errorf("%s: tanδ %g not rounded to one significant digit", s.Name, d.LossTangent)
		}
	}
	for _, c := range []struct {
		name   string
		layers int
	}{{"fr4-prepreg-0.2mm", 4}, {"fr4-prepreg-0.1mm", 6}} {
		s, _ := Preset(c.name)
		if !s.LayerPair() || s.Board.Layers != c.layers || s.BoardThickness() != 1.6e-3 ||
			!strings.Contains(s.Description, "layer pair of a "+strconv.Itoa(c.layers)+"-layer") {
			t.Errorf("%s: board %+v, description %q; want the outer pair of a %d-layer 1.6 mm board", c.name, s.Board, s.Description, c.layers)
		}
	}
	if s, _ := Preset("fr4-1.6mm"); s.LayerPair() || math.Abs(s.BoardThickness()-1.67e-3) > 1e-6 {
		t.Errorf("fr4-1.6mm: a two-layer board 1.6 + 2 × 0.035 mm thick (1 oz, about 35 µm), got %g m", s.BoardThickness())
	}
}

func TestPresetsSortedAndFresh(t *testing.T) {
	ps := Presets()
	names := make([]string, len(ps))
	for i, s := range ps {
		names[i] = s.Name
	}
	if !sort.StringsAreSorted(names) {
		t.Errorf("Presets() not sorted: %v", names)
	}
	ps[0].Name = "changed"
	for i := range ps {
		if ps[i].Mask != nil {
			ps[i].Mask.Er = 99
		}
	}
	again := Presets()
	if again[0].Name == "changed" {
		t.Error("Presets() returned shared values")
	}
	for _, s := range again {
		if s.Mask != nil && s.Mask.Er == 99 {
			t.Error("Presets() shares Mask pointers between calls")
		}
	}
}

func TestPresetLookup(t *testing.T) {
	for _, name := range []string{"", "nope", "../stackup", "presets/fr4-1.6mm", "fr4-1.6mm.toml", `fr4\1.6mm`, "FR4-1.6MM"} {
		if _, ok := Preset(name); ok {
			t.Errorf("Preset(%q) found a preset", name)
		}
	}
	if s, ok := Preset("fr4-1.6mm"); !ok || s.Name != "fr4-1.6mm" {
		t.Errorf("Preset(fr4-1.6mm) = %v, %v", s.Name, ok)
	}
}

func TestLoad(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "board.toml")
	if err := os.WriteFile(path, []byte(baseFile()), 0o644); err != nil {
		t.Fatal(err)
	}
	broken := filepath.Join(dir, "broken.toml")
	if err := os.WriteFile(broken, []byte(strings.Replace(baseFile(), "er = 3.5", "er = 0.8", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	want, _ := Decode(strings.NewReader(baseFile()), "x")
	preset, _ := Preset("alumina-0.635mm")

	if got, err := Load("alumina-0.635mm"); err != nil || !reflect.DeepEqual(got, preset) {
		t.Errorf("Load(preset) = %+v, %v", got, err)
	}
	if got, err := Load(path); err != nil || !reflect.DeepEqual(got, want) {
		t.Errorf("Load(path) = %+v, %v", got, err)
	}
	_, err := Load(broken)
	var e *Error
	if !errors.As(err, &e) || e.Source != broken || e.Line != 5 || e.Key != "dielectric.er" {
		t.Errorf("Load(broken) = %v, want an *Error at %s:5 on dielectric.er", err, broken)
	}
	_, err = Load("no-such-preset")
	if err == nil || !errors.Is(err, fs.ErrNotExist) || !strings.Contains(err.Error(), "fr4-1.6mm") {
		t.Errorf("Load(unknown name) = %v, want a not-exist error listing the presets", err)
	}
	_, err = Load(filepath.Join(dir, "missing.toml"))
	if err == nil || !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("Load(missing file) = %v, want a not-exist error", err)
	}
	// A file in the working directory named like a preset-less name is read.
	t.Chdir(dir)
	if err := os.WriteFile("myboard", []byte(baseFile()), 0o644); err != nil {
		t.Fatal(err)
	}
	if got, err := Load("myboard"); err != nil || got.Name != "board" {
		t.Errorf("Load(bare file name) = %+v, %v", got, err)
	}
}
