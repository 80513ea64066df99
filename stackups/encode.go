package stackups

import (
	"fmt"
	"io"
	"strconv"
	"strings"

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

	kv("name", quote(s.Name))
	if s.Description != "" {
		kv("description", quote(s.Description))
	}
	kv("line", quote(s.Line))
	if s.Line == GCPW {
		kv("gap", quote(formatLength(s.Gap)))
	}

	d := s.Dielectric
	b.WriteString("\n[dielectric]\n")
	kv("er", number(d.Er))
	if d.ErFrequency != 0 {
		kv("er_frequency", quote(formatFrequency(d.ErFrequency)))
	}
	kv("loss_tangent", number(d.LossTangent))
	kv("thickness", quote(formatLength(d.Thickness)))

	c := s.Copper
	b.WriteString("\n[copper]\n")
	kv("thickness", quote(formatLength(c.Thickness)))
	if c.Roughness != 0 {
		kv("roughness", quote(formatLength(c.Roughness)))
	}
	kv("conductivity", number(c.Conductivity))

	if m := s.Mask; m != nil {
		b.WriteString("\n[mask]\n")
		kv("thickness", quote(formatLength(m.Thickness)))
		kv("er", number(m.Er))
		kv("loss_tangent", number(m.LossTangent))
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
		return quote(p)
	}
	abs, ok := nearest(rel*er, "", func(s string) bool {
		v, err := strconv.ParseFloat(s, 64)
		return err == nil && v/er == rel
	})
	if ok && sigDigits(abs) <= short {
		return abs
	}
	return quote(p)
}

// thicknessSpreadText is erSpreadText for the thickness, whose absolute
// spread is a length.
func thicknessSpreadText(rel, thickness float64) string {
	p := formatPercent(rel)
	if sigDigits(p) <= short {
		return quote(p)
	}
	abs := formatLength(rel * thickness)
	if v, err := units.ParseLength(abs); err == nil && v/thickness == rel && sigDigits(abs) <= short {
		return quote(abs)
	}
	return quote(p)
}
