package geom

import "fmt"

// OpenAt removes the copper of segment id from l, the layout of a straight
// line without stubs, leaving the line open on both sides of a gap: the
// two halves become two nets (net+"_A" from the load port, net+"_B"), each
// with its port pad. It makes a reflect standard (two open ends) from the
// layout of a line whose middle segment is the gap.
func OpenAt(l Layout, id string) (Layout, error) {
	if len(l.Marks.Tees) > 0 || len(l.Copper) != 1 {
		return Layout{}, fmt.Errorf("geom: OpenAt: a straight line of one net is needed, the layout has %d stubs and %d nets", len(l.Marks.Tees), len(l.Copper))
	}
	var left, right []Rect
	var gap *Rect
	for _, e := range l.Marks.Elements {
		switch {
		case e.ID == id:
			r := e.Rect
			gap = &r
		case gap == nil:
			left = append(left, e.Rect)
		default:
			right = append(right, e.Rect)
		}
	}
	if gap == nil || len(left) == 0 || len(right) == 0 {
		return Layout{}, fmt.Errorf("geom: OpenAt: segment %q is not between two others", id)
	}
	net := l.Copper[0].Name
	a, b := Union(left), Union(right)
	if len(a) != 1 || len(b) != 1 {
		return Layout{}, fmt.Errorf("geom: OpenAt: the halves are not single polygons")
	}
	out := l
	out.Copper = []Net{{Name: net + "_A", Outline: a[0]}, {Name: net + "_B", Outline: b[0]}}
	out.Pads = append([]Pad(nil), l.Pads...)
	for i := range out.Pads {
		if out.Pads[i].Net != net {
			continue
		}
		if out.Pads[i].Center.X < gap.Min.X {
			out.Pads[i].Net = net + "_A"
		} else {
			out.Pads[i].Net = net + "_B"
		}
	}
	return out, nil
}
