// Package tomlx is the strict TOML layer shared by stackup and design
// files. BurntSushi/toml decodes; this package makes every fault an *Error
// that names the file, line, key and value as written, in the manner of
// encoding/json's errors:
//
//	board.toml:7: dielectric.er = 0.8: relative permittivity must be at least 1
//
// A schema's values are decoded as `any` and its tables as toml.Primitive,
// so the TOML reader never fails on a value of the wrong kind: the caller
// checks kinds with the helpers here (Table, Tables) and converts values
// itself, in its own words. Keys the schema does not hold are errors
// (Unknown). Syntax errors keep the reader's own position. Lines of keys,
// which the reader's metadata does not give, come from a scan of the text.
//
// Paths are dotted, with the 1-based index of an element of an array of
// tables: "load.impedance", "section[2].length".
package tomlx

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"reflect"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
)

// Error is a fault in a TOML file: where (file and line), which key, the
// value as written, and why. Line is 0 when unknown, Key is "" for the file
// as a whole, Value is "" for a missing key.
type Error struct {
	Source string // the file's name, "" when the text did not come from a file
	Line   int    // 1-based line of the key (or of its table), 0 when unknown
	Key    string // dotted path, "dielectric.er", "section[2].length"
	Value  string // the value in TOML syntax (strings quoted), "" when missing
	Err    error  // the reason
}

// Error reads "source:line: key = value: reason".
func (e *Error) Error() string {
	var b strings.Builder
	if e.Source != "" {
		b.WriteString(e.Source)
		if e.Line > 0 {
			b.WriteString(":" + strconv.Itoa(e.Line))
		}
		b.WriteString(": ")
	}
	if e.Key != "" {
		b.WriteString(e.Key)
		if e.Value != "" {
			b.WriteString(" = " + e.Value)
		}
		b.WriteString(": ")
	}
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	} else {
		b.WriteString("invalid value")
	}
	return b.String()
}

// Unwrap returns the reason.
func (e *Error) Unwrap() error { return e.Err }

// Reasons carried (wrapped) by Error.Err, for errors.Is.
var (
	ErrSyntax     = errors.New("TOML syntax error")
	ErrUnknownKey = errors.New("unknown key")
	ErrMissing    = errors.New("a required key is missing")
	ErrType       = errors.New("wrong kind of value")
)

// SyntaxError is the TOML reader's syntax error, without the position that
// Error already gives. It matches ErrSyntax and toml.ParseError.
type SyntaxError struct{ Parse toml.ParseError }

func (e SyntaxError) Error() string {
	msg := ErrSyntax.Error() + ": " + e.Parse.Message
	if e.Parse.Usage != "" {
		msg += " (" + strings.Join(strings.Fields(e.Parse.Usage), " ") + ")"
	}
	return msg
}

// Unwrap gives both ErrSyntax and the reader's toml.ParseError.
func (e SyntaxError) Unwrap() []error { return []error{ErrSyntax, e.Parse} }

// File is a decoded TOML text with what it takes to place a fault in it.
type File struct {
	Source string
	Meta   toml.MetaData
	lines  keyLines
	arrays map[string]int
}

// Decode decodes data into v, whose values should be `any` and whose
// tables toml.Primitive (see the package comment). A syntax error is an
// *Error wrapping SyntaxError, at the line of the byte at fault.
func Decode(data []byte, source string, v any) (*File, error) {
	md, err := toml.NewDecoder(bytes.NewReader(data)).Decode(v)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			return nil, &Error{Source: source, Line: syntaxLine(data, pe.Position), Err: SyntaxError{pe}}
		}
		// Not reached with a schema of `any` and toml.Primitive.
		return nil, &Error{Source: source, Err: fmt.Errorf("%w: %w", ErrType, err)}
	}
	lines, arrays := indexKeys(string(data))
	return &File{Source: source, Meta: md, lines: lines, arrays: arrays}, nil
}

// syntaxLine is the line of the byte at fault. The reader counts a newline
// it did not expect as the start of the next line; the line that holds the
// newline is the one to fix.
func syntaxLine(data []byte, p toml.Position) int {
	if p.Len > 0 && p.Start >= 0 && p.Start < len(data) {
		return 1 + bytes.Count(data[:p.Start], []byte("\n"))
	}
	return p.Line
}

// Line returns the line of path, or of its nearest enclosing table when
// the key itself is not written (a missing key), or 0.
func (f *File) Line(path string) int {
	if f == nil || path == "" {
		return 0
	}
	return f.lines.line(strings.Split(path, "."))
}

// Written reports whether path is written in the file.
func (f *File) Written(path string) bool {
	if f == nil || path == "" {
		return false
	}
	_, ok := f.lines[pathKey(strings.Split(path, "."))]
	return ok
}

// Path returns the dotted path of a key of the reader's metadata, with the
// index of the first element of an array of tables that holds it, and
// quoted where the key is not bare: ["section", "width"] →
// "section[2].width", ["mask", "e r"] → `mask."e r"`.
func (f *File) Path(k toml.Key) string {
	parts := make([]string, len(k))
	for i, el := range f.indexed(k) {
		name, index := el, ""
		if n := f.arrays[pathKey(k[:i+1])]; n > 0 && i < len(k)-1 {
			name, index = k[i], el[len(k[i]):]
		}
		if !bare(name) {
			name = strconv.Quote(name)
		}
		parts[i] = name + index
	}
	return strings.Join(parts, ".")
}

// KeyLine returns the line of a key of the reader's metadata (see Path).
func (f *File) KeyLine(k toml.Key) int { return f.lines.line(f.indexed(k)) }

// indexed returns k with the index of the first element of each array of
// tables that holds the rest of k: ["section", "width"] → ["section[2]",
// "width"].
func (f *File) indexed(k toml.Key) []string {
	var path []string
	for i, part := range k {
		n := f.arrays[pathKey(k[:i+1])]
		if n == 0 || i == len(k)-1 {
			path = append(path, part)
			continue
		}
		el := part + "[1]"
		for j := 1; j <= n; j++ {
			cand := append(append(append([]string(nil), path...), part+"["+strconv.Itoa(j)+"]"), k[i+1:]...)
			if _, ok := f.lines[pathKey(cand)]; ok {
				el = part + "[" + strconv.Itoa(j) + "]"
				break
			}
		}
		path = append(path, el)
	}
	return path
}

// bare reports whether a key can be written without quotes.
func bare(s string) bool {
	return s != "" && strings.IndexFunc(s, func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '_' || r == '-')
	}) < 0
}

// Fail returns the *Error for path with the value v as decoded (nil when
// missing).
func (f *File) Fail(path string, v any, err error) *Error {
	return &Error{Source: f.Source, Line: f.Line(path), Key: path, Value: Literal(v), Err: err}
}

// Missing returns the *Error of a required key that is not there; hint, if
// not empty, says what to write.
func (f *File) Missing(path, hint string) *Error {
	err := ErrMissing
	if hint != "" {
		err = fmt.Errorf("%w; %s", ErrMissing, hint)
	}
	return &Error{Source: f.Source, Line: f.Line(path), Key: path, Err: err}
}

// Table decodes the table at path (a key of the top level, or of a table
// already decoded) from p into v, whose fields should be `any`. It reports
// whether the table is in the file; a value of another kind is an *Error
// wrapping ErrType.
func (f *File) Table(path string, p toml.Primitive, v any) (bool, error) {
	return f.decode(path, p, v, "Hash", "a table")
}

// Tables decodes the array of tables at path from p into v, a pointer to a
// slice of structs whose fields should be `any`.
func (f *File) Tables(path string, p toml.Primitive, v any) (bool, error) {
	return f.decode(path, p, v, "ArrayHash", "an array of tables ([["+path+"]])")
}

func (f *File) decode(path string, p toml.Primitive, v any, kind, want string) (bool, error) {
	key := strings.Split(path, ".")
	if !f.Meta.IsDefined(key...) {
		return false, nil
	}
	// A table made implicitly by dotted keys (dielectric.er = 4) has no
	// type of its own in the metadata.
	if t := f.Meta.Type(key...); t != kind && !(kind == "Hash" && t == "") {
		return false, &Error{Source: f.Source, Line: f.Line(path), Key: path, Err: fmt.Errorf("%w: %s must be %s, not %s", ErrType, path, want, TypeName(t))}
	}
	if err := f.Meta.PrimitiveDecode(p, v); err != nil {
		// Not reached when v's fields are `any`.
		return false, &Error{Source: f.Source, Line: f.Line(path), Key: path, Err: fmt.Errorf("%w: %w", ErrType, err)}
	}
	return true, nil
}

// Schema lists the keys a file may hold: Schema[""] the top level,
// Schema["dielectric"] the keys of [dielectric], and so on (an array of
// tables by its name without index).
type Schema map[string][]string

// Keys returns the toml tags of the fields of the struct raw, in order: the
// keys of one table of a schema, read from the struct that decodes it so
// the two cannot drift apart.
func Keys(raw any) []string {
	t := reflect.TypeOf(raw)
	var keys []string
	for i := 0; i < t.NumField(); i++ {
		if k, _, _ := strings.Cut(t.Field(i).Tag.Get("toml"), ","); k != "" && k != "-" {
			keys = append(keys, k)
		}
	}
	return keys
}

// Unknown returns an *Error wrapping ErrUnknownKey for the first key, in
// file order, that s does not hold, naming the keys its table takes; what
// names the file's kind ("a stackup"). Keys are compared exactly (the
// reader would otherwise match "ER" to er).
func (f *File) Unknown(s Schema, what string) error {
	for _, k := range f.Meta.Keys() {
		for n := 1; n <= len(k); n++ {
			table := strings.Join(k[:n-1], ".")
			keys, ok := s[table]
			if !ok {
				break // under a plain value: a kind error, the caller's to report
			}
			if contains(keys, k[n-1]) {
				continue
			}
			where := "the top level of " + what + " takes "
			if table != "" {
				where = "[" + table + "] takes "
			}
			return &Error{Source: f.Source, Line: f.KeyLine(k[:n]), Key: f.Path(k[:n]),
				Err: fmt.Errorf("%w (%s%s)", ErrUnknownKey, where, strings.Join(keys, ", "))}
		}
	}
	return nil
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// TypeName turns the reader's name of a TOML type into words.
func TypeName(t string) string {
	switch t {
	case "ArrayHash":
		return "an array of tables"
	case "Array":
		return "an array"
	case "Integer":
		return "an integer"
	case "Bool":
		return "a boolean"
	case "Hash", "":
		return "a table"
	case "Datetime", "DatetimeLocal", "DateLocal", "TimeLocal":
		return "a date-time"
	}
	return "a " + strings.ToLower(t)
}

// Literal writes a decoded TOML value back in TOML syntax, for messages;
// nil is "".
func Literal(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case string:
		return Quote(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return Number(x)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = Literal(e)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case []map[string]any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = Literal(e)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case map[string]any:
		keys := make([]string, 0, len(x))
		for k := range x {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		parts := make([]string, len(keys))
		for i, k := range keys {
			parts[i] = k + " = " + Literal(x[k])
		}
		return "{" + strings.Join(parts, ", ") + "}"
	}
	return fmt.Sprint(v)
}

// Number writes a float as a TOML number that reads back exactly.
func Number(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan"
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// Quote writes s as a TOML basic string. TOML knows fewer escapes than Go
// (no \a, \v or \x), so strconv.Quote is not used. s must be valid UTF-8;
// invalid bytes are written as U+FFFD.
func Quote(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch r {
		case '"':
			b.WriteString(`\"`)
		case '\\':
			b.WriteString(`\\`)
		case '\b':
			b.WriteString(`\b`)
		case '\t':
			b.WriteString(`\t`)
		case '\n':
			b.WriteString(`\n`)
		case '\f':
			b.WriteString(`\f`)
		case '\r':
			b.WriteString(`\r`)
		default:
			if r < 0x20 || r == 0x7f {
				fmt.Fprintf(&b, `\u%04X`, r)
			} else {
				b.WriteRune(r)
			}
		}
	}
	b.WriteByte('"')
	return b.String()
}
