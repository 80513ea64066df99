package fieldsolve

import "math"

// Conductor labels of grid nodes.
const (
	free   = 0 // a node whose potential is unknown
	strip  = 1 // a node on the signal strip (1 V)
	ground = 2 // a node on a grounded conductor or the box (0 V)
)

// layout is a cross-section turned into coordinates of the half domain
// x ≥ 0 (the symmetry plane is x = 0), y ≥ 0 (the lower ground plane).
type layout struct {
	cs     CrossSection
	yb, yt float64 // strip bottom and top
	a0, a1 float64 // strip half-width at bottom and top
	tanE   float64 // tan of the etch angle
	mask   float64 // mask thickness (0 when none)
	gcpw   bool
	g0     float64 // GCPW: inner edge of the side ground at its bottom
	o0     float64 // GCPW: outer edge at its bottom; +Inf when wide
	xMax   float64 // box right wall
	yMax   float64 // box lid (the upper plane for stripline)
	lmin   float64 // smallest feature length
}

// boxFactor is the distance from the structure to the grounded box, in
// multiples of the structure's size. The stray field of an open line over a
// ground plane is a line dipole's, so the box changes C by roughly
// (size/distance)²; the solver measures this on the coarsest grid.
const boxFactor = 100

// striplineSide is the lateral distance from the strip to the box wall in
// plane spacings; the field there has decayed as exp(−π·x/b).
const striplineSide = 8

func newLayout(cs CrossSection, boxScale float64) layout {
	l := layout{cs: cs, tanE: cs.etchTan(), mask: cs.MaskThickness}
	l.yb, l.yt = cs.stripY()
	l.a0 = cs.Width / 2
	l.a1 = cs.topWidth() / 2
	span := l.a0
	l.lmin = math.Min(l.a1, l.a0)
	if cs.Thickness > 0 {
		l.lmin = math.Min(l.lmin, cs.Thickness)
	}
	if l.mask > 0 {
		l.lmin = math.Min(l.lmin, l.mask)
	}
	l.o0 = math.Inf(1)
	if cs.Geometry == GCPW {
		l.gcpw = true
		l.g0 = l.a0 + cs.Gap
		l.lmin = math.Min(l.lmin, cs.Gap)
		span = l.g0
		if cs.GroundWidth > 0 {
			l.o0 = l.g0 + cs.GroundWidth
			span = l.o0
			l.lmin = math.Min(l.lmin, cs.GroundWidth)
		}
	}
	if cs.Geometry == Stripline {
		l.lmin = math.Min(l.lmin, math.Min(l.yb, cs.Spacing-l.yt))
		l.xMax = span + striplineSide*cs.Spacing*boxScale
		l.yMax = cs.Spacing
		return l
	}
	l.lmin = math.Min(l.lmin, cs.Height)
	r := boxFactor * boxScale * math.Max(span, cs.Height)
	l.xMax = span + r
	l.yMax = l.yt + l.mask + r
	return l
}

// halfWidth is the strip's half-width at height y (clamped to the copper).
func (l *layout) halfWidth(y float64) float64 {
	return l.a0 - (clamp(y, l.yb, l.yt)-l.yb)*l.tanE
}

// groundInner and groundOuter are the side ground's edges at height y.
func (l *layout) groundInner(y float64) float64 {
	return l.g0 + (clamp(y, l.yb, l.yt)-l.yb)*l.tanE
}

func (l *layout) groundOuter(y float64) float64 {
	return l.o0 - (clamp(y, l.yb, l.yt)-l.yb)*l.tanE
}

func clamp(v, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, v)) }

// node labels the grid node at (x, y); tol absorbs rounding of coordinates
// that were placed on copper boundaries.
func (l *layout) node(x, y, tol float64) int8 {
	if y <= tol || y >= l.yMax-tol || x >= l.xMax-tol {
		return ground
	}
	if y < l.yb-tol || y > l.yt+tol {
		return free
	}
	if x <= l.halfWidth(y)+tol {
		return strip
	}
	if l.gcpw && x >= l.groundInner(y)-tol && x <= l.groundOuter(y)+tol {
		return ground
	}
	return free
}

// epsAt is the relative permittivity at a point that is not on copper, or
// the permittivity of the surrounding coat for a point inside copper.
func (l *layout) epsAt(x, y float64) float64 {
	cs := &l.cs
	if cs.Geometry == Stripline || y < cs.Height {
		return cs.Er
	}
	m := l.mask
	if m <= 0 {
		return 1
	}
	if y <= cs.Height+m {
		return cs.MaskEr
	}
	if y <= l.yt+m {
		if x <= l.halfWidth(y)+m {
			return cs.MaskEr
		}
		if l.gcpw && x >= l.groundInner(y)-m && x <= l.groundOuter(y)+m {
			return cs.MaskEr
		}
	}
	return 1
}

// keysX and keysY are the coordinates that must be grid lines; singX and
// singY are the copper edges about which the grid is graded.
func (l *layout) keys() (kx, ky, sx, sy []float64) {
	m := l.mask
	t := l.cs.Thickness
	dt := t * l.tanE
	kx = []float64{0, l.a1, l.a0, l.xMax}
	sx = []float64{l.a1, l.a0}
	if m > 0 {
		kx = append(kx, l.a1+m, l.a0+m)
	}
	if l.gcpw {
		kx = append(kx, l.g0, l.g0+dt)
		sx = append(sx, l.g0, l.g0+dt)
		if m > 0 {
			kx = append(kx, l.g0-m, l.g0+dt-m)
		}
		if !math.IsInf(l.o0, 1) {
			kx = append(kx, l.o0, l.o0-dt)
			sx = append(sx, l.o0, l.o0-dt)
			if m > 0 {
				kx = append(kx, l.o0+m, l.o0-dt+m)
			}
		}
	}
	ky = []float64{0, l.yb, l.yt, l.yMax}
	sy = []float64{l.yb, l.yt}
	if m > 0 {
		ky = append(ky, l.yb+m, l.yt+m)
	}
	return kx, ky, sx, sy
}
