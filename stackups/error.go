package stackups

import (
	"errors"
	"strconv"
	"strings"
)

// Error is a problem with one stackup: where it is (file and line), which
// key and value, and why. Line is 0 when the line is not known, Key is empty
// for a problem with the file as a whole, and Value is empty when the key is
// missing.
type Error struct {
	Source string // file name, or "" when the stackup did not come from a file
	Line   int    // 1-based line of the key in Source, 0 when unknown
	Key    string // dotted key path, such as "dielectric.er"
	Value  string // the value as TOML writes it, such as 0.8 or "35 furlongs"
	Err    error  // the reason
}

// Error reads like "board.toml:7: dielectric.er = 0.8: relative
// permittivity must be at least 1".
func (e *Error) Error() string {
	var b strings.Builder
	if e.Source != "" {
		b.WriteString(e.Source)
		if e.Line > 0 {
			b.WriteString(":")
			b.WriteString(strconv.Itoa(e.Line))
		}
		b.WriteString(": ")
	}
	if e.Key != "" {
		b.WriteString(e.Key)
		if e.Value != "" {
			b.WriteString(" = ")
			b.WriteString(e.Value)
		}
		b.WriteString(": ")
	}
	if e.Err != nil {
		b.WriteString(e.Err.Error())
	} else {
		b.WriteString("invalid stackup")
	}
	return b.String()
}

// Unwrap returns the reason.
func (e *Error) Unwrap() error { return e.Err }

// Reasons carried by Error.Err, for errors.Is. Range and unit problems carry
// their own messages (units.NumError for unreadable quantities).
var (
	ErrMissing    = errors.New("required key is missing")
	ErrUnknownKey = errors.New("unknown key")
	ErrType       = errors.New("wrong type")
	ErrSyntax     = errors.New("TOML syntax error")
)
