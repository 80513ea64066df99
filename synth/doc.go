// Package synth runs the whole path from a design to a built board:
//
//	in, err := synth.LoadDesign("design.toml", synth.LoadOptions{}) // or ReadDesign(r, …), LoadDemo
//	res, err := synth.Build(ctx, in)
//	files := export.Files(res, export.FileOptions{…})             // or any single writer of package export
//
// LoadDesign decodes the design file (DecodeDesign; faults are
// *DesignError naming file, line, key and value) and reads the stackup and
// the load it names, relative to the design. Build solves the electrical
// network (the single-shunt-stub match, SolveShuntStub, or the sections
// given), sizes each line on the stackup (Width, WidthWith), turns
// electrical lengths into drawn ones with the open-end, T-junction, via and
// width-step corrections (ToPhysical), re-centres the layout in the full
// model, sweeps the band, runs the Monte Carlo tolerance analysis (Analyse),
// draws the geometry (package geom) and checks the result. Its refusals
// are typed and carry their figures: *MatchedError, *MismatchError,
// *FabMinimumError and *BoardSizeError, found with errors.As. Simulate is
// Build without the geometry and the refusals.
//
// The context given to Build reaches every long computation: the field
// solves behind the line models (LineMakerFor), the re-centring and the
// Monte Carlo; a cancelled build returns an error wrapping ctx.Err().
//
// Package synth also holds the other topologies (double stub, quarter-wave
// transformers, band matching) and the Bode-Fano limit.
package synth
