package stackups

import (
	"bytes"
	"errors"
	"io/fs"
	"reflect"
	"testing"
)

// FuzzDecode checks that Decode never panics, that every error is an
// *Error, and that whatever it accepts is valid and survives Encode and
// Decode unchanged.
func FuzzDecode(f *testing.F) {
	f.Add([]byte(baseFile()))
	entries, _ := fs.ReadDir(presetFiles, "presets")
	for _, e := range entries {
		data, _ := presetFiles.ReadFile("presets/" + e.Name())
		f.Add(data)
	}
	f.Add([]byte("name = \"m\"\ndielectric = { er = 4, loss_tangent = 0, thickness = \"1mm\" }\ncopper.weight = \"1oz\"\n[spread]\ner = 0.1\n"))
	f.Add([]byte("name = \"m\"\nline = \"gcpw\"\ngap = \"1e-4m\"\n[dielectric]\ner = 1e0\nloss_tangent = 0\nthickness = \"1in\"\n[copper]\nthickness = \"-0um\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Decode(bytes.NewReader(data), "fuzz.toml")
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || e.Source != "fuzz.toml" {
				t.Fatalf("error %v is not an *Error naming the file", err)
			}
			return
		}
		if err := s.Validate(); err != nil {
			t.Fatalf("Decode accepted an invalid stackup: %v", err)
		}
		var b bytes.Buffer
		if err := Encode(&b, s); err != nil {
			t.Fatalf("Encode: %v", err)
		}
		back, err := Decode(bytes.NewReader(b.Bytes()), "again.toml")
		if err != nil {
			t.Fatalf("Decode(Encode): %v\n%s", err, b.String())
		}
		if !reflect.DeepEqual(back, s) {
			t.Fatalf("round trip changed\n%+v\nto\n%+v", s, back)
		}
	})
}
