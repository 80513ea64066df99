// Package geom lays out one microstrip matching network as board geometry:
// the through line from the load port to the source port along +x, the
// shunt stubs, the via pads and drills of shorted stubs, the port pads, the
// board outline, the ground plane, the solder-mask openings and the
// keep-out.
//
// Build takes a Spec in float64 metres and converts every length once, by
// rounding, to int64 nanometres; from then on all geometry is exact integer
// arithmetic, so that the writers in package export can print coordinates
// as millimetres with six decimals without any floating-point step.
//
// The copper of a net is the union of axis-aligned rectangles, computed
// exactly on the integer grid by a small rectilinear union (see Union).
// The via pad of a shorted stub is not merged into the copper polygon: it
// is a flashed round pad (a Pad with Function ViaPad) centred on the stub's
// centre line with its far edge on the stub's end. A flash is exact, where a
// polygon would approximate the circle, and it is what board fabs recognise
// as a via pad; where the pad is wider than the stub, the copper is the
// union of the polygon and the circle (the writers' tests measure both).
//
// Stubs are straight where they fit. A stub whose straight copper would
// make the board taller than Spec.MaxBoard[1] is laid out as an L with a
// 90° bend whose outer corner is cut by Douville and James's optimal miter
// (see Bend and MiterFraction); one that cannot bend within the board is
// refused (see ErrNoFit).
package geom
