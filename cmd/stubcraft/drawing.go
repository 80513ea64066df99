package main

import (
	"bytes"
	"fmt"
	"io"
	"sort"
	"time"

	"stubcraft/export"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// drawingArtefacts lists the drawing files of a build: the dimensioned
// drawing.pdf, the true-size layout.svg and the plot images. The plots are
// rendered once, lazily, by the first plot file written; a failure is
// reported by every plot file.
func drawingArtefacts(res *synth.Result, rep export.Report, lay geom.Layout, created time.Time, page pageSpec) []artefact {
	opt := export.DrawingOptions{Page: page.Size, Fit: page.Fit, Created: created, Version: version}
	files := []artefact{
		{"drawing.pdf", func(w io.Writer) error { return export.WritePDF(w, rep, lay, opt) }},
		{"layout.svg", func(w io.Writer) error { return export.WriteSVG(w, rep, lay) }},
	}
	var (
		plots   map[string][]byte
		plotErr error
		done    bool
	)
	render := func() (map[string][]byte, error) {
		if !done {
			plots, plotErr = export.WritePlots(rep)
			done = true
		}
		return plots, plotErr
	}
	names := export.PlotNames()
	sort.Strings(names)
	for _, name := range names {
		name := name
		files = append(files, artefact{name, func(w io.Writer) error {
			m, err := render()
			if err != nil {
				return fmt.Errorf("plots: %w", err)
			}
			_, err = io.Copy(w, bytes.NewReader(m[name]))
			return err
		}})
	}
	return files
}
