package fdtd

import (
	"math"
	"runtime"
	"sync"
)

// pmlAxis holds the convolutional PML of one axis: the positions along the
// axis that lie in an absorbing layer, the recursive-convolution
// coefficients b and c there (for E at the lines, for H half a cell on),
// and the auxiliary ψ fields of the two E and two H components whose update
// takes a derivative along this axis.
type pmlAxis struct {
	idx            []int // positions along the axis inside a layer, ascending
	bE, cE, invDE  []float32
	bH, cH, invDH  []float32
	psiE1, psiE2   []float32
	psiH1, psiH2   []float32
	other1, other2 int // sizes of the two other axes
}

// sim is one FDTD run's state.
type sim struct {
	nx, ny, nz             int
	ex, ey, ez, hx, hy, hz []float32
	// Inverse spacings with the PML's κ folded in: primary (for H) and dual
	// (for E).
	ixh, iyh, izh, ixe, iye, ize []float32
	caT, cbT, caZ, cbZ           []float32 // E coefficients by z index: tangential (Ex, Ey) and Ez
	dtmu                         float32
	hcoef                        []float32 // dtmu for every k (ψ passes use a per-k coefficient)
	pecX, pecY, pecZ             []int32
	pml                          [3]pmlAxis
	dt                           float64
	workers                      int
}

// cpmlProfile returns σ, κ, α at depth ρ ∈ [0, 1] into a layer whose cells
// are delta thick (Roden and Gedney 2000; grading of Taflove and Hagness
// 2005, §7.9: m = 3, σmax = 0.8·(m+1)/(η0·Δ), κmax = 3, α from 0.05 S/m at
// the inner face to 0 at the outer).
func cpmlProfile(rho, delta float64) (sigma, kappa, alpha float64) {
	const m = 3
	smax := 0.8 * (m + 1) / (eta0 * delta)
	sigma = smax * math.Pow(rho, m)
	kappa = 1 + 2*math.Pow(rho, m)
	alpha = 0.05 * (1 - rho)
	return
}

// axisPML builds one axis's layer coefficients. lines are the axis's mesh
// lines; low and high say which ends carry n layer cells. It returns the
// per-position κ for E (at lines) and H (at half lines) too.
func axisPML(lines []float64, n int, low, high bool, dt float64) (ax pmlAxis, kE, kH []float64) {
	N := len(lines)
	kE = make([]float64, N)
	kH = make([]float64, N)
	for i := range kE {
		kE[i], kH[i] = 1, 1
	}
	rho := func(x float64) (float64, float64, bool) {
		if low {
			in, out := lines[n], lines[0]
			if x < in {
				return (in - x) / (in - out), lines[1] - lines[0], true
			}
		}
		if high {
			in, out := lines[N-1-n], lines[N-1]
			if x > in {
				return (x - in) / (out - in), lines[N-1] - lines[N-2], true
			}
		}
		return 0, 0, false
	}
	coef := func(r, d float64) (b, c, k float64) {
		s, k, a := cpmlProfile(r, d)
		b = math.Exp(-(s/k + a) * dt / eps0)
		if s > 0 {
			c = s / (s*k + k*k*a) * (b - 1)
		}
		return b, c, k
	}
	for i := 0; i < N; i++ {
		rE, dE, inE := rho(lines[i])
		var rH, dH float64
		inH := false
		if i+1 < N {
			rH, dH, inH = rho((lines[i] + lines[i+1]) / 2)
		}
		if !inE && !inH {
			continue
		}
		ax.idx = append(ax.idx, i)
		var b, c float64
		b, c = 1, 0
		if inE {
			b, c, kE[i] = coef(rE, dE)
		}
		ax.bE = append(ax.bE, float32(b))
		ax.cE = append(ax.cE, float32(c))
		b, c = 1, 0
		if inH {
			b, c, kH[i] = coef(rH, dH)
		}
		ax.bH = append(ax.bH, float32(b))
		ax.cH = append(ax.cH, float32(c))
		dual := 0.0
		switch {
		case i == 0:
			dual = lines[1] - lines[0]
		case i == N-1:
			dual = lines[N-1] - lines[N-2]
		default:
			dual = (lines[i+1] - lines[i-1]) / 2
		}
		ax.invDE = append(ax.invDE, float32(1/dual))
		prim := lines[min(i+1, N-1)] - lines[min(i+1, N-1)-1]
		ax.invDH = append(ax.invDH, float32(1/prim))
	}
	return ax, kE, kH
}

// inverse spacings: primary (i to i+1) and dual, each divided by κ.
func invSpacings(lines, kE, kH []float64) (prim, dual []float32) {
	N := len(lines)
	prim = make([]float32, N)
	dual = make([]float32, N)
	for i := 0; i < N; i++ {
		if i+1 < N {
			prim[i] = float32(1 / (kH[i] * (lines[i+1] - lines[i])))
		}
		var d float64
		switch {
		case i == 0:
			d = lines[1] - lines[0]
		case i == N-1:
			d = lines[N-1] - lines[N-2]
		default:
			d = (lines[i+1] - lines[i-1]) / 2
		}
		dual[i] = float32(1 / (kE[i] * d))
	}
	return prim, dual
}

// timeStep returns the Courant-limited step of the grid with a 0.9 safety
// factor.
func timeStep(g *Grid) float64 {
	dx, dy, dz := minSpacing(g.X), minSpacing(g.Y), minSpacing(g.Z)
	return 0.9 / (c0 * math.Sqrt(1/(dx*dx)+1/(dy*dy)+1/(dz*dz)))
}

// newSim allocates the fields and coefficients for grid g.
func newSim(g *Grid, s Structure, workers int) *sim {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	nx, ny, nz := len(g.X), len(g.Y), len(g.Z)
	n := nx * ny * nz
	dt := timeStep(g)
	m := &sim{nx: nx, ny: ny, nz: nz, dt: dt, workers: workers}
	m.ex, m.ey, m.ez = make([]float32, n), make([]float32, n), make([]float32, n)
	m.hx, m.hy, m.hz = make([]float32, n), make([]float32, n), make([]float32, n)
	var kxE, kxH, kyE, kyH, kzE, kzH []float64
	m.pml[0], kxE, kxH = axisPML(g.X, g.NPML, true, true, dt)
	m.pml[1], kyE, kyH = axisPML(g.Y, g.NPML, true, true, dt)
	m.pml[2], kzE, kzH = axisPML(g.Z, g.NPML, false, true, dt)
	m.ixh, m.ixe = invSpacings(g.X, kxE, kxH)
	m.iyh, m.iye = invSpacings(g.Y, kyE, kyH)
	m.izh, m.ize = invSpacings(g.Z, kzE, kzH)
	m.pml[0].other1, m.pml[0].other2 = ny, nz
	m.pml[1].other1, m.pml[1].other2 = nx, nz
	m.pml[2].other1, m.pml[2].other2 = nx, ny
	for a := range m.pml {
		p := &m.pml[a]
		sz := len(p.idx) * p.other1 * p.other2
		p.psiE1, p.psiE2 = make([]float32, sz), make([]float32, sz)
		p.psiH1, p.psiH2 = make([]float32, sz), make([]float32, sz)
	}
	m.dtmu = float32(dt / mu0)
	m.hcoef = make([]float32, nz)
	for k := range m.hcoef {
		m.hcoef[k] = m.dtmu
	}
	// Materials: substrate below z = h, air above; Ex, Ey on the copper
	// plane see the average weighted by the half cells on each side.
	sigma := 2 * math.Pi * s.F0 * eps0 * s.Er * s.TanD
	coef := func(er, sg float64) (float32, float32) {
		e := eps0 * er
		q := sg * dt / (2 * e)
		return float32((1 - q) / (1 + q)), float32(dt / e / (1 + q))
	}
	m.caT, m.cbT = make([]float32, nz), make([]float32, nz)
	m.caZ, m.cbZ = make([]float32, nz), make([]float32, nz)
	for k := 0; k < nz; k++ {
		erZ, sgZ := 1.0, 0.0
		if k < g.KH {
			erZ, sgZ = s.Er, sigma
		}
		m.caZ[k], m.cbZ[k] = coef(erZ, sgZ)
		erT, sgT := 1.0, 0.0
		switch {
		case k < g.KH:
			erT, sgT = s.Er, sigma
		case k == g.KH:
			below, above := g.Z[k]-g.Z[k-1], g.Z[k+1]-g.Z[k]
			wb := below / (below + above)
			erT, sgT = wb*s.Er+(1-wb), wb*sigma
		}
		m.caT[k], m.cbT[k] = coef(erT, sgT)
	}
	m.markPEC(g)
	return m
}

// markPEC lists the E components forced to zero: tangential E on the copper
// plane inside copper, and Ez (with Ex, Ey) inside via columns.
func (m *sim) markPEC(g *Grid) {
	s := g.ext
	kh := g.KH
	nz, ny := m.nz, m.ny
	at := func(i, j, k int) int32 { return int32((i*ny+j)*nz + k) }
	for i := 0; i+1 < m.nx; i++ {
		xm := (g.X[i] + g.X[i+1]) / 2
		for j := 0; j < m.ny; j++ {
			if s.inCopper(xm, g.Y[j]) {
				m.pecX = append(m.pecX, at(i, j, kh))
			}
		}
	}
	for i := 0; i < m.nx; i++ {
		for j := 0; j+1 < m.ny; j++ {
			if s.inCopper(g.X[i], (g.Y[j]+g.Y[j+1])/2) {
				m.pecY = append(m.pecY, at(i, j, kh))
			}
		}
	}
	for _, v := range s.Vias {
		cx, cy := float64(v.Center.X)*1e-9, float64(v.Center.Y)*1e-9
		r := float64(v.Diameter) * 1e-9 / 2
		found := false
		for i := 0; i < m.nx; i++ {
			for j := 0; j < m.ny; j++ {
				if math.Hypot(g.X[i]-cx, g.Y[j]-cy) <= r {
					found = true
					for k := 0; k < kh; k++ {
						m.pecZ = append(m.pecZ, at(i, j, k))
					}
				}
			}
		}
		if !found {
			i, j := nearest(g.X, cx), nearest(g.Y, cy)
			for k := 0; k < kh; k++ {
				m.pecZ = append(m.pecZ, at(i, j, k))
			}
		}
	}
}

// parallel runs fn over [0, n) split into one contiguous range per worker.
func (m *sim) parallel(n int, fn func(a, b int)) {
	w := m.workers
	if w > n {
		w = n
	}
	if w <= 1 {
		fn(0, n)
		return
	}
	var wg sync.WaitGroup
	for t := 0; t < w; t++ {
		a, b := t*n/w, (t+1)*n/w
		wg.Add(1)
		go func() {
			defer wg.Done()
			fn(a, b)
		}()
	}
	wg.Wait()
}

// updateH advances H by one step over x slabs [ia, ib).
func (m *sim) updateH(ia, ib int) {
	ny, nz := m.ny, m.nz
	sx := ny * nz
	dtmu := m.dtmu
	izh := m.izh[:nz]
	for i := ia; i < ib && i < m.nx-1; i++ {
		ix := m.ixh[i]
		for j := 0; j < ny-1; j++ {
			iy := m.iyh[j]
			n0 := (i*ny + j) * nz
			hx := m.hx[n0 : n0+nz]
			hy := m.hy[n0 : n0+nz]
			hz := m.hz[n0 : n0+nz]
			ex := m.ex[n0 : n0+nz]
			ey := m.ey[n0 : n0+nz]
			ez := m.ez[n0 : n0+nz]
			exJ := m.ex[n0+nz : n0+2*nz]
			ezJ := m.ez[n0+nz : n0+2*nz]
			eyI := m.ey[n0+sx : n0+sx+nz]
			ezI := m.ez[n0+sx : n0+sx+nz]
			for k := 0; k < nz-1; k++ {
				iz := izh[k]
				hx[k] -= dtmu * ((ezJ[k]-ez[k])*iy - (ey[k+1]-ey[k])*iz)
				hy[k] -= dtmu * ((ex[k+1]-ex[k])*iz - (ezI[k]-ez[k])*ix)
				hz[k] -= dtmu * ((eyI[k]-ey[k])*ix - (exJ[k]-ex[k])*iy)
			}
		}
	}
}

// updateE advances E by one step over x slabs [ia, ib).
func (m *sim) updateE(ia, ib int) {
	ny, nz := m.ny, m.nz
	sx := ny * nz
	ize := m.ize[:nz]
	caT, cbT, caZ, cbZ := m.caT[:nz], m.cbT[:nz], m.caZ[:nz], m.cbZ[:nz]
	for i := ia; i < ib && i < m.nx-1; i++ {
		ix := m.ixe[i]
		for j := 0; j < ny-1; j++ {
			iy := m.iye[j]
			n0 := (i*ny + j) * nz
			hx := m.hx[n0 : n0+nz]
			hy := m.hy[n0 : n0+nz]
			hz := m.hz[n0 : n0+nz]
			if j >= 1 {
				ex := m.ex[n0 : n0+nz]
				hzJ := m.hz[n0-nz : n0]
				for k := 1; k < nz-1; k++ {
					ex[k] = caT[k]*ex[k] + cbT[k]*((hz[k]-hzJ[k])*iy-(hy[k]-hy[k-1])*ize[k])
				}
			}
			if i >= 1 {
				ey := m.ey[n0 : n0+nz]
				hzI := m.hz[n0-sx : n0-sx+nz]
				for k := 1; k < nz-1; k++ {
					ey[k] = caT[k]*ey[k] + cbT[k]*((hx[k]-hx[k-1])*ize[k]-(hz[k]-hzI[k])*ix)
				}
				if j >= 1 {
					ez := m.ez[n0 : n0+nz]
					hyI := m.hy[n0-sx : n0-sx+nz]
					hxJ := m.hx[n0-nz : n0]
					for k := 0; k < nz-1; k++ {
						ez[k] = caZ[k]*ez[k] + cbZ[k]*((hy[k]-hyI[k])*ix-(hx[k]-hxJ[k])*iy)
					}
				}
			}
		}
	}
}

// span is a half-open index range.
type span struct{ a, b int }

// psiPass applies one auxiliary field of the CPML along axis a to field f,
// whose curl takes the derivative of g along that axis. e says whether f is
// an E component (backward difference, dual spacing, E coefficients) or H
// (forward difference, primary spacing). r are f's update ranges in i, j,
// k; only x slabs [ia, ib) are touched.
func (m *sim) psiPass(a int, f, g, psi []float32, e bool, sign float32, coef []float32, r [3]span, ia, ib int) {
	p := &m.pml[a]
	ny, nz := m.ny, m.nz
	strides := [3]int{ny * nz, nz, 1}
	st := strides[a]
	b, c, inv := p.bH, p.cH, p.invDH
	if e {
		b, c, inv = p.bE, p.cE, p.invDE
		st = -st // backward difference: g[n] − g[n−st] = −(g[n−st] − g[n])
	}
	lo, hi := max(r[0].a, ia), min(r[0].b, ib)
	k0, k1 := r[2].a, r[2].b
	// row applies the pass to one run of k at f index n0, ψ index q0.
	row := func(n0, q0, pi int) {
		bb, cc := b[pi], c[pi]*inv[pi]
		if e {
			cc = -cc
		}
		fr := f[n0+k0 : n0+k1]
		gr := g[n0+k0 : n0+k1]
		gs := g[n0+k0+st : n0+k1+st]
		ps := psi[q0+k0 : q0+k1]
		cf := coef[k0:k1]
		for k := range fr {
			v := bb*ps[k] + cc*(gs[k]-gr[k])
			ps[k] = v
			fr[k] += sign * cf[k] * v
		}
	}
	switch a {
	case 0:
		for pi, i := range p.idx {
			if i < lo || i >= hi {
				continue
			}
			for j := r[1].a; j < r[1].b; j++ {
				row((i*ny+j)*nz, (pi*ny+j)*nz, pi)
			}
		}
	case 1:
		np := len(p.idx)
		for i := lo; i < hi; i++ {
			for pi, j := range p.idx {
				if j < r[1].a || j >= r[1].b {
					continue
				}
				row((i*ny+j)*nz, (i*np+pi)*nz, pi)
			}
		}
	case 2:
		np := len(p.idx)
		for i := lo; i < hi; i++ {
			for j := r[1].a; j < r[1].b; j++ {
				n0, q0 := (i*ny+j)*nz, (i*ny+j)*np
				for pi, k := range p.idx {
					if k < k0 || k >= k1 {
						continue
					}
					n := n0 + k
					cc := c[pi] * inv[pi]
					d := g[n+1] - g[n]
					if e {
						d = g[n] - g[n-1]
					}
					v := b[pi]*psi[q0+pi] + cc*d
					psi[q0+pi] = v
					f[n] += sign * coef[k] * v
				}
			}
		}
	}
}

// pmlH applies the CPML corrections to H over x slabs [ia, ib).
func (m *sim) pmlH(ia, ib int) {
	r := [3]span{{0, m.nx - 1}, {0, m.ny - 1}, {0, m.nz - 1}}
	px, py, pz := &m.pml[0], &m.pml[1], &m.pml[2]
	// x: Hy += dtmu·∂Ez/∂x, Hz −= dtmu·∂Ey/∂x
	m.psiPass(0, m.hy, m.ez, px.psiH1, false, +1, m.hcoef, r, ia, ib)
	m.psiPass(0, m.hz, m.ey, px.psiH2, false, -1, m.hcoef, r, ia, ib)
	// y: Hx −= dtmu·∂Ez/∂y, Hz += dtmu·∂Ex/∂y
	m.psiPass(1, m.hx, m.ez, py.psiH1, false, -1, m.hcoef, r, ia, ib)
	m.psiPass(1, m.hz, m.ex, py.psiH2, false, +1, m.hcoef, r, ia, ib)
	// z: Hx += dtmu·∂Ey/∂z, Hy −= dtmu·∂Ex/∂z
	m.psiPass(2, m.hx, m.ey, pz.psiH1, false, +1, m.hcoef, r, ia, ib)
	m.psiPass(2, m.hy, m.ex, pz.psiH2, false, -1, m.hcoef, r, ia, ib)
}

// pmlE applies the CPML corrections to E over x slabs [ia, ib).
func (m *sim) pmlE(ia, ib int) {
	nx, ny, nz := m.nx, m.ny, m.nz
	rx := [3]span{{0, nx - 1}, {1, ny - 1}, {1, nz - 1}}
	ry := [3]span{{1, nx - 1}, {0, ny - 1}, {1, nz - 1}}
	rz := [3]span{{1, nx - 1}, {1, ny - 1}, {0, nz - 1}}
	px, py, pz := &m.pml[0], &m.pml[1], &m.pml[2]
	// x: Ey −= cb·∂Hz/∂x, Ez += cb·∂Hy/∂x
	m.psiPass(0, m.ey, m.hz, px.psiE1, true, -1, m.cbT, ry, ia, ib)
	m.psiPass(0, m.ez, m.hy, px.psiE2, true, +1, m.cbZ, rz, ia, ib)
	// y: Ex += cb·∂Hz/∂y, Ez −= cb·∂Hx/∂y
	m.psiPass(1, m.ex, m.hz, py.psiE1, true, +1, m.cbT, rx, ia, ib)
	m.psiPass(1, m.ez, m.hx, py.psiE2, true, -1, m.cbZ, rz, ia, ib)
	// z: Ex −= cb·∂Hy/∂z, Ey += cb·∂Hx/∂z
	m.psiPass(2, m.ex, m.hy, pz.psiE1, true, -1, m.cbT, rx, ia, ib)
	m.psiPass(2, m.ey, m.hx, pz.psiE2, true, +1, m.cbT, ry, ia, ib)
}

// zeroPEC forces the listed E components to zero.
func (m *sim) zeroPEC() {
	for _, n := range m.pecX {
		m.ex[n] = 0
	}
	for _, n := range m.pecY {
		m.ey[n] = 0
	}
	for _, n := range m.pecZ {
		m.ez[n] = 0
	}
}

// step advances the fields by one time step (H then E), each half on every
// worker.
func (m *sim) step() {
	m.parallel(m.nx, func(a, b int) {
		m.updateH(a, b)
		m.pmlH(a, b)
	})
	m.parallel(m.nx, func(a, b int) {
		m.updateE(a, b)
		m.pmlE(a, b)
	})
	m.zeroPEC()
}

// energy returns Σ(E² + H²) over the grid, a decay measure (unweighted).
func (m *sim) energy() float64 {
	var total float64
	var mu sync.Mutex
	sx := m.ny * m.nz
	m.parallel(m.nx, func(a, b int) {
		var e, h float64
		for n := a * sx; n < b*sx; n++ {
			e += float64(m.ex[n]*m.ex[n] + m.ey[n]*m.ey[n] + m.ez[n]*m.ez[n])
			h += float64(m.hx[n]*m.hx[n] + m.hy[n]*m.hy[n] + m.hz[n]*m.hz[n])
		}
		mu.Lock()
		total += e*eps0 + h*mu0
		mu.Unlock()
	})
	return total
}
