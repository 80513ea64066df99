package fdtd

import (
	"math"
	"math/cmplx"
)

// zMaterials returns, for every z index of g, the relative permittivity and
// conductivity (S/m) that the tangential E components (Ex, Ey on the line
// z = g.Z[k]) and the normal one (Ez, in the middle of the cell from
// g.Z[k] to g.Z[k+1]) see. The board is layered in z only: substrate
// below the copper plane (index g.KH), the solder mask (if any) from the
// plane up to H + Mask.Thickness, air above.
//
// Without a mask, Ez below the plane sees the substrate and above it air,
// and Ex, Ey on the plane see the average weighted by the half cells on
// each side, as before the mask was modelled (the same expressions, so the
// fields are bitwise those of that solver).
//
// A mask is far thinner than a cell (15–40 µm against substrate cells of
// 50–200 µm), and resolving it with its own cells would shorten the
// Courant step in proportion. It is taken in sub-cell: every E component
// sees the permittivity of its own cell averaged over the layers it cuts,
// a tangential component the thickness-weighted mean (layers in parallel),
// the normal one the harmonic mean (layers in series). This is the
// anisotropic sub-pixel averaging of A. Farjadpour et al., "Improving
// accuracy by subpixel smoothing in the finite-difference time domain",
// Optics Letters 31(20), 2006 (from memory; in a layered medium it is
// exact for a field uniform across the cell). Loss follows the same rule
// on the complex permittivity ε − jσ/ω at F0: conductivities add in
// parallel; in series the complex harmonic mean at F0 is split back into
// ε and σ.
func zMaterials(g *Grid, s Structure) (erT, sgT, erZ, sgZ []float64) {
	nz := len(g.Z)
	erT, sgT = make([]float64, nz), make([]float64, nz)
	erZ, sgZ = make([]float64, nz), make([]float64, nz)
	sigma := 2 * math.Pi * s.F0 * eps0 * s.Er * s.TanD
	if s.Mask.Thickness == 0 {
		for k := 0; k < nz; k++ {
			erZ[k], sgZ[k] = 1.0, 0.0
			if k < g.KH {
				erZ[k], sgZ[k] = s.Er, sigma
			}
			erT[k], sgT[k] = 1.0, 0.0
			switch {
			case k < g.KH:
				erT[k], sgT[k] = s.Er, sigma
			case k == g.KH:
				below, above := g.Z[k]-g.Z[k-1], g.Z[k+1]-g.Z[k]
				wb := below / (below + above)
				erT[k], sgT[k] = wb*s.Er+(1-wb), wb*sigma
			}
		}
		return erT, sgT, erZ, sgZ
	}
	h, t := g.Z[g.KH], s.Mask.Thickness
	sigmaM := 2 * math.Pi * s.F0 * eps0 * s.Mask.Er * s.Mask.TanD
	// overlap returns the lengths of [lo, hi] in the substrate, the mask
	// and the air.
	overlap := func(lo, hi float64) (sub, mask, air float64) {
		sub = math.Max(0, math.Min(hi, h)-lo)
		mask = math.Max(0, math.Min(hi, h+t)-math.Max(lo, h))
		air = math.Max(0, hi-math.Max(lo, h+t))
		return
	}
	for k := 0; k < nz; k++ {
		if k < g.KH {
			erZ[k], sgZ[k] = s.Er, sigma
			erT[k], sgT[k] = s.Er, sigma
			continue
		}
		// Tangential: the dual cell round z[k].
		lo, hi := g.Z[k], g.Z[k]
		if k > 0 {
			lo = (g.Z[k-1] + g.Z[k]) / 2
		}
		if k+1 < nz {
			hi = (g.Z[k] + g.Z[k+1]) / 2
		}
		if hi > lo {
			a, b, c := overlap(lo, hi)
			d := a + b + c
			erT[k] = (a*s.Er + b*s.Mask.Er + c) / d
			sgT[k] = (a*sigma + b*sigmaM) / d
		} else {
			erT[k] = 1
		}
		// Normal: the primary cell above z[k] (air at the top line).
		erZ[k] = 1
		if k+1 < nz {
			_, b, c := overlap(g.Z[k], g.Z[k+1])
			erZ[k], sgZ[k] = seriesMean(b, s.Mask.Er, sigmaM, c, s.F0)
		}
	}
	return erT, sgT, erZ, sgZ
}

// seriesMean returns the permittivity and conductivity of a mask layer
// (length b, εr er, conductivity sg) in series with air (length c): the
// harmonic mean of the complex permittivity at f0, split back into ε and
// σ = −ω0·ε0·Im ε. Without loss it is the plain harmonic mean.
func seriesMean(b, er, sg, c, f0 float64) (float64, float64) {
	d := b + c
	if sg == 0 {
		return d / (b/er + c), 0
	}
	w := 2 * math.Pi * f0
	em := complex(er, -sg/(w*eps0))
	e := complex(d, 0) / (complex(b, 0)/em + complex(c, 0))
	if cmplx.IsNaN(e) {
		return 1, 0
	}
	return real(e), -imag(e) * w * eps0
}

// markWalls lists the E components of g's ground walls: Ez on every node
// of the wall's grid line below the top face, and Ex between two such
// nodes.
func (m *sim) markWalls(g *Grid) {
	at := func(i, j, k int) int32 { return int32((i*m.ny+j)*m.nz + k) }
	for _, w := range g.walls {
		j := nearest(g.Y, w.y)
		for i := 0; i < m.nx; i++ {
			if g.X[i] < w.x0 || g.X[i] > w.x1 {
				continue
			}
			for k := 0; k < g.KH; k++ {
				m.pecZ = append(m.pecZ, at(i, j, k))
				if k > 0 && i+1 < m.nx && g.X[i+1] <= w.x1 {
					m.pecX = append(m.pecX, at(i, j, k))
				}
			}
		}
	}
}
