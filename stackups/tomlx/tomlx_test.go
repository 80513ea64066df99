package tomlx

import (
	"errors"
	"strings"
	"testing"

	"github.com/BurntSushi/toml"
)

type rawDoc struct {
	Name    any            `toml:"name"`
	Load    toml.Primitive `toml:"load"`
	Section toml.Primitive `toml:"section"`
}

type rawLoad struct {
	Impedance any `toml:"impedance"`
}

type rawSection struct {
	Kind any `toml:"kind"`
}

var docSchema = Schema{"": {"name", "load", "section"}, "load": {"impedance"}, "section": {"kind"}}

// Line numbers counted by hand in each text.
func TestFileErrors(t *testing.T) {
	cases := []struct {
		name, text string
		line       int
		key, value string
		is         error
		contains   string
	}{
		{"unknown top key", "name = \"a\"\nnmae = 1\n", 2, "nmae", "", ErrUnknownKey, "the top level of a design takes name, load, section"},
		{"unknown key in a table", "name = \"a\"\n[load]\nimpedance = 5\nz = 1\n", 4, "load.z", "", ErrUnknownKey, "[load] takes impedance"},
		{"unknown key in the second section", "[[section]]\nkind = \"line\"\n[[section]]\nkind = \"stub\"\nwidth = 1\n", 5, "section[2].width", "", ErrUnknownKey, "[section] takes kind"},
		{"table of the wrong kind", "name = \"a\"\nload = \"50\"\n", 2, "load", "", ErrType, "load must be a table, not a string"},
		{"array of tables of the wrong kind", "section = 3\n", 1, "section", "", ErrType, "not an integer"},
		{"syntax", "name = \"a\"\nload = \n", 2, "", "", ErrSyntax, "TOML syntax error"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var raw rawDoc
			f, err := Decode([]byte(c.text), "d.toml", &raw)
			if err == nil {
				err = f.Unknown(docSchema, "a design")
			}
			if err == nil {
				var l rawLoad
				_, err = f.Table("load", raw.Load, &l)
			}
			if err == nil {
				var ss []rawSection
				_, err = f.Tables("section", raw.Section, &ss)
			}
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("got %v, want an *Error", err)
			}
			if e.Source != "d.toml" || e.Line != c.line || e.Key != c.key || e.Value != c.value || !errors.Is(err, c.is) || !strings.Contains(err.Error(), c.contains) {
				t.Errorf("got %q (line %d, key %q, value %q), want line %d, key %q, value %q, %v, containing %q",
					err, e.Line, e.Key, e.Value, c.line, c.key, c.value, c.is, c.contains)
			}
			if strings.Contains(err.Error(), "interface") || strings.Contains(err.Error(), "struct") {
				t.Errorf("%q names a Go type", err)
			}
		})
	}
}

func TestFileLinesAndValues(t *testing.T) {
	text := "name = \"a\"\n[load]\nimpedance = \"22-j31\"\n[[section]]\nkind = \"line\"\n[[section]]\nkind = \"stub\"\n"
	var raw rawDoc
	f, err := Decode([]byte(text), "d.toml", &raw)
	if err != nil {
		t.Fatal(err)
	}
	for path, want := range map[string]int{"name": 1, "load": 2, "load.impedance": 3, "load.missing": 2, "section[1].kind": 5, "section[2].kind": 7, "section[2]": 6, "nowhere": 0} {
		if got := f.Line(path); got != want {
			t.Errorf("Line(%q) = %d, want %d", path, got, want)
		}
	}
	if !f.Written("load.impedance") || f.Written("load.touchstone") {
		t.Error("Written: wrong")
	}
	var ss []rawSection
	if ok, err := f.Tables("section", raw.Section, &ss); !ok || err != nil || len(ss) != 2 || ss[1].Kind != "stub" {
		t.Errorf("Tables: %v %v %+v", ok, err, ss)
	}
	e := f.Fail("section[2].kind", ss[1].Kind, errors.New("bad"))
	if got := e.Error(); got != `d.toml:7: section[2].kind = "stub": bad` {
		t.Errorf("Fail: %q", got)
	}
	if got := f.Missing("load.touchstone", "for example touchstone = \"a.s1p\"").Error(); got != `d.toml:2: load.touchstone: a required key is missing; for example touchstone = "a.s1p"` {
		t.Errorf("Missing: %q", got)
	}
}

func TestLiteral(t *testing.T) {
	for _, c := range []struct {
		v    any
		want string
	}{
		{nil, ""}, {"a\"b", `"a\"b"`}, {int64(3), "3"}, {0.5, "0.5"}, {true, "true"},
		{[]any{int64(1), "x"}, `[1, "x"]`}, {map[string]any{"b": int64(2), "a": int64(1)}, "{a = 1, b = 2}"},
	} {
		if got := Literal(c.v); got != c.want {
			t.Errorf("Literal(%#v) = %q, want %q", c.v, got, c.want)
		}
	}
}

func TestErrorMessage(t *testing.T) {
	tests := []struct {
		err  Error
		want string // the forms documented on Error
	}{
		{Error{Source: "board.toml", Line: 7, Key: "dielectric.er", Value: "0.8", Err: errors.New("relative permittivity must be at least 1")},
			"board.toml:7: dielectric.er = 0.8: relative permittivity must be at least 1"},
		{Error{Source: "board.toml", Key: "name", Err: ErrMissing}, "board.toml: name: a required key is missing"},
		{Error{Key: "dielectric.er", Value: "0.8", Err: errors.New("bad")}, "dielectric.er = 0.8: bad"},
		{Error{Source: "board.toml", Line: 3, Err: errors.New("bad")}, "board.toml:3: bad"},
		{Error{}, "invalid value"},
	}
	for _, tt := range tests {
		if got := tt.err.Error(); got != tt.want {
			t.Errorf("Error() = %q, want %q", got, tt.want)
		}
	}
}
