package export

import (
	"fmt"
	"io"
	"sort"
	"time"

	"stubcraft/physical"
	"stubcraft/physical/units"
	"stubcraft/stackups"
	"stubcraft/synth"
)

// Artefact is one file of a build: its name in the output directory and
// the function that writes its bytes.
type Artefact struct {
	Name  string
	Write func(io.Writer) error
}

// FileOptions say how the files of a build are made.
type FileOptions struct {
	Version string    // the tool version written into every file
	Created time.Time // the creation date written into every file (SOURCE_DATE_EPOCH for reproducible output)
	Page    PageSize  // the drawing's paper, see DrawingOptions
	Fit     Fit       // a board larger than the page, see DrawingOptions
}

// Files lists every file of a built design (the result of synth.Build,
// with its Layout), in the order they are written: report.json, the
// Touchstone files, the Gerber layers, the drill and job files, the
// drawing, the SVG preview and the plots.
func Files(res *synth.Result, opt FileOptions) []Artefact {
	rep := NewReport(res, opt.Version)
	lay := res.Layout
	meta := Meta{ProjectName: res.Design.Name, Version: opt.Version, Created: opt.Created}
	if b := res.Stackup.Board; b != nil {
		meta.Layers = b.Layers
	}
	base := res.Design.Name
	files := []Artefact{
		{"report.json", func(w io.Writer) error { return WriteReport(w, rep) }},
		{"network.s2p", func(w io.Writer) error {
			return writeTouchstone(w, networkRecords(res), TouchstoneComments(res, opt.Version, "the matching network: port 1 the source side, port 2 the load port"))
		}},
		{"matched.s1p", func(w io.Writer) error {
			return writeTouchstone(w, inputRecords(res), TouchstoneComments(res, opt.Version, "the input of the matched load"))
		}},
	}
	fabFrom := len(files) // the fab archive holds the files from here to the notes
	for _, layer := range LayersOf(lay) {
		files = append(files, Artefact{layer.FileName(base), func(w io.Writer) error { return WriteGerber(w, lay, layer, meta) }})
	}
	if len(lay.Vias) > 0 {
		files = append(files, Artefact{ExcellonFileName(base), func(w io.Writer) error { return WriteExcellon(w, lay, meta) }})
	}
	files = append(files,
		Artefact{JobFileName(base), func(w io.Writer) error { return WriteGerberJob(w, lay, meta, JobStackFor(res)) }},
	)
	files = append(files, StructureFiles(res, opt)...)
	notes := NewFabNotes(res, rep, lay)
	files = append(files, Artefact{FabNotesFileName, func(w io.Writer) error { return WriteFabNotes(w, notes) }})
	// The fab archive: the Gerbers, the drill and job files and the notes.
	fab := append([]Artefact(nil), files[fabFrom:]...)
	files = append(files, Artefact{FabZipFileName(base), func(w io.Writer) error { return WriteFabZip(w, fab, opt.Created) }})
	files = append(files, Artefact{DXFFileName(base), func(w io.Writer) error { return WriteDXF(w, lay) }})
	dopt := DrawingOptions{Page: opt.Page, Fit: opt.Fit, Created: opt.Created, Version: opt.Version, FabNotes: &notes}
	files = append(files,
		Artefact{"drawing.pdf", func(w io.Writer) error { return WritePDF(w, rep, lay, dopt) }},
		Artefact{"layout.svg", func(w io.Writer) error { return WriteSVG(w, rep, lay) }},
	)
	// The plots, by file name.
	var plots []Artefact
	for _, p := range Plots() {
		for _, f := range ImageFormats() {
			plots = append(plots, Artefact{p.FileName(f), func(w io.Writer) error { return WritePlot(w, rep, p, f) }})
		}
	}
	sort.Slice(plots, func(i, j int) bool { return plots[i].Name < plots[j].Name })
	files = append(files, plots...)
	return files
}

// JobStackOf returns the material stack the Gerber job file reports for st.
func JobStackOf(st stackups.Stackup) JobStack {
	js := JobStack{DielectricName: st.Name, Er: st.Dielectric.Er, LossTangent: st.Dielectric.LossTangent,
		DielectricThickness: st.Dielectric.Thickness, CopperThickness: st.Copper.Thickness}
	if st.Mask != nil {
		js.Mask, js.MaskThickness, js.MaskEr = true, st.Mask.Thickness, st.Mask.Er
	}
	return js
}

// JobStackFor returns the job file's stack for a build: JobStackOf its
// stackup, the multilayer board a layer-pair stackup belongs to, the
// design's finish, and impedance control (every line is sized for its
// Z0, so the fab is to hold the widths of the impedance table).
func JobStackFor(res *synth.Result) JobStack {
	js := JobStackOf(res.Stackup)
	if b := res.Stackup.Board; b != nil {
		js.Layers, js.BoardThickness = b.Layers, b.Thickness
	}
	js.Finish = synth.FinishJobName(res.Design.Fab.Finish)
	js.ImpedanceControlled = true
	return js
}

// TouchstoneComments returns the comment lines of a build's Touchstone
// files: the tool, what the file holds, the design and that it is simulated.
func TouchstoneComments(res *synth.Result, version, what string) []string {
	return []string{
		fmt.Sprintf("stubcraft %s: %s", version, what),
		fmt.Sprintf("design %s at %s on %s, reference %g ohm", res.Design.Name, units.FormatFrequency(res.Design.Freq, 6), res.Stackup.Name, res.Design.Z0),
		"simulated, not measured: verify with a network analyser",
	}
}

// NetworkTouchstone returns the matching network alone as a two-port
// across the sweep (port 1 the source side, port 2 the load port).
func NetworkTouchstone(res *synth.Result) *physical.Touchstone {
	t := &physical.Touchstone{Ports: 2, Z0: res.Design.Z0}
	for i, f := range res.Sweep.Freqs {
		s := res.Sweep.Network[i]
		t.Freqs = append(t.Freqs, f)
		t.S = append(t.S, []complex128{s[0][0], s[0][1], s[1][0], s[1][1]})
	}
	return t
}

// networkRecords are NetworkTouchstone's records read straight from the
// sweep: a long sweep is not copied before it is written.
func networkRecords(res *synth.Result) touchRecords {
	sw := res.Sweep
	return touchRecords{ports: 2, z0: res.Design.Z0, freqs: sw.Freqs, n: len(sw.Network),
		row: func(k int, dst []complex128) []complex128 {
			s := sw.Network[k]
			dst[0], dst[1], dst[2], dst[3] = s[0][0], s[0][1], s[1][0], s[1][1]
			return dst
		}}
}

// inputRecords are InputTouchstone's records read straight from the sweep.
func inputRecords(res *synth.Result) touchRecords {
	sw := res.Sweep
	return touchRecords{ports: 1, z0: res.Design.Z0, freqs: sw.Freqs, n: len(sw.S11),
		row: func(k int, dst []complex128) []complex128 {
			dst[0] = sw.S11[k]
			return dst
		}}
}

// InputTouchstone returns the input of the matched load as a one-port
// across the sweep.
func InputTouchstone(res *synth.Result) *physical.Touchstone {
	t := &physical.Touchstone{Ports: 1, Z0: res.Design.Z0}
	for i, f := range res.Sweep.Freqs {
		t.Freqs = append(t.Freqs, f)
		t.S = append(t.S, []complex128{res.Sweep.S11[i]})
	}
	return t
}

// StructureFiles lists the files of the build's calibration and test
// structures: each has its own outline and so its own Gerber layers, drill
// file when it has holes, and job file, named after it (NAME-cal-KIND).
func StructureFiles(res *synth.Result, opt FileOptions) []Artefact {
	var files []Artefact
	for _, s := range res.Structures {
		lay := s.Layout
		meta := Meta{ProjectName: lay.Name, Version: opt.Version, Created: opt.Created}
		for _, layer := range LayersOf(lay) {
			files = append(files, Artefact{layer.FileName(lay.Name), func(w io.Writer) error { return WriteGerber(w, lay, layer, meta) }})
		}
		if len(lay.Vias) > 0 {
			files = append(files, Artefact{ExcellonFileName(lay.Name), func(w io.Writer) error { return WriteExcellon(w, lay, meta) }})
		}
		files = append(files, Artefact{JobFileName(lay.Name), func(w io.Writer) error { return WriteGerberJob(w, lay, meta, JobStackFor(res)) }})
	}
	return files
}
