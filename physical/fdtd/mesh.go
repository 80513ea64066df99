package fdtd

import (
	"math"
	"sort"
)

// MeshLevel names a mesh density.
type MeshLevel int

// Mesh densities. Coarse is for quick checks and tests, Normal for
// verification, Fine for convergence studies.
const (
	Coarse MeshLevel = iota
	Normal
	Fine
)

// String returns the level's name as the command line spells it.
func (m MeshLevel) String() string {
	switch m {
	case Coarse:
		return "coarse"
	case Normal:
		return "normal"
	case Fine:
		return "fine"
	}
	return "unknown"
}

// MeshParams are the numbers a mesh level stands for.
type MeshParams struct {
	SubstrateCells int     // cells across the substrate height
	PerWavelength  float64 // largest cell is λ/PerWavelength at the highest sweep frequency, in the medium
	EdgeDivisions  float64 // the edge cell is at most the narrowest strip width or coplanar gap / EdgeDivisions
	Grading        float64 // largest ratio of neighbouring cells
	PMLCells       int     // cells in each absorbing layer
	// ViaDivisions, when positive, puts grid lines at the via centre and
	// at i/ViaDivisions of the radius on each side (i = 1 … ViaDivisions)
	// in x and y, so that the column is every node within the radius on a
	// locally uniform grid (1: lines through the centre and the rim). 0,
	// the mesh levels' setting, draws the column as the nodes within its
	// radius on the grid the rest of the board gives (often the centre node
	// alone), with the thin-wire correction to the drill's radius unless
	// NodeVias. See the via column study in DEVELOPERS.md.
	ViaDivisions int
	// PortLinesOnBoardGrid calibrates each port line on the board's own y
	// grid lines (moved to the line's centre) instead of the line's own,
	// so that the calibrated line is the board's port line cell for cell:
	// lines that other features (a via column's divisions above all) put
	// through the port strip's cross-section change its Z0 and εeff.
	PortLinesOnBoardGrid bool
	// NodeVias draws every via on the board's grid as its grid nodes
	// alone, without the thin-wire correction that gives the column the
	// drill's radius (thinwire.go): a post of the nodes' own effective
	// radius (0.1985 of the cell for one node). For comparisons with the
	// drawing before the thin-wire model; the mesh levels leave it off.
	NodeVias bool
	// ThinCopper draws the copper's thickness (Structure.CopperThickness)
	// even where it is thinner than the substrate's z cell, on any board
	// (a grounded-coplanar board's is drawn anyway: NewGrid): a z cell of
	// the copper's own thickness, which shortens the time step (35 µm on
	// 64 µm substrate cells: 0.70× the step). The mesh levels leave it off.
	ThinCopper bool
}

// Params returns the level's mesh numbers.
func (m MeshLevel) Params() MeshParams {
	switch m {
	case Fine:
		return MeshParams{SubstrateCells: 6, PerWavelength: 30, EdgeDivisions: 6, Grading: 1.3, PMLCells: 10}
	case Normal:
		return MeshParams{SubstrateCells: 4, PerWavelength: 20, EdgeDivisions: 4, Grading: 1.3, PMLCells: 8}
	}
	return MeshParams{SubstrateCells: 3, PerWavelength: 15, EdgeDivisions: 3, Grading: 1.3, PMLCells: 8}
}

// Refined returns p with every cell count multiplied by factor (cells
// divided by it), the grading and absorbing layers kept.
func (p MeshParams) Refined(factor float64) MeshParams {
	p.SubstrateCells = int(math.Round(float64(p.SubstrateCells) * factor))
	p.PerWavelength *= factor
	p.EdgeDivisions *= factor
	return p
}

// mergeLines sorts xs and replaces every cluster of lines closer than tol
// by their mean.
func mergeLines(xs []float64, tol float64) []float64 {
	sort.Float64s(xs)
	var out []float64
	for i := 0; i < len(xs); {
		j, sum := i, 0.0
		for j < len(xs) && xs[j]-xs[i] < tol {
			sum += xs[j]
			j++
		}
		out = append(out, sum/float64(j-i))
		i = j
	}
	return out
}

// gradedLines returns mesh lines that include every fixed line (after
// merging those closer than minCell/2), spaced at most dmax, with
// neighbouring cells differing by at most ratio wherever the fixed lines
// leave room for it.
func gradedLines(fixed []float64, minCell, dmax, ratio float64) []float64 {
	f := mergeLines(append([]float64(nil), fixed...), minCell/2)
	if len(f) < 2 {
		return f
	}
	// Natural cell size at each fixed line: its smaller neighbouring gap.
	scale := make([]float64, len(f))
	for i := range f {
		s := dmax
		if i > 0 {
			s = math.Min(s, f[i]-f[i-1])
		}
		if i+1 < len(f) {
			s = math.Min(s, f[i+1]-f[i])
		}
		scale[i] = s
	}
	out := []float64{f[0]}
	for i := 0; i+1 < len(f); i++ {
		// A gap no wider than the edge cell is left whole even where its
		// neighbours are smaller than the ratio allows: it is the cell
		// across a copper edge (the one-third/two-thirds pair), and a line
		// inside it would put the edge in a cell whose middle lies in the
		// copper, so that the copper reaches that line. Between the close
		// edges of a 0.25 mm coplanar gap (edge cell h/4 on 0.51 mm) that
		// narrowed the gap on the mesh and raised the line's εeff by 19 %.
		if f[i+1]-f[i] <= minCell*(1+1e-9) {
			out = append(out, f[i+1])
			continue
		}
		out = append(out, fillGap(f[i], f[i+1], scale[i], scale[i+1], dmax, ratio)...)
		out = append(out, f[i+1])
	}
	return out
}

// fillGap returns the lines strictly inside (a, b) so that cells grow by
// at most ratio from sa at a and sb at b up to dmax. For n = 1, 2, … it
// takes the largest sizes the ratio allows at each position counted from
// both ends, c_i = min(sa·r^(i+1), sb·r^(n−i), dmax), until they cover the
// gap, then shrinks them all by one factor to fit: a uniform shrink keeps
// every ratio inside the gap, and the first n that covers it shrinks
// little, so the steps to the cells outside stay near the ratio too.
func fillGap(a, b, sa, sb, dmax, ratio float64) []float64 {
	g := b - a
	for n := 1; ; n++ {
		sizes := make([]float64, n)
		total := 0.0
		for i := range sizes {
			c := math.Min(sa*math.Pow(ratio, float64(i+1)), sb*math.Pow(ratio, float64(n-i)))
			sizes[i] = math.Min(c, dmax)
			total += sizes[i]
		}
		if total >= g*(1-1e-12) {
			k := g / total
			out := make([]float64, 0, n-1)
			x := a
			for i := 0; i < n-1; i++ {
				x += sizes[i] * k
				out = append(out, x)
			}
			return out
		}
	}
}

// withPML returns lines with n cells added beyond each end, each the size of
// the end cell there; low and high say which ends get them.
func withPML(lines []float64, n int, low, high bool) []float64 {
	out := lines
	if low {
		d := lines[1] - lines[0]
		pre := make([]float64, n)
		for i := range pre {
			pre[i] = lines[0] - float64(n-i)*d
		}
		out = append(pre, out...)
	}
	if high {
		m := len(out)
		d := out[m-1] - out[m-2]
		for i := 1; i <= n; i++ {
			out = append(out, out[m-1]+float64(i)*d)
		}
	}
	return out
}

// nearest returns the index of the line closest to x.
func nearest(lines []float64, x float64) int {
	i := sort.SearchFloat64s(lines, x)
	if i == len(lines) {
		return i - 1
	}
	if i > 0 && x-lines[i-1] < lines[i]-x {
		return i - 1
	}
	return i
}

// edgeLines appends, for every axis-parallel edge of the copper, the two
// lines of the one-third/two-thirds rule: d/3 inside the copper and 2d/3
// outside. axis 0 collects x lines (edges parallel to y), axis 1 y lines.
// It also returns the narrowest copper width it saw across such edges.
func edgeLines(s Structure, axis int, d float64) (lines []float64, narrowest float64) {
	narrowest = math.Inf(1)
	type edge struct {
		at, lo, hi float64
		in         int // +1 when the copper lies toward +axis
	}
	for _, p := range s.Copper {
		var edges []edge
		n := len(p)
		for i := 0; i < n; i++ {
			a, b := p[i], p[(i+1)%n]
			var at, lo, hi, px, py float64
			if axis == 0 && a.X == b.X && a.Y != b.Y {
				at = float64(a.X) * 1e-9
				lo, hi = float64(min(a.Y, b.Y))*1e-9, float64(max(a.Y, b.Y))*1e-9
				px, py = at, (lo+hi)/2
			} else if axis == 1 && a.Y == b.Y && a.X != b.X {
				at = float64(a.Y) * 1e-9
				lo, hi = float64(min(a.X, b.X))*1e-9, float64(max(a.X, b.X))*1e-9
				px, py = (lo+hi)/2, at
			} else {
				continue
			}
			eps := 1e-9
			var plus, minus bool
			if axis == 0 {
				plus, minus = s.inCopper(px+eps, py), s.inCopper(px-eps, py)
			} else {
				plus, minus = s.inCopper(px, py+eps), s.inCopper(px, py-eps)
			}
			if plus == minus {
				continue // inside merged copper or a sliver
			}
			e := edge{at: at, lo: lo, hi: hi, in: -1}
			if plus {
				e.in = 1
			}
			edges = append(edges, e)
			lines = append(lines, at+float64(e.in)*d/3, at-float64(e.in)*2*d/3)
		}
		// Width across each edge pair facing each other with overlapping spans.
		for _, e := range edges {
			if e.in != 1 {
				continue
			}
			for _, f := range edges {
				if f.in == -1 && f.at > e.at && f.lo < e.hi && f.hi > e.lo {
					narrowest = math.Min(narrowest, f.at-e.at)
				}
			}
		}
	}
	return lines, narrowest
}
