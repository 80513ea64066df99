package fieldsolve

import (
	"errors"
	"fmt"
)

// grid is one discretisation of the half domain: node coordinates, node
// labels and the relative permittivity of each cell.
type grid struct {
	xs, ys []float64
	label  []int     // per node, k = j*nx + i
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
	g.label = make([]int, nx*ny)
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
// couplings to fixed nodes are moved to the right-hand side.
type system struct {
	nx, ny int
	gx, gy []float64 // edge conductances (relative permittivity × face/length)
	diag   []float64
	ce, cn []float64 // off-diagonal entries (≤ 0), zero where either end is fixed
	rhs    []float64
	fixed  []float64 // potential of fixed nodes
	isFree []bool
}

// newSystem assembles the system; vacuum replaces every permittivity by 1.
func newSystem(g *grid, vacuum bool) *system {
	nx, ny := g.nx(), g.ny()
	s := &system{nx: nx, ny: ny,
		gx: make([]float64, nx*ny), gy: make([]float64, nx*ny),
		diag: make([]float64, nx*ny), ce: make([]float64, nx*ny), cn: make([]float64, nx*ny),
		rhs: make([]float64, nx*ny), fixed: make([]float64, nx*ny), isFree: make([]bool, nx*ny)}
	eps := func(i, j int) float64 {
		if i < 0 || j < 0 || i >= nx-1 || j >= ny-1 {
			return 0
		}
		if vacuum {
			return 1
		}
		return g.eps[j*(nx-1)+i]
	}
	for k, lab := range g.label {
		s.isFree[k] = lab == free
		if lab == strip {
			s.fixed[k] = 1
		}
	}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			k := j*nx + i
			if i+1 < nx {
				var dyl, dyu float64
				if j > 0 {
					dyl = g.ys[j] - g.ys[j-1]
				}
				if j+1 < ny {
					dyu = g.ys[j+1] - g.ys[j]
				}
				s.gx[k] = (eps(i, j-1)*dyl + eps(i, j)*dyu) / (2 * (g.xs[i+1] - g.xs[i]))
			}
			if j+1 < ny {
				var dxl, dxr float64
				if i > 0 {
					dxl = g.xs[i] - g.xs[i-1]
				}
				if i+1 < nx {
					dxr = g.xs[i+1] - g.xs[i]
				}
				s.gy[k] = (eps(i-1, j)*dxl + eps(i, j)*dxr) / (2 * (g.ys[j+1] - g.ys[j]))
			}
		}
	}
	link := func(a, b int, c float64, off []float64) {
		switch {
		case s.isFree[a] && s.isFree[b]:
			s.diag[a] += c
			s.diag[b] += c
			off[a] = -c
		case s.isFree[a]:
			s.diag[a] += c
			s.rhs[a] += c * s.fixed[b]
		case s.isFree[b]:
			s.diag[b] += c
			s.rhs[b] += c * s.fixed[a]
		}
	}
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			k := j*nx + i
			if i+1 < nx {
				link(k, k+1, s.gx[k], s.ce)
			}
			if j+1 < ny {
				link(k, k+nx, s.gy[k], s.cn)
			}
		}
	}
	for k := range s.diag {
		if !s.isFree[k] {
			s.diag[k] = 1
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

// micFactor is the MIC(0) factorisation M = (D+L)D⁻¹(D+Lᵀ), stored in the
// form the two triangular sweeps use: the inverse pivots and the
// off-diagonal couplings already divided by the pivot, so that each sweep
// step is multiplications and subtractions only. The sweeps are a serial
// chain through the previous node; a division on that chain made them
// twice as slow.
type micFactor struct {
	inv    []float64 // 1/d[k]
	fw, fs []float64 // forward: ce[k-1]/d[k], cn[k-nx]/d[k]
	be, bn []float64 // backward: ce[k]/d[k], cn[k]/d[k]
}

// factor returns the MIC(0) factorisation of the system.
func (s *system) factor() (*micFactor, error) {
	nx := s.nx
	n := len(s.diag)
	d := make([]float64, n)
	for k := range d {
		v := s.diag[k]
		if s.isFree[k] {
			if k >= 1 && s.ce[k-1] != 0 {
				w := s.ce[k-1]
				v -= w*w/d[k-1] + micOmega*w*s.cn[k-1]/d[k-1]
			}
			if k >= nx && s.cn[k-nx] != 0 {
				w := s.cn[k-nx]
				v -= w*w/d[k-nx] + micOmega*w*s.ce[k-nx]/d[k-nx]
			}
			if !(v > 1e-12*s.diag[k]) {
				return nil, errors.New("incomplete Cholesky breakdown")
			}
		}
		d[k] = v
	}
	m := &micFactor{inv: d, fw: make([]float64, n), fs: make([]float64, n),
		be: make([]float64, n), bn: make([]float64, n)}
	for k := range d {
		iv := 1 / d[k]
		if k >= 1 {
			m.fw[k] = s.ce[k-1] * iv
		}
		if k >= nx {
			m.fs[k] = s.cn[k-nx] * iv
		}
		m.be[k] = s.ce[k] * iv
		m.bn[k] = s.cn[k] * iv
		m.inv[k] = iv
	}
	return m, nil
}

// precond solves M z = r with the factorisation m of a system whose rows
// are nx nodes long.
func (m *micFactor) precond(nx int, r, z []float64) {
	n := len(r)
	inv, fw, fs := m.inv[:n], m.fw[:n], m.fs[:n]
	z = z[:n]
	prev := 0.0
	for k := 0; k < nx && k < n; k++ {
		prev = r[k]*inv[k] - fw[k]*prev
		z[k] = prev
	}
	for k := nx; k < n; k++ {
		prev = r[k]*inv[k] - fs[k]*z[k-nx] - fw[k]*prev
		z[k] = prev
	}
	be, bn := m.be[:n], m.bn[:n]
	next := 0.0
	for k := n - 1; k >= n-nx && k >= 0; k-- {
		next = z[k] - be[k]*next
		z[k] = next
	}
	for k := n - nx - 1; k >= 0; k-- {
		next = z[k] - bn[k]*z[k+nx] - be[k]*next
		z[k] = next
	}
}

// apply computes y = A u.
func (s *system) apply(u, y []float64) {
	nx := s.nx
	n := len(u)
	for k := 0; k < n; k++ {
		v := s.diag[k] * u[k]
		if k >= 1 {
			v += s.ce[k-1] * u[k-1]
		}
		if k+1 < n {
			v += s.ce[k] * u[k+1]
		}
		if k >= nx {
			v += s.cn[k-nx] * u[k-nx]
		}
		if k+nx < n {
			v += s.cn[k] * u[k+nx]
		}
		y[k] = v
	}
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
	u := make([]float64, n)
	for k := range u {
		if s.isFree[k] {
			u[k] = phi[k]
		} else {
			phi[k] = s.fixed[k]
		}
	}
	e := s.energy(phi)
	r := make([]float64, n)
	z := make([]float64, n)
	s.apply(u, r)
	for k := range r {
		r[k] = s.rhs[k] - r[k]
		if !s.isFree[k] {
			r[k] = 0
		}
	}
	p := make([]float64, n)
	q := make([]float64, n)
	mf.precond(s.nx, r, z)
	copy(p, z)
	rz := dot(r, z)
	converged := rz == 0
	it := 0
	for ; it < maxIter && !converged; it++ {
		s.apply(p, q)
		alpha := rz / dot(p, q)
		for k := range u {
			u[k] += alpha * p[k]
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
	for k := range phi {
		if s.isFree[k] {
			phi[k] = u[k]
		} else {
			phi[k] = s.fixed[k]
		}
	}
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
