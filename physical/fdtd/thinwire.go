package fdtd

import (
	"fmt"
	"math"
	"slices"
)

// The thin-wire via.
//
// A via drawn on the board's grid is the grid nodes within its radius
// (often the centre node alone), and a column of nodes conducts like a
// round post of its own effective radius a, not of the drill's: one node
// on a square lattice of cell Δ is a post of a = 0.1985·Δ (TestColumnRadius),
// whatever the drill. The thin-wire model of K. R. Umashankar, A. Taflove
// and B. Beker ("Calculation and experimental validation of induced
// currents on coupled wires in an arbitrary shaped cavity", IEEE Trans.
// Antennas Propagat. 35(11), 1987; from memory) gives the column the
// drill's radius r0 without small cells: near the wire the circling field
// goes as 1/ρ, so the H components on the links from the wire's Ez nodes
// to their neighbours are updated with a logarithmic difference in place
// of the linear one. Here the factor divides the link's μ (the link's H
// update is scaled as a whole, its Ex or Ey term too), which keeps the
// scheme symmetric: scaling the Ez term alone, as the recalled model does
// (its Ex term cancels between the 1/ρ of Hy and of Ex), was followed by a
// verify of sensor-antenna-sections (0.2 mm board, 25 µm z cells, 60 µm
// cells round its via) growing to |S11| = +37 dB at the normal mesh.
//
// Derived here for the non-uniform grid, in the quasi-static limit where
// the update of Ez, Hx, Hy in a plane is a resistor network (Ez·dt the
// potential, each link's H its current, the link's conductance w/d for a
// link of length d and dual width w). The column's nodes are at potential
// 0 (their Ez is zero). Solve that network around the column out to a
// circle of radius Rb held at 1 (columnLattice): the total current I out
// of the column gives its effective radius a = Rb·exp(−2π/I), since a
// continuum post of radius a carries 2π/ln(Rb/a), and each boundary link l
// (column node to free node) carries I_l = g_l·u_l. A post of radius r0
// instead of a has ln(a/r0)/(2π) more resistance in series. Put into each
// boundary link a series resistance ρ_l with ρ_l·I_l = I·c for all l,
// c = ln(a/r0)/(2π): every link then drops the same extra I·c, so the
// currents and the potentials outside are unchanged, and the total
// resistance is 1/I + c, that of the post of radius r0 — exactly, in the
// network. The link's conductance becomes α_l·g_l with
//
//	α_l = 1/(1 + ρ_l·g_l) = u_l/(u_l + I·c),
//
// which divides the link's μ in the H update. On a
// uniform grid with the centre node alone (u_l = I/4), α = 1/(1 +
// (2/π)·ln(a/r0)) = (π/2)/ln(0.955·Δ/r0): the annulus from r0 to about the
// neighbour node, over a quarter of the circle per link. The recalled
// Umashankar-Taflove-Beker form, 2/ln(Δ/r0), is the same difference taken
// across a straight cell instead of a quarter annulus; it leaves the plain
// update at r0 = 0.135·Δ where the lattice's own node is 0.1985·Δ, so it
// is not used. Setting r0 = a leaves every coefficient as it was (c = 0).
//
// Only the magnetic links of the substrate's z range are changed (the via
// runs from the plane to the copper). A column of several nodes (a drill
// wider than the cell) keeps its nodes and gets the same correction on its
// outer links. A factor above 1 would be a link of higher speed, and
// grows without bound as r0 approaches the next ring of nodes; wireLinks
// draws more nodes instead (maxWireFactor).

// maxWireFactor is the largest thin-wire factor α applied to a link: 1.
// A factor below 1 raises the link's μ (a series inductance), which can
// only slow the waves (the symmetric operator ε^−½·Cᵀ·μ⁻¹·C·ε^−½ of the
// update only decreases, so its largest eigenvalue does not grow and the
// plain grid's Courant bound holds whatever the factors); a factor above 1
// is a faster link, and no local bound was found safe: the form
// c·Δt·√(α/d² + 1/w² + 1/Δz²) ≤ 1 leaves out that the link's Δz term is
// scaled too, and a one-off Yee box in vacuum (square cells in x, y, Δz =
// Δ/2, 0.9 of the Courant step, α on the four links of a column) grew
// without bound at α = 2.2, which that form allows (up to 2.42 there),
// and stayed bounded at 1.7 (a substrate's εr widens the margin: 4 stayed
// bounded at εr 2.2). The lone via of viaCases[3] (factors 2.5–3.7) that grew back
// past its peak run on to −70 dB (37e2164) had the factor on the Ez term
// alone (8bf2300); with the link's μ divided it ran clean to −80 dB. So a
// via whose drill is wider than its drawn column's effective radius
// gets more nodes (wireLinks) until the column is at least as fat as the
// drill, and its links are then slowed to the drill's radius.
const maxWireFactor = 1.0

// wireLink is one magnetic link of a via column: the H component on the
// link (x: Hy between nodes i and i+1; y: Hx between j and j+1), the free
// node at its far end, and the thin-wire factor α of the link.
type wireLink struct {
	i, j   int // the link's H component is at node (i, j) (+ half a cell along its axis)
	fi, fj int // the free Ez node
	alongX bool
	alpha  float64
}

// viaColumn returns the grid nodes (i, j) a via is drawn with: every node
// within its radius, or the nearest one when none is.
func viaColumn(g *Grid, v Via) [][2]int {
	cx, cy := float64(v.Center.X)*1e-9, float64(v.Center.Y)*1e-9
	r := float64(v.Diameter) * 1e-9 / 2
	var out [][2]int
	ilo := nearest(g.X, cx-r)
	jlo := nearest(g.Y, cy-r)
	for i := max(ilo-1, 0); i < len(g.X) && g.X[i] <= cx+r; i++ {
		for j := max(jlo-1, 0); j < len(g.Y) && g.Y[j] <= cy+r; j++ {
			if math.Hypot(g.X[i]-cx, g.Y[j]-cy) <= r {
				out = append(out, [2]int{i, j})
			}
		}
	}
	if len(out) == 0 {
		out = append(out, [2]int{nearest(g.X, cx), nearest(g.Y, cy)})
	}
	return out
}

// wireWindow is the number of grid lines on each side of a via that
// columnLattice solves over.
const wireWindow = 14

// columnLattice solves the static plane network of a via column on the
// grid lines xs, ys (around the via centre cx, cy): the column's nodes at
// 0, a circle of radius Rb at 1 (Rb the distance from the centre to the
// nearest outermost line; links cut by the circle end on it, shortened),
// the free nodes between. It returns the effective radius a of the
// column, the total current I out of it and the potential of every node
// (index i·len(ys)+j; 0 on the column and outside the circle).
func columnLattice(xs, ys []float64, cx, cy float64, col [][2]int) (a, current float64, u []float64, ok bool) {
	nx, ny := len(xs), len(ys)
	if nx < 5 || ny < 5 {
		return 0, 0, nil, false
	}
	rb := math.Min(math.Min(cx-xs[0], xs[nx-1]-cx), math.Min(cy-ys[0], ys[ny-1]-cy))
	at := func(i, j int) int { return i*ny + j }
	const (
		free = iota
		pec
		out
	)
	kind := make([]int8, nx*ny)
	for i := range xs {
		for j := range ys {
			if math.Hypot(xs[i]-cx, ys[j]-cy) >= rb {
				kind[at(i, j)] = out
			}
		}
	}
	for _, c := range col {
		if c[0] < 0 || c[0] >= nx || c[1] < 0 || c[1] >= ny || kind[at(c[0], c[1])] == out {
			return 0, 0, nil, false
		}
		kind[at(c[0], c[1])] = pec
	}
	dual := func(l []float64, k int) float64 {
		switch {
		case k == 0:
			return (l[1] - l[0]) / 2
		case k == len(l)-1:
			return (l[k] - l[k-1]) / 2
		}
		return (l[k+1] - l[k-1]) / 2
	}
	// cut returns the fraction of the segment from p to q (q outside the
	// circle) that lies inside it.
	cut := func(px, py, qx, qy float64) float64 {
		dx, dy := qx-px, qy-py
		ex, ey := px-cx, py-cy
		A := dx*dx + dy*dy
		B := 2 * (ex*dx + ey*dy)
		C := ex*ex + ey*ey - rb*rb
		t := (-B + math.Sqrt(B*B-4*A*C)) / (2 * A)
		return math.Max(t, 1e-3)
	}
	// Each free node's links: neighbour index, conductance, and whether
	// the neighbour is held (to 0 on the column, to 1 on the circle).
	type link struct {
		n    int
		g    float64
		held int8
	}
	links := make([][]link, nx*ny)
	diag := make([]float64, nx*ny)
	rhs := make([]float64, nx*ny)
	for i := 1; i < nx-1; i++ {
		for j := 1; j < ny-1; j++ {
			p := at(i, j)
			if kind[p] != free {
				continue
			}
			for _, q := range [][2]int{{i + 1, j}, {i - 1, j}, {i, j + 1}, {i, j - 1}} {
				n := at(q[0], q[1])
				var g float64
				if q[0] != i {
					g = dual(ys, j) / math.Abs(xs[q[0]]-xs[i])
				} else {
					g = dual(xs, i) / math.Abs(ys[q[1]]-ys[j])
				}
				switch kind[n] {
				case out:
					g /= cut(xs[i], ys[j], xs[q[0]], ys[q[1]])
					rhs[p] += g
				case free:
					links[p] = append(links[p], link{n, g, free})
				}
				diag[p] += g
			}
		}
	}
	// Conjugate gradients, Jacobi-preconditioned, on the free nodes.
	u = make([]float64, nx*ny)
	r := append([]float64(nil), rhs...)
	z := make([]float64, nx*ny)
	p := make([]float64, nx*ny)
	ap := make([]float64, nx*ny)
	for k := range r {
		if diag[k] > 0 {
			z[k] = r[k] / diag[k]
		}
	}
	copy(p, z)
	rz := 0.0
	for k := range r {
		rz += r[k] * z[k]
	}
	r0 := rz
	for it := 0; it < 20*nx*ny && rz > 1e-28*r0; it++ {
		pap := 0.0
		for k := range p {
			if diag[k] == 0 {
				continue
			}
			v := diag[k] * p[k]
			for _, l := range links[k] {
				v -= l.g * p[l.n]
			}
			ap[k] = v
			pap += p[k] * v
		}
		al := rz / pap
		next := 0.0
		for k := range u {
			if diag[k] == 0 {
				continue
			}
			u[k] += al * p[k]
			r[k] -= al * ap[k]
			z[k] = r[k] / diag[k]
			next += r[k] * z[k]
		}
		for k := range p {
			p[k] = z[k] + next/rz*p[k]
		}
		rz = next
	}
	for _, c := range col {
		i, j := c[0], c[1]
		for _, q := range [][2]int{{i + 1, j}, {i - 1, j}, {i, j + 1}, {i, j - 1}} {
			if kind[at(q[0], q[1])] != free {
				continue
			}
			var g float64
			if q[0] != i {
				g = dual(ys, j) / math.Abs(xs[q[0]]-xs[i])
			} else {
				g = dual(xs, i) / math.Abs(ys[q[1]]-ys[j])
			}
			current += g * u[at(q[0], q[1])]
		}
	}
	if !(current > 0) {
		return 0, 0, nil, false
	}
	return rb * math.Exp(-2*math.Pi/current), current, u, true
}

// wireLinks returns the thin-wire links of every via of g drawn on the
// board's grid (ViaDivisions 0, or a stitching via), each with its factor
// for the drill's radius, the grid nodes each via is drawn with, and the
// notes to pass on as warnings.
//
// A via is drawn as the nodes within its radius, as without the model.
// When a link would then need a factor above maxWireFactor (the drawn
// column thinner than the drill), the failing links' free nodes nearest
// the via's centre are drawn too, each with the node nearest its mirror
// image through the centre, step by step, until every link fits: the
// drawn column is then at least as fat as the drill, and its links get
// factors below 1 (a series resistance, which costs no stability). The
// column grows as a disc round the drill, by distance, not by grid index:
// the grid round a via is often graded differently on its sides (fine
// toward a pad's far edge, coarse back along the stub the via ends), and
// growing whole rings mirrored by index drew sensor-antenna-by-hand's
// 0.3 mm via 0.79 mm back along its 0.246 mm stub (coarse mesh), shorting
// the stub early: best match +2.05 % from f0 (coarse), +0.62 % with the
// column a disc. So a mirror node more than maxMirrorReach times farther
// from the centre than the node it mirrors is left out (the column is
// then a little off-centre). A via that does not fit within maxWireNodes
// nodes is drawn as its nodes within the radius, uncorrected, with a
// warning.
func wireLinks(g *Grid, vias []Via, divisions int) (links []wireLink, cols [][][2]int, notes []string) {
	wide := 0
	cols = make([][][2]int, len(vias))
	for vi, v := range vias {
		cols[vi] = viaColumn(g, v)
		if divisions > 0 && !v.Stitch {
			continue
		}
		cx, cy := float64(v.Center.X)*1e-9, float64(v.Center.Y)*1e-9
		r0 := float64(v.Diameter) * 1e-9 / 2
		i0, j0 := nearest(g.X, cx), nearest(g.Y, cy)
		ia, ib := max(i0-wireWindow, 0), min(i0+wireWindow, len(g.X)-1)
		ja, jb := max(j0-wireWindow, 0), min(j0+wireWindow, len(g.Y)-1)
		col := cols[vi]
		for {
			mine, failed := columnLinks(g, col, cx, cy, r0, ia, ib, ja, jb)
			if len(failed) == 0 && mine != nil {
				links = append(links, mine...)
				cols[vi] = col
				break
			}
			if len(col) >= maxWireNodes || mine == nil {
				wide++
				break
			}
			// Draw the failing links' free nodes nearest the via's centre
			// (those within a part in a thousand of the nearest one's
			// distance), so the column grows as a disc round the drill
			// whatever the grading on each side.
			dist := func(q [2]int) float64 { return math.Hypot(g.X[q[0]]-cx, g.Y[q[1]]-cy) }
			dmin := math.Inf(1)
			for _, f := range failed {
				dmin = math.Min(dmin, dist(f))
			}
			col = append([][2]int(nil), col...)
			for _, q := range failed {
				if dist(q) > dmin*(1+1e-3) {
					continue
				}
				m := [2]int{nearest(g.X, 2*cx-g.X[q[0]]), nearest(g.Y, 2*cy-g.Y[q[1]])}
				for _, p := range [][2]int{q, m} {
					if p == m && dist(m) > maxMirrorReach*dist(q) {
						continue
					}
					if p[0] > ia && p[0] < ib && p[1] > ja && p[1] < jb && !slices.Contains(col, p) {
						col = append(col, p)
					}
				}
			}
		}
	}
	// Columns of neighbouring vias may touch (a row's pitch is about two
	// cells): a link whose free node is another via's is not a link (its
	// Ez is zero too), and a link two vias share gets one factor, the
	// larger, so that no H component is corrected twice.
	inAny := map[[2]int]bool{}
	for _, c := range cols {
		for _, q := range c {
			inAny[q] = true
		}
	}
	type hKey struct {
		i, j   int
		alongX bool
	}
	keep := map[hKey]int{}
	var merged []wireLink
	for _, l := range links {
		if inAny[[2]int{l.fi, l.fj}] {
			continue
		}
		k := hKey{l.i, l.j, l.alongX}
		if n, ok := keep[k]; ok {
			merged[n].alpha = math.Max(merged[n].alpha, l.alpha)
			continue
		}
		keep[k] = len(merged)
		merged = append(merged, l)
	}
	links = merged
	if wide > 0 {
		notes = append(notes, fmt.Sprintf("%d via(s) too wide for the thin-wire model on this mesh: drawn as the grid nodes within the drill, a thinner post than drilled", wide))
	}
	return links, cols, notes
}

// maxWireNodes is how many nodes wireLinks draws a via's column with at
// most.
const maxWireNodes = 64

// maxMirrorReach is how many times farther from a via's centre than a
// node the node drawn as its mirror may lie. Chosen here: the lone vias
// of TestThinWireVia need their mirrors at 1.25 and 1.30 times (a grid
// graded 311/388 µm and 233/302 µm on the two sides; without them the
// column is off-centre and 40 pH high against Goldfarb-Pucel), and
// sensor-antenna-by-hand's coarse grid must not take the one at 1.65
// (208 µm toward the pad's edge, 344 µm back along the stub).
const maxMirrorReach = 1.5

// columnLinks returns the thin-wire links of the column col of a via of
// radius r0 centred at (cx, cy), solved on the grid lines [ia, ib] ×
// [ja, jb], and the free nodes of the links whose factor lies outside
// (0, maxWireFactor]; nil links when the network cannot be solved there.
func columnLinks(g *Grid, col [][2]int, cx, cy, r0 float64, ia, ib, ja, jb int) (mine []wireLink, failed [][2]int) {
	local := make([][2]int, len(col))
	for k, c := range col {
		local[k] = [2]int{c[0] - ia, c[1] - ja}
	}
	a, current, u, ok := columnLattice(g.X[ia:ib+1], g.Y[ja:jb+1], cx, cy, local)
	if !ok {
		return nil, nil
	}
	c := math.Log(a/r0) / (2 * math.Pi)
	for _, cn := range col {
		i, j := cn[0], cn[1]
		for _, q := range [][2]int{{i + 1, j}, {i - 1, j}, {i, j + 1}, {i, j - 1}} {
			if q[0] < ia || q[0] > ib || q[1] < ja || q[1] > jb || slices.Contains(col, q) {
				continue
			}
			ul := u[(q[0]-ia)*(jb-ja+1)+(q[1]-ja)]
			alpha := ul / (ul + current*c)
			if !(alpha > 0) || alpha > maxWireFactor {
				failed = append(failed, q)
			}
			l := wireLink{fi: q[0], fj: q[1], alongX: q[0] != i, alpha: alpha}
			l.i, l.j = min(i, q[0]), min(j, q[1])
			mine = append(mine, l)
		}
	}
	return mine, failed
}

// wireFix is one thin-wire correction of an H component: H[h] += c·Ez[e]
// after the plain update, c = ±(Δt/μ0)·(α − 1)/d.
type wireFix struct {
	h, e int32
	c    float32
	t    int32   // the tangential E below the H component (Ex for Hy, Ey for Hx); t+1 is the one above
	ct   float32 // (α − 1)·(Δt/μ0)/Δz, signed as the plain update's z term
}

// wireFixes turns g's thin-wire links into corrections of Hx (x) and Hy
// (y), for every z row of the substrate, sorted by H index.
func (m *sim) wireFixes(g *Grid) (fx, fy []wireFix) {
	at := func(i, j, k int) int32 { return int32((i*m.ny+j)*m.nz + k) }
	for _, l := range g.wires {
		if l.alpha == 1 {
			continue
		}
		// The plain update adds ±(Δt/μ0)/d·Ez of the free node: Hy on an x
		// link gets +Ez(i+1)/dx when the free node is the far one and
		// −Ez(i)/dx when it is the near one; Hx on a y link the opposite.
		var d, sign float64
		if l.alongX {
			d = g.X[l.i+1] - g.X[l.i]
			sign = 1
			if l.fi == l.i {
				sign = -1
			}
		} else {
			d = g.Y[l.j+1] - g.Y[l.j]
			sign = -1
			if l.fj == l.j {
				sign = 1
			}
		}
		c := float32(sign * m.dt / mu0 * (l.alpha - 1) / d)
		if c == 0 {
			continue
		}
		for k := 0; k < g.KH; k++ {
			f := wireFix{h: at(l.i, l.j, k), e: at(l.fi, l.fj, k), c: c, t: at(l.i, l.j, k)}
			// The z term: Hy −= (Δt/μ0)·(Ex(k+1) − Ex(k))/Δz, Hx += (Δt/μ0)·(Ey(k+1) − Ey(k))/Δz.
			f.ct = float32(-m.dt / mu0 * (l.alpha - 1) / (g.Z[k+1] - g.Z[k]))
			if !l.alongX {
				f.ct = -f.ct
			}
			if l.alongX {
				fy = append(fy, f)
			} else {
				fx = append(fx, f)
			}
		}
	}
	less := func(a, b wireFix) int { return int(a.h) - int(b.h) }
	slices.SortFunc(fx, less)
	slices.SortFunc(fy, less)
	return fx, fy
}

// thinWire applies the thin-wire corrections in x slabs [ia, ib) after
// their H update (the lists are sorted by cell index, a slab's cells are
// contiguous, and Ez is not written during the H half step).
func (m *sim) thinWire(ia, ib int) {
	lo, hi := int32(ia*m.ny*m.nz), int32(min(ib, m.nx)*m.ny*m.nz)
	for _, c := range []struct {
		fix  []wireFix
		h, t []float32
	}{{m.wireX, m.hx, m.ey}, {m.wireY, m.hy, m.ex}} {
		a, _ := slices.BinarySearchFunc(c.fix, lo, func(f wireFix, t int32) int { return int(f.h) - int(t) })
		for _, f := range c.fix[a:] {
			if f.h >= hi {
				break
			}
			c.h[f.h] += f.c*m.ez[f.e] + f.ct*(c.t[f.t+1]-c.t[f.t])
		}
	}
}
