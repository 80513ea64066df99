// Package synth turns electrical designs into physical ones: the
// single-shunt-stub matching solutions, the strip width for a target
// impedance, the physical length for an electrical length, and the
// corrections for open ends, T-junctions and vias that make the drawn
// copper behave like the electrical solution.
package synth
