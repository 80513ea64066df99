// Package export writes the artefacts of a built design (a *synth.Result
// from synth.Build): Gerber X2 copper, mask, outline and drill layers
// (WriteGerber), Excellon drill (WriteExcellon), the Gerber job file
// (WriteGerberJob), Touchstone networks (WriteTouchstone with
// NetworkTouchstone and InputTouchstone), the JSON report (NewReport,
// WriteReport), the dimensioned PDF drawing (WritePDF), the SVG preview
// (WriteSVG) and the plots.
//
// Every writer takes an io.Writer and a value, in the manner of
// image/png's Encode, and is deterministic: dates come in through Meta or
// the options (the command takes SOURCE_DATE_EPOCH). Files lists every file
// of a build with its name and writer; the caller decides where the bytes
// go.
package export
