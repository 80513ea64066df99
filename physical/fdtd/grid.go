package fdtd

import (
	"fmt"
	"math"
)

const (
	c0   = 299792458.0
	mu0  = 4e-7 * math.Pi
	eps0 = 1 / (mu0 * c0 * c0)
	eta0 = mu0 * c0
)

// portPlan holds the x positions (m) of one port's source and probes.
type portPlan struct {
	side      Side
	edge      float64 // board edge, the reference plane
	yc, w     float64 // strip centre and width
	front     float64 // inner line of the front probe pair (toward the board)
	source    float64
	back      float64 // inner line of the back probe pair
	pairPitch float64 // spacing of each probe pair's two lines
}

// Grid is the rectilinear mesh: the lines in x, y and z (m), the index of
// the copper plane, and the port plans.
type Grid struct {
	X, Y, Z  []float64
	KH       int // index of z = h
	KT       int // index of the copper's top face z = h + t; KH when the copper is drawn as a sheet
	NPML     int
	ports    [2]portPlan
	EdgeCell float64    // the edge cell size used for the 1/3–2/3 rule, m
	ext      Structure  // the structure with the port lines drawn out into the absorbing layers
	walls    []wall     // ground walls: the structure's own and those of coplanar port lines
	wires    []wireLink // the thin-wire links of the vias drawn on the board's grid
	viaCols  [][][2]int // the grid nodes (i, j) each via of ext is drawn with; nil: those within its radius
	notes    []string   // what the solve should warn about the drawing (vias too wide for the thin-wire model)
}

// Cells returns the number of Yee cells.
func (g *Grid) Cells() int { return len(g.X) * len(g.Y) * len(g.Z) }

// minSpacing returns the smallest gap between neighbouring lines.
func minSpacing(l []float64) float64 {
	m := math.Inf(1)
	for i := 1; i < len(l); i++ {
		m = math.Min(m, l[i]-l[i-1])
	}
	return m
}

// MaxGrading returns the largest ratio of neighbouring cell sizes along
// any axis.
func (g *Grid) MaxGrading() float64 {
	r := 1.0
	for _, l := range [][]float64{g.X, g.Y, g.Z} {
		for i := 2; i < len(l); i++ {
			a, b := l[i-1]-l[i-2], l[i]-l[i-1]
			r = math.Max(r, math.Max(a/b, b/a))
		}
	}
	return r
}

// NewGrid builds the mesh for s at the given density.
func NewGrid(s Structure, p MeshParams) (*Grid, error) { return newGrid(s, p, 0, nil) }

// newGrid is NewGrid with the edge cell forced to edge when edge > 0, so
// that a port line's calibration meshes its strip as the board's grid does,
// and with the y lines ys (absorbing layers included) when ys is not nil.
func newGrid(s Structure, p MeshParams, edge float64, ys []float64) (*Grid, error) {
	if err := s.Validate(); err != nil {
		return nil, err
	}
	if p.SubstrateCells < 1 || !(p.PerWavelength >= 4) || !(p.EdgeDivisions >= 1) || !(p.Grading > 1) || p.PMLCells < 4 {
		return nil, fmt.Errorf("fdtd: mesh parameters %+v out of range", p)
	}
	h := s.H
	fmax := s.Freqs[len(s.Freqs)-1]
	dmaxSub := c0 / (fmax * math.Sqrt(s.Er)) / p.PerWavelength
	dmaxAir := c0 / fmax / p.PerWavelength
	_, narrow := edgeLines(s, 1, 0)
	_, nx := edgeLines(s, 0, 0)
	narrow = math.Min(narrow, nx)
	wport := math.Inf(1)
	for _, pt := range s.Ports {
		wport = math.Min(wport, float64(pt.Width)*1e-9)
		// A coplanar gap is meshed like a strip of its width: the field
		// crowds into it, and with the gap in two or three cells a
		// grounded-coplanar line came out high in εeff against the field
		// solver (TestThinCopperOnCoplanarLine, TestRecordedCoplanarLines).
		if pt.Gap > 0 {
			narrow = math.Min(narrow, float64(pt.Gap)*1e-9)
		}
	}
	narrow = math.Min(narrow, wport)
	d := math.Min(h/float64(p.SubstrateCells), narrow/p.EdgeDivisions)
	d = math.Min(d, dmaxSub)
	if edge > 0 {
		d = edge
	}

	// Port plans and the copper that carries each port line out of the board.
	g := &Grid{NPML: p.PMLCells, EdgeCell: d}
	ext := s
	ext.Copper = append([]Polygon(nil), s.Copper...)
	var xfix []float64
	var yfix []float64
	xlo, xhi := float64(s.BoardMinX)*1e-9, float64(s.BoardMaxX)*1e-9
	for i, pt := range s.Ports {
		w := float64(pt.Width) * 1e-9
		hw := math.Max(h, w)
		pp := portPlan{side: pt.Side, yc: float64(pt.Y) * 1e-9, w: w}
		pitch := math.Min(dmaxSub, hw/2)
		pp.pairPitch = pitch
		out := float64(pt.Side) // outward direction in x
		pp.edge = xlo
		if pt.Side == Right {
			pp.edge = xhi
		}
		pp.front = pp.edge + out*2*hw
		pp.source = pp.front + out*(pitch+2*hw)
		pp.back = pp.source + out*2*hw
		end := pp.back + out*3*pitch // where the absorbing layer starts
		xfix = append(xfix, pp.front, pp.front+out*pitch, pp.source, pp.back, pp.back+out*pitch, end)
		yfix = append(yfix, pp.yc)
		g.ports[i] = pp
		// The port line: from the edge to far beyond the domain end.
		far := end + out*1.0
		x0, x1 := math.Min(pp.edge, far), math.Max(pp.edge, far)
		ext.Copper = append(ext.Copper, RectPolygon(int64(math.Round(x0*1e9)), pt.Y-pt.Width/2,
			int64(math.Round(x1*1e9)), pt.Y-pt.Width/2+pt.Width))
		if pt.Gap > 0 {
			lo, hi, wy := pt.sideGrounds()
			for k := range lo {
				ext.Copper = append(ext.Copper, RectPolygon(int64(math.Round(x0*1e9)), int64(math.Round(lo[k]*1e9)),
					int64(math.Round(x1*1e9)), int64(math.Round(hi[k]*1e9))))
				g.walls = append(g.walls, wall{y: wy[k], x0: x0, x1: x1})
				yfix = append(yfix, wy[k])
			}
		}
	}
	for _, w := range s.walls {
		g.walls = append(g.walls, w)
		yfix = append(yfix, w.y)
	}
	ex, _ := edgeLines(ext, 0, d)
	ey, _ := edgeLines(ext, 1, d)
	// Only the x edges inside the domain matter (the port lines' far ends are
	// beyond it).
	xmin, xmax := math.Inf(1), math.Inf(-1)
	for _, x := range xfix {
		xmin, xmax = math.Min(xmin, x), math.Max(xmax, x)
	}
	for _, x := range ex {
		if x > xmin && x < xmax {
			xfix = append(xfix, x)
		}
	}
	yfix = append(yfix, ey...)
	minCell := d // lines closer than half of it merge
	for _, v := range s.Vias {
		cx, cy := float64(v.Center.X)*1e-9, float64(v.Center.Y)*1e-9
		xfix = append(xfix, cx)
		yfix = append(yfix, cy)
		k := p.ViaDivisions
		if v.Stitch {
			k = 0
		}
		r := float64(v.Diameter) * 1e-9 / 2
		if k > 0 {
			minCell = math.Min(minCell, r/float64(k))
		}
		for i := 1; i <= k; i++ {
			d := r * float64(i) / float64(k)
			xfix = append(xfix, cx-d, cx+d)
			yfix = append(yfix, cy-d, cy+d)
		}
	}
	ymin, ymax := math.Inf(1), math.Inf(-1)
	for _, pl := range s.Copper {
		for _, q := range pl {
			ymin, ymax = math.Min(ymin, float64(q.Y)*1e-9), math.Max(ymax, float64(q.Y)*1e-9)
		}
	}
	margin := math.Max(5*h, 2*wport)
	yfix = append(yfix, ymin-margin, ymax+margin)

	dmaxX := dmaxSub
	gx, gy := gradedLines(xfix, minCell, dmaxX, p.Grading), gradedLines(yfix, minCell, dmaxX, p.Grading)
	if minCell < d {
		// Finer via divisions make the grading fill the cell that straddles
		// a copper edge, which moves the edge off its one-third point and
		// changes the line (a 1.2 mm strip's εeff moved by 14 % at one
		// division of a 0.6 mm drill): keep those cells whole.
		gx, gy = keepEdgeCells(gx, ex, xfix, minCell), keepEdgeCells(gy, ey, yfix, minCell)
	}
	g.X = withPML(gx, p.PMLCells, true, true)
	g.Y = withPML(gy, p.PMLCells, true, true)
	if ys != nil {
		g.Y = ys
	}

	// z: uniform substrate cells no taller than half the edge cell, then
	// graded air up to the absorbing layer. The line's Z0 depends on how
	// finely z is cut at the copper plane far more than on the edge cell
	// across the strip: with z cells as tall as the edge cell a uniform line
	// came out 2.2 % below Hammerstad-Jensen (εr 4.35, W/h 1, coarse) and
	// 0.7 % above with z cells half as tall at the same edge cell (the study
	// is in DEVELOPERS.md). The half-height cells cost a √2 shorter time
	// step and a few more z cells.
	nsub := max(p.SubstrateCells, int(math.Ceil(2*h/d-1e-9)))
	dz := h / float64(nsub)
	z := []float64{0}
	for i := 1; i <= nsub; i++ {
		z = append(z, float64(i)*h/float64(nsub))
	}
	g.KH, g.KT = nsub, nsub
	top := h + math.Max(6*h, 3*wport)
	first := dz
	// Copper no thinner than the substrate's z cell gets its own cell,
	// from h to h + t, and the air grading starts from it: the smallest
	// z spacing, and with it the time step, stays that of the sheet.
	// Thinner copper would shorten the step in proportion and stays a
	// sheet at h, except on a grounded-coplanar board (coplanar ports),
	// where the copper's walls face each other across the gaps and the
	// thickness matters most: gcpw-probe's zero-thickness line is 4.3 %
	// high in εeff against the field solver with its 35 µm, the copper
	// drawn 1.3 % (coarse; TestThinCopperOnCoplanarLine), its 35 µm cell
	// under the coarse mesh's 39 µm substrate cells (the normal mesh's
	// 30 µm cells, set by the gap, are thinner). MeshParams.ThinCopper
	// draws it on any board. A solder mask over thick copper follows it (on
	// the substrate, over the top face and down the walls: conformalFixes).
	coplanar := s.Ports[0].Gap > 0 || s.Ports[1].Gap > 0
	if t := s.CopperThickness; t > 0 && (t >= dz*(1-1e-9) || p.ThinCopper || coplanar) {
		z = append(z, h+t)
		g.KT = nsub + 1
		first = t
	}
	for s := first; z[len(z)-1] < top; {
		s = math.Min(s*p.Grading, dmaxAir)
		z = append(z, z[len(z)-1]+s)
	}
	g.Z = withPML(z, p.PMLCells, false, true)
	g.ext = ext
	if !p.NodeVias {
		g.wires, g.viaCols, g.notes = wireLinks(g, s.Vias, p.ViaDivisions)
	}
	return g, nil
}

// keepEdgeCells drops from lines every line that the grading put strictly
// inside an edge cell, the cell between the one-third and two-thirds lines
// of a copper edge (pairs consecutive in edges, as edgeLines returns
// them), unless a fixed line lies within minCell/2 of it.
func keepEdgeCells(lines, edges, fixed []float64, minCell float64) []float64 {
	out := lines[:0:0]
	for _, l := range lines {
		inside := false
		for i := 0; i+1 < len(edges); i += 2 {
			lo, hi := math.Min(edges[i], edges[i+1]), math.Max(edges[i], edges[i+1])
			if l > lo+minCell/2 && l < hi-minCell/2 {
				inside = true
				break
			}
		}
		if inside {
			for _, f := range fixed {
				if math.Abs(f-l) < minCell/2 {
					inside = false
					break
				}
			}
		}
		if !inside {
			out = append(out, l)
		}
	}
	return out
}
