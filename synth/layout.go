package synth

import (
	"fmt"
	"math"
	"stubcraft/physical"
	"stubcraft/stackups"

	"stubcraft/synth/geom"
	"stubcraft/synth/tune"
)

// PortPadLength is the length of the pad flashed at each port for an
// edge-launch connector's pin (common practice, no source).
const PortPadLength = 1.0e-3

// MaskExpansion is how far the solder-mask window grows beyond the copper
// it opens (common practice, no source: 50 µm mask registration).
const MaskExpansion = 50e-6

// GeomSpec returns the geometry of the drawn network. On a grounded
// coplanar stackup the top layer gets a ground pour at the stackup's gap,
// stitched to the plane below. The through line
// runs from the load port at x = 0 toward the source port. A shorted stub's
// drawn length ends at its via's centre; its copper goes on to the pad's
// far edge, half a pad further. A stub too tall for the board's
// max_board height is bent by geom.Build into a mitred L of the same
// centre-line length (see LayoutNotes).
func (r *Result) GeomSpec() geom.Spec {
	d := r.Design
	side := 1
	if d.Layout.StubSide == StubDown {
		side = -1
	}
	s := geom.Spec{
		Name:          d.Name,
		Margin:        d.Layout.Margin,
		EdgeClearance: d.Layout.EdgeClearance,
		LegendTitle:   d.Name,
		LegendNote:    fmt.Sprintf("F0 %.4gGHZ", d.Freq/1e9),
		MaxBoard:      d.Layout.MaxBoard,
		Height:        r.Stackup.Dielectric.Thickness,
		Er:            r.Stackup.Dielectric.Er,
		Mask:          d.Layout.Mask.String(),
		MaskExpansion: MaskExpansion,
	}
	var portWidth float64
	for _, e := range r.Physical.Elements {
		if e.Role == RoleStub {
			st := geom.Stub{ID: e.ID, At: e.At, Width: e.Width, Length: e.Drawn(), Side: side}
			if e.End == Open {
				st.TrimAllowance = d.Layout.Trim
			}
			if e.End == Short {
				n, sp := physical.ViaRow(e.Width, d.Layout.ViaDrill, d.Layout.ViaPad, d.Layout.ViaRowPitch())
				st.Via = &geom.ViaSpec{Drill: d.Layout.ViaDrill, Pad: d.Layout.ViaPad, Count: n, Spacing: sp}
				st.Length += d.Layout.ViaPad / 2
			}
			s.Stubs = append(s.Stubs, st)
			continue
		}
		if portWidth == 0 {
			portWidth = e.Width
		}
		s.Segments = append(s.Segments, geom.Segment{ID: e.ID, Width: e.Width, Length: e.Drawn()})
	}
	if r.Stackup.Line == stackups.GCPW {
		// A coplanar ground pour at the stackup's gap, stitched at a
		// twentieth of the guided wavelength or 2 mm, whichever is less.
		s.CoplanarGap = r.Stackup.Gap
		var epsEff float64
		for _, e := range r.Physical.Elements {
			epsEff = max(epsEff, e.Params.EpsEff)
		}
		s.StitchPitch = min(geom.StitchMaxPitch(epsEff, d.Freq), geom.DefaultStitchPitch)
	}
	if d.Layout.FeedLength >= PortPadLength {
		s.PortPad = geom.PadSpec{Width: portWidth, Length: PortPadLength}
	}
	if d.Layout.Port == PortEdge {
		g := d.Layout.Launch.Resolve(d.Layout, portWidth)
		s.Launch = &g
	}
	if d.Layout.FencePitch > 0 {
		s.Fence = &geom.FenceSpec{Pitch: d.Layout.FencePitch, Offset: r.fenceOffset(), Drill: d.Layout.ViaDrill, Pad: d.Layout.ViaPad}
	}
	return s
}

// portWidth returns the width of the port line (the first through
// element), m.
func (r *Result) portWidth() float64 {
	for _, e := range r.Physical.Elements {
		if e.Role != RoleStub {
			return e.Width
		}
	}
	return 0
}

// LayoutNotes returns a note for each stub that l, the layout of
// r.GeomSpec(), bends: where it bends, its miter and that it is modelled
// at its centre-line length. The simulation takes a bent stub as a
// straight line of its drawn length: with Douville and James's optimal
// miter the bend's own reflection is small, and counting a mitred bend at
// its centre-line length is common practice, no source. The project's
// full-wave record shows the bend electrically shorter than that by about
// half a strip width (physical.MitredBendShortening); the note gives the
// figure, the layout does not yet compensate it. A bend outside
// the miter's measured range says so in its note.
func (r *Result) LayoutNotes(l geom.Layout) []string {
	var notes []string
	h := r.Stackup.Dielectric.Thickness
	for _, b := range l.Marks.Bends {
		w := float64(b.ChamferLeg) * 1e-9 / (2 * b.Miter) // the cut's legs are 2·m·W
		toward := "the source port"
		if b.Toward < 0 {
			toward = "the load port"
		}
		n := fmt.Sprintf("%s bends 90° toward %s at %.3f mm from the through line's edge, miter %.0f %% (Douville and James 1978); modelled at its centre-line length, which a full-wave fit puts %.2f mm longer than the bend acts (physical.MitredBendShortening; not compensated: the stub acts that much shorter)",
			b.StubID, toward, float64(b.Leg1)*1e-6, math.Round(100*b.Miter), 1e3*physical.MitredBendShortening(w, h))
		if b.Warning != "" {
			n += " (" + b.Warning + ")"
		}
		notes = append(notes, n)
	}
	for _, t := range l.Marks.Trims {
		notes = append(notes, r.TrimNote(t))
	}
	if n, _ := r.LaunchNote(); n != "" {
		notes = append(notes, n)
	}
	if n, _ := r.FenceNote(l); n != "" {
		notes = append(notes, n)
	}
	return notes
}

// TrimNote says how to use the trim ticks of one stub drawn with a trim
// allowance: which tick is the design length, and how far each tick cut
// moves the best match (from the stub's length sensitivity).
func (r *Result) TrimNote(t geom.Trim) string {
	n := fmt.Sprintf("%s is drawn %.2f mm beyond its design length for trimming at the bench: ticks every %.2f mm on the legend, tick 0 (nearest the tee) at the design length, the drawn end %d ticks beyond it",
		t.StubID, r.Design.Layout.Trim*1e3, float64(geom.TrimTickPitch)*1e-6, t.Ticks)
	if mhz, ok := r.TickShift(t.StubID); ok {
		n += fmt.Sprintf("; each tick cut moves the best match by %+.1f MHz", mhz)
	}
	return n
}

// TickShift returns how far one trim tick cut from stub id moves the best
// match, MHz (from the length sensitivity, scaled to the tick pitch).
func (r *Result) TickShift(id string) (float64, bool) {
	for _, s := range r.Sensitivity {
		if s.ID == id && s.Quantity == tune.Length && !math.IsNaN(s.BestMatchShift) {
			return -s.BestMatchShift / 1e6 * float64(geom.TrimTickPitch) * 1e-9 / tune.LengthStep, true
		}
	}
	return 0, false
}
