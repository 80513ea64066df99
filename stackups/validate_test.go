package stackups

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// good returns a valid stackup built in code, not decoded.
func good() Stackup {
	return Stackup{
		Name: "g", Line: Microstrip,
		Dielectric: Dielectric{Er: 4.4, LossTangent: 0.02, Thickness: 1.6e-3},
		Copper:     Copper{Thickness: 35e-6, Conductivity: 5.8e7},
	}
}

func TestValidateGood(t *testing.T) {
	gcpw := good()
	gcpw.Line, gcpw.Gap = GCPW, 0.2e-3
	edge := good() // every limit reached exactly; limits are common practice, no source
	edge.Dielectric = Dielectric{Er: 30, ErFrequency: 1e12, LossTangent: 0, Thickness: 20e-3}
	edge.Copper = Copper{Thickness: 500e-6, Roughness: 20e-6, Conductivity: 1e8}
	edge.Mask = &Mask{Thickness: 200e-6, Er: 1}
	edge.Spread = Spread{ErRel: 0.5, ThicknessRel: 0.5}
	low := good()
	low.Dielectric = Dielectric{Er: 1, Thickness: 10e-6}
	low.Copper = Copper{Thickness: 0, Roughness: 1e-6, Conductivity: 1e5}
	for name, s := range map[string]Stackup{"good": good(), "gcpw": gcpw, "upper limits": edge, "lower limits": low} {
		if err := s.Validate(); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
}

func TestValidateBad(t *testing.T) {
	tests := []struct {
		name  string
		edit  func(*Stackup)
		key   string
		value string
		msg   string
	}{
		{"no name", func(s *Stackup) { s.Name = " " }, "name", `" "`, "empty"},
		{"bad utf-8", func(s *Stackup) { s.Description = "\xff" }, "description", `"` + "\uFFFD" + `"`, "UTF-8"},
		{"empty line", func(s *Stackup) { s.Line = "" }, "line", `""`, "microstrip"},
		{"gcpw no gap", func(s *Stackup) { s.Line = GCPW }, "gap", "", "needs the gap"},
		{"gcpw nan gap", func(s *Stackup) { s.Line, s.Gap = GCPW, math.NaN() }, "gap", `"nan"`, "number from"},
		{"microstrip gap", func(s *Stackup) { s.Gap = 1e-4 }, "gap", `"0.1mm"`, "no gap"},
		{"er", func(s *Stackup) { s.Dielectric.Er = 0.8 }, "dielectric.er", "0.8", "relative permittivity must be at least 1"},
		{"er nan", func(s *Stackup) { s.Dielectric.Er = math.NaN() }, "dielectric.er", "nan", "from 1 to 30"},
		{"er frequency", func(s *Stackup) { s.Dielectric.ErFrequency = -1e9 }, "dielectric.er_frequency", `"-1GHz"`, "positive"},
		{"er frequency high", func(s *Stackup) { s.Dielectric.ErFrequency = 2e12 }, "dielectric.er_frequency", `"2000GHz"`, "at most 1THz"},
		{"loss tangent nan", func(s *Stackup) { s.Dielectric.LossTangent = math.NaN() }, "dielectric.loss_tangent", "nan", "loss tangent"},
		{"thickness", func(s *Stackup) { s.Dielectric.Thickness = 9e-6 }, "dielectric.thickness", `"9um"`, "at least 10um"},
		{"copper", func(s *Stackup) { s.Copper.Thickness = 501e-6 }, "copper.thickness", `"0.501mm"`, "at most 0.5mm"},
		{"roughness", func(s *Stackup) { s.Copper.Roughness = 35e-6 }, "copper.roughness", `"35um"`, "at most 20um"},
		{"conductivity unset", func(s *Stackup) { s.Copper.Conductivity = 0 }, "copper.conductivity", "0", "at least 100000"},
		{"mask er", func(s *Stackup) { s.Mask = &Mask{Thickness: 20e-6, Er: 0.9} }, "mask.er", "0.9", "at least 1"},
		{"mask thickness", func(s *Stackup) { s.Mask = &Mask{Er: 3.5} }, "mask.thickness", `"0um"`, "positive"},
		{"mask loss", func(s *Stackup) { s.Mask = &Mask{Thickness: 20e-6, Er: 3.5, LossTangent: -0.01} }, "mask.loss_tangent", "-0.01", "at least 0"},
		{"spread er", func(s *Stackup) { s.Spread.ErRel = 0.6 }, "spread.er", `"60%"`, "at most 50%"},
		{"spread thickness", func(s *Stackup) { s.Spread.ThicknessRel = -0.01 }, "spread.thickness", `"-1%"`, "at least 0%"},
	}
	for _, tt := range tests {
		s := good()
		tt.edit(&s)
		err := s.Validate()
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%s: got %v, want an *Error", tt.name, err)
			continue
		}
		if e.Key != tt.key || e.Value != tt.value || e.Source != "" || e.Line != 0 || !strings.Contains(err.Error(), tt.msg) {
			t.Errorf("%s: got key %q value %q source %q line %d: %v; want key %q value %q, message with %q",
				tt.name, e.Key, e.Value, e.Source, e.Line, err, tt.key, tt.value, tt.msg)
		}
	}
}
