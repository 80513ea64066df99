package fdtd

import (
	"math"
	"math/cmplx"
	"slices"
	"sort"
)

// The conformal solder mask: over copper drawn with its thickness, a real
// mask follows the copper. It lies on the substrate beside the copper
// (H … H+m), on the copper's top face (H+t … H+t+m) and on its walls, a
// band m wide beside each copper edge from H to H+t+m (with the square
// corner the 2-D field solver draws too). zMaterials gives each z index
// the layering far from copper (the mask on the substrate, air above);
// conformalFixes lists the E components near or over the copper whose
// own average differs from it, and the kernel corrects them after each
// E update (see fixList).
//
// The average is the one zMaterials uses (A. Farjadpour et al., Optics
// Letters 31(20), 2006, from memory), taken over the component's cell in
// three dimensions: along the component the layers it crosses are in
// series (harmonic mean), across it in parallel (weighted arithmetic
// mean), so a cell cut by one plane gets the arithmetic mean for a
// component parallel to the plane and the harmonic mean for the normal
// one, as in zMaterials; a cell the mask's top face and the wall band
// both cut gets the series average along each line of the component's
// direction, then the parallel average of those lines. The copper's own
// volume is left out of the average (its field is zero). z is taken
// exactly (the layers' faces are breakpoints); x and y are sampled at
// conformalSamples points per cell side where a copper edge lies within
// m of the cell.

// conformalSamples is the number of sample points per cell side across x
// and y in a cell near a copper edge (midpoint rule): a boundary's
// position is then within 1/64 of the cell, about 1 µm on the meshes of
// a thin board, against a wall band of 15–40 µm.
const conformalSamples = 32

// column kinds of the top face: far from copper (the z layering), within
// the wall band, in copper.
const (
	colFar = iota
	colNear
	colCopper
)

// fix is one E component whose update coefficients differ from its z
// layer's: after the layer's update E_new = ca0·E_old + cb0·(curl + ψ),
// the component is set to ca·E_old + cbr·(E_new − ca0·E_old), cbr = cb/cb0,
// which is its own update with the same curl and CPML terms.
type fix struct {
	cell         int32
	ca, cbr, ca0 float32
	old          float32
}

// fixList is one field component's fixes, sorted by cell.
type fixList []fix

// span returns the fixes whose cells lie in [lo, hi).
func (l fixList) span(lo, hi int32) fixList {
	a := sort.Search(len(l), func(n int) bool { return l[n].cell >= lo })
	b := sort.Search(len(l), func(n int) bool { return l[n].cell >= hi })
	return l[a:b]
}

// save keeps the values before the update.
func (l fixList) save(f []float32) {
	for n := range l {
		l[n].old = f[l[n].cell]
	}
}

// apply turns the layer's update into each component's own.
func (l fixList) apply(f []float32) {
	for n := range l {
		x := &l[n]
		e0 := x.old
		f[x.cell] = x.ca*e0 + x.cbr*(f[x.cell]-x.ca0*e0)
	}
}

// edgeSeg is one polygon edge, m.
type edgeSeg struct{ x0, y0, x1, y1 float64 }

// copperTop classifies points of the top face for the conformal mask.
type copperTop struct {
	polys [][]edgeSeg
	boxes [][4]float64 // each polygon's bounding box: x0, y0, x1, y1
	edges []edgeSeg
}

// newCopperTop returns the copper of s as edges, by polygon and all
// together.
func newCopperTop(s Structure) *copperTop {
	c := &copperTop{}
	for _, p := range s.Copper {
		var es []edgeSeg
		b := [4]float64{math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)}
		for i := range p {
			a, q := p[i], p[(i+1)%len(p)]
			e := edgeSeg{float64(a.X) * 1e-9, float64(a.Y) * 1e-9, float64(q.X) * 1e-9, float64(q.Y) * 1e-9}
			es = append(es, e)
			b = [4]float64{math.Min(b[0], e.x0), math.Min(b[1], e.y0), math.Max(b[2], e.x0), math.Max(b[3], e.y0)}
		}
		c.polys = append(c.polys, es)
		c.boxes = append(c.boxes, b)
		c.edges = append(c.edges, es...)
	}
	return c
}

// rowCopper sets in[n] to whether (xs[n], y) lies in copper, by the
// even-odd rule of Polygon.contains on each polygon; xs need not be
// sorted.
func (c *copperTop) rowCopper(y float64, xs []float64, in []bool) {
	for n := range in {
		in[n] = false
	}
	var cross []float64
	for pi, es := range c.polys {
		b := c.boxes[pi]
		if y < b[1] || y > b[3] {
			continue
		}
		cross = cross[:0]
		for _, e := range es {
			if (e.y0 > y) != (e.y1 > y) {
				cross = append(cross, (e.x1-e.x0)*(y-e.y0)/(e.y1-e.y0)+e.x0)
			}
		}
		slices.Sort(cross)
		for n, x := range xs {
			// contains counts the crossings with x < xc.
			k := sort.Search(len(cross), func(i int) bool { return cross[i] > x })
			if (len(cross)-k)%2 == 1 {
				in[n] = true
			}
		}
	}
}

// nearEdge reports whether any of the edges es meets the square of half
// side m round (x, y).
func nearEdge(es []edgeSeg, x, y, m float64) bool {
	for _, e := range es {
		if segHitsRect(e, x-m, y-m, x+m, y+m) {
			return true
		}
	}
	return false
}

// segHitsRect reports whether segment e meets the closed rectangle
// [x0, x1]×[y0, y1] (Liang-Barsky clipping).
func segHitsRect(e edgeSeg, x0, y0, x1, y1 float64) bool {
	t0, t1 := 0.0, 1.0
	dx, dy := e.x1-e.x0, e.y1-e.y0
	for _, c := range [4][2]float64{{-dx, e.x0 - x0}, {dx, x1 - e.x0}, {-dy, e.y0 - y0}, {dy, y1 - e.y0}} {
		p, q := c[0], c[1]
		if p == 0 {
			if q < 0 {
				return false
			}
			continue
		}
		r := q / p
		if p < 0 {
			t0 = math.Max(t0, r)
		} else {
			t1 = math.Min(t1, r)
		}
		if t0 > t1 {
			return false
		}
	}
	return true
}

// dualSpan returns the dual cell of line i of lines.
func dualSpan(lines []float64, i int) (lo, hi float64) {
	lo, hi = lines[i], lines[i]
	if i > 0 {
		lo = (lines[i-1] + lines[i]) / 2
	}
	if i+1 < len(lines) {
		hi = (lines[i] + lines[i+1]) / 2
	}
	return lo, hi
}

// conformalLayers holds what the column kinds' layering is made of: the
// plane's height h, the copper's thickness t and the mask's m (m), and
// the complex relative permittivities ε − jσ/(ω0·ε0) of the substrate and
// the mask at F0.
type conformalLayers struct {
	h, t, m  float64
	sub, msk complex128
}

// at returns the permittivity at height z in a column of kind kind, and
// false inside copper.
func (l *conformalLayers) at(kind int, z float64) (complex128, bool) {
	switch {
	case z < l.h:
		return l.sub, true
	case kind == colCopper && z < l.h+l.t:
		return 0, false
	case kind == colFar && z < l.h+l.m, kind != colFar && z < l.h+l.t+l.m:
		return l.msk, true
	}
	return 1, true
}

// pieces returns the z pieces of [lo, hi] cut at the layers' faces.
func (l *conformalLayers) pieces(lo, hi float64) (mid, length []float64) {
	cuts := []float64{lo}
	for _, z := range []float64{l.h, l.h + l.m, l.h + l.t, l.h + l.t + l.m} {
		if z > lo && z < hi {
			cuts = append(cuts, z)
		}
	}
	cuts = append(cuts, hi)
	slices.Sort(cuts)
	for i := 1; i < len(cuts); i++ {
		if d := cuts[i] - cuts[i-1]; d > 0 {
			mid = append(mid, (cuts[i]+cuts[i-1])/2)
			length = append(length, d)
		}
	}
	return mid, length
}

// average returns the averaged permittivity of a cell whose columns are
// kinds[a][b] (a the sample index along the component when axis < 2,
// b across it; for axis 2, Ez, every sample a column of its own) over the
// z span [lo, hi], and false when the cell is all copper.
func (l *conformalLayers) average(kinds [][]int, axis int, lo, hi float64) (complex128, bool) {
	mid, length := l.pieces(lo, hi)
	var sum complex128
	var wsum float64
	if axis == 2 {
		for _, row := range kinds {
			for _, k := range row {
				var inv complex128
				var ln float64
				for p := range mid {
					e, ok := l.at(k, mid[p])
					if ok {
						inv += complex(length[p], 0) / e
						ln += length[p]
					}
				}
				if ln > 0 {
					sum += complex(ln, 0) * complex(ln, 0) / inv
					wsum += ln
				}
			}
		}
	} else {
		na := len(kinds)
		for b := range kinds[0] {
			for p := range mid {
				var inv complex128
				n := 0
				for a := 0; a < na; a++ {
					e, ok := l.at(kinds[a][b], mid[p])
					if ok {
						inv += 1 / e
						n++
					}
				}
				if n > 0 {
					w := length[p] * float64(n) / float64(na)
					sum += complex(w*float64(n), 0) / inv
					wsum += w
				}
			}
		}
	}
	if wsum == 0 {
		return 0, false
	}
	return sum / complex(wsum, 0), true
}

// conformalFixes returns the fixes of Ex, Ey and Ez for a mask that
// follows copper drawn with its thickness (g.KT > g.KH and a mask), given
// the z layers' coefficients, and nil lists otherwise. pec holds the
// components forced to zero (they need no fix). coef turns εr and σ into
// the update coefficients.
func conformalFixes(g *Grid, s Structure, caT, cbT, caZ, cbZ []float32, pec [3][]int32, coef func(er, sg float64) (float32, float32)) (out [3]fixList) {
	if g.KT == g.KH || s.Mask.Thickness == 0 {
		return out
	}
	nx, ny, nz := len(g.X), len(g.Y), len(g.Z)
	h, t, m := g.Z[g.KH], g.Z[g.KT]-g.Z[g.KH], s.Mask.Thickness
	w := 2 * math.Pi * s.F0
	perm := func(er, tand float64) complex128 {
		if tand == 0 || w == 0 {
			return complex(er, 0)
		}
		return complex(er, -er*tand)
	}
	l := conformalLayers{h: h, t: t, m: m, sub: perm(s.Er, s.TanD), msk: perm(s.Mask.Er, s.Mask.TanD)}
	top := newCopperTop(g.ext)
	at := func(i, j, k int) int32 { return int32((i*ny+j)*nz + k) }
	for axis := 0; axis < 3; axis++ {
		// The component's cell across x and y, and the z indices whose
		// cell reaches below the mask's highest face.
		xspan := func(i int) (float64, float64) {
			if axis == 0 {
				return g.X[i], g.X[i+1]
			}
			return dualSpan(g.X, i)
		}
		yspan := func(j int) (float64, float64) {
			if axis == 1 {
				return g.Y[j], g.Y[j+1]
			}
			return dualSpan(g.Y, j)
		}
		zspan := func(k int) (float64, float64) {
			if axis == 2 {
				return g.Z[k], g.Z[k+1]
			}
			return dualSpan(g.Z, k)
		}
		i0, j0 := 0, 0
		if axis != 0 {
			i0 = 1
		}
		if axis != 1 {
			j0 = 1
		}
		var ks []int
		for k := g.KH; k < nz-1; k++ {
			lo, _ := zspan(k)
			if lo >= h+t+m {
				break
			}
			ks = append(ks, k)
		}
		// Edges near each cell: by cell row j, the edges whose box, grown by
		// the band, meets the row.
		near := make([][]edgeSeg, ny)
		for j := j0; j < ny-1; j++ {
			ylo, yhi := yspan(j)
			for _, e := range top.edges {
				if math.Max(e.y0, e.y1) >= ylo-m && math.Min(e.y0, e.y1) <= yhi+m {
					near[j] = append(near[j], e)
				}
			}
		}
		centres := make([]float64, nx)
		inC := make([]bool, nx)
		xs := make([]float64, conformalSamples)
		ys := make([]float64, conformalSamples)
		row := make([]bool, conformalSamples)
		kinds := make([][]int, conformalSamples)
		for a := range kinds {
			kinds[a] = make([]int, conformalSamples)
		}
		one := [][]int{{colCopper}}
		for j := j0; j < ny-1; j++ {
			ylo, yhi := yspan(j)
			for i := i0; i < nx-1; i++ {
				xlo, xhi := xspan(i)
				centres[i] = (xlo + xhi) / 2
			}
			top.rowCopper((ylo+yhi)/2, centres, inC)
			for i := i0; i < nx-1; i++ {
				xlo, xhi := xspan(i)
				var local []edgeSeg
				for _, e := range near[j] {
					if math.Max(e.x0, e.x1) >= xlo-m && math.Min(e.x0, e.x1) <= xhi+m &&
						segHitsRect(e, xlo-m, ylo-m, xhi+m, yhi+m) {
						local = append(local, e)
					}
				}
				var cell [][]int
				switch {
				case len(local) > 0:
					// Sample the cell: kinds[a][b], a along the component.
					for n := range xs {
						xs[n] = xlo + (float64(n)+0.5)*(xhi-xlo)/conformalSamples
						ys[n] = ylo + (float64(n)+0.5)*(yhi-ylo)/conformalSamples
					}
					anyOff := false
					for q, y := range ys {
						top.rowCopper(y, xs, row)
						for p, x := range xs {
							k := colFar
							if row[p] {
								k = colCopper
							} else if nearEdge(local, x, y, m) {
								k = colNear
							}
							anyOff = anyOff || k != colFar
							if axis == 1 {
								kinds[q][p] = k
							} else {
								kinds[p][q] = k
							}
						}
					}
					if !anyOff {
						continue
					}
					cell = kinds
				case inC[i]:
					cell = one
				default:
					continue
				}
				for _, k := range ks {
					c := at(i, j, k)
					if _, found := slices.BinarySearch(pec[axis], c); found {
						continue
					}
					zlo, zhi := zspan(k)
					e, ok := l.average(cell, axis, zlo, zhi)
					if !ok || cmplx.IsNaN(e) {
						continue
					}
					sg := 0.0
					if w > 0 {
						sg = -imag(e) * w * eps0
					}
					ca, cb := coef(real(e), sg)
					ca0, cb0 := caT[k], cbT[k]
					if axis == 2 {
						ca0, cb0 = caZ[k], cbZ[k]
					}
					if ca == ca0 && cb == cb0 {
						continue
					}
					out[axis] = append(out[axis], fix{cell: c, ca: ca, cbr: cb / cb0, ca0: ca0})
				}
			}
		}
		slices.SortFunc(out[axis], func(a, b fix) int { return int(a.cell) - int(b.cell) })
	}
	return out
}
