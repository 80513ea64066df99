package synth

import (
	"errors"
	"fmt"
	"strings"

	"stubcraft/synth/geom"
	"stubcraft/synth/tune"
)

// StructureKind is a calibration or test structure made on the same panel
// as the board, so that the bench measures on the same laminate and with
// the same port launches.
type StructureKind int

// The structures of [panel] structures.
const (
	StructureThru    StructureKind = iota // TRL thru: the two port launches back to back
	StructureLine                         // TRL line: the thru plus a quarter wave at f0
	StructureReflect                      // TRL reflect: each launch ending open, a gap between them
	StructureCoupon                       // a 50 Ω (z0) impedance coupon for TDR
)

// StructureKinds lists every structure kind in report order.
func StructureKinds() []StructureKind {
	return []StructureKind{StructureThru, StructureLine, StructureReflect, StructureCoupon}
}

// String returns the kind's design-file name.
func (k StructureKind) String() string {
	switch k {
	case StructureThru:
		return "thru"
	case StructureLine:
		return "line"
	case StructureReflect:
		return "reflect"
	case StructureCoupon:
		return "coupon"
	}
	return fmt.Sprintf("StructureKind(%d)", int(k))
}

// ParseStructureKind reads a structure's design-file name.
func ParseStructureKind(s string) (StructureKind, error) {
	var names []string
	for _, k := range StructureKinds() {
		if s == k.String() {
			return k, nil
		}
		names = append(names, fmt.Sprintf("%q", k.String()))
	}
	return 0, fmt.Errorf("unknown structure %q; the structures are %s", s, strings.Join(names, ", "))
}

// CouponLength is the length of the impedance coupon's line between its
// launches: long enough for a TDR trace to settle on a flat plateau
// between the launch reflections at the usual 30–50 ps rise times (common
// practice, no source).
const CouponLength = 50e-3

// Structure is one calibration or test structure with its own outline.
type Structure struct {
	Kind   StructureKind
	Layout geom.Layout
	Width  float64 // of its line, m (the board's port line)
	// Length is the copper between the port edges, m (for the reflect,
	// each half's).
	Length float64
	// TRL is the line standard's sizing, for StructureLine.
	TRL *tune.TRLLine
	// Note says what the structure is for and how to use it.
	Note string
}

// ErrNoPortLine is returned when a design has no port line to make
// structures from.
var ErrNoPortLine = errors.New("no port line")

// structures makes the design's [panel] structures: each a straight line
// of the board's port width with the board's launches (feed length and
// port pads), margin and edge clearance, named NAME-cal-KIND.
func (r *Result) structures() ([]Structure, error) {
	kinds := r.Design.Panel.Structures
	if len(kinds) == 0 {
		return nil, nil
	}
	var port *Element
	for i := range r.Physical.Elements {
		if r.Physical.Elements[i].Role != RoleStub {
			port = &r.Physical.Elements[i]
			break
		}
	}
	if port == nil {
		return nil, ErrNoPortLine
	}
	base := r.GeomSpec()
	launch := r.Design.Layout.FeedLength
	w := port.Width
	line, err := r.benchLines(w, r.Physical.Board.Sub)
	if err != nil {
		return nil, fmt.Errorf("structures: %w", err)
	}
	trl, err := tune.NewTRLLine(line, r.Design.Freq)
	if err != nil {
		return nil, fmt.Errorf("structures: %w", err)
	}
	// The reflect's gap keeps the two open ends from coupling: three
	// substrate heights, or 1 mm (common practice, no source).
	gap := max(3*r.Stackup.Dielectric.Thickness, 1e-3)
	var out []Structure
	for _, k := range kinds {
		// The board's own spec, with the structure's line instead of the
		// network: the same launches, margin, clearance, mask and pour.
		spec := base
		spec.Name = fmt.Sprintf("%s-cal-%s", r.Design.Name, k)
		spec.Stubs, spec.MaxBoard = nil, [2]float64{}
		s := Structure{Kind: k, Width: w}
		switch k {
		case StructureThru:
			spec.Segments = []geom.Segment{{ID: "launch-1", Width: w, Length: launch}, {ID: "launch-2", Width: w, Length: launch}}
			s.Length = 2 * launch
			s.Note = "TRL thru: the two launches back to back; the reference planes lie at its centre"
		case StructureLine:
			spec.Segments = []geom.Segment{{ID: "launch-1", Width: w, Length: launch}, {ID: "line", Width: w, Length: trl.Extra}, {ID: "launch-2", Width: w, Length: launch}}
			s.Length, s.TRL = 2*launch+trl.Extra, &trl
			s.Note = fmt.Sprintf("TRL line: %.3f mm longer than the thru, 90° at f0; usable where its phase is %g°–%g°: %s to %s",
				trl.Extra*1e3, tune.TRLMinDeg, tune.TRLMaxDeg, hzText(trl.Lo), hzText(trl.Hi))
		case StructureReflect:
			spec.Segments = []geom.Segment{{ID: "launch-1", Width: w, Length: launch}, {ID: "gap", Width: w, Length: gap}, {ID: "launch-2", Width: w, Length: launch}}
			s.Length = launch
			s.Note = fmt.Sprintf("TRL reflect: each launch ends open at the reference plane, %.2f mm apart", gap*1e3)
		case StructureCoupon:
			spec.Segments = []geom.Segment{{ID: "coupon", Width: w, Length: CouponLength}}
			s.Length = CouponLength
			s.Note = fmt.Sprintf("impedance coupon: %.0f mm of the %g Ω port line, for a TDR check of the etched impedance", CouponLength*1e3, port.Z0)
		}
		lay, err := geom.Build(spec)
		if err != nil {
			return nil, fmt.Errorf("structure %s: %w", k, err)
		}
		if k == StructureReflect {
			if lay, err = geom.OpenAt(lay, "gap"); err != nil {
				return nil, fmt.Errorf("structure %s: %w", k, err)
			}
		}
		s.Layout = lay
		out = append(out, s)
	}
	return out, nil
}

// hzText prints a frequency in MHz below 1 GHz, in GHz above.
func hzText(f float64) string {
	if f < 1e9 {
		return fmt.Sprintf("%.4g MHz", f/1e6)
	}
	return fmt.Sprintf("%.4g GHz", f/1e9)
}
