package stackups

import (
	"bytes"
	"errors"
	"reflect"
	"strings"
	"testing"
)

func roundTrip(t *testing.T, s Stackup) (Stackup, string) {
	t.Helper()
	var b bytes.Buffer
	if err := Encode(&b, s); err != nil {
		t.Fatalf("Encode(%s): %v", s.Name, err)
	}
	got, err := Decode(bytes.NewReader(b.Bytes()), "encoded.toml")
	if err != nil {
		t.Fatalf("Decode(Encode(%s)): %v\n%s", s.Name, err, b.String())
	}
	return got, b.String()
}

func TestEncodeRoundTrip(t *testing.T) {
	cases := Presets()
	base, err := Decode(strings.NewReader(baseFile()), "board.toml")
	if err != nil {
		t.Fatal(err)
	}
	odd := good() // values that no short decimal in mm or µm gives exactly
	odd.Name = `odd "name" \ with µ`
	odd.Description = "two\nlines\tand a tab"
	odd.Line, odd.Gap = GCPW, 1.0/3*1e-3
	odd.Dielectric.Thickness = 2.0 / 3 * 1e-3
	odd.Dielectric.Er = 3.123456789012345
	odd.Dielectric.ErFrequency = 1.0 / 7 * 1e10
	odd.Copper.Roughness = 1.0 / 9 * 1e-6
	odd.Mask = &Mask{Thickness: 1.0 / 7 * 1e-4, Er: 3.3}
	odd.Spread = Spread{ErRel: 1.0 / 3 * 0.1, ThicknessRel: 0.07}
	cases = append(cases, base, odd)
	for _, s := range cases {
		got, text := roundTrip(t, s)
		if !reflect.DeepEqual(got, s) {
			t.Errorf("%s: round trip\n got %+v %+v\nwant %+v %+v\n%s", s.Name, got, got.Mask, s, s.Mask, text)
		}
	}
}

func TestEncodeText(t *testing.T) {
	s, _ := Preset("fr4-1.6mm-masked")
	var b bytes.Buffer
	if err := Encode(&b, s); err != nil {
		t.Fatal(err)
	}
	// The exact text: our schema, as documented in doc.go.
	want := `name = "fr4-1.6mm-masked"
description = "two-layer FR-4, 1.6 mm, 1 oz copper, 20 um solder mask"
line = "microstrip"

[dielectric]
er = 4.4
er_frequency = "1GHz"
loss_tangent = 0.02
thickness = "1.6mm"

[copper]
thickness = "34.8um"
roughness = "2um"
conductivity = 5.8e+07

[mask]
thickness = "20um"
er = 3.5
loss_tangent = 0.025

[spread]
er = 0.25
thickness = "10%"
`
	if b.String() != want {
		t.Errorf("Encode =\n%s\nwant\n%s", b.String(), want)
	}
}

func TestEncodeRefusesInvalid(t *testing.T) {
	s := good()
	s.Dielectric.Er = 0.5
	var b bytes.Buffer
	err := Encode(&b, s)
	var e *Error
	if !errors.As(err, &e) || e.Key != "dielectric.er" || b.Len() != 0 {
		t.Errorf("Encode(invalid) = %v and wrote %d bytes, want the validation error and nothing written", err, b.Len())
	}
}

// failWriter fails every write.
type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, errors.New("disk full") }

func TestEncodeWriteError(t *testing.T) {
	if err := Encode(failWriter{}, good()); err == nil || !strings.Contains(err.Error(), "disk full") {
		t.Errorf("Encode to a failing writer = %v", err)
	}
}
