package synth

import (
	"errors"
	"fmt"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"
)

// DesignError reports a fault in a design file, in the manner of
// encoding/json's errors: where (file and line), which key, the value as it
// was written, and why.
//
//	demo.toml:4: frequency = "0Hz": the design frequency must be positive
type DesignError struct {
	Source string // the file's name, as given to DecodeDesign
	Line   int    // 1-based line of the key (or of its table), 0 when unknown
	Key    string // dotted key path, "load.impedance", "section[2].length"; "" for the whole file
	Value  string // the value in TOML syntax (strings quoted), "" when missing
	Err    error  // the reason
}

// Error formats the error as "source:line: key = value: reason".
func (e *DesignError) Error() string {
	var b strings.Builder
	if e.Source != "" {
		b.WriteString(e.Source)
	} else {
		b.WriteString("design")
	}
	if e.Line > 0 {
		b.WriteString(":" + strconv.Itoa(e.Line))
	}
	b.WriteString(": ")
	if e.Key != "" {
		b.WriteString(e.Key)
		if e.Value != "" {
			b.WriteString(" = " + e.Value)
		}
		b.WriteString(": ")
	}
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	}
	return b.String()
}

// Unwrap returns the reason.
func (e *DesignError) Unwrap() error { return e.Err }

// Reasons carried (wrapped) by DesignError.Err, for errors.Is.
var (
	ErrUnknownKey = errors.New("unknown key")
	ErrMissingKey = errors.New("a required key is missing")
)

// designSyntaxError carries the TOML reader's own error without repeating
// the position that DesignError already prints.
type designSyntaxError struct{ err toml.ParseError }

func (e designSyntaxError) Error() string { return "TOML syntax: " + e.err.Message }
func (e designSyntaxError) Unwrap() error { return e.err }

// designTOMLError reads the position out of the TOML decoder's type
// errors (a compiled pattern, read only).
var designTOMLError = regexp.MustCompile(`^toml: (?:line (\d+) )?(?:\(last key "([^"]*)"\): )?(.*)$`)

// designKindError is a type mismatch reported by the TOML decoder, with
// its position taken out of the message.
type designKindError struct {
	msg string
	err error
}

func (e designKindError) Error() string { return e.msg }
func (e designKindError) Unwrap() error { return e.err }

// designDecodeFailure turns an error of toml.Decode into a DesignError.
func designDecodeFailure(source string, err error) error {
	var pe toml.ParseError
	if errors.As(err, &pe) {
		return &DesignError{Source: source, Line: pe.Position.Line, Key: pe.LastKey, Err: designSyntaxError{pe}}
	}
	// Type mismatches come as "toml: line 5 (last key "load"): incompatible
	// types: ...".
	if m := designTOMLError.FindStringSubmatch(err.Error()); m != nil {
		line, _ := strconv.Atoi(m[1])
		return &DesignError{Source: source, Line: line, Key: m[2], Err: designKindError{"wrong kind of value: " + m[3], err}}
	}
	return &DesignError{Source: source, Err: err}
}

// designScanKeys maps the dotted path of every table and key in a TOML
// text to the line it is on. Arrays of tables count from 1:
// "section[2].length". It is a plain line scanner, enough for the files
// people write by hand: it skips the bodies of multi-line strings, and a
// multi-line array is found at its first line.
func designScanKeys(text string) map[string]int {
	lines := map[string]int{}
	set := func(path string, n int) {
		if _, ok := lines[path]; !ok {
			lines[path] = n
		}
	}
	counts := map[string]int{}
	table, inMulti := "", ""
	for i, ln := range strings.Split(text, "\n") {
		n := i + 1
		s := strings.TrimSpace(ln)
		if inMulti != "" {
			if strings.Count(s, inMulti)%2 == 1 {
				inMulti = ""
			}
			continue
		}
		if s == "" || s[0] == '#' {
			continue
		}
		switch {
		case strings.HasPrefix(s, "[["):
			end := strings.Index(s, "]]")
			if end < 0 {
				continue
			}
			name := designKeyPath(s[2:end])
			counts[name]++
			table = name + "[" + strconv.Itoa(counts[name]) + "]"
			set(table, n)
		case s[0] == '[':
			end := strings.Index(s, "]")
			if end < 0 {
				continue
			}
			table = designKeyPath(s[1:end])
			set(table, n)
		default:
			eq := strings.Index(s, "=")
			if eq < 0 {
				continue
			}
			path := designKeyPath(s[:eq])
			if table != "" {
				path = table + "." + path
			}
			set(path, n)
			rest := s[eq+1:]
			for _, delim := range []string{`"""`, `'''`} {
				if strings.Count(rest, delim)%2 == 1 {
					inMulti = delim
				}
			}
		}
	}
	return lines
}

// designKeyPath normalises a written key, ` "load" . impedance `, to
// "load.impedance".
func designKeyPath(s string) string {
	parts := strings.Split(s, ".")
	for i, p := range parts {
		parts[i] = strings.Trim(strings.TrimSpace(p), `"'`)
	}
	return strings.Join(parts, ".")
}

// designFindLine returns the line of a key path as the TOML reader names it
// (without array indexes), or 0. With several matches (one per element of
// an array of tables) the first in the file wins.
func designFindLine(lines map[string]int, key []string) int {
	want := strings.Join(key, ".")
	best := 0
	for path, n := range lines {
		if designStripIndexes(path) == want && (best == 0 || n < best) {
			best = n
		}
	}
	return best
}

// designIndexedPath returns the path with its array index, such as
// "section[2].foo", that designFindLine found for key.
func designIndexedPath(lines map[string]int, key []string) string {
	want := strings.Join(key, ".")
	best, bestPath := 0, want
	for path, n := range lines {
		if designStripIndexes(path) == want && (best == 0 || n < best) {
			best, bestPath = n, path
		}
	}
	return bestPath
}

func designStripIndexes(path string) string {
	var b strings.Builder
	skip := false
	for _, r := range path {
		switch {
		case r == '[':
			skip = true
		case r == ']':
			skip = false
		case !skip:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// designLineOf returns the line of path, or of its nearest enclosing table
// when the key itself is not written (a missing key), or 0.
func designLineOf(lines map[string]int, path string) int {
	for p := path; p != ""; {
		if n, ok := lines[p]; ok {
			return n
		}
		i := strings.LastIndex(p, ".")
		if i < 0 {
			break
		}
		p = p[:i]
	}
	return 0
}

// designValueText writes a decoded TOML value back in TOML syntax, for
// error messages.
func designValueText(v any) string {
	switch x := v.(type) {
	case nil:
		return ""
	case string:
		return strconv.Quote(x)
	case int64:
		return strconv.FormatInt(x, 10)
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	case bool:
		return strconv.FormatBool(x)
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			parts[i] = designValueText(e)
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
			parts[i] = k + " = " + designValueText(x[k])
		}
		return "{" + strings.Join(parts, ", ") + "}"
	}
	return fmt.Sprint(v)
}
