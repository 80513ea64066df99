package geom

import (
	"errors"
	"fmt"
)

// Reasons carried by SpecError.Err.
var (
	ErrSize    = errors.New("size must be positive and finite")
	ErrRange   = errors.New("out of range")
	ErrOverlap = errors.New("copper overlaps")
	ErrVia     = errors.New("via does not fit the stub")
	ErrNoFit   = errors.New("network does not fit the board size limit")
)

// SpecError records what is wrong with a Spec, in the manner of
// json.UnmarshalTypeError: the field at fault, its value and the reason.
type SpecError struct {
	Field  string // e.g. "Stubs[1].Via.Pad"
	Detail string // the value or the conflict, for people
	Err    error  // one of the Err* reasons
}

func (e *SpecError) Error() string {
	return fmt.Sprintf("geom: %s: %v: %s", e.Field, e.Err, e.Detail)
}

func (e *SpecError) Unwrap() error { return e.Err }

func specErr(field string, err error, format string, a ...any) error {
	return &SpecError{Field: field, Detail: fmt.Sprintf(format, a...), Err: err}
}
