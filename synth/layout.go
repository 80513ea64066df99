package synth

import (
	"fmt"
	"math"
	"strings"
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
// centre-line length, which Build lengthens by the bend's shortening
// (Element.Bend, drawCompensated; see LayoutNotes).
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
	var portWidth, sourceWidth float64
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
		sourceWidth = e.Width
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
		// Each pad is its port line's width: the two differ where the
		// feeds do (a transformer from a low load impedance).
		s.PortPad = geom.PadSpec{Width: portWidth, SourceWidth: sourceWidth, Length: PortPadLength}
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

// MaxBendPasses bounds drawCompensated's passes: the first draws the
// stubs at their electrical length, the second with each bent stub
// lengthened by its bends' shortening; a third is needed only if that
// lengthening changed which stubs bend.
const MaxBendPasses = 3

// drawCompensated draws r's layout (drawBoard) with every bent stub
// lengthened so that its electrical length is kept: a mitred 90° bend acts
// physical.MitredBendShortening(W, h) shorter than its centre-line length
// (a fit to the full-wave record testdata/discontinuities/bend.tsv), so a
// stub the layout bends n times gets Element.Bend = n × that. The added
// length can change which stubs bend, so it draws again until the bends
// it compensated are the bends it drew, at most MaxBendPasses times, and
// fails naming the stubs otherwise. The circuit model is unchanged: it
// leaves Bend out of an element's model length.
func (r *Result) drawCompensated() (geom.Layout, error) {
	h := r.Stackup.Dielectric.Thickness
	for pass := 1; ; pass++ {
		lay, err := r.drawBoard()
		if err != nil {
			return geom.Layout{}, err
		}
		bends := map[string]int{}
		for _, b := range lay.Marks.Bends {
			bends[b.StubID]++
		}
		var changed []string
		for i := range r.Physical.Elements {
			e := &r.Physical.Elements[i]
			if e.Role != RoleStub {
				continue
			}
			want := 0.0
			if n := bends[e.ID]; n > 0 {
				want = float64(n) * physical.MitredBendShortening(e.Width, h)
			}
			if math.Abs(want-e.Bend) > 0.5e-9 { // the layout's 1 nm grid
				changed = append(changed, e.ID)
				e.Bend = want
			}
		}
		if len(changed) == 0 {
			return lay, nil
		}
		if pass == MaxBendPasses {
			return geom.Layout{}, fmt.Errorf("layout: the mitred-bend compensation of %s still changes which stubs bend after %d passes", strings.Join(changed, ", "), pass)
		}
	}
}

// LayoutNotes returns a note for each stub that l, the layout of
// r.GeomSpec(), bends: where it bends, its miter, and how much longer
// than its electrical length it is drawn to make up for the bend (the
// element's Bend, set by Build; a layout of a Simulate result has none and
// its note says the stub acts that much shorter). A bend outside the
// miter's measured range says so in its note.
func (r *Result) LayoutNotes(l geom.Layout) []string {
	var notes []string
	h := r.Stackup.Dielectric.Thickness
	comp := map[string]float64{}
	for _, e := range r.Physical.Elements {
		if e.Role == RoleStub {
			comp[e.ID] = e.Bend
		}
	}
	for _, b := range l.Marks.Bends {
		w := float64(b.ChamferLeg) * 1e-9 / (2 * b.Miter) // the cut's legs are 2·m·W
		toward := "the source port"
		if b.Toward < 0 {
			toward = "the load port"
		}
		short := physical.MitredBendShortening(w, h)
		n := fmt.Sprintf("%s bends 90° toward %s at %.3f mm from the through line's edge, miter %.0f %% (Douville and James 1978); ",
			b.StubID, toward, float64(b.Leg1)*1e-6, math.Round(100*b.Miter))
		if c := comp[b.StubID]; c > 0 {
			n += fmt.Sprintf("the bend is compensated: the stub is drawn %.3f mm longer than its electrical length (bend_mm), the %.3f mm per bend a mitred bend acts shorter than its centre-line length (physical.MitredBendShortening, a fit to the full-wave record testdata/discontinuities/bend.tsv)",
				1e3*c, 1e3*short)
		} else {
			n += fmt.Sprintf("not compensated: the stub acts %.3f mm shorter than its centre-line length (physical.MitredBendShortening, a fit to the full-wave record testdata/discontinuities/bend.tsv)",
				1e3*short)
		}
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
