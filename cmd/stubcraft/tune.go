package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/export"
	"stubcraft/physical"
	"stubcraft/synth"
	"stubcraft/synth/tune"
)

// tuneReport is what tune prints with --json and writes as tune.json.
type tuneReport struct {
	Design               string     `json:"design"`
	Measurement          string     `json:"measurement"`
	FrequencyHz          float64    `json:"frequency_hz"`
	Points               int        `json:"points"`
	MeasuredBestMatchHz  float64    `json:"measured_best_match_hz"`
	FittedEr             float64    `json:"fitted_er"`
	FittedErRatio        float64    `json:"fitted_er_ratio"`
	FittedErRatioSigma   float64    `json:"fitted_er_ratio_sigma"`
	FittedEtchUM         float64    `json:"fitted_etch_um"`
	FittedEtchUMSigma    float64    `json:"fitted_etch_um_sigma"`
	FittedLoadScale      *float64   `json:"fitted_load_scale,omitempty"`
	FittedLoadScaleSigma *float64   `json:"fitted_load_scale_sigma,omitempty"`
	ResidualDB           float64    `json:"residual_db"`
	Trims                []tuneTrim `json:"trims"`
	PredictedBestMatchHz float64    `json:"predicted_best_match_hz"`
	PredictedS11DBF0     float64    `json:"predicted_s11_db_f0"`
	Notes                []string   `json:"notes"`
}

type tuneTrim struct {
	ID     string  `json:"id"`
	TrimMM float64 `json:"trim_mm"` // length to cut from the open end; negative: the stub would have to grow
	CanCut bool    `json:"can_cut"`
}

func newTuneCmd() *cobra.Command {
	var (
		outDir, pageArg, scaleArg string
		asJSON, fitLoad, force    bool
	)
	cmd := &cobra.Command{
		Use:   "tune DESIGN.toml MEASURED.s1p",
		Short: "Fit a measured S11 of the etched board and say how much to trim",
		Long: `Read the measured input reflection of an etched board at its source port
(Touchstone 1.1, one port, any format), fit the board's relative εr, the
etch (µm removed per edge; positive means narrower than drawn) and,
with --fit-load, a scale of the load, by least squares over the measured
band on the full model; then report the cut of each open stub that brings
the best match back to f0. With -o it writes the drawing of the trimmed
board and tune.json. A measurement that does not cover f0, or that no board
state explains, is refused and gives no trims.

` + cautionText(),
		Example: `  stubcraft tune probe.toml bench/probe-board-3.s1p
  stubcraft tune probe.toml bench/probe-board-3.s1p --json -o trimmed`,
		Args: cobra.ExactArgs(2),
		RunE: func(cmd *cobra.Command, args []string) error {
			page, err := parsePage(pageArg, scaleArg)
			if err != nil {
				return err
			}
			in, err := loadDesign(args[0], "")
			if err != nil {
				return err
			}
			in.SkipTolerance = true
			in.Lines = synth.LineMakerFor(cmd.Context(), in.Stackup, newSolverCache())
			res, err := synth.Build(cmd.Context(), in)
			if err != nil {
				return inDesign(args[0], err)
			}
			meas, err := readMeasurement(args[1], res.Design.Z0)
			if err != nil {
				return err
			}
			tr, err := res.Tune(cmd.Context(), meas, synth.TuneOptions{FitLoad: fitLoad})
			if err != nil {
				return err
			}
			rep := newTuneReport(res, tr, args[0], args[1])
			if outDir != "" {
				out, err := openOutput(cmd, outDir, force, args[0], args[1], in.Design.StackupRef(), in.Design.Load.Touchstone)
				if err != nil {
					return err
				}
				defer out.Close()
				trimmed, err := res.Trimmed(tr.Trims.Trims)
				if err != nil {
					return err
				}
				created, err := creationTime()
				if err != nil {
					return err
				}
				files := []artefact{{"tune.json", func(w io.Writer) error { return printJSON(w, rep) }}}
				for _, f := range export.Files(trimmed, export.FileOptions{Version: version, Created: created, Page: page.Size, Fit: page.Fit}) {
					if f.Name == "drawing.pdf" || f.Name == "layout.svg" {
						files = append(files, artefact{f.Name, f.Write})
					}
				}
				if err := out.write(cmd.Context(), files); err != nil {
					return err
				}
			}
			if asJSON {
				return printJSON(cmd.OutOrStdout(), rep)
			}
			return printTune(cmd.OutOrStdout(), rep, outDir)
		},
	}
	f := cmd.Flags()
	f.StringVarP(&outDir, "out", "o", "", "write the trimmed board's drawing and tune.json into this directory")
	f.BoolVar(&force, "force", false, "replace an existing output directory written by stubcraft")
	f.BoolVar(&asJSON, "json", false, "print the result as JSON")
	f.BoolVar(&fitLoad, "fit-load", false, "also fit a scale of the load impedance")
	f.StringVar(&pageArg, "page", "a4", "drawing page size: a4 or letter")
	f.StringVar(&scaleArg, "fit", "scale", `when the board does not fit the page at 1:1: "scale" or "tile"`)
	return cmd
}

// readMeasurement reads a one-port Touchstone file of a measured board
// and refers it to z0.
func readMeasurement(path string, z0 float64) (tune.Measurement, error) {
	t, err := physical.ReadTouchstoneFile(path, 1)
	if err != nil {
		return tune.Measurement{}, err
	}
	s11 := make([]complex128, len(t.S))
	for i, row := range t.S {
		s11[i] = row[0]
	}
	return tune.MeasurementFrom(t.Freqs, s11, t.Z0, z0, t.Freqs[0], t.Freqs[len(t.Freqs)-1], path), nil
}

func newTuneReport(res *synth.Result, tr *synth.TuneResult, design, measured string) tuneReport {
	fit := tr.Fit
	rep := tuneReport{
		Design: design, Measurement: measured, FrequencyHz: res.Design.Freq, Points: fit.Points,
		MeasuredBestMatchHz: tr.MeasuredBestMatch,
		FittedEr:            res.Physical.Board.Sub.Er * fit.State.ErRatio,
		FittedErRatio:       fit.State.ErRatio, FittedErRatioSigma: fit.Sigma.ErRatio,
		FittedEtchUM: fit.State.Etch * 1e6, FittedEtchUMSigma: fit.Sigma.Etch * 1e6,
		ResidualDB:           fit.ResidualDB,
		PredictedBestMatchHz: tr.Trims.BestMatch,
		PredictedS11DBF0:     physical.MagDB(tr.Trims.S11F0),
		Notes:                append([]string{}, tr.Trims.Notes...),
		Trims:                []tuneTrim{},
	}
	if fit.Sigma.LoadScale != 0 || fit.State.LoadScale != 1 {
		s, sig := fit.State.LoadScale, fit.Sigma.LoadScale
		rep.FittedLoadScale, rep.FittedLoadScaleSigma = &s, &sig
	}
	for _, t := range tr.Trims.Trims {
		rep.Trims = append(rep.Trims, tuneTrim{ID: t.ID, TrimMM: t.Cut * 1e3, CanCut: t.CanCut()})
	}
	return rep
}

func printTune(w io.Writer, r tuneReport, dir string) error {
	fmt.Fprintf(w, "%s against %s (%d points)\n", r.Design, r.Measurement, r.Points)
	fmt.Fprintf(w, "measured best match: %s (design f0 %s)\n", tuneHz(r.MeasuredBestMatchHz), tuneHz(r.FrequencyHz))
	fmt.Fprintf(w, "fitted εr: %.4g (%.4f ± %.4f of the design's)\n", r.FittedEr, r.FittedErRatio, r.FittedErRatioSigma)
	printfMinus(w, "fitted etch: %+.1f ± %.1f µm per edge (positive: narrower than drawn)\n", r.FittedEtchUM, r.FittedEtchUMSigma)
	if r.FittedLoadScale != nil {
		fmt.Fprintf(w, "fitted load scale: %.4f ± %.4f\n", *r.FittedLoadScale, *r.FittedLoadScaleSigma)
	}
	fmt.Fprintf(w, "residual: %.2f dB RMS of |S11|\n", r.ResidualDB)
	if len(r.Trims) > 0 {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "\nstub\tcut from the open end (mm)\t")
		for _, t := range r.Trims {
			printfMinus(tw, "%s\t%.3f\t\n", t.ID, t.TrimMM)
		}
		if err := tw.Flush(); err != nil {
			return err
		}
		fmt.Fprintf(w, "predicted after the trims: best match %s, |S11| at f0 %s\n", tuneHz(r.PredictedBestMatchHz), export.ModelDB(r.PredictedS11DBF0))
	}
	for _, n := range r.Notes {
		fmt.Fprintln(w, "note:", export.Minus(n))
	}
	if dir != "" {
		fmt.Fprintf(w, "wrote the trimmed drawing to %s\n", dir)
	}
	fmt.Fprintf(w, "\n%s", cautionText())
	return nil
}

// tuneHz prints a frequency in MHz below 1 GHz and in GHz above.
func tuneHz(f float64) string {
	if f < 1e9 {
		return fmt.Sprintf("%.6g MHz", f/1e6)
	}
	return fmt.Sprintf("%.6g GHz", f/1e9)
}
