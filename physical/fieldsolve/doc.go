// Package fieldsolve computes the quasi-static characteristic impedance and
// effective permittivity of a printed line from its cross-section, by solving
// Laplace's equation in two dimensions.
//
// The method is a finite-volume (five-point finite-difference) discretisation
// on a graded tensor-product grid: grid lines are placed on every material
// and copper boundary, and cell sizes grow geometrically away from the copper
// edges, where the field is singular, out to a distant grounded box. The
// symmetry plane through the strip centre halves the domain. The linear
// system is solved by conjugate gradients preconditioned with a modified
// incomplete Cholesky factorisation, MIC(0) (Gustafsson 1978).
//
// The capacitance per unit length is found twice, with the dielectrics (C)
// and with every dielectric replaced by vacuum (C0); then
//
//	Z0 = 1/(c0·sqrt(C·C0)),  εeff = C/C0.
//
// Accuracy is controlled by solving a sequence of grids, each √2 finer than
// the last in both directions, and applying Richardson extrapolation with
// the observed order of convergence (Richardson 1911; Roache 1998). The size
// of the extrapolation step, plus an estimate of the error due to the finite
// box, is reported with each answer as its relative error estimate, and
// refinement stops when it falls below the requested tolerance.
//
// Lengths are metres, capacitances farads per metre, impedances ohms.
package fieldsolve
