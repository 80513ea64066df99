package synth

import (
	"fmt"
	"math"

	"stubcraft/synth/geom"
)

// FenceWavelengths is the largest fence pitch in wavelengths at the
// highest frequency of the build: vias closer than about a tenth of a
// wavelength in the dielectric act as a wall (common practice, no
// source).
const FenceWavelengths = 0.1

// speedOfLight is c0, m/s (exact by the definition of the metre).
const speedOfLight = 299792458.0

// fenceOffset returns the fence's offset from the copper's edge to the via
// centres, m: layout.fence_offset, or by default KeepOutHeights dielectric
// heights plus half a via pad, so that the via pads keep three heights
// from the line, where a microstrip's field has died away enough for the
// circuit model, which leaves the fence out, to stay fair (common
// practice, no source).
func (r *Result) fenceOffset() float64 {
	if o := r.Design.Layout.FenceOffset; o > 0 {
		return o
	}
	return geom.KeepOutHeights*r.Stackup.Dielectric.Thickness + r.Design.Layout.ViaPad/2
}

// highestFrequency returns the highest frequency the build looks at, Hz:
// the top of the sweep, the band or f0.
func (r *Result) highestFrequency() float64 {
	d := r.Design
	f := max(d.Freq, d.Sweep.Stop)
	if d.Match.HasBand() {
		f = max(f, d.Match.Band[1])
	}
	return f
}

// FenceNote says what the fence is and that the circuit model leaves it
// out, and warns when the pitch is over FenceWavelengths at the highest
// frequency or the vias come closer to the copper than KeepOutHeights
// heights; all "" without a fence.
func (r *Result) FenceNote(l geom.Layout) (note string, warnings []string) {
	d := r.Design.Layout
	if d.FencePitch <= 0 {
		return "", nil
	}
	h := r.Stackup.Dielectric.Thickness
	off := r.fenceOffset()
	n := FenceViaCount(l)
	clear := off - d.ViaPad/2
	note = fmt.Sprintf("via fence: %d plated vias to the plane (%.3g mm drill) alongside the RF copper, centres %.3g mm from its edge (pads %.3g mm = %.2g h away), at most %.3g mm apart; "+
		"the fence is not in the circuit model, which is fair while the vias keep at least %g dielectric heights from the lines (common practice, no source); "+
		"the project's full-wave check of one fenced board (testdata/designs/edge-launch-fence.toml, 5.8 GHz, pads 3 h away) found its fence moving the best match by −0.65 %% and S21 by up to 0.045 (2.6°) within ±10 %% of f0 (testdata/fdtd/fence.tsv): check a fenced board with verify",
		n, d.ViaDrill*1e3, off*1e3, clear*1e3, clear/h, d.FencePitch*1e3, geom.KeepOutHeights)
	if clear < geom.KeepOutHeights*h {
		warnings = append(warnings, fmt.Sprintf("the via fence's pads come %.3g mm (%.2g h) from the RF copper, closer than %g dielectric heights: the lines' impedance and the stubs' lengths shift by an amount the circuit model does not include",
			clear*1e3, clear/h, geom.KeepOutHeights))
	}
	f := r.highestFrequency()
	lambda := speedOfLight / (f * math.Sqrt(r.Stackup.Dielectric.Er))
	if d.FencePitch > FenceWavelengths*lambda {
		warnings = append(warnings, fmt.Sprintf("the via fence's pitch %.3g mm is more than λ/10 = %.3g mm in the dielectric at %.4g GHz, the highest frequency of the build (common practice, no source): the fence leaks there",
			d.FencePitch*1e3, FenceWavelengths*lambda*1e3, f/1e9))
	}
	if n == 0 {
		warnings = append(warnings, "the via fence found no room for a single via (every row was too close to other copper, a landing or the board edge)")
	}
	return note, warnings
}

// FenceViaCount returns the number of fence vias of l: the ground vias
// that are not an edge-launch landing's. (On a board without a coplanar
// pour, which a fence may not have, every other ground via is the
// fence's.)
func FenceViaCount(l geom.Layout) int {
	n := 0
	for _, v := range l.Vias {
		if v.Net == geom.NetGround && !landingVia(l, v) {
			n++
		}
	}
	return n
}

// landingVia reports whether v is one of the edge-launch landing's ground
// vias (inside a ground pad, which carries a connector pin).
func landingVia(l geom.Layout, v geom.Via) bool {
	for _, p := range l.Pads {
		if p.Pin != "" && p.Net == geom.NetGround &&
			v.Center.X > p.Center.X-p.W/2 && v.Center.X < p.Center.X+p.W/2 &&
			v.Center.Y > p.Center.Y-p.H/2 && v.Center.Y < p.Center.Y+p.H/2 {
			return true
		}
	}
	return false
}

// MaxFenceSize bounds fence_pitch and fence_offset (common practice, no
// source: a fence farther or sparser than this does nothing).
const MaxFenceSize = 20e-3

// checkFence checks the fence keys: a pitch and offset within range, an
// offset only with a pitch, a pitch that keeps neighbouring via pads
// apart and an offset that keeps the pads off the copper. (A fence on a
// grounded-coplanar stackup, whose pour is stitched already, is refused
// when the layout is drawn.)
func (c *designCheck) checkFence(l LayoutSpec) {
	if l.FencePitch == 0 {
		if l.FenceOffset != 0 {
			c.fail("layout.fence_offset", designMM(l.FenceOffset), "a fence needs fence_pitch too, for example fence_pitch = \"2mm\"")
		}
		return
	}
	if min := l.ViaPad + geom.StitchSpacing; !(l.FencePitch >= min && l.FencePitch <= MaxFenceSize) {
		c.failErr("layout.fence_pitch", designMM(l.FencePitch), rangeError("the fence pitch must be from the via pad plus %g mm (%s) to %s", geom.StitchSpacing*1e3, formatMM(min), formatMM(MaxFenceSize)))
	}
	if min := l.ViaPad/2 + geom.StitchSetback; l.FenceOffset != 0 && !(l.FenceOffset >= min && l.FenceOffset <= MaxFenceSize) {
		c.failErr("layout.fence_offset", designMM(l.FenceOffset), rangeError("the fence offset (copper edge to via centre) must be from half the via pad plus %g mm (%s) to %s", geom.StitchSetback*1e3, formatMM(min), formatMM(MaxFenceSize)))
	}
}
