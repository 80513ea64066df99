package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"time"

	"github.com/spf13/cobra"

	"stubcraft/export"
	"stubcraft/physical"
	"stubcraft/physical/fdtd"
	"stubcraft/synth"
	"stubcraft/synth/fullwave"
)

// verifyReport is what verify prints with --json and writes as
// fullwave.json.
type verifyReport struct {
	Design      string  `json:"design"`
	Mesh        string  `json:"mesh"`
	FrequencyHz float64 `json:"frequency_hz"`
	fullwave.Summary
}

func newVerifyCmd() *cobra.Command {
	var (
		outDir, meshArg         string
		asJSON, force, mismatch bool
		memMiB                  int
	)
	cmd := &cobra.Command{
		Use:   "verify [DESIGN.toml]",
		Short: "Check the drawn copper with a full-wave (3-D FDTD) solve",
		Long: `Build the design with the same checks as build, then solve the drawn copper
full-wave (three-dimensional FDTD: perfect copper, drawn with its
thickness where it is no thinner than the substrate's cells and always on
a grounded-coplanar board, a sheet elsewhere; a solder mask over the
copper, following it where the copper is drawn thick; the substrate with
its loss tangent, the ground plane, and the vias with their drill radius),
attach the load by network math and compare with the circuit model. It writes
fullwave.s2p (the network alone, port 1 the source side, port 2 the load
port, as network.s2p), fullwave-matched.s1p, fullwave.json and plots that
overlay the full-wave and circuit |S11|. Without a design it checks the
embedded demo. A run that does not converge writes nothing.`,
		Example: `  stubcraft verify -o fw
  stubcraft verify probe.toml -o fw --mesh normal --json`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			path := ""
			if len(args) == 1 {
				path = args[0]
			}
			opt, err := fullwaveOptions(meshArg, memMiB)
			if err != nil {
				return err
			}
			in, err := loadDesign(path, "")
			if err != nil {
				return err
			}
			out, err := openOutput(cmd, outDir, force, path, in.Design.StackupRef(), in.Design.Load.Touchstone)
			if err != nil {
				return err
			}
			defer out.Close()
			cache := synth.NewSolverCache()
			in.Lines = synth.LineMakerFor(cmd.Context(), in.Stackup, cache)
			in.SkipTolerance, in.AcceptMismatch = true, mismatch
			res, err := synth.Build(cmd.Context(), in)
			if err != nil {
				var mm *synth.MismatchError
				if errors.As(err, &mm) {
					err = fmt.Errorf("%w; fix the network or pass --accept-mismatch to check it anyway", err)
				}
				return inDesign(path, err)
			}
			stop := fullwaveProgress(&opt)
			rep, err := fullwave.Verify(cmd.Context(), res, opt)
			stop()
			if err != nil {
				return fullwaveError(err)
			}
			vr := verifyReport{Design: res.Design.Name, Mesh: meshArg, FrequencyHz: res.Design.Freq, Summary: rep.Summary}
			files := append([]artefact{{"fullwave.json", func(w io.Writer) error { return printJSON(w, vr) }}},
				fullwaveFiles(res, rep, meshArg)...)
			if err := out.write(cmd.Context(), files); err != nil {
				return err
			}
			if asJSON {
				return printJSON(cmd.OutOrStdout(), vr)
			}
			w := cmd.OutOrStdout()
			printfMinus(w, "full-wave |S11| at f0: %.1f dB (circuit model %.1f dB)\n", vr.S11DBF0, vr.CircuitS11DBF0)
			fmt.Fprintf(w, "best match: %.4f GHz full-wave, %.4f GHz circuit model (f0 %.4f GHz)\n", vr.BestMatchHz/1e9, vr.CircuitBestMatchHz/1e9, vr.FrequencyHz/1e9)
			fmt.Fprintf(w, "largest |S_fullwave − S_circuit| of the network: %.3f\n", vr.MaxSDifference)
			fmt.Fprintf(w, "%d cells, %d steps, %.1f s; files in %s\n", vr.Cells, vr.Steps, vr.Seconds, outDir)
			return nil
		},
	}
	f := cmd.Flags()
	f.StringVarP(&outDir, "out", "o", "", "write the full-wave results into this directory (required)")
	f.BoolVar(&force, "force", false, "replace an existing output directory written by stubcraft")
	f.BoolVar(&asJSON, "json", false, "print the result as JSON")
	f.StringVar(&meshArg, "mesh", "normal", "mesh density: coarse, normal or fine")
	f.BoolVar(&mismatch, "accept-mismatch", false, "check the copper even when the layout does not match (|S11| at f0 above −10 dB)")
	f.IntVar(&memMiB, "memory", 1024, "refuse a grid whose estimate exceeds this many MiB")
	_ = cmd.MarkFlagRequired("out")
	return cmd
}

// fullwaveOptions returns the solve options of --mesh and --memory, or
// the refusal of a bad value.
func fullwaveOptions(meshArg string, memMiB int) (fdtd.Options, error) {
	var mesh fdtd.MeshLevel
	switch meshArg {
	case "coarse":
		mesh = fdtd.Coarse
	case "normal":
		mesh = fdtd.Normal
	case "fine":
		mesh = fdtd.Fine
	default:
		return fdtd.Options{}, fmt.Errorf("--mesh %q: want coarse, normal or fine", meshArg)
	}
	if memMiB <= 0 {
		return fdtd.Options{}, fmt.Errorf("--memory %d: want a positive number of MiB", memMiB)
	}
	return fdtd.Options{Mesh: mesh.Params(), MemoryLimit: int64(memMiB) << 20}, nil
}

// fullwaveError names the option that lowers a grid above the memory
// limit.
func fullwaveError(err error) error {
	var me *fdtd.MemoryError
	if errors.As(err, &me) {
		return fmt.Errorf("%w (or raise --memory)", err)
	}
	return err
}

// fullwaveFiles are the full-wave records of rep, the check of res's
// drawn copper: fullwave.s2p (the network alone, as network.s2p),
// fullwave-matched.s1p and the plots that overlay the full-wave and the
// circuit model.
func fullwaveFiles(res *synth.Result, rep *fullwave.Report, meshArg string) []artefact {
	z0 := res.Design.Z0
	net := &physical.Touchstone{Ports: 2, Z0: z0, Freqs: rep.Freqs}
	in1 := &physical.Touchstone{Ports: 1, Z0: z0, Freqs: rep.Freqs}
	for k := range rep.Freqs {
		s := rep.Network[k]
		net.S = append(net.S, []complex128{s[0][0], s[0][1], s[1][0], s[1][1]})
		in1.S = append(in1.S, []complex128{rep.Matched[k]})
	}
	comments := func(what string) []string {
		c := export.TouchstoneComments(res, version, what)
		return append(c, fmt.Sprintf("full-wave FDTD, %s mesh, %d cells, %d steps", meshArg, rep.Cells, rep.Steps))
	}
	curves := export.FullwaveCurves{Name: res.Design.Name, F0: res.Design.Freq, Z0: z0, Freqs: rep.Freqs,
		Fullwave: rep.Matched, Circuit: rep.CircuitMatched}
	files := []artefact{
		{"fullwave.s2p", func(w io.Writer) error {
			return export.WriteTouchstone(w, net, comments("the matching network, full-wave: port 1 the source side, port 2 the load port"))
		}},
		{"fullwave-matched.s1p", func(w io.Writer) error {
			return export.WriteTouchstone(w, in1, comments("the input of the matched load, full-wave network"))
		}},
	}
	for _, name := range export.FullwavePlotNames() {
		files = append(files, artefact{name, func(w io.Writer) error { return export.WriteFullwavePlot(w, name, curves) }})
	}
	return files
}

// fullwaveProgress sets o.Progress to show, on stderr when it is a
// terminal, which run the solve is in, the field energy's decay and an
// estimate of the time left. The returned function ends the line.
func fullwaveProgress(o *fdtd.Options) (stop func()) {
	if !isTerminal(os.Stderr) {
		return func() {}
	}
	var l progressLine
	o.Progress = func(p fdtd.Progress) { l.show("", p) }
	return l.end
}

// centreProgress sets o.Progress to show the same as fullwaveProgress,
// after the centring run.
func centreProgress(o *fullwave.CentreOptions) (stop func()) {
	if !isTerminal(os.Stderr) {
		return func() {}
	}
	var l progressLine
	o.Progress = func(c fullwave.CentreProgress) {
		l.show(fmt.Sprintf("centring run %d of at most %d, ", c.Run, c.MaxRuns), c.Progress)
	}
	return l.end
}

// progressLine is a line of full-wave progress on stderr, redrawn in
// place.
type progressLine struct{ shown bool }

func (l *progressLine) show(head string, p fdtd.Progress) {
	eta := "?"
	if p.EstimatedRemain > 0 {
		eta = p.EstimatedRemain.Round(time.Second).String()
	}
	fmt.Fprintf(os.Stderr, "\r%sfull-wave run %d of %d: step %d, energy %.0f dB of %.0f dB, %s elapsed, about %s left   ",
		head, p.Run, p.Runs, p.Step, p.EnergyDB, p.TargetDB, p.Elapsed.Round(time.Second), eta)
	l.shown = true
}

func (l *progressLine) end() {
	if l.shown {
		fmt.Fprintln(os.Stderr)
	}
}
