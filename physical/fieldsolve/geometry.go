package fieldsolve

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"stubcraft/physical"
)

// Geometry is the kind of line cross-section.
type Geometry int

// The cross-sections the solver knows.
const (
	// Microstrip is a strip on a dielectric over a ground plane, open above.
	Microstrip Geometry = iota
	// GCPW is grounded coplanar waveguide: a strip between two coplanar
	// side grounds, over a ground plane. Vias joining the side grounds to
	// the plane are not modelled (the grounds are held at ground potential).
	GCPW
	// Stripline is a strip inside a homogeneous dielectric between two
	// ground planes, centred or offset vertically.
	Stripline
)

// String returns the lower-case geometry name used on the command line.
func (g Geometry) String() string {
	switch g {
	case Microstrip:
		return "microstrip"
	case GCPW:
		return "gcpw"
	case Stripline:
		return "stripline"
	}
	return fmt.Sprintf("Geometry(%d)", int(g))
}

// ParseGeometry reads a geometry name ("microstrip", "gcpw", "stripline";
// case is ignored).
func ParseGeometry(s string) (Geometry, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "microstrip", "ms":
		return Microstrip, nil
	case "gcpw", "cpwg":
		return GCPW, nil
	case "stripline", "sl":
		return Stripline, nil
	}
	return 0, fmt.Errorf("unknown geometry %q (use microstrip, gcpw or stripline)", s)
}

// CrossSection describes one line cross-section. All lengths are metres.
//
// The strip is a trapezoid: Width is its bottom width (on the dielectric)
// and the side walls lean inwards by EtchAngleDeg from the vertical, so the
// top width is Width − 2·Thickness·tan(EtchAngleDeg). Side grounds of GCPW
// are etched the same way on both edges.
//
// Solder mask (microstrip and GCPW only) is a layer MaskThickness thick on
// the bare dielectric and a conformal coat of the same thickness over the
// copper: over the top, and horizontally MaskThickness beyond each side wall.
// The coat's outer corners are square, not rounded.
type CrossSection struct {
	Geometry Geometry

	Width     float64 // strip bottom width
	Height    float64 // dielectric thickness between strip and ground plane (microstrip, GCPW)
	Thickness float64 // copper thickness (0 for an ideal thin strip)
	Er        float64 // relative permittivity of the dielectric

	EtchAngleDeg float64 // side-wall angle from the vertical, degrees, 0 ≤ angle < 90

	MaskThickness float64 // solder mask thickness (0: no mask)
	MaskEr        float64 // solder mask relative permittivity

	Gap         float64 // GCPW: spacing between strip and side grounds (bottom edges)
	GroundWidth float64 // GCPW: width of each side ground; 0 means they run to the domain edge

	Spacing float64 // stripline: ground-plane to ground-plane spacing b
	Offset  float64 // stripline: height of the strip's mid-thickness above the mid-plane
}

// InputError reports a cross-section value that cannot be solved, naming the
// field and the value, in the manner of strconv.NumError.
type InputError struct {
	Field string  // the CrossSection field at fault
	Value float64 // its value
	Err   error   // the reason
}

func (e *InputError) Error() string {
	return fmt.Sprintf("fieldsolve: %s = %g: %v", e.Field, e.Value, e.Err)
}

func (e *InputError) Unwrap() error { return e.Err }

// ErrInvalid is the reason class of every InputError.
var ErrInvalid = errors.New("invalid cross-section")

func invalid(field string, v float64, format string, args ...any) error {
	return &InputError{Field: field, Value: v, Err: fmt.Errorf("%w: "+format, append([]any{ErrInvalid}, args...)...)}
}

// Validate checks the cross-section and returns an *InputError naming the
// first field at fault, or nil.
func (cs CrossSection) Validate() error {
	finite := func(name string, v float64) error {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return invalid(name, v, "not a finite number")
		}
		return nil
	}
	for _, f := range []struct {
		name string
		v    float64
	}{
		{"Width", cs.Width}, {"Height", cs.Height}, {"Thickness", cs.Thickness}, {"Er", cs.Er},
		{"EtchAngleDeg", cs.EtchAngleDeg}, {"MaskThickness", cs.MaskThickness}, {"MaskEr", cs.MaskEr},
		{"Gap", cs.Gap}, {"GroundWidth", cs.GroundWidth}, {"Spacing", cs.Spacing}, {"Offset", cs.Offset},
	} {
		if err := finite(f.name, f.v); err != nil {
			return err
		}
	}
	switch cs.Geometry {
	case Microstrip, GCPW, Stripline:
	default:
		return invalid("Geometry", float64(cs.Geometry), "unknown geometry")
	}
	if cs.Width <= 0 {
		return invalid("Width", cs.Width, "the strip width must be positive")
	}
	if cs.Thickness < 0 {
		return invalid("Thickness", cs.Thickness, "the copper thickness must not be negative")
	}
	if cs.Er < 1 {
		return invalid("Er", cs.Er, "a relative permittivity must be at least 1")
	}
	if cs.EtchAngleDeg < 0 || cs.EtchAngleDeg >= 90 {
		return invalid("EtchAngleDeg", cs.EtchAngleDeg, "the etch angle must be in [0, 90) degrees from the vertical")
	}
	if top := cs.topWidth(); top <= 0 {
		return invalid("EtchAngleDeg", cs.EtchAngleDeg, "the strip's top width Width−2·Thickness·tan(angle) = %g m is not positive", top)
	}
	if cs.MaskThickness < 0 {
		return invalid("MaskThickness", cs.MaskThickness, "the mask thickness must not be negative")
	}
	if cs.MaskThickness > 0 && cs.MaskEr < 1 {
		return invalid("MaskEr", cs.MaskEr, "a solder mask needs a relative permittivity of at least 1")
	}
	switch cs.Geometry {
	case Microstrip, GCPW:
		if cs.Height <= 0 {
			return invalid("Height", cs.Height, "the dielectric height must be positive")
		}
		if cs.Spacing != 0 || cs.Offset != 0 {
			return invalid("Spacing", cs.Spacing, "Spacing and Offset apply to stripline only")
		}
	case Stripline:
		if cs.Spacing <= 0 {
			return invalid("Spacing", cs.Spacing, "stripline needs a positive ground-plane spacing")
		}
		if cs.MaskThickness != 0 {
			return invalid("MaskThickness", cs.MaskThickness, "solder mask does not apply to a buried stripline")
		}
		lo, hi := cs.stripY()
		if lo <= 0 || hi >= cs.Spacing {
			return invalid("Offset", cs.Offset, "the strip (from %g m to %g m above the lower plane) is not inside the %g m spacing", lo, hi, cs.Spacing)
		}
	}
	if cs.Geometry == GCPW {
		if cs.Gap <= 0 {
			return invalid("Gap", cs.Gap, "grounded coplanar waveguide needs a positive gap")
		}
		if cs.GroundWidth < 0 {
			return invalid("GroundWidth", cs.GroundWidth, "the side-ground width must not be negative (0 means wide)")
		}
		if cs.GroundWidth > 0 && cs.GroundWidth-2*cs.Thickness*cs.etchTan() <= 0 {
			return invalid("GroundWidth", cs.GroundWidth, "the side grounds have no top width at this etch angle")
		}
	} else if cs.Gap != 0 || cs.GroundWidth != 0 {
		return invalid("Gap", cs.Gap, "Gap and GroundWidth apply to GCPW only")
	}
	return nil
}

func (cs CrossSection) etchTan() float64 { return math.Tan(cs.EtchAngleDeg * math.Pi / 180) }

func (cs CrossSection) topWidth() float64 { return cs.Width - 2*cs.Thickness*cs.etchTan() }

// stripY returns the bottom and top of the strip above the lower ground plane.
func (cs CrossSection) stripY() (lo, hi float64) {
	if cs.Geometry == Stripline {
		mid := cs.Spacing/2 + cs.Offset
		return mid - cs.Thickness/2, mid + cs.Thickness/2
	}
	return cs.Height, cs.Height + cs.Thickness
}

// FromSubstrate builds a cross-section for a strip of the given width on
// sub. For Microstrip and GCPW the substrate's height is the dielectric under
// the strip and its mask applies; for GCPW gap is the strip-to-ground spacing
// and the side grounds are wide. For Stripline the substrate's height is
// taken as the plane-to-plane spacing, the strip centred, and the mask
// ignored; gap must be 0 except for GCPW.
func FromSubstrate(g Geometry, width, gap float64, sub physical.Substrate) (CrossSection, error) {
	cs := CrossSection{
		Geometry:  g,
		Width:     width,
		Thickness: sub.CopperThickness,
		Er:        sub.Er,
		Gap:       gap,
	}
	switch g {
	case Stripline:
		cs.Spacing = sub.Height
	default:
		cs.Height = sub.Height
		cs.MaskThickness = sub.MaskThickness
		cs.MaskEr = sub.MaskEr
	}
	if err := cs.Validate(); err != nil {
		return CrossSection{}, fmt.Errorf("fieldsolve: building a %v cross-section: %w", g, err)
	}
	return cs, nil
}
