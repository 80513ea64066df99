package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/physical/units"
	"stubcraft/synth"
)

// solveOptions are the flags of the solve command, as typed.
type solveOptions struct {
	load, z0, lineZ0, stubZ0, stub string
	asJSON, acceptLoss             bool
	stubSet                        bool // --stub was given
}

// newSolveCmd returns the command that prints the single-shunt-stub
// solutions for a load, with the load's mismatch.
func newSolveCmd() *cobra.Command {
	var o solveOptions
	var b solveBandOptions
	cmd := &cobra.Command{
		Use:   "solve (--load Z | --touchstone FILE) [--z0 Z0] [--stub open|short] [--band START..STOP --topology T]",
		Short: "Solve the single shunt stub that matches a load",
		Long: `Solve the single shunt stub that matches a load impedance to z0: where to
put the stub on the line from the load, and how long to make it. Both
solutions are printed, in wavelengths and degrees, with the load's
reflection, VSWR and return loss. The series line and the stub may have
impedances other than z0 (--line-z0, --stub-z0).

With --band, the match is asked for across a band instead: every network
of --topology (shunt-stub, double-stub, quarter-wave, or auto for all of
them) is solved at the band's centre and its lengths optimised on ideal
lossless lines for the worst |S11| in the band; each is listed with that
worst |S11| and its total electrical length, beside the Bode-Fano limit
of the load. The load may then be a one-port Touchstone file.`,
		Example: `  stubcraft solve --load 22-j31
  stubcraft solve --load "75+j40" --z0 50 --stub short --json
  stubcraft solve --band 2.4GHz..2.4835GHz --topology auto --load 31-j24
  stubcraft solve --band 2.4GHz..2.4835GHz --topology auto --touchstone antenna.s1p`,
		Args:         cobra.NoArgs,
		SilenceUsage: true,
		RunE: func(cmd *cobra.Command, args []string) error {
			o.stubSet = cmd.Flags().Changed("stub")
			if b.band != "" {
				return runSolveBand(cmd.OutOrStdout(), o, b)
			}
			if b.touchstone != "" || cmd.Flags().Changed("topology") {
				return errors.New("--touchstone and --topology go with --band")
			}
			return runSolve(cmd.OutOrStdout(), o)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.load, "load", "", `load impedance in ohms, such as "22-j31" (required)`)
	f.StringVar(&o.z0, "z0", "50", "reference impedance, ohm")
	f.StringVar(&o.lineZ0, "line-z0", "", "impedance of the line from the load to the stub, ohm (default: z0)")
	f.StringVar(&o.stubZ0, "stub-z0", "", "impedance of the stub, ohm (default: z0)")
	f.StringVar(&o.stub, "stub", "open", "stub end: open, or short (a via to ground)")
	f.StringVar(&b.band, "band", "", "match across this band, START..STOP, such as 2.4GHz..2.4835GHz")
	f.StringVar(&b.topology, "topology", synth.TopologyAuto, "with --band: shunt-stub, double-stub, quarter-wave or auto")
	f.StringVar(&b.touchstone, "touchstone", "", "with --band: the load as a one-port Touchstone file")
	f.IntVar(&b.sections, "sections", 0, "with --band and quarter-wave: sections, 1 to 4 (default 2)")
	f.StringVar(&b.response, "response", "", "with --band and quarter-wave: binomial or chebyshev (default chebyshev)")
	f.BoolVar(&o.asJSON, "json", false, "print JSON instead of a table")
	f.BoolVar(&o.acceptLoss, "accept-loss", false, "solve a load even when |Γ| is above 0.98 (a network for it would dissipate most of the power)")
	return cmd
}

// solveOhms reads a real, positive impedance given to flag.
func solveOhms(flag, text string) (float64, error) {
	z, err := units.ParseImpedance(text)
	if err != nil {
		return 0, fmt.Errorf("--%s %q: %w", flag, text, err)
	}
	if imag(z) != 0 || !(real(z) > 0) {
		return 0, fmt.Errorf("--%s %q: a characteristic impedance must be real and positive", flag, text)
	}
	if err := synth.CheckLineZ0(real(z)); err != nil {
		return 0, fmt.Errorf("--%s %q: %w", flag, text, err)
	}
	return real(z), nil
}

func runSolve(w io.Writer, o solveOptions) error {
	if strings.TrimSpace(o.load) == "" {
		return errors.New(`--load is required, for example --load "22-j31"`)
	}
	zl, err := units.ParseImpedance(o.load)
	if err != nil {
		return fmt.Errorf("--load %q: %w", o.load, err)
	}
	z0, err := solveOhms("z0", o.z0)
	if err != nil {
		return err
	}
	lineZ0, stubZ0 := z0, z0
	if o.lineZ0 != "" {
		if lineZ0, err = solveOhms("line-z0", o.lineZ0); err != nil {
			return err
		}
	}
	if o.stubZ0 != "" {
		if stubZ0, err = solveOhms("stub-z0", o.stubZ0); err != nil {
			return err
		}
	}
	if err := synth.CheckLoadGamma(zl, z0); err != nil && !o.acceptLoss {
		return fmt.Errorf("--load %q: %w", o.load, err)
	}
	end, err := synth.ParseStubEnd(o.stub)
	if err != nil {
		return fmt.Errorf("--stub %q: %w", o.stub, err)
	}
	sols, err := synth.SolveShuntStubZ(zl, z0, lineZ0, stubZ0, end)
	matched := errors.Is(err, synth.ErrMatched)
	if err != nil && !matched {
		return fmt.Errorf("--load %q: %w", o.load, err)
	}
	g, vswr, rl := synth.LoadReport(zl, z0)
	if o.asJSON {
		return printJSON(w, solveJSON(zl, z0, g, vswr, rl, sols))
	}
	fmt.Fprintf(w, "load %s Ω on %g Ω: |Γ| = %.4f, VSWR = %.3f, return loss = %s\n",
		units.FormatImpedance(zl), z0, g, vswr, solveDB(rl))
	if matched {
		fmt.Fprintln(w, "the load is already matched: no stub is needed")
		return nil
	}
	fmt.Fprintf(w, "single shunt stub, %s end; line %g Ω, stub %g Ω\n\n", end, lineZ0, stubZ0)
	shortest, _ := synth.PickSolution(sols, synth.PickShortest)
	var table strings.Builder
	tw := tabwriter.NewWriter(&table, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "solution\tload→stub (λ)\tload→stub (°)\tstub (λ)\tstub (°)\tline+stub (°)\t\t")
	for i, s := range sols {
		mark := ""
		if s == shortest {
			mark = "shortest"
		}
		fmt.Fprintf(tw, "%d\t%.4f\t%.2f\t%.4f\t%.2f\t%.2f\t%s\t\n", i+1, s.LineWL(), s.LineDeg, s.StubWL(), s.StubDeg, s.TotalDeg(), mark)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	writeTrimmedLines(w, table.String())
	fmt.Fprintln(w, "\nlengths are electrical, at the frequency the load was measured at")
	return nil
}

func solveDB(db float64) string {
	if math.IsInf(db, 1) {
		return "∞ dB"
	}
	return fmt.Sprintf("%.2f dB", db)
}

// The JSON form of the solve command's output.
type solveResult struct {
	Load         solveComplex    `json:"load_ohm"`
	Z0           float64         `json:"z0_ohm"`
	GammaMag     float64         `json:"gamma_mag"`
	VSWR         *float64        `json:"vswr"`           // null when infinite
	ReturnLossDB *float64        `json:"return_loss_db"` // null when infinite (a perfect match)
	Solutions    []solveSolution `json:"solutions"`
}

type solveComplex struct {
	Re float64 `json:"re"`
	Im float64 `json:"im"`
}

type solveSolution struct {
	LineWL    float64 `json:"line_wl"`
	LineDeg   float64 `json:"line_deg"`
	StubWL    float64 `json:"stub_wl"`
	StubDeg   float64 `json:"stub_deg"`
	StubEnd   string  `json:"stub_end"`
	LineZ0Ohm float64 `json:"line_z0_ohm"`
	StubZ0Ohm float64 `json:"stub_z0_ohm"`
}

func solveFinite(v float64) *float64 {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return nil
	}
	return &v
}

func solveJSON(zl complex128, z0, g, vswr, rl float64, sols []synth.StubSolution) solveResult {
	r := solveResult{
		Load:         solveComplex{real(zl), imag(zl)},
		Z0:           z0,
		GammaMag:     g,
		VSWR:         solveFinite(vswr),
		ReturnLossDB: solveFinite(rl),
		Solutions:    []solveSolution{},
	}
	for _, s := range sols {
		r.Solutions = append(r.Solutions, solveSolution{
			LineWL: s.LineWL(), LineDeg: s.LineDeg, StubWL: s.StubWL(), StubDeg: s.StubDeg,
			StubEnd: s.End.String(), LineZ0Ohm: s.LineZ0, StubZ0Ohm: s.StubZ0,
		})
	}
	return r
}

// writeTrimmedLines writes text line by line without the trailing blanks
// a right-aligned tabwriter leaves.
func writeTrimmedLines(w io.Writer, text string) {
	for _, ln := range strings.Split(strings.TrimRight(text, "\n"), "\n") {
		fmt.Fprintln(w, strings.TrimRight(ln, " "))
	}
}
