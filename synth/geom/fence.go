package geom

import "math"

// FenceSpec is a via fence: rows of plated ground vias alongside the RF
// copper (the through line, the stubs, bends included, the via pads and
// the port pads), on both sides, Offset from its edge. Lengths are metres.
//
// The rows follow the outline of the RF copper grown by Offset (grown as
// rectangles, so a fence turns square around a stub's end and a bend's
// corner): every via centre is at least Offset from all RF copper, so a
// fence never hits the line or a stub, and where two pieces of copper lie
// closer than twice Offset there is no room and no row. On each straight
// run the vias step at exactly Pitch from a corner (or centred on the
// run); between two corners they are spread evenly at most Pitch apart,
// with a via on each corner. A via is left out where its pad would come
// closer than StitchSpacing to another via's pad, to a ground pad of an
// edge-launch landing or to the pulled-back board edge.
type FenceSpec struct {
	Pitch, Offset float64
	Drill, Pad    float64
}

// checkFence refuses a fence with a non-positive or non-finite size, a pad
// not wider than its drill, a pitch that would make neighbouring pads
// closer than StitchSpacing, an offset that puts the pads within
// StitchSetback of the copper, or a fence beside a coplanar pour (which is
// stitched already).
func checkFence(s Spec) error {
	f := s.Fence
	for _, v := range []struct {
		name string
		v    float64
	}{{"Fence.Pitch", f.Pitch}, {"Fence.Offset", f.Offset}, {"Fence.Drill", f.Drill}, {"Fence.Pad", f.Pad}} {
		if !(v.v > 0) || math.IsInf(v.v, 0) || Nanometres(v.v) <= 0 {
			return specErr(v.name, ErrSize, "%g mm", v.v*1e3)
		}
	}
	pad, pitch, off := Nanometres(f.Pad), Nanometres(f.Pitch), Nanometres(f.Offset)
	switch {
	case f.Pad <= f.Drill:
		return specErr("Fence.Pad", ErrVia, "fence via pad %g mm is not wider than its drill %g mm", f.Pad*1e3, f.Drill*1e3)
	case pitch < pad+Nanometres(StitchSpacing):
		return specErr("Fence.Pitch", ErrRange, "%s mm is below the fence via pad %s mm + %s mm spacing", mm(pitch), mm(pad), mm(Nanometres(StitchSpacing)))
	case off < pad/2+Nanometres(StitchSetback):
		return specErr("Fence.Offset", ErrRange, "%s mm puts the fence via pads (%s mm) within %s mm of the RF copper", mm(off), mm(pad), mm(Nanometres(StitchSetback)))
	case s.CoplanarGap > 0:
		return specErr("Fence", ErrRange, "a grounded-coplanar pour is stitched already; a via fence is for microstrip")
	}
	return nil
}

// addFence draws the via fence f of l: rf are the RF copper's rectangles,
// board the board pulled back by the edge clearance, avoid the landing's
// ground pads.
func (l *Layout) addFence(f FenceSpec, rf []Rect, board Rect, avoid []Rect) {
	off, pad := Nanometres(f.Offset), Nanometres(f.Pad)
	r := stitchRule{pitch: Nanometres(f.Pitch), drill: Nanometres(f.Drill), pad: pad, spacing: pad + Nanometres(StitchSpacing)}
	grown := make([]Rect, len(rf))
	for i, q := range rf {
		grown[i] = q.Inset(off)
	}
	keep := make([]Rect, len(avoid))
	for i, a := range avoid {
		keep[i] = a.Inset(r.spacing - pad/2)
	}
	path := Union(complement(board, grown))
	for _, c := range stitch(path, nil, keep, board, r, l.Vias) {
		l.Vias = append(l.Vias, Via{Net: NetGround, Center: c, Drill: r.drill, Pad: r.pad})
		l.Pads = append(l.Pads, Pad{Net: NetGround, Function: ViaPad, Center: c, W: r.pad, H: r.pad, Round: true})
	}
}
