package stackups

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/BurntSushi/toml"

	"stubcraft/physical"
	"stubcraft/physical/units"
	"stubcraft/stackups/tomlx"
)

// schema returns the keys a stackup file may hold: the top-level keys, and
// for each table the keys inside it, in the order of the raw structs.
func schema() tomlx.Schema {
	return tomlx.Schema{
		"":           tomlx.Keys(rawFile{}),
		"dielectric": tomlx.Keys(rawDielectric{}),
		"copper":     tomlx.Keys(rawCopper{}),
		"mask":       tomlx.Keys(rawMask{}),
		"spread":     tomlx.Keys(rawSpread{}),
		"board":      tomlx.Keys(rawBoard{}),
	}
}

// Raw forms of the file. Every value is decoded as `any` and its type
// checked here, so that a wrong type gets our error with file, line, key
// and value; tables are toml.Primitive until their type has been checked.
type (
	rawFile struct {
		Name        any            `toml:"name"`
		Description any            `toml:"description"`
		Line        any            `toml:"line"`
		Gap         any            `toml:"gap"`
		Dielectric  toml.Primitive `toml:"dielectric"`
		Copper      toml.Primitive `toml:"copper"`
		Mask        toml.Primitive `toml:"mask"`
		Spread      toml.Primitive `toml:"spread"`
		Board       toml.Primitive `toml:"board"`
	}
	rawBoard struct {
		Layers    any `toml:"layers"`
		Thickness any `toml:"thickness"`
	}
	rawDielectric struct {
		Er          any `toml:"er"`
		ErFrequency any `toml:"er_frequency"`
		LossTangent any `toml:"loss_tangent"`
		Thickness   any `toml:"thickness"`
	}
	rawCopper struct {
		Thickness    any `toml:"thickness"`
		Weight       any `toml:"weight"`
		Roughness    any `toml:"roughness"`
		Conductivity any `toml:"conductivity"`
	}
	rawMask struct {
		Thickness   any `toml:"thickness"`
		Er          any `toml:"er"`
		LossTangent any `toml:"loss_tangent"`
	}
	rawSpread struct {
		Er        any `toml:"er"`
		Thickness any `toml:"thickness"`
	}
)

// Decode reads a stackup file from r and validates it. source names the
// file in error messages. Every error is an *Error.
func Decode(r io.Reader, source string) (Stackup, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return Stackup{}, &Error{Source: source, Err: err}
	}
	var raw rawFile
	f, err := tomlx.Decode(data, source, &raw)
	if err != nil {
		return Stackup{}, err
	}
	d := &decoder{f: f, values: map[string]any{}}
	s, err := d.stackup(&raw)
	if err != nil {
		return Stackup{}, err
	}
	if err := s.Validate(); err != nil {
		var e *Error
		if errors.As(err, &e) {
			return Stackup{}, d.place(e)
		}
		return Stackup{}, err
	}
	return s, nil
}

// decoder holds the decoded file and the raw value of each key read.
type decoder struct {
	f      *tomlx.File
	values map[string]any // by dotted key
}

// place fills in the file, line and, when the key is in the file, the value
// as written there.
func (d *decoder) place(e *Error) *Error {
	e.Source = d.f.Source
	e.Line = d.f.Line(e.Key)
	if v, ok := d.values[e.Key]; ok {
		e.Value = tomlx.Literal(v)
	}
	return e
}

// fail makes an error for key with the raw value v.
func (d *decoder) fail(key string, v any, err error) *Error { return d.f.Fail(key, v, err) }

func (d *decoder) stackup(raw *rawFile) (Stackup, error) {
	if err := d.f.Unknown(schema(), "a stackup"); err != nil {
		return Stackup{}, err
	}
	var s Stackup
	var err error
	if s.Name, err = d.text("name", raw.Name, true); err != nil {
		return Stackup{}, err
	}
	if s.Description, err = d.text("description", raw.Description, false); err != nil {
		return Stackup{}, err
	}
	line, err := d.text("line", raw.Line, false)
	if err != nil {
		return Stackup{}, err
	}
	s.Line = LineKind(line) // checked by Validate
	if raw.Line == nil {
		s.Line = Microstrip
	}
	if s.Gap, err = d.quantity("gap", raw.Gap, false, units.ParseLength, "0.25mm"); err != nil {
		return Stackup{}, err
	}
	if s.Dielectric, err = d.dielectric(raw.Dielectric); err != nil {
		return Stackup{}, err
	}
	if s.Copper, err = d.copper(raw.Copper); err != nil {
		return Stackup{}, err
	}
	if s.Mask, err = d.mask(raw.Mask); err != nil {
		return Stackup{}, err
	}
	if s.Spread, err = d.spread(raw.Spread, s.Dielectric); err != nil {
		return Stackup{}, err
	}
	if s.Board, err = d.board(raw.Board); err != nil {
		return Stackup{}, err
	}
	// Everything in the schema has now been decoded; what is left is what
	// sits under a key that should have been a plain value (er = {x = 1}),
	// which the type checks above have already refused.
	if left := d.f.Meta.Undecoded(); len(left) > 0 {
		k := left[0]
		return Stackup{}, &Error{Source: d.f.Source, Line: d.f.KeyLine(k), Key: d.f.Path(k), Err: ErrUnknownKey}
	}
	return s, nil
}

// table decodes the table at key into v. It reports whether the table is
// in the file.
func (d *decoder) table(key string, p toml.Primitive, v any, required bool) (bool, error) {
	present, err := d.f.Table(key, p, v)
	if err == nil && !present && required {
		return false, &Error{Source: d.f.Source, Key: key, Err: fmt.Errorf("%w: the file needs a [%s] table", ErrMissing, key)}
	}
	return present, err
}

// missing makes the error for a required key that is not there.
func (d *decoder) missing(key, hint string) error { return d.f.Missing(key, hint) }

// text reads a string value.
func (d *decoder) text(key string, v any, required bool) (string, error) {
	if v == nil {
		if required {
			return "", d.missing(key, "")
		}
		return "", nil
	}
	d.values[key] = v
	s, ok := v.(string)
	if !ok {
		return "", d.fail(key, v, fmt.Errorf("%w: %s must be a string", ErrType, key))
	}
	return s, nil
}

// num reads a TOML integer or float.
func (d *decoder) num(key string, v any, required bool) (float64, bool, error) {
	if v == nil {
		if required {
			return 0, false, d.missing(key, "")
		}
		return 0, false, nil
	}
	d.values[key] = v
	switch n := v.(type) {
	case float64:
		return n, true, nil
	case int64:
		return float64(n), true, nil
	}
	return 0, false, d.fail(key, v, fmt.Errorf("%w: %s must be a number", ErrType, key))
}

// quantity reads a string with a unit through parse; example shows the
// form in the error for a bare number.
func (d *decoder) quantity(key string, v any, required bool, parse func(string) (float64, error), example string) (float64, error) {
	if v == nil {
		if required {
			return 0, d.missing(key, "")
		}
		return 0, nil
	}
	d.values[key] = v
	s, ok := v.(string)
	if !ok {
		return 0, d.fail(key, v, fmt.Errorf("%w: write it as a string with its unit, such as %q", ErrType, example))
	}
	x, err := parse(s)
	if err != nil {
		return 0, d.fail(key, v, quantityError{err})
	}
	return x, nil
}

// quantityError carries a units parse error without repeating the text,
// which the Error's Value already shows.
type quantityError struct{ err error }

func (e quantityError) Error() string {
	var ne *units.NumError
	if errors.As(e.err, &ne) {
		return fmt.Sprintf("not a %s: %v", ne.Quantity, ne.Err)
	}
	return e.err.Error()
}

func (e quantityError) Unwrap() error { return e.err }

func (d *decoder) dielectric(p toml.Primitive) (Dielectric, error) {
	var raw rawDielectric
	if _, err := d.table("dielectric", p, &raw, true); err != nil {
		return Dielectric{}, err
	}
	var out Dielectric
	var err error
	if out.Er, _, err = d.num("dielectric.er", raw.Er, true); err != nil {
		return Dielectric{}, err
	}
	if out.ErFrequency, err = d.quantity("dielectric.er_frequency", raw.ErFrequency, false, units.ParseFrequency, "10GHz"); err != nil {
		return Dielectric{}, err
	}
	if out.LossTangent, _, err = d.num("dielectric.loss_tangent", raw.LossTangent, true); err != nil {
		return Dielectric{}, err
	}
	if out.Thickness, err = d.quantity("dielectric.thickness", raw.Thickness, true, units.ParseLength, "0.508mm"); err != nil {
		return Dielectric{}, err
	}
	return out, nil
}

func (d *decoder) copper(p toml.Primitive) (Copper, error) {
	var raw rawCopper
	if _, err := d.table("copper", p, &raw, true); err != nil {
		return Copper{}, err
	}
	out := Copper{Conductivity: physical.CopperConductivity}
	var err error
	switch {
	case raw.Thickness != nil && raw.Weight != nil:
		d.values["copper.weight"] = raw.Weight
		return Copper{}, d.fail("copper.weight", raw.Weight, errors.New("give copper thickness or weight, not both"))
	case raw.Weight != nil:
		if out.Thickness, err = d.quantity("copper.weight", raw.Weight, true, ounces, "1oz"); err != nil {
			return Copper{}, err
		}
	default:
		if raw.Thickness == nil {
			return Copper{}, d.missing("copper.thickness", `or give copper.weight such as "1oz"`)
		}
		if out.Thickness, err = d.quantity("copper.thickness", raw.Thickness, true, units.ParseCopperThickness, "35um"); err != nil {
			return Copper{}, err
		}
	}
	if out.Roughness, err = d.quantity("copper.roughness", raw.Roughness, false, units.ParseLength, "1um"); err != nil {
		return Copper{}, err
	}
	if c, ok, err := d.num("copper.conductivity", raw.Conductivity, false); err != nil {
		return Copper{}, err
	} else if ok {
		out.Conductivity = c
	}
	return out, nil
}

// ounces reads a copper weight, which must be in ounces per square foot.
func ounces(s string) (float64, error) {
	if !strings.HasSuffix(strings.ToLower(strings.TrimSpace(s)), "oz") {
		return 0, &units.NumError{Quantity: "copper weight", Text: s, Err: fmt.Errorf("%w (a weight is in oz, such as \"1oz\"; give a length as copper.thickness)", units.ErrUnit)}
	}
	return units.ParseCopperThickness(s)
}

func (d *decoder) mask(p toml.Primitive) (*Mask, error) {
	var raw rawMask
	present, err := d.table("mask", p, &raw, false)
	if err != nil || !present {
		return nil, err
	}
	var out Mask
	if out.Thickness, err = d.quantity("mask.thickness", raw.Thickness, true, units.ParseLength, "20um"); err != nil {
		return nil, err
	}
	if out.Er, _, err = d.num("mask.er", raw.Er, true); err != nil {
		return nil, err
	}
	if out.LossTangent, _, err = d.num("mask.loss_tangent", raw.LossTangent, false); err != nil {
		return nil, err
	}
	return &out, nil
}

// board reads the optional [board] table: the whole board this layer
// pair belongs to.
func (d *decoder) board(p toml.Primitive) (*Board, error) {
	var raw rawBoard
	present, err := d.table("board", p, &raw, false)
	if err != nil || !present {
		return nil, err
	}
	var out Board
	n, _, err := d.num("board.layers", raw.Layers, true)
	if err != nil {
		return nil, err
	}
	out.Layers = int(n)
	if float64(out.Layers) != n {
		out.Layers = -1 // refused by Validate
	}
	if out.Thickness, err = d.quantity("board.thickness", raw.Thickness, true, units.ParseLength, "1.6mm"); err != nil {
		return nil, err
	}
	return &out, nil
}

// spread reads the tolerances. A relative spread is a percentage string; an
// absolute one is a number for er and a length for the thickness, and is
// divided by the nominal value.
func (d *decoder) spread(p toml.Primitive, diel Dielectric) (Spread, error) {
	var raw rawSpread
	present, err := d.table("spread", p, &raw, false)
	if err != nil || !present {
		return Spread{}, err
	}
	var out Spread
	if raw.Er != nil {
		d.values["spread.er"] = raw.Er
		switch v := raw.Er.(type) {
		case string:
			if out.ErRel, err = parsePercent(v); err != nil {
				return Spread{}, d.fail("spread.er", v, fmt.Errorf("%w, or an absolute spread as a number such as 0.2", err))
			}
		default:
			abs, _, err := d.num("spread.er", v, true)
			if err != nil {
				return Spread{}, d.fail("spread.er", v, fmt.Errorf(`%w: a spread is a percentage such as "5%%" or a number such as 0.2`, ErrType))
			}
			out.ErRel = abs / diel.Er
		}
	}
	if raw.Thickness != nil {
		d.values["spread.thickness"] = raw.Thickness
		v, ok := raw.Thickness.(string)
		if !ok {
			return Spread{}, d.fail("spread.thickness", raw.Thickness, fmt.Errorf(`%w: a spread is a percentage such as "10%%" or a length such as "0.05mm"`, ErrType))
		}
		if strings.HasSuffix(strings.TrimSpace(v), "%") {
			if out.ThicknessRel, err = parsePercent(v); err != nil {
				return Spread{}, d.fail("spread.thickness", v, err)
			}
		} else {
			abs, err := units.ParseLength(v)
			if err != nil {
				return Spread{}, d.fail("spread.thickness", v, fmt.Errorf(`%w (a spread is a percentage such as "10%%" or a length such as "0.05mm")`, quantityError{err}))
			}
			out.ThicknessRel = abs / diel.Thickness
		}
	}
	return out, nil
}
