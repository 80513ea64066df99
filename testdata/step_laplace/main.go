// Command step_laplace solves the static field of an asymmetric
// parallel-plate step (plate spacing 1 on one side, a on the other, ε = 1)
// by finite differences (SOR, n cells per unit spacing, 3 spacings of line
// on each side, Neumann ends) and prints π times the excess capacitance
// per unit depth beside the closed form F(a) = (a²+1)/a·ln((1+a)/(1−a)) −
// 2·ln(4a/(1−a²)) of Whinnery and Jamieson (1944, from memory). Only a on
// the grid (a·n an integer) gives a clean excess, so a is 0.3 and 0.5;
// the error falls about in half with n (first order, from the corner).
// The recorded results, checked by
// TestStepPlanarWaveguideReference in physical, ran on 2026-12-04:
//
//	a=0.300 n=40  excess·π = 1.7189   F = 1.6959
//	a=0.300 n=80  excess·π = 1.7050   F = 1.6959
//	a=0.500 n=40  excess·π = 0.7951   F = 0.7849
//	a=0.500 n=80  excess·π = 0.7889   F = 0.7849
//
// Run: cd testdata/step_laplace && go run main.go (about 5 s).
package main

import (
	"fmt"
	"math"
)

func run(a float64, n int) float64 {
	hs := 1.0 / float64(n)
	nb := n
	na := int(math.Round(a * float64(n)))
	lx := 3 * n
	nx := 2*lx + 1
	// node (i,j): x = (i-lx)*hs, y = j*hs
	V := make([][]float64, nx)
	fixed := make([][]bool, nx)
	top := func(i int) int {
		if i < lx {
			return nb
		}
		return na
	}
	for i := range V {
		V[i] = make([]float64, nb+1)
		fixed[i] = make([]bool, nb+1)
		t := top(i)
		for j := 0; j <= nb; j++ {
			if j == 0 {
				fixed[i][j] = true
			} else if j >= t {
				fixed[i][j] = true
				V[i][j] = 1
			} else {
				V[i][j] = float64(j) / float64(t)
			}
		}
	}
	// vertical face at i = lx: j from na..nb fixed at 1 (already since top(lx)=na)
	w := 2 / (1 + math.Sin(math.Pi/float64(n)))
	for it := 0; it < 20000; it++ {
		maxd := 0.0
		for i := 0; i < nx; i++ {
			for j := 1; j < nb; j++ {
				if fixed[i][j] {
					continue
				}
				l, r := i-1, i+1
				if l < 0 {
					l = 1
				}
				if r >= nx {
					r = nx - 2
				}
				nv := (V[l][j] + V[r][j] + V[i][j-1] + V[i][j+1]) / 4
				d := w * (nv - V[i][j])
				V[i][j] += d
				if math.Abs(d) > maxd {
					maxd = math.Abs(d)
				}
			}
		}
		if maxd < 1e-11 {
			break
		}
	}
	// energy sum over edges inside the dielectric region (both ends not both fixed conductor at same V contributes 0 anyway)
	e := 0.0
	for i := 0; i < nx; i++ {
		for j := 0; j <= nb; j++ {
			if j+1 <= nb {
				d := V[i][j+1] - V[i][j]
				w := 1.0
				if i == 0 || i == nx-1 {
					w = 0.5
				}
				e += w * d * d
			}
			if i+1 < nx {
				d := V[i+1][j] - V[i][j]
				e += d * d
			}
		}
	}
	L := float64(lx) * hs
	return e - L/1 - L/a
}

func main() {
	for _, a := range []float64{0.3, 0.5} {
		F := (a*a+1)/a*math.Log((1+a)/(1-a)) - 2*math.Log(4*a/(1-a*a))
		for _, n := range []int{40, 80} {
			fmt.Printf("a=%.3f n=%d  excess·π = %.4f   F = %.4f\n", a, n, run(a, n)*math.Pi, F)
		}
	}
}
