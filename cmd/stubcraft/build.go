package main

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/cmd/stubcraft/internal/outdir"
	"stubcraft/export"
	"stubcraft/physical/fdtd"
	"stubcraft/physical/units"
	"stubcraft/synth"
	"stubcraft/synth/fullwave"
)

func cautionText() string {
	var b strings.Builder
	b.WriteString("RF safety:\n")
	for _, c := range export.Cautions() {
		b.WriteString("  - " + c + "\n")
	}
	return b.String()
}

func newBuildCmd() *cobra.Command {
	var (
		outDir, stackupArg, pageArg, scaleArg      string
		force, noTolerance, asJSON, acceptMismatch bool
		acceptLoss, fullwaveCentre                 bool
		samples, memMiB                            int
		meshArg                                    string
	)
	cmd := &cobra.Command{
		Use:   "build [design.toml]",
		Short: "Build a design into corrected copper, fab files and a drawing",
		Long: `Build a design file (or, with no file, the embedded demo): solve or take
the electrical network, size every line on the stackup, correct the
lengths for open ends, T-junctions and vias, re-centre the layout in the
full model, sweep the band, run the tolerance analysis, and write the
report, Touchstone files, Gerber X2 artwork, drill and job files and the
dimensioned drawing into the output directory, with a manifest
(stubcraft-manifest.sha256) of every file and its SHA-256. Nothing is
written when any step fails or the build is interrupted (exit 130 for
SIGINT, 143 for SIGTERM); the new directory replaces the old in one step.

An existing directory is refused unless --force is given. --force
replaces only a directory stubcraft wrote: one that holds its manifest
and no file the manifest does not list, or an empty one. It refuses,
listing what would be lost, a directory with any other file or
subdirectory, and one that holds the design, stackup or Touchstone file
being built. A symbolic link stays; its target gets the build. A second
build to the same directory waits up to 3 s, then fails "in use by
process N".

--fullwave-centre re-centres the drawn lengths on full-wave (3-D FDTD)
runs of the copper, as verify solves it (--mesh, --memory): after each
run whose best match is more than 0.3 % from f0 it maps the circuit
model onto the full-wave result (a length offset per line and stub, and
the S11 left over at f0), re-centres the lengths in the mapped model and
solves the new copper again, at most three runs in all. report.json
(fullwave_centre) and the notes give every run's best match and |S11| at
f0 and the mapping applied; fullwave.s2p, fullwave-matched.s1p and the
full-wave plots are the kept layout's. When no run comes within 0.3 %
the build says so in a warning and keeps the run nearest f0. A band
match is not centred. Each run takes as long as verify on that mesh.

` + cautionText(),
		Example: `  stubcraft build -o out
  stubcraft build design.toml -o out --force --page letter
  stubcraft build design.toml -o out --fullwave-centre --mesh coarse`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			path := ""
			if len(args) == 1 {
				path = args[0]
			}
			var fwOpt fdtd.Options
			if fullwaveCentre {
				var err error
				if fwOpt, err = fullwaveOptions(meshArg, memMiB); err != nil {
					return err
				}
			} else {
				for _, name := range []string{"mesh", "memory"} {
					if cmd.Flags().Changed(name) {
						return fmt.Errorf("--%s sets the full-wave solve of --fullwave-centre; give --fullwave-centre too, or leave --%s out", name, name)
					}
				}
				limitBuildMemory()
			}
			in, err := loadDesign(path, stackupArg)
			if err != nil {
				return err
			}
			if fullwaveCentre {
				if err := fullwave.CanCentre(in); err != nil {
					return inDesign(path, err)
				}
			}
			out, err := openOutput(cmd, outDir, force, path, in.Design.StackupRef(), stackupArg, in.Design.Load.Touchstone)
			if err != nil {
				return err
			}
			defer out.Close()
			if cmd.Flags().Changed("samples") {
				if samples < 0 {
					return fmt.Errorf("--samples %d: must not be negative", samples)
				}
				in.Design.Tolerance.Samples = samples
			}
			page, err := parsePage(pageArg, scaleArg)
			if err != nil {
				return err
			}
			cache := newSolverCache()
			in.Lines = synth.LineMakerFor(cmd.Context(), in.Stackup, cache)
			in.SkipTolerance, in.AcceptMismatch, in.AcceptLoss = noTolerance, acceptMismatch, acceptLoss
			stop := solverProgress(cache)
			res, err := synth.Build(cmd.Context(), in)
			stop()
			if err != nil {
				var mismatch *synth.MismatchError
				if errors.As(err, &mismatch) {
					err = fmt.Errorf("%w; fix the network or pass --accept-mismatch to write it anyway", err)
				}
				return inDesign(path, err)
			}
			var centred *fullwave.Centring
			if fullwaveCentre {
				co := fullwave.CentreOptions{Solve: fwOpt, Mesh: meshArg}
				stop := centreProgress(&co)
				centred, err = fullwave.Centre(cmd.Context(), in, co)
				stop()
				if err != nil {
					var mismatch *synth.MismatchError
					if errors.As(err, &mismatch) {
						err = fmt.Errorf("%w; pass --accept-mismatch to write it anyway", err)
					}
					return inDesign(path, fullwaveError(err))
				}
				res = centred.Result
			}
			res.Notes = append(res.Notes, cacheNotes(cache)...)
			created, err := creationTime()
			if err != nil {
				return err
			}
			var files []artefact
			for _, f := range export.Files(res, export.FileOptions{Version: version, Created: created, Page: page.Size, Fit: page.Fit}) {
				files = append(files, artefact{f.Name, f.Write})
			}
			if centred != nil {
				files = append(files, fullwaveFiles(res, centred.Report, meshArg)...)
			}
			if err := out.write(cmd.Context(), files); err != nil {
				return err
			}
			rep := export.NewReport(res, version)
			if c := res.FullwaveCentre; c != nil && !c.Converged {
				fmt.Fprintln(cmd.ErrOrStderr(), "warning:", res.Warnings[0])
			}
			if asJSON {
				return export.WriteReport(cmd.OutOrStdout(), rep)
			}
			if centred != nil {
				if err := printCentring(cmd.OutOrStdout(), rep.FullwaveCentre, centred.Result.FullwaveCentre); err != nil {
					return err
				}
			}
			return printSummary(cmd.OutOrStdout(), rep, outDir, files)
		},
	}
	f := cmd.Flags()
	f.StringVarP(&outDir, "out", "o", "stubcraft-out", "output directory")
	f.BoolVar(&force, "force", false, "replace an existing output directory that stubcraft wrote (never one holding other files or the inputs)")
	f.StringVar(&stackupArg, "stackup", "", "build on this stackup instead of the design's (preset name or TOML path)")
	f.BoolVar(&noTolerance, "no-tolerance", false, "skip the Monte Carlo tolerance analysis")
	f.IntVar(&samples, "samples", 0, "Monte Carlo samples (overrides the design file)")
	f.StringVar(&pageArg, "page", "a4", "drawing page size: a4 or letter")
	f.StringVar(&scaleArg, "fit", "scale", `when the board does not fit the page at 1:1: "scale" (a stated smaller scale) or "tile" (1:1 across pages)`)
	f.BoolVar(&asJSON, "json", false, "print the report JSON instead of the summary")
	f.BoolVar(&acceptMismatch, "accept-mismatch", false, "write the files even when the layout does not match (|S11| at f0 above −10 dB)")
	f.BoolVar(&acceptLoss, "accept-loss", false, "build a load even when the network would burn more than half the source's power (3 dB) at f0 or |Γ_load| is above 0.98")
	f.BoolVar(&fullwaveCentre, "fullwave-centre", false, "re-centre the drawn lengths on up to three full-wave (3-D FDTD) solves, until the full-wave best match is within 0.3 % of f0")
	f.StringVar(&meshArg, "mesh", "normal", "with --fullwave-centre: full-wave mesh density, coarse, normal or fine")
	f.IntVar(&memMiB, "memory", 1024, "with --fullwave-centre: refuse a full-wave grid whose estimate exceeds this many MiB")
	_ = cmd.RegisterFlagCompletionFunc("stackup", completeStackup)
	_ = cmd.RegisterFlagCompletionFunc("mesh", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{"coarse", "normal", "fine"}, cobra.ShellCompDirectiveNoFileComp
	})
	_ = cmd.RegisterFlagCompletionFunc("page", func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
		return []string{"a4", "letter"}, cobra.ShellCompDirectiveNoFileComp
	})
	return cmd
}

// inDesign names the design file in err unless err already does.
func inDesign(path string, err error) error {
	var de *synth.DesignError
	if errors.As(err, &de) {
		return err
	}
	return fmt.Errorf("%s: %w", designName(path), err)
}

func designName(path string) string {
	if path == "" {
		return "demo design"
	}
	return path
}

// printSummary writes the human-readable account of a build.
func printSummary(w io.Writer, rep export.Report, dir string, files []artefact) error {
	fmt.Fprintf(w, "%s at %s, %g Ω, on %s (%s)\n", rep.Name, units.FormatFrequency(rep.FrequencyHz, 6), rep.Z0Ohm, rep.Stackup.Name, rep.Model)
	fmt.Fprintln(w, export.Headline(rep))
	fmt.Fprintln(w, "verdict:", rep.Summary.Verdict)
	fmt.Fprintf(w, "load %s Ω: |Γ| %.3f, VSWR %.2f, return loss %.2f dB\n\n", units.FormatImpedanceWith(complex(rep.Load.ROhm, rep.Load.XOhm), units.ImpedanceStyle{Decimals: 2}), rep.Load.GammaMag, rep.Load.VSWR, rep.Load.ReturnLossDB)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "element\trole\tend\tZ0 (Ω)\twidth (mm)\telectrical (°)\tline (mm)\topen end (mm)\ttee (mm)\tvia (mm)\tre-centre (mm)\tdrawn (mm)\t")
	for _, e := range rep.Elements {
		end := e.End
		if end == "" {
			end = "—"
		}
		role := e.Role
		if e.Feed {
			role = "feed"
		}
		printfMinus(tw, "%s\t%s\t%s\t%.1f\t%.3f\t%.2f\t%.3f\t%+.3f\t%+.3f\t%+.3f\t%+.3f\t%.3f\t\n", e.ID, role, end, e.Z0Ohm, e.WidthMM,
			e.ElectricalDeg, e.LineLengthMM, e.OpenEndMM, e.TeeMM, e.ViaMM, e.RecentreMM, e.DrawnLengthMM)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(w, "\n|S11| at f0: %s drawn (%s without the discontinuity corrections; %s before re-centring)\n",
		export.ModelDB(rep.S11DBF0), export.ModelDB(rep.S11DBF0Uncorr), export.ModelDB(rep.Recentring.S11DBBefore))
	if rep.Bandwidth10DBHz > 0 {
		fmt.Fprintf(w, "band |S11| < −10 dB: %s (%.1f MHz)\n", units.FormatFrequencyRange(rep.Band10DBHz[0], rep.Band10DBHz[1], 4), rep.Bandwidth10DBHz/1e6)
	}
	if rep.Bandwidth20DBHz > 0 {
		fmt.Fprintf(w, "band |S11| < −20 dB: %s (%.1f MHz)\n", units.FormatFrequencyRange(rep.Band20DBHz[0], rep.Band20DBHz[1], 4), rep.Bandwidth20DBHz/1e6)
	}
	if b := rep.Band; b != nil {
		goal := "no goal"
		if b.GoalDB != nil {
			goal = fmt.Sprintf("goal %.1f dB", *b.GoalDB)
		}
		printfMinus(w, "across %s (%s, objective %s): worst |S11| %.2f dB, %s; Bode-Fano limit %s\n",
			units.FormatFrequencyRange(b.StartHz, b.StopHz, 6), b.Topology, b.Objective, b.WorstS11DB, goal, b.BodeFanoNote)
	}
	fmt.Fprintf(w, "network loss at f0: %.3f dB\n", rep.NetworkLossDBF0)
	if t := rep.Tolerance; t != nil {
		printfMinus(w, "tolerance (%d boards, seed %d): |S11| at f0 median %.1f dB, 90th percentile %.1f dB, yield below %.0f dB %.1f %%\n",
			t.Samples, t.Seed, t.P50S11DB, t.P90S11DB, t.YieldBelowDB, 100*t.Yield)
	}
	if err := printSensitivity(w, rep.Sensitivity); err != nil {
		return err
	}
	for _, n := range rep.Notes {
		fmt.Fprintln(w, "note:", n)
	}
	for _, warn := range rep.Warnings {
		fmt.Fprintln(w, "warning:", warn)
	}
	fmt.Fprintf(w, "\nwrote %d files and %s to %s\n\n%s", len(files), outdir.ManifestName, dir, cautionText())
	return nil
}

// printCentring writes the account of build --fullwave-centre: one row
// per full-wave run, and whether it converged.
func printCentring(w io.Writer, c *export.ReportFullwaveCentre, rec *synth.FullwaveCentring) error {
	if c.Converged {
		fmt.Fprintf(w, "full-wave centring (%s mesh): converged, run %d of at most %d is within ±%.2g %% of f0\n", c.Mesh, c.KeptRun, c.MaxRuns, c.TolerancePct)
	} else {
		fmt.Fprintf(w, "full-wave centring (%s mesh): NOT CONVERGED after %d runs: none within ±%.2g %% of f0; the copper drawn is run %d's, the nearest\n", c.Mesh, len(c.Runs), c.TolerancePct, c.KeptRun)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "run\tbest match (GHz)\tfrom f0 (%)\t|S11| at f0 (dB)\tmapped circuit best match (GHz)\tcells\tsteps\ttime (s)\t")
	for i, r := range c.Runs {
		printfMinus(tw, "%d\t%.4f\t%+.2f\t%.1f\t%.4f\t%d\t%d\t%.0f\t\n", r.Run, r.BestMatchHz/1e9, r.BestMatchOffsetPct, r.S11DBF0, r.CircuitBestMatchHz/1e9, r.Cells, r.Steps, rec.Runs[i].Seconds)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(w)
	return nil
}

// printSensitivity writes the sensitivity table: what one step of each
// quantity does to the best match and to |S11| at f0.
func printSensitivity(w io.Writer, sens []export.ReportSensitivity) error {
	if len(sens) == 0 {
		return nil
	}
	fmt.Fprintln(w, "\nsensitivity (per step; for the bench):")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	if sens[0].WorstInBandDB != nil {
		fmt.Fprintln(tw, "element\tstep\tworst in band after (dB)\t|S11| at f0 after (dB)\t")
	} else {
		fmt.Fprintln(tw, "element\tstep\tbest match (MHz)\t|S11| at f0 after (dB)\t")
	}
	for _, s := range sens {
		move := "—"
		switch {
		case s.WorstInBandDB != nil:
			move = fmt.Sprintf("%.2f", *s.WorstInBandDB)
		case s.BestMatchShiftMHz != nil:
			move = fmt.Sprintf("%+.2f", *s.BestMatchShiftMHz)
		}
		printfMinus(tw, "%s\t%s\t%s\t%s\t\n", s.ID, s.Step, move, export.ModelDB(s.S11DBF0AfterStep))
	}
	return tw.Flush()
}
