package synth

import (
	"fmt"
	"strings"
	"testing"
)

// maskDesign is the fr4 test design with [layout] mask set (or left out
// when mask is "").
func maskDesign(mask string) string {
	d := fmt.Sprintf(fr4Open, "open")
	if mask != "" {
		d += "[layout]\nmask = \"" + mask + "\"\n"
	}
	return d
}

// The mask follows the model. fr4-1.6mm-masked is fr4-1.6mm with a 20 µm
// mask (the presets differ in nothing else), so:
//   - by default the masked stackup's line is drawn covered and sized
//     under the mask, narrower than the bare line (a mask's extra
//     dielectric lowers Z0; 20 µm of εr 3.5 over 1.6 mm FR-4 moves a
//     50 Ω width by well under 3 %: common practice, no source);
//   - mask = "open" on it is sized for the bare line that is drawn: the
//     widths of the bare preset exactly;
//   - mask = "cover" on a bare stackup is warned about.
func TestMaskFollowsModel(t *testing.T) {
	width := func(r *Result) float64 { return r.Physical.Elements[0].Width }
	bare := build(t, maskDesign(""), "fr4-1.6mm", true)
	covered := build(t, maskDesign(""), "fr4-1.6mm-masked", true)
	opened := build(t, maskDesign("open"), "fr4-1.6mm-masked", true)
	if bare.Design.Layout.Mask != MaskOpen || covered.Design.Layout.Mask != MaskCover || opened.Design.Layout.Mask != MaskOpen {
		t.Errorf("resolved masks %q %q %q, want open cover open", bare.Design.Layout.Mask, covered.Design.Layout.Mask, opened.Design.Layout.Mask)
	}
	if w, wb := width(covered), width(bare); !(w < wb && w > 0.97*wb) {
		t.Errorf("covered width %.4f mm, bare %.4f mm: want narrower by under 3 %%", w*1e3, wb*1e3)
	}
	for i, e := range opened.Physical.Elements {
		if e.Width != bare.Physical.Elements[i].Width {
			t.Errorf("%s: open on the masked stackup %.5f mm, the bare preset %.5f mm", e.ID, e.Width*1e3, bare.Physical.Elements[i].Width*1e3)
		}
	}
	if s := strings.Join(opened.Notes, "\n"); !strings.Contains(s, "without the stackup's [mask]") {
		t.Errorf("no note that the open line is sized bare: %s", s)
	}
	warned := build(t, maskDesign("cover"), "fr4-1.6mm", true)
	if s := strings.Join(warned.Warnings, "\n"); !strings.Contains(s, "sized as bare microstrip") {
		t.Errorf("cover on a bare stackup: no warning in %q", s)
	}
	for _, r := range []*Result{bare, covered, opened} {
		if s := strings.Join(r.Warnings, "\n"); strings.Contains(s, "layout.mask") {
			t.Errorf("consistent mask warned: %s", s)
		}
	}
}
