package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"stubcraft/cmd/stubcraft/internal/outdir"
	"stubcraft/export"
)

// printJSON writes v as indented JSON followed by a newline.
func printJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

// printfMinus writes format and a as fmt.Fprintf does, with the minus
// signs of its figures written as U+2212 (export.Minus).
func printfMinus(w io.Writer, format string, a ...any) {
	fmt.Fprint(w, export.Minus(fmt.Sprintf(format, a...)))
}

// artefact is one file of a build's output directory.
type artefact struct {
	name  string
	write func(io.Writer) error
}

// output is a build's output directory, locked from openOutput until
// Close.
type output struct{ *outdir.Target }

// openOutput locks the build's output directory and checks it may be
// written before any work is done; see package outdir. inputs are the
// files the build reads. Notes go to w.
func openOutput(cmd *cobra.Command, dir string, force bool, inputs ...string) (output, error) {
	w := cmd.ErrOrStderr()
	t, err := outdir.Open(cmd.Context(), dir, outdir.Options{Force: force, Inputs: inputs,
		Note: func(s string) { fmt.Fprintln(w, "note:", s) }})
	return output{t}, err
}

// write writes files and the manifest and puts them in place of the
// directory; nothing changes there if ctx is cancelled or a file fails.
func (o output) write(ctx context.Context, files []artefact) error {
	list := make([]outdir.File, len(files))
	for i, f := range files {
		list[i] = outdir.File{Name: f.name, Write: f.write}
	}
	return o.Write(ctx, list)
}
