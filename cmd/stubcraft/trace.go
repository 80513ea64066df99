package main

import (
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/physical"
	"stubcraft/physical/units"
	"stubcraft/synth"
)

// traceReport is the JSON form of "stubcraft trace"; every key says its unit.
type traceReport struct {
	Stackup            string   `json:"stackup"`
	Model              string   `json:"model"`
	FrequencyHz        float64  `json:"frequency_hz"`
	WidthMM            float64  `json:"width_mm"`
	Z0Ohm              float64  `json:"z0_ohm"`
	Z0StaticOhm        float64  `json:"z0_static_ohm"`
	EpsEff             float64  `json:"eps_eff"`
	EpsEffStatic       float64  `json:"eps_eff_static"`
	GuidedWavelengthMM float64  `json:"guided_wavelength_mm"`
	ElectricalDeg      *float64 `json:"electrical_deg,omitempty"`
	LengthMM           *float64 `json:"length_mm,omitempty"`
	AlphaCondDBPerM    float64  `json:"alpha_conductor_db_per_m"`
	AlphaDielDBPerM    float64  `json:"alpha_dielectric_db_per_m"`
	AlphaTotalDBPerM   float64  `json:"alpha_total_db_per_m"`
	LossDB             *float64 `json:"loss_db,omitempty"`
	Er                 float64  `json:"er_at_freq"`
	LossTangent        float64  `json:"loss_tangent_at_freq"`
	Notes              []string `json:"notes"`
	Warnings           []string `json:"warnings"`
}

func newTraceCmd() *cobra.Command {
	var (
		stackupArg, freqArg, z0Arg, widthArg, lengthArg string
		asJSON                                          bool
	)
	cmd := &cobra.Command{
		Use:   "trace",
		Short: "Width for an impedance, or impedance for a width, on a stackup",
		Long: `Synthesise the strip width for a characteristic impedance (--z0), or
analyse a given width (--width), on a stackup at a frequency. Z0 is the
dispersive impedance at --freq; the static value is reported beside it.
With --length (degrees "90deg" or wavelengths "0.25wl") the physical length
of that electrical length at --freq is given too.`,
		Example: `  stubcraft trace --stackup fr4-1.6mm --freq 2.45GHz --z0 50 --length 90deg
  stubcraft trace --stackup board.toml --freq 5.8GHz --width 0.9mm --json`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if (z0Arg == "") == (widthArg == "") {
				return fmt.Errorf("give exactly one of --z0 (synthesis) or --width (analysis)")
			}
			st, err := loadStackup(stackupArg)
			if err != nil {
				return err
			}
			freq, err := units.ParseFrequency(freqArg)
			if err != nil {
				return fmt.Errorf("--freq: %w", err)
			}
			if err := synth.CheckFrequency(freq); err != nil {
				return fmt.Errorf("--freq %q: %w", freqArg, err)
			}
			cache := newSolverCache()
			maker := synth.LineMakerFor(cmd.Context(), st, cache)
			defer solverProgress(cache)()
			sub, subNotes := synth.SubstrateAt(st, freq)
			if err := synth.CheckFrequencyOn(freq, sub); err != nil {
				return fmt.Errorf("--freq %q on stackup %s: %w", freqArg, st.Name, err)
			}
			var model physical.LineModel
			var warnings []string
			if z0Arg != "" {
				z0, err := parsePositive("--z0", z0Arg)
				if err != nil {
					return err
				}
				if err := synth.CheckLineZ0(z0); err != nil {
					return fmt.Errorf("--z0 %s: %w", z0Arg, err)
				}
				res, err := synth.WidthWith(maker, sub, z0, freq)
				if err != nil {
					return fmt.Errorf("--z0 %s: %w", z0Arg, err)
				}
				model, warnings = res.Model, res.Warnings
			} else {
				w, err := units.ParseLength(widthArg)
				if err != nil {
					return fmt.Errorf("--width: %w", err)
				}
				if err := synth.CheckStripWidth(w, sub); err != nil {
					return fmt.Errorf("--width %q on stackup %s: %w", widthArg, st.Name, err)
				}
				model, err = maker(w, sub)
				if err != nil {
					return fmt.Errorf("--width %s: %w", widthArg, err)
				}
				warnings = model.Warnings(freq)
			}
			p := model.At(freq)
			z0s, es := model.Static()
			width, _ := model.Strip()
			rep := traceReport{
				Stackup: st.Name, Model: model.Name(), FrequencyHz: freq,
				WidthMM: width * 1e3, Z0Ohm: p.Z0, Z0StaticOhm: z0s, EpsEff: p.EpsEff, EpsEffStatic: es,
				GuidedWavelengthMM: p.GuidedWavelength() * 1e3,
				AlphaCondDBPerM:    p.AlphaConductor * physical.NpDB,
				AlphaDielDBPerM:    p.AlphaDielectric * physical.NpDB,
				AlphaTotalDBPerM:   p.Alpha() * physical.NpDB,
				Warnings:           nonNil(warnings),
				Notes:              nonNil(append(subNotes, cacheNotes(cache)...)),
				Er:                 sub.Er,
				LossTangent:        sub.LossTangent,
			}
			if lengthArg != "" {
				deg, err := units.ParseElectricalLength(lengthArg)
				if err != nil {
					return fmt.Errorf("--length: %w", err)
				}
				if err := synth.CheckElectricalLength(deg); err != nil {
					return fmt.Errorf("--length %q: %w", lengthArg, err)
				}
				l := synth.PhysicalLength(p, deg)
				lmm, loss := l*1e3, p.Alpha()*l*physical.NpDB
				rep.ElectricalDeg, rep.LengthMM, rep.LossDB = &deg, &lmm, &loss
			}
			if err := rep.finite(); err != nil {
				return fmt.Errorf("%s: %w", traceInput(z0Arg, widthArg), err)
			}
			if asJSON {
				return printJSON(cmd.OutOrStdout(), rep)
			}
			return printTrace(cmd.OutOrStdout(), rep)
		},
	}
	f := cmd.Flags()
	f.StringVar(&stackupArg, "stackup", "fr4-1.6mm", "preset name or path to a stackup TOML file")
	f.StringVar(&freqArg, "freq", "", `design frequency, e.g. "2.45GHz"`)
	f.StringVar(&z0Arg, "z0", "", "target characteristic impedance in ohms (synthesis)")
	f.StringVar(&widthArg, "width", "", `strip width, e.g. "1.2mm" (analysis)`)
	f.StringVar(&lengthArg, "length", "", `electrical length, e.g. "90deg" or "0.147wl"`)
	f.BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	_ = cmd.MarkFlagRequired("freq")
	_ = cmd.RegisterFlagCompletionFunc("stackup", completeStackup)
	return cmd
}

// traceInput names the flag that chose the strip.
func traceInput(z0Arg, widthArg string) string {
	if z0Arg != "" {
		return "--z0 " + z0Arg
	}
	return "--width " + widthArg
}

// finite refuses a report with a value that is not a finite number, so
// that NaN is never printed and --json never fails on one.
func (r traceReport) finite() error {
	vals := []struct {
		name string
		v    float64
	}{
		{"Z0", r.Z0Ohm}, {"static Z0", r.Z0StaticOhm}, {"εeff", r.EpsEff}, {"static εeff", r.EpsEffStatic},
		{"guided wavelength", r.GuidedWavelengthMM}, {"width", r.WidthMM},
		{"conductor loss", r.AlphaCondDBPerM}, {"dielectric loss", r.AlphaDielDBPerM},
	}
	if r.LengthMM != nil {
		vals = append(vals, struct {
			name string
			v    float64
		}{"length", *r.LengthMM}, struct {
			name string
			v    float64
		}{"loss over the length", *r.LossDB})
	}
	for _, x := range vals {
		if math.IsNaN(x.v) || math.IsInf(x.v, 0) {
			return fmt.Errorf("the %s model gives no finite %s for this strip (%v); choose a width or impedance inside the model's range", r.Model, x.name, x.v)
		}
	}
	return nil
}

func printTrace(w io.Writer, r traceReport) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	row := func(k, format string, v ...any) { fmt.Fprintf(tw, k+"\t"+format+"\n", v...) }
	row("stackup", "%s", r.Stackup)
	row("model", "%s", r.Model)
	row("εr, tanδ at frequency", "%.3f, %.4f", r.Er, r.LossTangent)
	row("frequency", "%s", units.FormatFrequency(r.FrequencyHz, 6))
	row("width", "%.4f mm", r.WidthMM)
	row("Z0 at frequency", "%.3f Ω", r.Z0Ohm)
	row("Z0 static", "%.3f Ω", r.Z0StaticOhm)
	row("εeff at frequency", "%.4f", r.EpsEff)
	row("εeff static", "%.4f", r.EpsEffStatic)
	row("guided wavelength λg", "%.3f mm", r.GuidedWavelengthMM)
	if r.LengthMM != nil {
		row("electrical length", "%.3f° (%.4f λ)", *r.ElectricalDeg, *r.ElectricalDeg/360)
		row("physical length", "%.4f mm", *r.LengthMM)
		row("loss over length", "%.4f dB", *r.LossDB)
	}
	row("attenuation, conductor", "%.3f dB/m", r.AlphaCondDBPerM)
	row("attenuation, dielectric", "%.3f dB/m", r.AlphaDielDBPerM)
	row("attenuation, total", "%.3f dB/m", r.AlphaTotalDBPerM)
	if err := tw.Flush(); err != nil {
		return err
	}
	for _, n := range r.Notes {
		fmt.Fprintln(w, "note:", n)
	}
	for _, warn := range r.Warnings {
		fmt.Fprintln(w, "warning:", warn)
	}
	return nil
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}
