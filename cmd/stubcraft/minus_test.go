package main

import (
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// asciiMinus finds an ASCII hyphen-minus that starts a number: a negative
// figure not written with U+2212.
var asciiMinus = regexp.MustCompile(`(^|[^\p{L}\p{N}._-])-[.\d]`)

// The figures of the command output carry a true minus sign (U+2212), as
// the headline, the drawing and report.json's summary do: the element
// table, |S11| at f0, the band and tolerance lines, the sensitivity
// table, the notes and warnings, a refusal's |S11|, and solve --band's
// table and notes. Only an impedance keeps the form it is typed in
// ("31-j24").
func TestOutputMinusSigns(t *testing.T) {
	td := filepath.Join("..", "..", "testdata", "designs")
	cases := []struct {
		name    string
		args    []string
		refused bool // the build is refused: its error is checked
	}{
		{"demo", []string{"build", "-o", "", "--samples", "20"}, false},
		{"band-auto", []string{"build", filepath.Join(td, "band-auto.toml"), "-o", "", "--samples", "20"}, false},
		{"sensor-antenna-sections", []string{"build", filepath.Join(td, "sensor-antenna-sections.toml"), "-o", "", "--samples", "20", "--accept-mismatch"}, false},
		{"sensor-antenna-sections refused", []string{"build", filepath.Join(td, "sensor-antenna-sections.toml"), "-o", "", "--samples", "20"}, true},
		{"solve --band", []string{"solve", "--band", "2GHz..3GHz", "--topology", "double-stub", "--stub", "open", "--load", "50+j15"}, false},
	}
	for _, c := range cases {
		args := append([]string(nil), c.args...)
		for i, a := range args {
			if a == "-o" {
				args[i+1] = filepath.Join(t.TempDir(), "out")
			}
		}
		out, err := runRoot(t, args...)
		if c.refused {
			if err == nil || asciiMinus.MatchString(err.Error()) || !strings.Contains(err.Error(), "−") {
				t.Errorf("%s: error %v, want a refusal with its |S11| in U+2212", c.name, err)
			}
			continue
		}
		if err != nil {
			t.Fatalf("%s: %v\n%s", c.name, err, out)
		}
		for _, line := range strings.Split(out, "\n") {
			if strings.HasPrefix(line, "load ") || strings.HasPrefix(line, "wrote ") {
				continue // the load's impedance as typed; the output path
			}
			if asciiMinus.MatchString(line) {
				t.Errorf("%s: an ASCII minus in %q", c.name, line)
			}
		}
	}
}
