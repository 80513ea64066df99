package synth

import (
	"stubcraft/synth/geom"
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
// far edge, half a pad further.
func (r *Result) GeomSpec() geom.Spec {
	d := r.Design
	side := 1
	if d.Layout.StubSide == "down" {
		side = -1
	}
	s := geom.Spec{
		Name:          d.Name,
		Margin:        d.Layout.Margin,
		MaxBoard:      d.Layout.MaxBoard,
		Height:        r.Stackup.Dielectric.Thickness,
		Mask:          d.Layout.Mask,
		MaskExpansion: MaskExpansion,
	}
	var portWidth float64
	for _, e := range r.Physical.Elements {
		if e.Role == RoleStub {
			st := geom.Stub{ID: e.ID, At: e.At, Width: e.Width, Length: e.DrawnLength, Side: side}
			if e.End == Short {
				st.Via = &geom.ViaSpec{Drill: d.Layout.ViaDrill, Pad: d.Layout.ViaPad}
				st.Length += d.Layout.ViaPad / 2
			}
			s.Stubs = append(s.Stubs, st)
			continue
		}
		if portWidth == 0 {
			portWidth = e.Width
		}
		s.Segments = append(s.Segments, geom.Segment{ID: e.ID, Width: e.Width, Length: e.DrawnLength})
	}
	if r.Stackup.Line == "gcpw" {
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
	return s
}
