package fdtd

import (
	"errors"
	"fmt"
	"math"
)

// Point is a position on the board's top face, nm.
type Point struct{ X, Y int64 }

// Polygon is a simple polygon of top copper, vertices in nm, either
// orientation.
type Polygon []Point

// Via is a perfectly conducting round column from the ground plane to the
// top face, centre and diameter in nm. A via that carries the circuit's
// current (a shorted stub's) is drawn with MeshParams.ViaDivisions grid
// lines across it; a ground-stitching via (a fence, a landing's ground
// pads, a coplanar pour), Stitch, is drawn on the board's grid, which
// keeps the grid from refining at every stitch. A via drawn on the board's
// grid (every via at ViaDivisions 0, the mesh levels' setting) is the
// grid nodes within its radius with the thin-wire correction that gives
// the column the drill's radius (thinwire.go; without it, with
// MeshParams.NodeVias, one node is a post of about 0.2 of the local cell:
// see the via column study in DEVELOPERS.md).
type Via struct {
	Center   Point
	Diameter int64
	Stitch   bool
}

// Side says on which board edge a port lies.
type Side int

const (
	// Left is the board edge at the smallest x; its port line runs toward −x.
	Left Side = -1
	// Right is the board edge at the largest x; its port line runs toward +x.
	Right Side = 1
)

// Port is a microstrip port on a board edge: the strip of width Width (nm)
// centred on Y (nm) meets the edge, and the solver extends it straight out
// of the board into the absorbing layer.
//
// With Gap > 0 the port line is grounded coplanar: two side grounds
// GroundWidth wide, Gap from the strip's edges (nm), run out with the
// strip, each held to the ground plane by a wall of vertical perfect
// conductor along its middle (the side grounds at ground potential, as the
// 2-D field solver takes them). The board's own copper must meet them at
// the edge.
type Port struct {
	Side             Side
	Y                int64
	Width            int64
	Gap, GroundWidth int64
}

// Mask is a solder mask: a dielectric layer Thickness thick (m) over the
// whole top face, copper and bare substrate alike, running on into the
// absorbing layers like the substrate. Over copper drawn with its
// thickness it is conformal: Thickness on the substrate, on the copper's
// top face and beside its walls. The zero value is no mask.
type Mask struct {
	Thickness float64 // m; 0 for none
	Er        float64 // relative permittivity
	TanD      float64 // loss tangent at the structure's F0
}

// Structure is everything the solver needs to know about a board. Copper
// is drawn at z = H on the top face; the ground plane is at z = 0; a
// solder mask, when there is one, lies from z = H to H + Mask.Thickness.
// BoardMinX and BoardMaxX are the x of the two edges the ports lie on
// (the S-parameters' reference planes), nm.
type Structure struct {
	Er   float64 // substrate relative permittivity
	TanD float64 // substrate loss tangent at F0
	F0   float64 // frequency at which TanD becomes a conductivity, Hz
	H    float64 // substrate height, m
	Mask Mask    // solder mask over the top face; zero value none
	// CopperThickness is the copper's thickness, m (0: zero-thickness
	// copper). The grid draws it, as a z line at H + CopperThickness,
	// only where that costs no time step: when it is no thinner than the
	// substrate's z cell (see NewGrid); elsewhere the copper stays a
	// sheet at H. A solder mask over copper drawn thick follows it: on
	// the substrate beside it, over its top face and down its walls.
	CopperThickness float64
	Copper          []Polygon
	Vias            []Via
	// Ports: Ports[0] is port 1, Ports[1] port 2; one on each side.
	Ports                [2]Port
	BoardMinX, BoardMaxX int64
	Freqs                []float64 // sweep frequencies, Hz, ascending
	// Zref is the reference impedance of the S-parameters, ohm; 0 means 50.
	Zref float64
	// walls are ground walls the package adds on its own boards (the side
	// grounds of a coplanar port line's calibration).
	walls []wall
}

// wall is a vertical perfect conductor from the ground plane to the top
// face along y = Y (m), from X0 to X1 (m).
type wall struct{ y, x0, x1 float64 }

// sideGrounds returns the y ranges (m) of a coplanar port's two side
// grounds and the y of the wall under each (its middle).
func (p Port) sideGrounds() (lo, hi [2]float64, wallY [2]float64) {
	yc, w := float64(p.Y)*1e-9, float64(p.Width)*1e-9
	gap, gw := float64(p.Gap)*1e-9, float64(p.GroundWidth)*1e-9
	lo = [2]float64{yc - w/2 - gap - gw, yc + w/2 + gap}
	hi = [2]float64{yc - w/2 - gap, yc + w/2 + gap + gw}
	for i := range wallY {
		wallY[i] = (lo[i] + hi[i]) / 2
	}
	return lo, hi, wallY
}

// ErrStructure is wrapped by every error Validate returns.
var ErrStructure = errors.New("fdtd: bad structure")

// Validate checks that the structure can be simulated.
func (s Structure) Validate() error {
	bad := func(format string, a ...any) error {
		return fmt.Errorf("%w: %s", ErrStructure, fmt.Sprintf(format, a...))
	}
	switch {
	case !(s.Er >= 1) || math.IsInf(s.Er, 0):
		return bad("εr = %g, want ≥ 1", s.Er)
	case !(s.TanD >= 0) || s.TanD > 0.1:
		return bad("tanδ = %g, want 0 to 0.1", s.TanD)
	case s.TanD > 0 && !(s.F0 > 0):
		return bad("f0 = %g Hz, want > 0 with a loss tangent", s.F0)
	case !(s.H > 0) || s.H > 0.1:
		return bad("h = %g m, want 0 to 0.1 m", s.H)
	case !(s.Mask.Thickness >= 0) || s.Mask.Thickness > 1e-3:
		return bad("mask thickness %g m, want 0 to 1 mm", s.Mask.Thickness)
	case s.Mask.Thickness > 0 && (!(s.Mask.Er >= 1) || math.IsInf(s.Mask.Er, 0)):
		return bad("mask εr = %g, want ≥ 1", s.Mask.Er)
	case s.Mask.Thickness > 0 && (!(s.Mask.TanD >= 0) || s.Mask.TanD > 0.1):
		return bad("mask tanδ = %g, want 0 to 0.1", s.Mask.TanD)
	case s.Mask.Thickness > 0 && s.Mask.TanD > 0 && !(s.F0 > 0):
		return bad("f0 = %g Hz, want > 0 with a mask loss tangent", s.F0)
	case !(s.CopperThickness >= 0) || s.CopperThickness > 1e-3:
		return bad("copper thickness %g m, want 0 to 1 mm", s.CopperThickness)
	case len(s.Freqs) == 0:
		return bad("no sweep frequencies")
	case s.BoardMaxX <= s.BoardMinX:
		return bad("board x range %d to %d nm is empty", s.BoardMinX, s.BoardMaxX)
	case len(s.Copper) == 0:
		return bad("no copper")
	}
	for i, f := range s.Freqs {
		if !(f > 0) || math.IsInf(f, 0) || (i > 0 && f <= s.Freqs[i-1]) {
			return bad("sweep frequency %d = %g Hz: want positive and ascending", i, f)
		}
	}
	if s.Ports[0].Side == s.Ports[1].Side || (s.Ports[0].Side != Left && s.Ports[0].Side != Right) ||
		(s.Ports[1].Side != Left && s.Ports[1].Side != Right) {
		return bad("want one port on the left edge and one on the right")
	}
	for i, p := range s.Ports {
		if p.Width <= 0 {
			return bad("port %d width %d nm, want > 0", i+1, p.Width)
		}
		if p.Gap < 0 || (p.Gap > 0 && p.GroundWidth <= 0) {
			return bad("port %d gap %d nm and side-ground width %d nm: want no gap, or both > 0", i+1, p.Gap, p.GroundWidth)
		}
	}
	for i, p := range s.Copper {
		if len(p) < 3 {
			return bad("copper polygon %d has %d vertices", i, len(p))
		}
	}
	for i, v := range s.Vias {
		if v.Diameter <= 0 {
			return bad("via %d diameter %d nm, want > 0", i, v.Diameter)
		}
	}
	return nil
}

// RectPolygon returns the rectangle [x0,x1]×[y0,y1] (nm) as a polygon.
func RectPolygon(x0, y0, x1, y1 int64) Polygon {
	return Polygon{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}}
}

// contains reports whether (x, y) (m) lies inside p by the even-odd rule.
func (p Polygon) contains(x, y float64) bool {
	in := false
	n := len(p)
	for i, j := 0, n-1; i < n; j, i = i, i+1 {
		xi, yi := float64(p[i].X)*1e-9, float64(p[i].Y)*1e-9
		xj, yj := float64(p[j].X)*1e-9, float64(p[j].Y)*1e-9
		if (yi > y) != (yj > y) && x < (xj-xi)*(y-yi)/(yj-yi)+xi {
			in = !in
		}
	}
	return in
}

// inCopper reports whether (x, y) (m) lies in any copper polygon.
func (s Structure) inCopper(x, y float64) bool {
	for _, p := range s.Copper {
		if p.contains(x, y) {
			return true
		}
	}
	return false
}
