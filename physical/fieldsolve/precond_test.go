package fieldsolve

import (
	"math"
	"testing"
)

// precondPlain is the MIC(0) solve M z = r by the plain forward and
// backward recurrences, one node at a time (precond before the paired
// sweeps): the reference for precond.
func (m *micFactor) precondPlain(nx int, r, z []float64) {
	n := len(r)
	inv, ce, cn := m.inv[:n], m.ce[:n], m.cn[:n]
	z = z[:n]
	prev := r[0] * inv[0]
	z[0] = prev
	for k := 1; k < nx && k < n; k++ {
		prev = r[k]*inv[k] - (ce[k-1]*inv[k])*prev
		z[k] = prev
	}
	for k := nx; k < n; k++ {
		prev = r[k]*inv[k] - (cn[k-nx]*inv[k])*z[k-nx] - (ce[k-1]*inv[k])*prev
		z[k] = prev
	}
	next := 0.0
	for k := n - 1; k >= n-nx && k >= 0; k-- {
		next = z[k] - (ce[k]*inv[k])*next
		z[k] = next
	}
	for k := n - nx - 1; k >= 0; k-- {
		next = z[k] - (cn[k]*inv[k])*z[k+nx] - (ce[k]*inv[k])*next
		z[k] = next
	}
}

// precondCase is the factorised system of the masked 50 Ω microstrip's
// second grid and a residual that is the right-hand side.
func precondCase(t testing.TB) (*system, *micFactor, []float64) {
	cs := CrossSection{Geometry: Microstrip, Width: 3e-3, Height: 1.6e-3, Er: 4.4, Thickness: 35e-6, MaskThickness: 25e-6, MaskEr: 3.5}
	l := newLayout(cs, 1)
	g := newGrid(&l, startDensity*refineRatio)
	s := newSystem(g, false, nil)
	m, err := s.factor()
	if err != nil {
		t.Fatal(err)
	}
	return s, m, append([]float64(nil), s.rhs...)
}

func TestPrecondPairedSweeps(t *testing.T) {
	// Source: exact algebra — stepping the triangular recurrences two
	// nodes at a time computes the same solves; only rounding differs.
	s, m, r := precondCase(t)
	for _, odd := range []int{0, 1} { // both parities of the row length's remainder
		n := len(r) - odd*s.nx
		got, want := make([]float64, n), make([]float64, n)
		m.precond(s.nx, r[:n], got)
		m.precondPlain(s.nx, r[:n], want)
		var norm, diff float64
		for k := range want {
			norm = math.Max(norm, math.Abs(want[k]))
			diff = math.Max(diff, math.Abs(got[k]-want[k]))
		}
		if !(norm > 0) || diff > 1e-12*norm {
			t.Errorf("n=%d: paired sweeps differ from the plain ones by %.3g (largest value %.3g)", n, diff, norm)
		}
	}
}

// BenchmarkPrecond compares the paired sweeps with the plain recurrences on
// one grid, in one run.
func BenchmarkPrecond(b *testing.B) {
	s, m, r := precondCase(b)
	z := make([]float64, len(r))
	b.Run("paired", func(b *testing.B) {
		for b.Loop() {
			m.precond(s.nx, r, z)
		}
	})
	b.Run("plain", func(b *testing.B) {
		for b.Loop() {
			m.precondPlain(s.nx, r, z)
		}
	})
}
