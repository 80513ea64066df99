package synth

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzDecodeDesign: any text decodes or fails with a *DesignError, never
// panics; what decodes validates.
func FuzzDecodeDesign(f *testing.F) {
	files, _ := filepath.Glob("../testdata/designs/*.toml")
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(string(data))
		}
	}
	f.Add("name = \"x\"\nfrequency = \"1GHz\"\n")
	f.Fuzz(func(t *testing.T, text string) {
		d, err := DecodeDesign(strings.NewReader(text), "fuzz.toml", "")
		if err != nil {
			var de *DesignError
			if !errors.As(err, &de) {
				t.Fatalf("error %T is not a *DesignError: %v", err, err)
			}
			return
		}
		if err := d.Validate(); err != nil {
			t.Fatalf("decoded but does not validate: %v", err)
		}
	})
}
