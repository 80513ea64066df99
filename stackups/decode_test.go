package stackups

import (
	"errors"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"stubcraft/physical/units"
)

// baseFile is a complete stackup using every key of the schema, one key a
// line, so that error rows can state the line they expect.
func baseFile() string {
	return `name = "board"
description = "test board"

[dielectric]
er = 3.5
er_frequency = "10GHz"
loss_tangent = 0.004
thickness = "0.51mm"

[copper]
thickness = "35um"
roughness = "1um"
conductivity = 5.8e7

[mask]
thickness = "20um"
er = 3.8
loss_tangent = 0.02

[spread]
er = "5%"
thickness = "10%"
`
}

// edit returns baseFile with each old text replaced by the new one that
// follows it; it fails the test when an old text is not there exactly once,
// so that a row cannot silently test the base file.
func edit(t *testing.T, oldNew ...string) string {
	t.Helper()
	text := baseFile()
	for i := 0; i+1 < len(oldNew); i += 2 {
		if strings.Count(text, oldNew[i]) != 1 {
			t.Fatalf("edit: %q is not in the file exactly once", oldNew[i])
		}
		text = strings.Replace(text, oldNew[i], oldNew[i+1], 1)
	}
	return text
}

// near reports equality to within a few ulps: a quantity such as "0.51mm"
// is 0.51 × 1e-3 in floating point, which may differ from the literal
// 0.51e-3 in the last place.
func near(got, want float64) bool {
	return got == want || math.Abs(got-want) <= 4e-16*math.Abs(want)
}

func TestDecodeBase(t *testing.T) {
	s, err := Decode(strings.NewReader(baseFile()), "board.toml")
	if err != nil {
		t.Fatal(err)
	}
	// Expected values are the file's quantities in SI units (SI prefixes,
	// exact); the structure is the schema of doc.go.
	tests := []struct {
		name      string
		got, want float64
	}{
		{"dielectric.er", s.Dielectric.Er, 3.5},
		{"dielectric.er_frequency", s.Dielectric.ErFrequency, 10e9},
		{"dielectric.loss_tangent", s.Dielectric.LossTangent, 0.004},
		{"dielectric.thickness", s.Dielectric.Thickness, 0.51e-3},
		{"copper.thickness", s.Copper.Thickness, 35e-6},
		{"copper.roughness", s.Copper.Roughness, 1e-6},
		{"copper.conductivity", s.Copper.Conductivity, 5.8e7},
		{"mask.thickness", s.Mask.Thickness, 20e-6},
		{"mask.er", s.Mask.Er, 3.8},
		{"mask.loss_tangent", s.Mask.LossTangent, 0.02},
		{"spread.er", s.Spread.ErRel, 0.05},
		{"spread.thickness", s.Spread.ThicknessRel, 0.10},
		{"gap", s.Gap, 0},
	}
	for _, tt := range tests {
		if !near(tt.got, tt.want) {
			t.Errorf("%s = %.17g, want %.17g", tt.name, tt.got, tt.want)
		}
	}
	if s.Name != "board" || s.Description != "test board" || s.Line != Microstrip {
		t.Errorf("name, description, line = %q, %q, %q", s.Name, s.Description, s.Line)
	}
}

func TestDecodeForms(t *testing.T) {
	minimal := "name = \"m\"\n[dielectric]\ner = 4\nloss_tangent = 0\nthickness = \"1.6mm\"\n[copper]\nthickness = \"0um\"\n"
	tests := []struct {
		name   string
		text   string
		check  func(Stackup) bool
		source string
	}{
		{"defaults", minimal, func(s Stackup) bool {
			return s.Line == Microstrip && s.Gap == 0 && s.Copper.Conductivity == 5.8e7 &&
				s.Copper.Roughness == 0 && s.Mask == nil && s.Spread == (Spread{}) && s.Dielectric.ErFrequency == 0
		}, "schema defaults; 5.8e7 S/m annealed copper, IEC 60028 (1925)"},
		{"integer er", minimal, func(s Stackup) bool { return s.Dielectric.Er == 4 }, "TOML integer 4 read as the number 4"},
		{"zero copper", minimal, func(s Stackup) bool { return s.Copper.Thickness == 0 }, "0 µm: an ideal thin strip (schema)"},
		{"weight 1oz", strings.Replace(minimal, `thickness = "0um"`, `weight = "1oz"`, 1),
			func(s Stackup) bool { return near(s.Copper.Thickness, 34.8e-6) }, "1 oz/ft² = 34.8 µm, IPC-4562 nominal, from memory"},
		{"weight 0.5 OZ", strings.Replace(minimal, `thickness = "0um"`, `weight = "0.5 OZ"`, 1),
			func(s Stackup) bool { return near(s.Copper.Thickness, 17.4e-6) }, "half of 34.8 µm, from memory"},
		{"thickness in oz", strings.Replace(minimal, `thickness = "0um"`, `thickness = "2oz"`, 1),
			func(s Stackup) bool { return near(s.Copper.Thickness, 69.6e-6) }, "2 × 34.8 µm, from memory"},
		{"mil", strings.Replace(minimal, `"1.6mm"`, `"20mil"`, 1),
			func(s Stackup) bool { return near(s.Dielectric.Thickness, 0.508e-3) }, "1 mil = 25.4 µm exactly"},
		{"gcpw", strings.Replace(minimal, "name = \"m\"\n", "name = \"m\"\nline = \"gcpw\"\ngap = \"0.25mm\"\n", 1),
			func(s Stackup) bool { return s.Line == GCPW && near(s.Gap, 0.25e-3) }, "schema: gcpw with a gap"},
		{"absolute spreads", minimal + "[spread]\ner = 0.2\nthickness = \"0.16mm\"\n",
			func(s Stackup) bool { return near(s.Spread.ErRel, 0.05) && near(s.Spread.ThicknessRel, 0.1) },
			"0.2/4 = 5 %, 0.16/1.6 = 10 % (exact arithmetic)"},
		{"percent with space and exponent", minimal + "[spread]\ner = \"2.5 %\"\nthickness = \"1e1%\"\n",
			func(s Stackup) bool { return s.Spread.ErRel == 0.025 && s.Spread.ThicknessRel == 0.1 }, "2.5 % = 0.025, 1e1 % = 0.1 (exact decimals)"},
		{"inline tables", "name = \"m\"\ndielectric = { er = 4, loss_tangent = 0, thickness = \"1mm\" }\ncopper = { weight = \"1oz\" }\n",
			func(s Stackup) bool { return s.Dielectric.Er == 4 && near(s.Dielectric.Thickness, 1e-3) }, "TOML inline tables"},
		{"dotted and quoted keys", "name = \"m\"\ndielectric.er = 4\n\"dielectric\".'loss_tangent' = 0\ndielectric.thickness = \"1mm\"\ncopper.thickness = \"1um\"\n",
			func(s Stackup) bool { return s.Dielectric.Er == 4 && near(s.Copper.Thickness, 1e-6) }, "TOML dotted and quoted keys"},
		{"mask without loss tangent", minimal + "[mask]\nthickness = \"15um\"\ner = 3.3\n",
			func(s Stackup) bool { return s.Mask != nil && s.Mask.LossTangent == 0 && near(s.Mask.Thickness, 15e-6) }, "schema: mask loss_tangent optional"},
	}
	for _, tt := range tests {
		s, err := Decode(strings.NewReader(tt.text), "f.toml")
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		if !tt.check(s) {
			t.Errorf("%s: got %+v (%s)", tt.name, s, tt.source)
		}
	}
}

// errorRow is one broken file and the error it must give.
type errorRow struct {
	name  string
	text  string
	key   string
	value string // as TOML writes it; "" for a missing key
	line  int    // 0 when the key is not in the file
	is    error  // a reason the error must wrap, or nil
	msg   string // a part of the message
}

func checkError(t *testing.T, tt errorRow, err error) {
	t.Helper()
	if err == nil {
		t.Errorf("%s: no error", tt.name)
		return
	}
	var e *Error
	if !errors.As(err, &e) {
		t.Errorf("%s: %v is a %T, want *Error", tt.name, err, err)
		return
	}
	if e.Source != "board.toml" || e.Key != tt.key || e.Value != tt.value || e.Line != tt.line {
		t.Errorf("%s: got source %q line %d key %q value %q, want line %d key %q value %q (%v)",
			tt.name, e.Source, e.Line, e.Key, e.Value, tt.line, tt.key, tt.value, err)
	}
	if tt.is != nil && !errors.Is(err, tt.is) {
		t.Errorf("%s: %v does not wrap %v", tt.name, err, tt.is)
	}
	msg := err.Error()
	prefix := "board.toml: "
	if tt.line > 0 {
		prefix = "board.toml:" + strconv.Itoa(tt.line) + ": "
	}
	if !strings.HasPrefix(msg, prefix) || !strings.Contains(msg, tt.key) || !strings.Contains(msg, tt.value) || !strings.Contains(msg, tt.msg) {
		t.Errorf("%s: message %q lacks %q, the key, the value or %q", tt.name, msg, prefix, tt.msg)
	}
}

func TestDecodeExactMessage(t *testing.T) {
	// The form of the message set out in the task brief.
	_, err := Decode(strings.NewReader(edit(t, "er = 3.5", "er = 0.8")), "board.toml")
	want := "board.toml:5: dielectric.er = 0.8: relative permittivity must be at least 1"
	if err == nil || err.Error() != want {
		t.Errorf("got %v, want %s", err, want)
	}
	// The same with a byte-order mark and with CRLF line ends (both TOML).
	for _, text := range []string{"\ufeff" + edit(t, "er = 3.5", "er = 0.8"), strings.ReplaceAll(edit(t, "er = 3.5", "er = 0.8"), "\n", "\r\n")} {
		if _, err := Decode(strings.NewReader(text), "board.toml"); err == nil || err.Error() != want {
			t.Errorf("got %v, want %s", err, want)
		}
	}
}

func TestDecodeFieldErrors(t *testing.T) {
	var rows []errorRow
	add := func(name, old, new, key, value string, line int, is error, msg string) {
		rows = append(rows, errorRow{name, edit(t, old, new), key, value, line, is, msg})
	}
	// top level
	add("name missing", `name = "board"`, ``, "name", "", 0, ErrMissing, "missing")
	add("name number", `name = "board"`, `name = 5`, "name", "5", 1, ErrType, "string")
	add("name empty", `name = "board"`, `name = ""`, "name", `""`, 1, nil, "empty")
	add("name newline", `name = "board"`, `name = "a\nb"`, "name", `"a\nb"`, 1, nil, "control")
	add("description number", `description = "test board"`, `description = 3`, "description", "3", 2, ErrType, "string")
	add("line unknown", "board\"\n\n", "board\"\nline = \"stripline\"\n", "line", `"stripline"`, 3, nil, `"microstrip" or "gcpw"`)
	add("line number", "board\"\n\n", "board\"\nline = 1\n", "line", "1", 3, ErrType, "string")
	add("gcpw without gap", "board\"\n\n", "board\"\nline = \"gcpw\"\n", "gap", "", 0, ErrMissing, "gcpw")
	add("gap on microstrip", "board\"\n\n", "board\"\ngap = \"0.2mm\"\n", "gap", `"0.2mm"`, 3, nil, "no gap")
	add("negative gap", "board\"\n\n", "board\"\nline = \"gcpw\"\ngap = \"-0.2mm\"\n", "gap", `"-0.2mm"`, 4, nil, "at least")
	add("gap too wide", "board\"\n\n", "board\"\nline = \"gcpw\"\ngap = \"3cm\"\n", "gap", `"3cm"`, 4, nil, "at most 20mm")
	add("gap unit", "board\"\n\n", "board\"\nline = \"gcpw\"\ngap = \"2 furlongs\"\n", "gap", `"2 furlongs"`, 4, units.ErrUnit, "furlongs")
	add("gap number", "board\"\n\n", "board\"\nline = \"gcpw\"\ngap = 0.2\n", "gap", "0.2", 4, ErrType, "unit")
	// dielectric
	add("er low", "er = 3.5", "er = 0.8", "dielectric.er", "0.8", 5, nil, "at least 1")
	add("er high", "er = 3.5", "er = 31", "dielectric.er", "31", 5, nil, "at most 30")
	add("er nan", "er = 3.5", "er = nan", "dielectric.er", "nan", 5, nil, "number from 1 to 30")
	add("er inf", "er = 3.5", "er = inf", "dielectric.er", "inf", 5, nil, "at most 30")
	add("er string", "er = 3.5", `er = "3.5"`, "dielectric.er", `"3.5"`, 5, ErrType, "number")
	add("er table", "er = 3.5", `er = { value = 3.5 }`, "dielectric.er", "{value = 3.5}", 5, ErrType, "number")
	add("er array", "er = 3.5", `er = [3.5]`, "dielectric.er", "[3.5]", 5, ErrType, "number")
	add("er missing", "er = 3.5", "", "dielectric.er", "", 4, ErrMissing, "missing")
	add("er_frequency unit", `"10GHz"`, `"10 furlongs"`, "dielectric.er_frequency", `"10 furlongs"`, 6, units.ErrUnit, "frequency")
	add("er_frequency bare", `"10GHz"`, `"10"`, "dielectric.er_frequency", `"10"`, 6, units.ErrNoUnit, "unit is needed")
	add("er_frequency negative", `"10GHz"`, `"-1GHz"`, "dielectric.er_frequency", `"-1GHz"`, 6, nil, "positive")
	add("er_frequency number", `"10GHz"`, `1e10`, "dielectric.er_frequency", "1e+10", 6, ErrType, "unit")
	add("loss tangent negative", "loss_tangent = 0.004", "loss_tangent = -0.1", "dielectric.loss_tangent", "-0.1", 7, nil, "at least 0")
	add("loss tangent one", "loss_tangent = 0.004", "loss_tangent = 1", "dielectric.loss_tangent", "1", 7, nil, "less than 1")
	add("loss tangent missing", "loss_tangent = 0.004", "", "dielectric.loss_tangent", "", 4, ErrMissing, "missing")
	add("loss tangent string", "loss_tangent = 0.004", `loss_tangent = "0.004"`, "dielectric.loss_tangent", `"0.004"`, 7, ErrType, "number")
	add("thickness thin", `"0.51mm"`, `"5um"`, "dielectric.thickness", `"5um"`, 8, nil, "at least 10um")
	add("thickness thick", `"0.51mm"`, `"25mm"`, "dielectric.thickness", `"25mm"`, 8, nil, "at most 20mm")
	add("thickness zero", `"0.51mm"`, `"0mm"`, "dielectric.thickness", `"0mm"`, 8, nil, "at least")
	add("thickness unit", `"0.51mm"`, `"3 furlongs"`, "dielectric.thickness", `"3 furlongs"`, 8, units.ErrUnit, "furlongs")
	add("thickness overflow", `"0.51mm"`, `"1e999mm"`, "dielectric.thickness", `"1e999mm"`, 8, units.ErrNotFinite, "finite")
	add("thickness bare", `"0.51mm"`, `"0.51"`, "dielectric.thickness", `"0.51"`, 8, units.ErrNoUnit, "unit")
	add("thickness empty", `"0.51mm"`, `""`, "dielectric.thickness", `""`, 8, units.ErrSyntax, "not a number")
	add("thickness number", `thickness = "0.51mm"`, `thickness = 0.51`, "dielectric.thickness", "0.51", 8, ErrType, "unit")
	add("thickness missing", `thickness = "0.51mm"`, ``, "dielectric.thickness", "", 4, ErrMissing, "missing")
	// copper
	add("copper thick", `"35um"`, `"600um"`, "copper.thickness", `"600um"`, 11, nil, "at most 0.5mm")
	add("copper negative", `"35um"`, `"-1um"`, "copper.thickness", `"-1um"`, 11, nil, "at least 0")
	add("copper unit", `"35um"`, `"35 furlongs"`, "copper.thickness", `"35 furlongs"`, 11, units.ErrUnit, "furlongs")
	add("copper both", `thickness = "35um"`, "thickness = \"35um\"\nweight = \"1oz\"", "copper.weight", `"1oz"`, 12, nil, "not both")
	add("copper weight as length", `thickness = "35um"`, `weight = "35um"`, "copper.weight", `"35um"`, 11, units.ErrUnit, "oz")
	add("copper weight number", `thickness = "35um"`, `weight = 1`, "copper.weight", "1", 11, ErrType, "unit")
	add("copper neither", `thickness = "35um"`, ``, "copper.thickness", "", 10, ErrMissing, "weight")
	add("roughness high", `roughness = "1um"`, `roughness = "25um"`, "copper.roughness", `"25um"`, 12, nil, "at most 20um")
	add("roughness negative", `roughness = "1um"`, `roughness = "-1um"`, "copper.roughness", `"-1um"`, 12, nil, "at least 0")
	rows = append(rows, errorRow{"roughness over thickness", edit(t, `"35um"`, `"4um"`, `roughness = "1um"`, `roughness = "5um"`),
		"copper.roughness", `"5um"`, 12, nil, "less than the copper thickness (4um)"})
	add("roughness unit", `roughness = "1um"`, `roughness = "1 furlong"`, "copper.roughness", `"1 furlong"`, 12, units.ErrUnit, "furlong")
	add("conductivity zero", `conductivity = 5.8e7`, `conductivity = 0`, "copper.conductivity", "0", 13, nil, "at least 100000")
	add("conductivity high", `conductivity = 5.8e7`, `conductivity = 1e9`, "copper.conductivity", "1e+09", 13, nil, "at most 1e+08")
	add("conductivity string", `conductivity = 5.8e7`, `conductivity = "5.8e7"`, "copper.conductivity", `"5.8e7"`, 13, ErrType, "number")
	// mask
	add("mask thick", `thickness = "20um"`, `thickness = "300um"`, "mask.thickness", `"300um"`, 16, nil, "at most 0.2mm")
	add("mask zero", `thickness = "20um"`, `thickness = "0um"`, "mask.thickness", `"0um"`, 16, nil, "positive")
	add("mask thickness missing", `thickness = "20um"`, ``, "mask.thickness", "", 15, ErrMissing, "missing")
	add("mask er low", "er = 3.8", "er = 0.5", "mask.er", "0.5", 17, nil, "at least 1")
	add("mask er missing", "er = 3.8", "", "mask.er", "", 15, ErrMissing, "missing")
	add("mask loss tangent", "loss_tangent = 0.02", "loss_tangent = 1.5", "mask.loss_tangent", "1.5", 18, nil, "less than 1")
	// spread
	add("spread er high", `er = "5%"`, `er = "60%"`, "spread.er", `"60%"`, 21, nil, "at most 50%")
	add("spread er negative", `er = "5%"`, `er = "-5%"`, "spread.er", `"-5%"`, 21, nil, "at least 0%")
	add("spread er no percent", `er = "5%"`, `er = "5"`, "spread.er", `"5"`, 21, nil, "percentage")
	add("spread er bool", `er = "5%"`, `er = true`, "spread.er", "true", 21, ErrType, "percentage")
	add("spread er absolute high", `er = "5%"`, `er = 2`, "spread.er", "2", 21, nil, "at most 50%")
	add("spread thickness junk", `thickness = "10%"`, `thickness = "x%"`, "spread.thickness", `"x%"`, 22, nil, "percentage")
	add("spread thickness number", `thickness = "10%"`, `thickness = 0.1`, "spread.thickness", "0.1", 22, ErrType, "percentage")
	add("spread thickness unit", `thickness = "10%"`, `thickness = "1 furlong"`, "spread.thickness", `"1 furlong"`, 22, units.ErrUnit, "percentage")
	add("spread thickness absolute high", `thickness = "10%"`, `thickness = "0.3mm"`, "spread.thickness", `"0.3mm"`, 22, nil, "at most 50%")

	for _, tt := range rows {
		_, err := Decode(strings.NewReader(tt.text), "board.toml")
		checkError(t, tt, err)
	}
}

func TestDecodeTableErrors(t *testing.T) {
	noDielectric := edit(t, "[dielectric]\ner = 3.5\ner_frequency = \"10GHz\"\nloss_tangent = 0.004\nthickness = \"0.51mm\"\n", "\n\n\n\n\n")
	rows := []errorRow{
		{"dielectric missing", noDielectric, "dielectric", "", 0, ErrMissing, "[dielectric]"},
		{"dielectric not a table", strings.Replace(noDielectric, "test board\"\n", "test board\"\ndielectric = 5\n", 1), "dielectric", "", 3, ErrType, "table"},
		{"dielectric array of tables", edit(t, "[dielectric]", "[[dielectric]]"), "dielectric", "", 4, ErrType, "not an array of tables"},
		{"copper missing", edit(t, "[copper]\nthickness = \"35um\"\nroughness = \"1um\"\nconductivity = 5.8e7\n", ""), "copper", "", 0, ErrMissing, "[copper]"},
		{"mask not a table", edit(t, "[mask]\nthickness = \"20um\"\ner = 3.8\nloss_tangent = 0.02\n", "[spread.x]\n"), "spread.x", "", 15, ErrUnknownKey, "unknown"},
		{"mask a string", edit(t, "test board\"\n", "test board\"\nmask = \"thin\"\n", "[mask]\nthickness = \"20um\"\ner = 3.8\nloss_tangent = 0.02\n", ""),
			"mask", "", 3, ErrType, "must be a table, not a string"},
	}
	for _, tt := range rows {
		_, err := Decode(strings.NewReader(tt.text), "board.toml")
		checkError(t, tt, err)
	}
}

func TestDecodeUnknownKeys(t *testing.T) {
	rows := []errorRow{
		{"top level", edit(t, "test board\"\n\n", "test board\"\ncolour = \"green\"\n"), "colour", "", 3, ErrUnknownKey, "the top level of a stackup takes name"},
		{"in a table", edit(t, "\"0.51mm\"\n\n", "\"0.51mm\"\nthicknes = \"1mm\"\n"), "dielectric.thicknes", "", 9, ErrUnknownKey, "[dielectric] takes er"},
		{"case differs", edit(t, "er = 3.8\n", "ER = 3.8\n"), "mask.ER", "", 17, ErrUnknownKey, "[mask] takes"},
		{"unknown table", edit(t, "[mask]", "[solder]"), "solder", "", 15, ErrUnknownKey, "unknown key"},
		{"sub-table", edit(t, "\"10%\"\n", "\"10%\"\n[copper.plating]\nthickness = \"5um\"\n"), "copper.plating", "", 23, ErrUnknownKey, "[copper] takes"},
		{"dotted at top", edit(t, "test board\"\n\n", "test board\"\nmask.shine = 1\n"), "mask.shine", "", 3, ErrUnknownKey, "[mask] takes"},
		// The same key inside a string on line 3 must not be taken for it.
		{"after a multi-line string", edit(t, "description = \"test board\"\n", "description = \"\"\"\nshade = 1 ''' \\\"\"\"\"\nshade = 2\n"), "shade", "", 4, ErrUnknownKey, "unknown"},
		{"after a multi-line literal", edit(t, "description = \"test board\"\n", "description = '''\nshade = 1 \"\"\" \\\n'''\nshade = 2\n"), "shade", "", 5, ErrUnknownKey, "unknown"},
		{"after a multi-line array", edit(t, "\"0.51mm\"\n\n", "\"0.51mm\"\nlist = [\n \"x = 1\",\n 2 ]\n"), "dielectric.list", "", 9, ErrUnknownKey, "unknown"},
		{"inline table", edit(t, "test board\"\n\n", "test board\"\nmask = { thickness = \"20um\", er = 3.8, shine = 1 }\n",
			"[mask]\nthickness = \"20um\"\ner = 3.8\nloss_tangent = 0.02\n", ""), "mask.shine", "", 3, ErrUnknownKey, "[mask] takes"},
		{"quoted key", edit(t, "er = 3.5\n", "er = 3.5\n\"e r\" = 1\n"), `dielectric."e r"`, "", 6, ErrUnknownKey, "unknown"},
		{"array of tables", edit(t, "[spread]", "[[extra]]\nx = 1\n[spread]"), "extra", "", 20, ErrUnknownKey, "unknown"},
	}
	for _, tt := range rows {
		_, err := Decode(strings.NewReader(tt.text), "board.toml")
		checkError(t, tt, err)
	}
}

func TestDecodeSyntaxErrors(t *testing.T) {
	rows := []struct {
		name string
		text string
		line int
	}{
		{"double equals", edit(t, "er = 3.5", "er = = 3.5"), 5},
		{"unterminated string", edit(t, `thickness = "35um"`, `thickness = "35um`), 11},
		{"duplicate key", edit(t, "er = 3.5\n", "er = 3.5\ner = 3.5\n"), 6},
		{"bad header", edit(t, "[copper]", "[copper"), 10}, // the library says 11, the line after the newline at fault

		{"bare value", edit(t, "roughness = \"1um\"", "roughness"), 12},
	}
	for _, tt := range rows {
		_, err := Decode(strings.NewReader(tt.text), "board.toml")
		var e *Error
		if !errors.As(err, &e) {
			t.Errorf("%s: %v is not an *Error", tt.name, err)
			continue
		}
		if !errors.Is(err, ErrSyntax) || e.Source != "board.toml" || e.Line != tt.line {
			t.Errorf("%s: got %v (line %d), want a syntax error on line %d", tt.name, err, e.Line, tt.line)
		}
		if !strings.HasPrefix(err.Error(), "board.toml:"+strconv.Itoa(tt.line)+": ") {
			t.Errorf("%s: message %q does not start with file and line", tt.name, err)
		}
	}
}

// errReader fails every read.
type errReader struct{}

func (errReader) Read([]byte) (int, error) { return 0, errors.New("disk on fire") }

func TestDecodeReadError(t *testing.T) {
	_, err := Decode(errReader{}, "board.toml")
	var e *Error
	if !errors.As(err, &e) || e.Source != "board.toml" || !strings.Contains(err.Error(), "disk on fire") {
		t.Errorf("got %v, want an *Error naming the file and the read error", err)
	}
}

func TestDecodeKeepsNumError(t *testing.T) {
	_, err := Decode(strings.NewReader(edit(t, `"0.51mm"`, `"3 furlongs"`)), "board.toml")
	var ne *units.NumError
	if !errors.As(err, &ne) || ne.Text != "3 furlongs" {
		t.Errorf("got %v, want it to wrap the *units.NumError for \"3 furlongs\"", err)
	}
}

func TestSubstrate(t *testing.T) {
	s, err := Decode(strings.NewReader(baseFile()), "board.toml")
	if err != nil {
		t.Fatal(err)
	}
	sub := s.Substrate()
	// Each field of physical.Substrate against the value in baseFile.
	tests := []struct {
		name      string
		got, want float64
	}{
		{"Er", sub.Er, 3.5},
		{"Height", sub.Height, 0.51e-3},
		{"LossTangent", sub.LossTangent, 0.004},
		{"CopperThickness", sub.CopperThickness, 35e-6},
		{"Conductivity", sub.Conductivity, 5.8e7},
		{"Roughness", sub.Roughness, 1e-6},
		{"MaskThickness", sub.MaskThickness, 20e-6},
		{"MaskEr", sub.MaskEr, 3.8},
		{"MaskLossTangent", sub.MaskLossTangent, 0.02},
	}
	for _, tt := range tests {
		if !near(tt.got, tt.want) {
			t.Errorf("Substrate().%s = %g, want %g", tt.name, tt.got, tt.want)
		}
	}
	s.Mask = nil
	if sub := s.Substrate(); sub.MaskThickness != 0 || sub.MaskEr != 0 || sub.MaskLossTangent != 0 {
		t.Errorf("Substrate() without a mask = %+v, want no mask", sub)
	}
	if !reflect.DeepEqual(s.Substrate().Er, 3.5) {
		t.Errorf("Substrate().Er changed when the mask was removed")
	}
}
