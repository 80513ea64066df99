package main

import (
	"context"
	"fmt"
	"io"
	"strings"
	"stubcraft/physical"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/export"
	"stubcraft/physical/units"
	"stubcraft/stackups"
	"stubcraft/synth"
)

// compareRow is one stackup's outcome in "stubcraft compare".
type compareRow struct {
	Stackup        string    `json:"stackup"`
	Model          string    `json:"line_model"`
	WidthsMM       []float64 `json:"widths_mm"`
	CopperLengthMM float64   `json:"copper_length_mm"`
	CopperAreaMM2  float64   `json:"copper_area_mm2"`
	InsertionDB    float64   `json:"network_loss_db_f0"`
	P50S11DB       *float64  `json:"p50_s11_db,omitempty"`
	P90S11DB       *float64  `json:"p90_s11_db,omitempty"`
	S11DBF0        float64   `json:"s11_db_f0"`
	MinWidthMM     float64   `json:"narrowest_mm"`
	MeetsFab       bool      `json:"meets_fab_minimum"`
	Error          string    `json:"error,omitempty"`
}

func newCompareCmd() *cobra.Command {
	var (
		list, minWidthArg string
		noTolerance       bool
		samples           int
		asJSON            bool
	)
	cmd := &cobra.Command{
		Use:   "compare [design.toml]",
		Short: "Build one design on several laminates and compare them",
		Long: `Build the design (or the embedded demo) on every embedded preset, or on the
stackups listed with --stackups, and print for each: the widths, total
copper length and area, the network's own loss at f0, |S11| at f0, the
90th-percentile |S11| of the tolerance analysis, and whether every width
meets the fab minimum. Nothing is written to disk.`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			path := ""
			if len(args) == 1 {
				path = args[0]
			}
			in, err := loadDesign(path, "")
			if err != nil {
				return err
			}
			minWidth := in.Design.Fab.MinWidth
			if minWidthArg != "" {
				if minWidth, err = units.ParseLength(minWidthArg); err != nil {
					return fmt.Errorf("--min-width: %w", err)
				}
				if minWidth < 0 {
					return fmt.Errorf("--min-width %q: must not be negative", minWidthArg)
				}
			}
			if cmd.Flags().Changed("samples") {
				if samples < 0 {
					return fmt.Errorf("--samples %d: must not be negative", samples)
				}
				in.Design.Tolerance.Samples = samples
			}
			var sts []stackups.Stackup
			if list == "" {
				sts = stackups.Presets()
			} else {
				for _, name := range strings.Split(list, ",") {
					st, err := stackups.Load(strings.TrimSpace(name))
					if err != nil {
						return fmt.Errorf("--stackups: %w", err)
					}
					sts = append(sts, st)
				}
			}
			cache := newSolverCache()
			stop := solverProgress(cache)
			var rows []compareRow
			for _, st := range sts {
				in := in
				in.Stackup, in.Lines, in.SkipTolerance = st, synth.LineMakerFor(cmd.Context(), st, cache), noTolerance
				in.SkipSensitivity = true // compare prints no bench figures
				rows = append(rows, compareOne(cmd.Context(), in, minWidth))
				if err := cmd.Context().Err(); err != nil {
					stop()
					return err
				}
			}
			stop()
			if asJSON {
				return printJSON(cmd.OutOrStdout(), rows)
			}
			return printCompare(cmd.OutOrStdout(), rows, minWidth)
		},
	}
	f := cmd.Flags()
	f.StringVar(&list, "stackups", "", "comma-separated preset names or TOML paths (default: every preset)")
	f.StringVar(&minWidthArg, "min-width", "", `fab minimum track width, e.g. "0.15mm" (default: the design's [fab] min_width)`)
	f.BoolVar(&noTolerance, "no-tolerance", false, "skip the tolerance analysis")
	f.IntVar(&samples, "samples", 0, "Monte Carlo samples per stackup (overrides the design file)")
	f.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	return cmd
}

// compareOne simulates in on its stackup; the fab minimum is checked, not
// refused.
func compareOne(ctx context.Context, in synth.BuildInput, minWidth float64) compareRow {
	row := compareRow{Stackup: in.Stackup.Name}
	res, err := synth.Simulate(ctx, in)
	if err != nil {
		row.Error = err.Error()
		return row
	}
	row.Model = res.Model
	row.MinWidthMM = -1
	seen := map[float64]bool{}
	for _, e := range res.Physical.Elements {
		w := e.Width * 1e3
		if !seen[w] {
			seen[w] = true
			row.WidthsMM = append(row.WidthsMM, w)
		}
		row.CopperLengthMM += e.Drawn() * 1e3
		row.CopperAreaMM2 += e.Drawn() * e.Width * 1e6
		if row.MinWidthMM < 0 || w < row.MinWidthMM {
			row.MinWidthMM = w
		}
	}
	row.MeetsFab = res.CheckFabMinimum(minWidth) == nil
	row.InsertionDB = res.LossF0DB
	row.S11DBF0 = physical.MagDB(res.S11F0)
	if res.Tolerance != nil {
		p50, p90 := res.Tolerance.P50, res.Tolerance.P90
		row.P50S11DB, row.P90S11DB = &p50, &p90
	}
	return row
}

func printCompare(w io.Writer, rows []compareRow, minWidth float64) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	// As-built figures lead; the model's nominal |S11| follows, floored.
	fmt.Fprintf(tw, "stackup	median |S11| f0 (dB)	p90 |S11| f0 (dB)	model |S11| f0 (dB)	widths (mm)	copper length (mm)	copper area (mm²)	loss at f0 (dB)	narrowest (mm)	≥ %.3f mm\n", minWidth*1e3)
	for _, r := range rows {
		if r.Error != "" {
			fmt.Fprintf(tw, "%s\tfailed: %s\n", r.Stackup, r.Error)
			continue
		}
		var ws []string
		for _, v := range r.WidthsMM {
			ws = append(ws, fmt.Sprintf("%.3f", v))
		}
		p50, p90 := "—", "—"
		if r.P50S11DB != nil {
			p50 = fmt.Sprintf("%.1f", *r.P50S11DB)
		}
		if r.P90S11DB != nil {
			p90 = fmt.Sprintf("%.1f", *r.P90S11DB)
		}
		ok := "yes"
		if !r.MeetsFab {
			ok = "NO"
		}
		printfMinus(tw, "%s\t%s\t%s\t%s\t%s\t%.2f\t%.2f\t%.3f\t%.3f\t%s\n", r.Stackup, p50, p90, strings.TrimSuffix(export.ModelDB(r.S11DBF0), " dB"),
			strings.Join(ws, ", "), r.CopperLengthMM, r.CopperAreaMM2, r.InsertionDB, r.MinWidthMM, ok)
	}
	return tw.Flush()
}
