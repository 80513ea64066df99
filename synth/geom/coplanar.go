package geom

import (
	"errors"
	"fmt"
	"math"
)

// Stitching defaults and rules for the grounded-coplanar pour, in metres.
// All are common practice, no source.
const (
	// DefaultStitchPitch is the stitching-via pitch when Spec.StitchPitch
	// is 0. Callers that know the line's effective permittivity and the
	// frequency pass math.Min(StitchMaxPitch(epsEff, freq),
	// DefaultStitchPitch) instead.
	DefaultStitchPitch = 2e-3
	// DefaultStitchDrill and DefaultStitchPad size the stitching vias when
	// the Spec gives no size of its own and has no shorted stub to copy.
	DefaultStitchDrill = 0.3e-3
	DefaultStitchPad   = 0.6e-3
	// StitchSetback is how much further than half its pad a stitching
	// via's centre stays from the pour edge that faces the RF copper.
	StitchSetback = 0.1e-3
	// StitchSpacing is the least clearance between the pads of two vias:
	// via centres are at least StitchPad + StitchSpacing apart, and at
	// least that far from the board edge.
	StitchSpacing = 0.2e-3
)

// ErrGap is the SpecError reason for a coplanar gap that leaves no ground
// pour, or cuts the pour off at the board edge.
var ErrGap = errors.New("coplanar ground pour does not fit")

// speedOfLight is c0, m/s (exact by the definition of the metre).
const speedOfLight = 299792458.0

// StitchMaxPitch returns a twentieth of the guided wavelength,
// c0 / (freq·√epsEff) / 20: stitching vias closer than λg/20 keep the
// pour's ground at one potential along the line (common practice, no
// source). freq is in hertz. It returns 0, which a Spec reads as "use the
// default pitch", when epsEff or freq is not positive and finite.
func StitchMaxPitch(epsEff, freq float64) float64 {
	if !(epsEff > 0) || !(freq > 0) || math.IsInf(epsEff, 0) || math.IsInf(freq, 0) {
		return 0
	}
	return speedOfLight / (freq * math.Sqrt(epsEff)) / 20
}

// stitchRule is a Spec's coplanar settings in nanometres, defaults filled.
type stitchRule struct {
	gap, pitch, drill, pad int64
	setback                int64 // from the pour edge to a via centre
	spacing                int64 // least distance from a via centre to another via centre or the board edge
}

// coplanarRule checks the coplanar fields of s and fills the defaults. ok
// is false when s asks for no pour (CoplanarGap ≤ 0 or NaN).
func coplanarRule(s Spec) (r stitchRule, ok bool, err error) {
	for _, f := range []struct {
		name string
		v    float64
	}{{"StitchPitch", s.StitchPitch}, {"StitchDrill", s.StitchDrill}, {"StitchPad", s.StitchPad}} {
		if !(f.v >= 0) || math.IsInf(f.v, 0) {
			return r, false, specErr(f.name, ErrSize, "%g m must be zero or positive", f.v)
		}
	}
	g := s.CoplanarGap
	if !(g > 0) {
		return r, false, nil
	}
	if math.IsInf(g, 0) || Nanometres(g) <= 0 {
		return r, false, specErr("CoplanarGap", ErrSize, "%g m", g)
	}
	drill, pad := DefaultStitchDrill, DefaultStitchPad
	for _, t := range s.Stubs {
		if t.Via != nil {
			drill, pad = t.Via.Drill, t.Via.Pad
			break
		}
	}
	if s.StitchDrill > 0 {
		drill = s.StitchDrill
	}
	if s.StitchPad > 0 {
		pad = s.StitchPad
	}
	pitch := DefaultStitchPitch
	if s.StitchPitch > 0 {
		pitch = s.StitchPitch
	}
	r = stitchRule{
		gap: Nanometres(g), pitch: Nanometres(pitch), drill: Nanometres(drill), pad: Nanometres(pad),
	}
	r.setback = r.pad/2 + Nanometres(StitchSetback)
	r.spacing = r.pad + Nanometres(StitchSpacing)
	switch {
	case r.drill <= 0:
		return r, false, specErr("StitchDrill", ErrSize, "%g m", drill)
	case r.pad <= r.drill:
		return r, false, specErr("StitchPad", ErrVia, "stitching pad %s mm is not wider than the drill %s mm", mm(r.pad), mm(r.drill))
	case r.pitch < r.spacing:
		return r, false, specErr("StitchPitch", ErrRange,
			"%s mm is below the stitching pad %s mm + %s mm spacing", mm(r.pitch), mm(r.pad), mm(Nanometres(StitchSpacing)))
	}
	return r, true, nil
}

// addCoplanar draws the grounded-coplanar pour of l: board (the board
// pulled back by the edge clearance) minus the
// RF copper rf (line, stubs, port pads and the bounding squares of the via
// pads) grown by the gap, as one GND net per piece, and the stitching vias
// along the pour's edges that face the RF copper. A round via pad keeps
// the gap from its bounding square: exactly the gap along the axes through
// its centre, more toward its diagonals.
func (l *Layout) addCoplanar(s Spec, rf []Rect, board Rect, r stitchRule) error {
	grown := make([]Rect, len(rf))
	for i, q := range rf {
		grown[i] = q.Inset(r.gap)
	}
	cells := complement(board, grown)
	if len(cells) == 0 {
		return specErr("CoplanarGap", ErrGap, "no ground pour remains on the %s × %s mm board with a %s mm gap",
			mm(board.Dx()), mm(board.Dy()), mm(r.gap))
	}
	for k, t := range l.Marks.Tees {
		if d := minI(board.Max.Y-t.EndY, t.EndY-board.Min.Y); d <= r.gap {
			return specErr(fmt.Sprintf("Stubs[%d]", k), ErrGap,
				"stub %q ends %s mm from the board edge, within the %s mm gap: the pour would be cut off (raise Margin above the gap)",
				t.StubID, mm(d), mm(r.gap))
		}
	}
	for _, g := range grown {
		if g.Min.Y <= board.Min.Y || g.Max.Y >= board.Max.Y {
			return specErr("CoplanarGap", ErrGap,
				"%s mm: the copper comes within the gap of the board's edge in y, so the pour would be cut off; Margin %s mm must exceed the gap",
				mm(r.gap), mm(Nanometres(s.Margin)))
		}
	}
	pour := Union(cells)
	for _, p := range pour {
		if p.DoubleArea() < 0 {
			return specErr("CoplanarGap", ErrGap, "the pour would have a hole (a loop at %s, %s mm)", mm(p[0].X), mm(p[0].Y))
		}
	}
	for _, p := range pour {
		l.Copper = append(l.Copper, Net{Name: NetGround, Outline: p})
	}
	for _, c := range stitch(pour, grown, nil, board, r, l.Vias) {
		l.Vias = append(l.Vias, Via{Net: NetGround, Center: c, Drill: r.drill, Pad: r.pad})
		l.Pads = append(l.Pads, Pad{Net: NetGround, Function: ViaPad, Center: c, W: r.pad, H: r.pad, Round: true})
	}
	return nil
}

// maskGrowth is how far the solder-mask windows grow beyond the copper they
// open: MaskExpansion, plus the coplanar gap when the RF copper is open
// and there is a pour, so that the window spans the gap and ends on the
// pour.
func maskGrowth(s Spec, r stitchRule, pour bool) int64 {
	d := Nanometres(s.MaskExpansion)
	if pour && s.Mask != "cover" {
		d += r.gap
	}
	return d
}
