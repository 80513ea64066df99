package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"text/tabwriter"
	"time"

	"github.com/spf13/cobra"

	"stubcraft/physical/fieldsolve"
	"stubcraft/physical/units"
	"stubcraft/stackups"
	"stubcraft/synth"
)

// xsectFlags holds the text of the xsect command's flags; quantities are
// parsed after cobra has read them, so errors can name flag and value.
type xsectFlags struct {
	stackup, geometry                string
	width, height, copper, gap, gndW string
	maskT, maskEr, er, etch, offset  string
	tolerance                        string
	asJSON                           bool
}

// xsectFieldFlag maps a fieldsolve.CrossSection field to the flag that sets it.
func xsectFieldFlag(field string, g fieldsolve.Geometry) string {
	switch field {
	case "Width":
		return "--width"
	case "Height", "Spacing":
		return "--height"
	case "Thickness":
		return "--copper"
	case "Er":
		return "--er"
	case "EtchAngleDeg":
		return "--etch-angle"
	case "MaskThickness":
		return "--mask-thickness"
	case "MaskEr":
		return "--mask-er"
	case "Gap":
		if g != fieldsolve.GCPW {
			return "--gap (GCPW only)"
		}
		return "--gap"
	case "GroundWidth":
		return "--ground-width"
	case "Offset":
		return "--offset"
	case "Geometry":
		return "--geometry"
	}
	return field
}

func newXsectCmd() *cobra.Command {
	var f xsectFlags
	cmd := &cobra.Command{
		Use:   "xsect",
		Short: "Solve a line cross-section with the 2-D field solver",
		Long: `Solve a board cross-section (microstrip, grounded coplanar waveguide or
stripline) for its quasi-static characteristic impedance and effective
permittivity with the finite-difference field solver, which accounts for
copper thickness, etched (trapezoidal) edges and solder mask. The answer
carries its estimated relative error; refinement stops below --tolerance.

Values come from --stackup (a preset name or a TOML file) and are
overridden by the flags given. For stripline, --height is the
plane-to-plane spacing and --offset moves the strip up from the centre.`,
		Example: `  stubcraft xsect --stackup fr4-1.6mm-masked --width 3mm
  stubcraft xsect --geometry gcpw --width 1mm --gap 0.2mm --height 0.5mm --er 3.5 --copper 1oz
  stubcraft xsect --geometry stripline --width 0.4mm --height 1mm --er 3.5 --offset 0.1mm --json`,
		Args:         cobra.NoArgs,
		SilenceUsage: true,
		RunE: func(cmd *cobra.Command, args []string) error {
			cs, tol, err := f.crossSection(cmd)
			if err != nil {
				return err
			}
			// Proportions outside the solver's range are refused before a
			// grid is built, naming the flag like the solver's own checks.
			var res fieldsolve.Result
			if err = cs.Validate(); err == nil {
				err = synth.CheckCrossSection(cs)
			}
			if err == nil {
				res, err = xsectSolve(cmd.Context(), cs, tol, os.Stderr)
			}
			if err != nil {
				var ie *fieldsolve.InputError
				if errors.As(err, &ie) {
					name := xsectFieldFlag(ie.Field, cs.Geometry)
					if fl := cmd.Flags().Lookup(strings.TrimPrefix(name, "--")); fl != nil && fl.Changed {
						return fmt.Errorf("%s %q: %w", name, fl.Value.String(), ie.Err)
					}
					return fmt.Errorf("%s (%g in SI units, from the stackup or the default): %w", name, ie.Value, ie.Err)
				}
				if !errors.Is(err, fieldsolve.ErrNotConverged) {
					return err
				}
				fmt.Fprintln(cmd.ErrOrStderr(), "stubcraft: warning:", err)
			}
			if f.asJSON {
				return xsectJSON(cmd.OutOrStdout(), cs, res)
			}
			return xsectTable(cmd.OutOrStdout(), cs, res)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.stackup, "stackup", "", "preset name or stackup TOML file giving the defaults")
	fl.StringVar(&f.geometry, "geometry", "", "microstrip, gcpw or stripline (default: the stackup's line, else microstrip)")
	fl.StringVar(&f.width, "width", "", "strip width at its base, with unit (e.g. 3mm, 20mil); required")
	fl.StringVar(&f.height, "height", "", "dielectric under the strip; for stripline the plane-to-plane spacing")
	fl.StringVar(&f.er, "er", "", "relative permittivity of the dielectric")
	fl.StringVar(&f.copper, "copper", "", "copper thickness (e.g. 35um, 1oz; 0 for an ideal thin strip)")
	fl.StringVar(&f.gap, "gap", "", "GCPW: strip-to-side-ground gap")
	fl.StringVar(&f.gndW, "ground-width", "", "GCPW: width of each side ground (default: wide)")
	fl.StringVar(&f.maskT, "mask-thickness", "", "solder mask thickness (0: none)")
	fl.StringVar(&f.maskEr, "mask-er", "", "solder mask relative permittivity (default 3.5 when a thickness is given)")
	fl.StringVar(&f.etch, "etch-angle", "", "side-wall angle from the vertical, degrees (0: rectangular)")
	fl.StringVar(&f.offset, "offset", "", "stripline: strip centre above the mid-plane (negative: below)")
	fl.StringVar(&f.tolerance, "tolerance", "", "target relative error of Z0, e.g. 0.005 or 0.5% (default 0.5%)")
	fl.BoolVar(&f.asJSON, "json", false, "print JSON instead of a table")
	return cmd
}

// crossSection assembles the cross-section from the stackup and the flags.
func (f *xsectFlags) crossSection(cmd *cobra.Command) (fieldsolve.CrossSection, float64, error) {
	var cs fieldsolve.CrossSection
	var height float64
	if f.stackup != "" {
		st, err := stackups.Load(f.stackup)
		if err != nil {
			return cs, 0, fmt.Errorf("--stackup %q: %w", f.stackup, err)
		}
		cs = synth.CrossSectionOf(st)
		height, cs.Height = cs.Height, 0
	}
	if f.geometry != "" {
		g, err := fieldsolve.ParseGeometry(f.geometry)
		if err != nil {
			return cs, 0, fmt.Errorf("--geometry: %w", err)
		}
		cs.Geometry = g
	}
	length := func(flag, text string, dst *float64, allowNeg bool) error {
		if text == "" {
			return nil
		}
		v, err := units.ParseLength(text)
		if err != nil {
			if t := strings.TrimSpace(text); t == "0" {
				v, err = 0, nil
			} else {
				return fmt.Errorf("--%s %q: %w", flag, text, err)
			}
		}
		if v < 0 && !allowNeg {
			return fmt.Errorf("--%s %q: must not be negative", flag, text)
		}
		*dst = v
		return nil
	}
	number := func(flag, text string, dst *float64, parse func(string) (float64, error)) error {
		if text == "" {
			return nil
		}
		v, err := parse(text)
		if err != nil {
			return fmt.Errorf("--%s %q: %w", flag, text, err)
		}
		*dst = v
		return nil
	}
	if f.width == "" {
		return cs, 0, errors.New("--width is required (e.g. --width 3mm)")
	}
	var tol float64
	for _, err := range []error{
		length("width", f.width, &cs.Width, false),
		length("height", f.height, &height, false),
		number("er", f.er, &cs.Er, units.ParseNumber),
		length("gap", f.gap, &cs.Gap, false),
		length("ground-width", f.gndW, &cs.GroundWidth, false),
		length("mask-thickness", f.maskT, &cs.MaskThickness, false),
		number("mask-er", f.maskEr, &cs.MaskEr, units.ParseNumber),
		number("etch-angle", f.etch, &cs.EtchAngleDeg, units.ParseAngle),
		length("offset", f.offset, &cs.Offset, true),
		number("tolerance", f.tolerance, &tol, units.ParseFraction),
	} {
		if err != nil {
			return cs, 0, err
		}
	}
	if f.copper != "" {
		v, err := units.ParseCopperThickness(f.copper)
		if err != nil && strings.TrimSpace(f.copper) != "0" {
			return cs, 0, fmt.Errorf("--copper %q: %w", f.copper, err)
		}
		if v < 0 {
			return cs, 0, fmt.Errorf("--copper %q: must not be negative", f.copper)
		}
		cs.Thickness = v
	}
	if cs.Er == 0 {
		return cs, 0, errors.New("--er is required without --stackup")
	}
	if height == 0 && f.height == "" {
		return cs, 0, errors.New("--height is required without --stackup")
	}
	if f.tolerance != "" && !(tol > 0 && tol < 1) {
		return cs, 0, fmt.Errorf("--tolerance %q: must be between 0 and 1 (a fraction, or a percentage with %%)", f.tolerance)
	}
	if cs.MaskThickness > 0 && cs.MaskEr == 0 {
		cs.MaskEr = 3.5 // common practice, no source: a typical liquid photoimageable mask
	}
	if cs.Geometry == fieldsolve.Stripline {
		cs.Spacing = height
		cs.MaskThickness, cs.MaskEr = 0, 0
		if f.maskT != "" {
			return cs, 0, fmt.Errorf("--mask-thickness %q: solder mask does not apply to stripline", f.maskT)
		}
	} else {
		cs.Height = height
	}
	if cs.Geometry != fieldsolve.GCPW {
		if f.gap != "" {
			return cs, 0, fmt.Errorf("--gap %q: applies to --geometry gcpw only", f.gap)
		}
		cs.Gap, cs.GroundWidth = 0, 0
	}
	if cs.Geometry != fieldsolve.Stripline && f.offset != "" {
		return cs, 0, fmt.Errorf("--offset %q: applies to --geometry stripline only", f.offset)
	}
	return cs, tol, nil
}

// xsectSolve runs the solver, showing progress on stderr when it takes more
// than a second and stderr is a terminal.
func xsectSolve(ctx context.Context, cs fieldsolve.CrossSection, tol float64, stderr *os.File) (fieldsolve.Result, error) {
	start := time.Now()
	tty := false
	if st, err := stderr.Stat(); err == nil && st.Mode()&os.ModeCharDevice != 0 {
		tty = true
	}
	shown := false
	opt := fieldsolve.Options{Tolerance: tol}
	if tty {
		opt.Progress = func(done, total int) {
			if time.Since(start) > time.Second {
				fmt.Fprintf(stderr, "\rsolving: grid %d (of at most %d), %.1f s ", done, total, time.Since(start).Seconds())
				shown = true
			}
		}
	}
	res, err := fieldsolve.SolveContext(ctx, cs, opt)
	if shown {
		fmt.Fprintln(stderr)
	}
	return res, err
}

// xsectOut is the JSON form of a solved cross-section.
type xsectOut struct {
	Geometry      string  `json:"geometry"`
	Z0            float64 `json:"z0_ohm"`
	EpsEff        float64 `json:"eps_eff"`
	CpFPerM       float64 `json:"c_pf_per_m"`
	CAirpFPerM    float64 `json:"c_air_pf_per_m"`
	ErrorEstimate float64 `json:"error_estimate"`
	Cells         int     `json:"cells"`
	Levels        int     `json:"levels"`
	WidthMM       float64 `json:"width_mm"`
	HeightMM      float64 `json:"height_mm"`
	CopperUM      float64 `json:"copper_um"`
	Er            float64 `json:"er"`
	EtchAngleDeg  float64 `json:"etch_angle_deg"`
	MaskUM        float64 `json:"mask_thickness_um,omitempty"`
	MaskEr        float64 `json:"mask_er,omitempty"`
	GapMM         float64 `json:"gap_mm,omitempty"`
	GroundWidthMM float64 `json:"ground_width_mm,omitempty"`
	OffsetMM      float64 `json:"offset_mm,omitempty"`
}

func xsectResult(cs fieldsolve.CrossSection, r fieldsolve.Result) xsectOut {
	h := cs.Height
	if cs.Geometry == fieldsolve.Stripline {
		h = cs.Spacing
	}
	return xsectOut{
		Geometry: cs.Geometry.String(), Z0: r.Z0, EpsEff: r.EpsEff,
		CpFPerM: r.C * 1e12, CAirpFPerM: r.CAir * 1e12, ErrorEstimate: r.ErrorEstimate,
		Cells: r.Cells, Levels: len(r.Levels),
		WidthMM: cs.Width * 1e3, HeightMM: h * 1e3, CopperUM: cs.Thickness * 1e6, Er: cs.Er,
		EtchAngleDeg: cs.EtchAngleDeg, MaskUM: cs.MaskThickness * 1e6, MaskEr: cs.MaskEr,
		GapMM: cs.Gap * 1e3, GroundWidthMM: cs.GroundWidth * 1e3, OffsetMM: cs.Offset * 1e3,
	}
}

func xsectJSON(w io.Writer, cs fieldsolve.CrossSection, r fieldsolve.Result) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(xsectResult(cs, r))
}

func xsectTable(w io.Writer, cs fieldsolve.CrossSection, r fieldsolve.Result) error {
	o := xsectResult(cs, r)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintf(tw, "cross-section\t%s, W %.4g mm, h %.4g mm, εr %.4g, copper %.4g µm", o.Geometry, o.WidthMM, o.HeightMM, o.Er, o.CopperUM)
	if o.EtchAngleDeg > 0 {
		fmt.Fprintf(tw, ", etch %.3g°", o.EtchAngleDeg)
	}
	if o.MaskUM > 0 {
		fmt.Fprintf(tw, ", mask %.3g µm εr %.3g", o.MaskUM, o.MaskEr)
	}
	if cs.Geometry == fieldsolve.GCPW {
		gw := "wide"
		if o.GroundWidthMM > 0 {
			gw = fmt.Sprintf("%.4g mm", o.GroundWidthMM)
		}
		fmt.Fprintf(tw, ", gap %.4g mm, side grounds %s", o.GapMM, gw)
	}
	if o.OffsetMM != 0 {
		fmt.Fprintf(tw, ", offset %+.4g mm", o.OffsetMM)
	}
	fmt.Fprintln(tw)
	fmt.Fprintf(tw, "Z0\t%.3f Ω\t± %.2g %% (estimated)\n", o.Z0, 100*o.ErrorEstimate)
	fmt.Fprintf(tw, "εeff\t%.4f\t\n", o.EpsEff)
	fmt.Fprintf(tw, "C\t%.3f pF/m\twith dielectrics\n", o.CpFPerM)
	fmt.Fprintf(tw, "C0\t%.3f pF/m\tin vacuum\n", o.CAirpFPerM)
	fmt.Fprintf(tw, "grid\t%d nodes\tfinest of %d, half domain\n", o.Cells, o.Levels)
	return tw.Flush()
}
