// Package tune closes the loop from an etched board back to a match.
//
// A matching network is finished at the bench: the board is measured on a
// network analyser, and when its match has moved (εr a few per cent off,
// the copper over- or under-etched, a load that is not what was measured)
// an open stub is trimmed. This package gives the three numbers a
// practitioner needs for that:
//
//   - Sensitivities: how the best-match frequency and |S11| at f0 move per
//     +0.1 mm of each element's length, per +10 µm of its width, and, for the
//     whole board, per +1 % εr and per +10 µm of etch.
//   - Fit: the relative εr, the etch (per edge) and optionally a load scale
//     that best explain a measured S11, by least squares over the measured
//     band on the full board model, with uncertainties and the residual.
//   - Trims: the length to cut from each open stub so that the fitted board's
//     best match returns to f0.
//
// Everything works on a [Model]: the drawn board (physical.Board), the line
// maker that simulates it, the load and the reference impedance. The
// perturbations of [State] are applied to the drawn geometry, so every
// figure comes from the same full model (dispersion, loss, tees, open ends,
// vias) that proved the match.
package tune
