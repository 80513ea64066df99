package stackups

import (
	"fmt"
	"io"
	"strconv"
	"strings"
	"stubcraft/stackups/tomlx"

	"stubcraft/physical/units"
)

// Encode writes s to w as a stackup file that Decode reads back to an equal
// Stackup. Lengths are written in mm or µm, frequencies in GHz or MHz, and
// spreads as percentages, each in a form that reads back exactly. An invalid
// stackup is not written: Encode returns Validate's error.
func Encode(w io.Writer, s Stackup) error {
	if err := s.Validate(); err != nil {
		return fmt.Errorf("encoding stackup: %w", err)
	}
	var b strings.Builder
	kv := func(key, value string) { fmt.Fprintf(&b, "%s = %s\n", key, value) }

	kv("name", tomlx.Quote(s.Name))
	if s.Description != "" {
		kv("description", tomlx.Quote(s.Description))
	}
	kv("line", tomlx.Quote(s.Line.String()))
	if s.Line == GCPW {
		kv("gap", tomlx.Quote(formatLength(s.Gap)))
	}

	d := s.Dielectric
	b.WriteString("\n[dielectric]\n")
	kv("er", tomlx.Number(d.Er))
	if d.ErFrequency != 0 {
		kv("er_frequency", tomlx.Quote(formatFrequency(d.ErFrequency)))
	}
	kv("loss_tangent", tomlx.Number(d.LossTangent))
	kv("thickness", tomlx.Quote(formatLength(d.Thickness)))

	c := s.Copper
	b.WriteString("\n[copper]\n")
	kv("thickness", tomlx.Quote(formatLength(c.Thickness)))
	if c.Roughness != 0 {
		kv("roughness", tomlx.Quote(formatLength(c.Roughness)))
	}
	kv("conductivity", tomlx.Number(c.Conductivity))

	if m := s.Mask; m != nil {
		b.WriteString("\n[mask]\n")
		kv("thickness", tomlx.Quote(formatLength(m.Thickness)))
		kv("er", tomlx.Number(m.Er))
		kv("loss_tangent", tomlx.Number(m.LossTangent))
	}

	if bd := s.Board; bd != nil {
		b.WriteString("\n[board]\n")
		kv("layers", tomlx.Number(float64(bd.Layers)))
		kv("thickness", tomlx.Quote(formatLength(bd.Thickness)))
	}

	if sp := s.Spread; sp != (Spread{}) {
		b.WriteString("\n[spread]\n")
		if sp.ErRel != 0 {
			kv("er", erSpreadText(sp.ErRel, d.Er))
		}
		if sp.ThicknessRel != 0 {
			kv("thickness", thicknessSpreadText(sp.ThicknessRel, d.Thickness))
		}
	}
	if _, err := io.WriteString(w, b.String()); err != nil {
		return fmt.Errorf("encoding stackup %q: %w", s.Name, err)
	}
	return nil
}

// erSpreadText writes a relative εr spread as a percentage or, when that
// takes many digits (an absolute spread read from a file), as the absolute
// number that Decode divides back to exactly rel.
func erSpreadText(rel, er float64) string {
	p := formatPercent(rel)
	if sigDigits(p) <= short {
		return tomlx.Quote(p)
	}
	abs, ok := nearest(rel*er, "", func(s string) bool {
		v, err := strconv.ParseFloat(s, 64)
		return err == nil && v/er == rel
	})
	if ok && sigDigits(abs) <= short {
		return abs
	}
	return tomlx.Quote(p)
}

// thicknessSpreadText is erSpreadText for the thickness, whose absolute
// spread is a length.
func thicknessSpreadText(rel, thickness float64) string {
	p := formatPercent(rel)
	if sigDigits(p) <= short {
		return tomlx.Quote(p)
	}
	abs := formatLength(rel * thickness)
	if v, err := units.ParseLength(abs); err == nil && v/thickness == rel && sigDigits(abs) <= short {
		return tomlx.Quote(abs)
	}
	return tomlx.Quote(p)
}
