// Package export writes the artefacts of a build: Gerber X2 copper, mask
// and outline, Excellon drill, the Gerber job file, Touchstone networks,
// the dimensioned PDF drawing, the SVG preview and the JSON report. Every
// writer takes an io.Writer and a value; the caller decides where the
// bytes go.
package export
