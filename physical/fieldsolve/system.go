package fieldsolve

import (
	"errors"
	"fmt"
)

// grid is one discretisation of the half domain: node coordinates, node
// labels and the relative permittivity of each cell.
type grid struct {
	xs, ys []float64
	label  []int8    // per node, k = j*nx + i
	eps    []float64 // per cell, c = j*(nx-1) + i, with the dielectrics
}

func (g *grid) nx() int { return len(g.xs) }
func (g *grid) ny() int { return len(g.ys) }

// newGrid discretises the layout with density parameter n.
func newGrid(l *layout, n float64) *grid {
	kx, ky, sx, sy := l.keys()
	d := coreFraction * l.lmin
	g := &grid{xs: gradedAxis(kx, sx, d, n), ys: gradedAxis(ky, sy, d, n)}
	nx, ny := g.nx(), g.ny()
	tol := 1e-9 * l.lmin
	g.label = make([]int8, nx*ny)
	for j, y := range g.ys {
		for i, x := range g.xs {
			g.label[j*nx+i] = l.node(x, y, tol)
		}
	}
	// Cells whose every boundary is a grid line are uniform and sampled at
	// the centre; cells cut by an etched wall are averaged over 4×4 points.
	sub := 1
	if l.tanE > 0 {
		sub = 4
	}
	g.eps = make([]float64, (nx-1)*(ny-1))
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			x0, x1, y0, y1 := g.xs[i], g.xs[i+1], g.ys[j], g.ys[j+1]
			s := 1
			if sub > 1 && y1 > l.yb && y0 < l.yt+l.mask {
				s = sub
			}
			var sum float64
			for b := 0; b < s; b++ {
				for a := 0; a < s; a++ {
					x := x0 + (x1-x0)*(float64(a)+0.5)/float64(s)
					y := y0 + (y1-y0)*(float64(b)+0.5)/float64(s)
					sum += l.epsAt(x, y)
				}
			}
			g.eps[j*(nx-1)+i] = sum / float64(s*s)
		}
	}
	return g
}

// system is the five-point finite-volume matrix for one permittivity map.
// Only couplings to the east (k+1) and north (k+nx) neighbours are stored;
// couplings to fixed nodes are moved to the right-hand side. The rows of
// fixed nodes are the identity, so a vector that is zero on them stays
// zero under the matrix, and the fixed potentials never reach a free row.
type system struct {
	nx, ny int
	gx, gy []float64 // edge conductances (relative permittivity × face/length)
	diag   []float64
	ce, cn []float64 // off-diagonal entries (≤ 0), zero where either end is fixed
	rhs    []float64 // right-hand side; solve turns it into the residual
	label  []int8    // the grid's node labels (free, strip, ground)
	ws     *scratch  // where the arrays come from; nil for fresh memory
}

// scratch is the working memory of one solve of C or C0: the arrays of a
// system, its factorisation and the conjugate-gradient vectors
// (systemArrays of them per node), cut from one block that is reused from
// grid to grid. The finest grid's arrays are most of a solve's memory, and
// fresh memory costs page faults and clearing, so Solve sizes the block for
// the finest grid of the usual sequence at the start. The arrays hold
// whatever the last grid left: every user writes every element it reads.
type scratch struct {
	buf  []float64
	used int
}

// systemArrays is the number of node arrays a system, its factorisation
// and its solve take: gx, gy, diag, ce, cn, rhs; inv; z, p, q.
const systemArrays = 10

// reset frees the block for a grid of the given node count, growing it if
// needed.
func (w *scratch) reset(nodes int) {
	if need := systemArrays * nodes; cap(w.buf) < need {
		w.buf = make([]float64, need)
	}
	w.used = 0
}

// take returns the next n elements of the block, or fresh zeroed memory
// when w is nil or the block is used up.
func (w *scratch) take(n int) []float64 {
	if w == nil || w.used+n > len(w.buf) {
		return make([]float64, n)
	}
	a := w.buf[w.used : w.used+n : w.used+n]
	w.used += n
	return a
}

// fixedPotential is the potential of a fixed node: 1 V on the strip, 0 on
// grounds.
func fixedPotential(label int8) float64 {
	if label == strip {
		return 1
	}
	return 0
}

// newSystem assembles the system; vacuum replaces every permittivity by 1.
// Each free row sums its four conductances in the order south, west,
// east, north (absent ones are zero), and its right-hand side the
// conductances to fixed neighbours times their potentials in that order.
func newSystem(g *grid, vacuum bool, ws *scratch) *system {
	nx, ny := g.nx(), g.ny()
	n := nx * ny
	s := &system{nx: nx, ny: ny, label: g.label, ws: ws,
		gx: ws.take(n), gy: ws.take(n), diag: ws.take(n), ce: ws.take(n), cn: ws.take(n), rhs: ws.take(n)}
	// cells returns row j of the cell permittivities, nil outside the
	// domain (where they count as 0).
	ex := nx - 1
	var ones []float64
	if vacuum {
		ones = make([]float64, ex)
		for i := range ones {
			ones[i] = 1
		}
	}
	cells := func(j int) []float64 {
		switch {
		case j < 0 || j >= ny-1:
			return nil
		case vacuum:
			return ones
		}
		return g.eps[j*ex : j*ex+ex]
	}
	for j := 0; j < ny; j++ {
		var dyl, dyu float64
		if j > 0 {
			dyl = g.ys[j] - g.ys[j-1]
		}
		if j+1 < ny {
			dyu = g.ys[j+1] - g.ys[j]
		}
		below, above := cells(j-1), cells(j)
		row := s.gx[j*nx : j*nx+nx]
		for i := 0; i < ex; i++ {
			var el, eu float64
			if below != nil {
				el = below[i]
			}
			if above != nil {
				eu = above[i]
			}
			row[i] = (el*dyl + eu*dyu) / (2 * (g.xs[i+1] - g.xs[i]))
		}
		row[ex] = 0
		if above == nil {
			clear(s.gy[j*nx : j*nx+nx])
		} else {
			row := s.gy[j*nx : j*nx+nx]
			dy := 2 * (g.ys[j+1] - g.ys[j])
			for i := range row {
				var dxl, dxr, el, er float64
				if i > 0 {
					dxl, el = g.xs[i]-g.xs[i-1], above[i-1]
				}
				if i < ex {
					dxr, er = g.xs[i+1]-g.xs[i], above[i]
				}
				row[i] = (el*dxl + er*dxr) / dy
			}
		}
	}
	lab := g.label
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			k := j*nx + i
			s.ce[k], s.cn[k] = 0, 0
			if lab[k] != free {
				s.diag[k], s.rhs[k] = 1, 0
				continue
			}
			var d, b float64
			if j > 0 {
				c := s.gy[k-nx]
				d += c
				if lab[k-nx] != free {
					b += c * fixedPotential(lab[k-nx])
				}
			}
			if i > 0 {
				c := s.gx[k-1]
				d += c
				if lab[k-1] != free {
					b += c * fixedPotential(lab[k-1])
				}
			}
			if i+1 < nx {
				c := s.gx[k]
				d += c
				if lab[k+1] != free {
					b += c * fixedPotential(lab[k+1])
				} else {
					s.ce[k] = -c
				}
			}
			if j+1 < ny {
				c := s.gy[k]
				d += c
				if lab[k+nx] != free {
					b += c * fixedPotential(lab[k+nx])
				} else {
					s.cn[k] = -c
				}
			}
			s.diag[k], s.rhs[k] = d, b
		}
	}
	return s
}

// energy returns Σ G·Δφ² over all edges for the full potential phi; the
// capacitance of the half domain is ε0 times it (for 1 V on the strip).
func (s *system) energy(phi []float64) float64 {
	nx := s.nx
	var e float64
	for k := range phi {
		i := k % nx
		if i+1 < nx {
			d := phi[k+1] - phi[k]
			e += s.gx[k] * d * d
		}
		if k+nx < len(phi) {
			d := phi[k+nx] - phi[k]
			e += s.gy[k] * d * d
		}
	}
	return e
}

// micOmega is the relaxation of the modified incomplete Cholesky
// factorisation: 1 is Gustafsson's MIC(0), 0 plain IC(0); slightly below 1
// guards against breakdown on strongly graded grids.
const micOmega = 0.97

// micFactor is the MIC(0) factorisation M = (D+L)D⁻¹(D+Lᵀ), kept as the
// inverse pivots beside the system's couplings: the sweeps multiply each
// coupling by the inverse pivot off their serial chain, so that each chain
// step is a multiplication and a subtraction (a division costs several
// multiplications on that chain), and storing the scaled couplings, four more node
// arrays, cost more in memory traffic than it saved.
type micFactor struct {
	inv    []float64 // 1/d[k]
	ce, cn []float64 // the system's couplings
}

// factor returns the MIC(0) factorisation of the system. The pivots of
// the last nx nodes, all the elimination needs, are kept in one row.
func (s *system) factor() (*micFactor, error) {
	nx, ny := s.nx, s.ny
	n := len(s.diag)
	diag, ce, cn, lab := s.diag[:n], s.ce[:n], s.cn[:n], s.label[:n]
	m := &micFactor{inv: s.ws.take(n), ce: ce, cn: cn}
	// last[i] is the pivot of column i in this row once passed, else in
	// the row below.
	last := make([]float64, nx)
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			k := j*nx + i
			v := diag[k]
			if lab[k] == free {
				if k >= 1 && ce[k-1] != 0 {
					w := ce[k-1]
					dw := last[nx-1] // node k-1 ends the row below
					if i > 0 {
						dw = last[i-1]
					}
					v -= w*w/dw + micOmega*w*cn[k-1]/dw
				}
				if k >= nx && cn[k-nx] != 0 {
					w := cn[k-nx]
					ds := last[i]
					v -= w*w/ds + micOmega*w*ce[k-nx]/ds
				}
				if !(v > 1e-12*diag[k]) {
					return nil, errors.New("incomplete Cholesky breakdown")
				}
			}
			last[i] = v
			m.inv[k] = 1 / v
		}
	}
	return m, nil
}

// precond solves M z = r with the factorisation m of a system whose rows
// are nx nodes long. Each sweep is a recurrence through the previous node,
// so its speed is the latency of that chain; the sweeps step two nodes at
// a time, z[k+1] from z[k-1] directly,
//
//	z[k+1] = (a[k+1] − f[k+1]·a[k]) + f[k+1]·f[k]·z[k-1],
//
// with a the part that does not depend on the chain and f the coupling
// over the pivot, and z[k] from z[k-1] beside it, which halves the chain
// (the same sums, rounded differently).
func (m *micFactor) precond(nx int, r, z []float64) {
	n := len(r)
	inv, ce, cn := m.inv[:n], m.ce[:n], m.cn[:n]
	z = z[:n]
	prev := 0.0
	for k := 0; k < nx && k < n; k++ {
		var fw float64
		if k >= 1 {
			fw = ce[k-1] * inv[k]
		}
		prev = r[k]*inv[k] - fw*prev
		z[k] = prev
	}
	k := nx
	for ; k+1 < n; k += 2 {
		iv0, iv1 := inv[k], inv[k+1]
		fw0, fw1 := ce[k-1]*iv0, ce[k]*iv1
		a0 := r[k]*iv0 - (cn[k-nx]*iv0)*z[k-nx]
		a1 := r[k+1]*iv1 - (cn[k+1-nx]*iv1)*z[k+1-nx]
		z[k] = a0 - fw0*prev
		prev = (a1 - fw1*a0) + fw1*fw0*prev
		z[k+1] = prev
	}
	for ; k < n; k++ {
		prev = r[k]*inv[k] - (cn[k-nx]*inv[k])*z[k-nx] - (ce[k-1]*inv[k])*prev
		z[k] = prev
	}
	next := 0.0
	for k := n - 1; k >= n-nx && k >= 0; k-- {
		next = z[k] - (ce[k]*inv[k])*next
		z[k] = next
	}
	k = n - nx - 1
	for ; k >= 1; k -= 2 {
		be0, be1 := ce[k]*inv[k], ce[k-1]*inv[k-1]
		b0 := z[k] - (cn[k]*inv[k])*z[k+nx]
		b1 := z[k-1] - (cn[k-1]*inv[k-1])*z[k-1+nx]
		z[k] = b0 - be0*next
		next = (b1 - be1*b0) + be1*be0*next
		z[k-1] = next
	}
	for ; k >= 0; k-- {
		next = z[k] - (cn[k]*inv[k])*z[k+nx] - (ce[k]*inv[k])*next
		z[k] = next
	}
}

// apply computes y = A u.
func (s *system) apply(u, y []float64) { s.applyDot(u, y) }

// applyDot computes y = A u and returns u·y. The rows away from the
// first and last grid rows have all four neighbours and run without
// tests.
func (s *system) applyDot(u, y []float64) float64 {
	nx := s.nx
	n := len(u)
	diag, ce, cn := s.diag[:n], s.ce[:n], s.cn[:n]
	y = y[:n]
	var uy float64
	row := func(k int) {
		v := diag[k] * u[k]
		if k >= 1 {
			v += ce[k-1] * u[k-1]
		}
		if k+1 < n {
			v += ce[k] * u[k+1]
		}
		if k >= nx {
			v += cn[k-nx] * u[k-nx]
		}
		if k+nx < n {
			v += cn[k] * u[k+nx]
		}
		y[k] = v
		uy += u[k] * v
	}
	lo, hi := min(nx, n), max(n-nx, min(nx, n))
	for k := 0; k < lo; k++ {
		row(k)
	}
	for k := lo; k < hi; k++ {
		v := diag[k] * u[k]
		v += ce[k-1] * u[k-1]
		v += ce[k] * u[k+1]
		v += cn[k-nx] * u[k-nx]
		v += cn[k] * u[k+nx]
		y[k] = v
		uy += u[k] * v
	}
	for k := hi; k < n; k++ {
		row(k)
	}
	return uy
}

// solve runs preconditioned conjugate gradients from the initial potential
// phi (full, fixed nodes included; overwritten with the solution) and
// returns the iteration count. What the solver needs of phi is its energy
// (energy), and that is what the stopping test watches: for the full
// potential, energy(φ) = E* + ‖u − u*‖²_A exactly, so the energy of the
// iterate is above the converged one by the squared energy norm of its
// error, and each CG step lowers it by exactly α·(r·M⁻¹r) (Hestenes and
// Stiefel 1952; the estimate of Strakoš and Tichý 2002 sums these steps).
// The energy is tracked through these decrements from the energy of the
// start, and the iteration stops once a step lowers it by less than etol
// times its value; with the geometric convergence of MIC(0)-preconditioned
// CG the steps still to come sum to about that step again, so the relative
// error of C left by the iteration is about etol.
func (s *system) solve(phi []float64, etol float64, maxIter int) (int, error) {
	n := len(phi)
	mf, err := s.factor()
	if err != nil {
		return 0, err
	}
	// phi is the iterate: its fixed nodes hold their potentials, which the
	// free rows do not see (see system), and the search directions are zero
	// on them. The right-hand side becomes the residual.
	for k, lab := range s.label {
		if lab != free {
			phi[k] = fixedPotential(lab)
		}
	}
	e := s.energy(phi)
	r := s.rhs
	z, q, p := s.ws.take(n), s.ws.take(n), s.ws.take(n)
	s.apply(phi, q)
	for k, lab := range s.label {
		if lab == free {
			r[k] -= q[k]
		} else {
			r[k] = 0
		}
	}
	mf.precond(s.nx, r, z)
	copy(p, z)
	rz := dot(r, z)
	converged := rz == 0
	it := 0
	for ; it < maxIter && !converged; it++ {
		alpha := rz / s.applyDot(p, q)
		for k := range phi {
			phi[k] += alpha * p[k]
			r[k] -= alpha * q[k]
		}
		step := alpha * rz
		e -= step
		if step <= etol*e {
			converged = true
			continue
		}
		mf.precond(s.nx, r, z)
		rz1 := dot(r, z)
		beta := rz1 / rz
		rz = rz1
		for k := range p {
			p[k] = z[k] + beta*p[k]
		}
	}
	s.rhs = nil
	if !converged {
		return it, fmt.Errorf("conjugate gradients did not converge in %d iterations", maxIter)
	}
	return it, nil
}

func dot(a, b []float64) float64 {
	var s float64
	for k := range a {
		s += a[k] * b[k]
	}
	return s
}

// interpolate carries a potential from grid a to grid b bilinearly, as the
// starting guess for b.
func interpolate(a *grid, pa []float64, b *grid) []float64 {
	ix := bracket(a.xs, b.xs)
	iy := bracket(a.ys, b.ys)
	nxa := a.nx()
	out := make([]float64, b.nx()*b.ny())
	for j, y := range b.ys {
		j0 := iy[j]
		ty := (y - a.ys[j0]) / (a.ys[j0+1] - a.ys[j0])
		for i, x := range b.xs {
			i0 := ix[i]
			tx := (x - a.xs[i0]) / (a.xs[i0+1] - a.xs[i0])
			k := j0*nxa + i0
			out[j*b.nx()+i] = (1-ty)*((1-tx)*pa[k]+tx*pa[k+1]) + ty*((1-tx)*pa[k+nxa]+tx*pa[k+nxa+1])
		}
	}
	return out
}

// bracket returns, for each v in to, the index i with from[i] ≤ v ≤ from[i+1].
func bracket(from, to []float64) []int {
	idx := make([]int, len(to))
	i := 0
	for t, v := range to {
		for i+2 < len(from) && from[i+1] < v {
			i++
		}
		idx[t] = i
	}
	return idx
}

// coreFraction sets the size of the uniformly meshed core around each copper
// edge, in units of the smallest feature: the grid is graded geometrically
// down to it. The field singularity makes the energy error of the core scale
// with its size, so it is small enough that the core contributes little next
// to the O(h²) error of the graded region.
const coreFraction = 0.002
