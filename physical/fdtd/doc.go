// Package fdtd is a three-dimensional finite-difference time-domain solver
// for microstrip circuits: a substrate of relative permittivity εr and loss
// tangent tanδ on a perfectly conducting ground plane, perfectly
// conducting copper on its top face (a zero-thickness sheet, or with its
// thickness where that is no less than the substrate's z cell, and on a
// grounded-coplanar board whatever its thickness: a z line
// at h + t, tangential E zero on both faces inside the copper and vertical
// E between them, the time step that of the sheet (shorter on a coplanar
// board, where the copper's cell is the smallest); checked against
// the 2-D field solver physical/fieldsolve), optionally a solder mask
// (a dielectric layer of its own εr, tanδ and thickness over the whole top
// face; over copper drawn thick it follows the copper, on the substrate,
// over the top face and down the walls), perfectly conducting via
// columns of the drill's radius, and a microstrip port at each of the board's two x edges. It
// returns the two-port scattering parameters referenced at the board
// edges.
//
// Methods, each from its paper:
//   - the staggered-grid scheme of K. S. Yee, "Numerical solution of initial
//     boundary value problems involving Maxwell's equations in isotropic
//     media", IEEE Trans. Antennas Propagat. 14(3), 1966, on a non-uniform
//     rectilinear grid (primary spacings for H, dual spacings for E);
//   - the convolutional perfectly matched layer of J. A. Roden and
//     S. D. Gedney, "Convolution PML (CPML): an efficient FDTD
//     implementation of the CFS-PML for arbitrary media", Microwave Opt.
//     Technol. Lett. 27(5), 2000, with the polynomial grading and the
//     σ_max ≈ 0.8·(m+1)/(η0·Δ) choice of Taflove and Hagness,
//     "Computational Electrodynamics", 3rd ed., 2005, ch. 7;
//   - the one-third/two-thirds placement of grid lines at strip edges, which
//     puts a strip's effective edge where the copper is (common practice in
//     FDTD microstrip work; the 1/3 rule of thumb, no single source);
//   - the solder mask in sub-cell: it is far thinner than a cell, so each E
//     component sees its cell's permittivity averaged over the layers it
//     cuts, the thickness-weighted mean for Ex and Ey and the harmonic mean
//     for Ez (the anisotropic averaging of A. Farjadpour et al., "Improving
//     accuracy by subpixel smoothing in the finite-difference time
//     domain", Optics Letters 31(20), 2006, from memory); the time step
//     stays that of the mesh without a mask, and a zero-thickness mask
//     leaves every field bitwise as without one. Over copper drawn thick
//     the mask varies in x and y too, in the few z cells round the
//     copper: the E components whose cell it or the band beside a copper
//     wall cuts get the same average over their cell in three dimensions
//     (series along the component, parallel across it; the copper left
//     out), applied after the z-layered update as a correction, so that
//     the kernel's loops stay as they are. Checked against the 2-D
//     field solver physical/fieldsolve on the same cross-section;
//   - the thin-wire via: a via drawn on the board's grid is the grid nodes
//     within its radius, often one node, which conducts like a post of
//     0.1985 of a cell whatever the drill; the H components on the links
//     from its column to the free nodes get a factor on their Ez term so
//     that the column carries the current of a round post of the drill's
//     radius (the thin-wire model of K. R. Umashankar, A. Taflove and
//     B. Beker, IEEE Trans. Antennas Propagat. 35(11), 1987, from memory,
//     derived anew for the non-uniform grid from the column's plane
//     network: thinwire.go), applied after the H update as a short list
//     of corrections. Checked against the refined via column study and
//     Goldfarb-Pucel (TestThinWireVia);
//   - the time-step bound of the non-uniform Yee grid,
//     Δt ≤ 1/(c·√(Δx⁻²+Δy⁻²+Δz⁻²)) with the smallest spacings (Taflove and
//     Hagness, ch. 4).
//
// A port may be grounded coplanar (Port.Gap): its line then runs out with
// side grounds at the gap, each held to the plane by a wall of vertical
// conductor along its middle, and the calibration line is the same
// coplanar section, so that the S-parameters are referred to the coplanar
// line the circuit model takes at the board edge. The cell across a copper
// edge (the one-third/two-thirds pair) is never split by the grading: a
// line inside it made the copper reach beyond its edge on the mesh, which
// narrowed a 0.25 mm coplanar gap enough to raise the line's εeff by 19 %.
// A coplanar gap bounds the edge cell as a strip's width does (at most
// gap/EdgeDivisions): the field crowds into it, and with a 0.25 mm gap in
// two cells the thick-copper line's εeff was 1.7 % above the 2-D field
// solver's, against 0.96 % with four and an extrapolated 0.0 %
// (TestRecordedCoplanarLines).
//
// Ports follow the practice of D. M. Sheen, S. M. Ali, M. D. Abouzahra and
// J. A. Kong, "Application of the three-dimensional finite-difference
// time-domain method to the analysis of planar microstrip circuits", IEEE
// Trans. Microwave Theory Tech. 38(7), 1990: the port line runs straight
// out of the board into the absorbing layer; a soft vertical-field source
// under the strip launches a pulse. Wave separation uses the line's own
// propagation constant and characteristic impedance measured in the same
// run, behind the source, where only outgoing waves travel: γ from the
// voltage at two planes, Z0 = V/I from the strip voltage (line integral of
// Ez under the strip centre) and the strip current (loop integral of H round
// the strip). In front of the source, voltage and current at one plane then
// split into incident and reflected waves, which are moved to the board
// edge with γ. Two runs, one per driven port, give the wave matrices A
// (incident) and B (outgoing); S = B·A⁻¹ corrects for what little the
// terminations reflect. The S-parameters are power waves normalised to a
// reference impedance (50 Ω unless set) through each port line's measured
// Z0.
//
// The substrate, the ground plane and the port lines extend into the
// absorbing layer: the board is simulated as a cut from an infinite
// substrate, so radiation and surface waves leave the domain. Loss is the
// substrate's tanδ turned into a conductivity σ = 2π·f0·ε0·εr·tanδ at one
// frequency f0; copper is lossless.
//
// Fields are float32. The update runs over x slabs on persistent workers,
// one handoff per half step; each z-row gets its curl update and then,
// while it is in cache, the CPML recursions of the layers it lies in.
// The substrate is cut into cells no taller than half the edge cell: with
// cells as tall as the edge cell a uniform line's Z0 came out about 2 %
// low against Hammerstad-Jensen (the study is in DEVELOPERS.md).
package fdtd
