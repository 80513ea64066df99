package main

import (
	"fmt"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"stubcraft/stackups"
)

func newStackupsCmd() *cobra.Command {
	var asJSON bool
	cmd := &cobra.Command{
		Use:   "stackups",
		Short: "List the embedded laminate presets",
		Long: `List the embedded laminate presets. Their values are typical of each
material class (from memory, not from a datasheet); check your laminate's
data before committing a design. "stackups show NAME" prints one as TOML,
ready to be copied and edited.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			presets := stackups.Presets()
			if asJSON {
				type row struct {
					Name        string  `json:"name"`
					Er          float64 `json:"er"`
					LossTangent float64 `json:"loss_tangent"`
					ThicknessMM float64 `json:"dielectric_thickness_mm"`
					CopperUM    float64 `json:"copper_thickness_um"`
					MaskUM      float64 `json:"mask_thickness_um"`
					Line        string  `json:"line"`
					Description string  `json:"description"`
				}
				rows := make([]row, 0, len(presets))
				for _, s := range presets {
					r := row{Name: s.Name, Er: s.Dielectric.Er, LossTangent: s.Dielectric.LossTangent,
						ThicknessMM: s.Dielectric.Thickness * 1e3, CopperUM: s.Copper.Thickness * 1e6,
						Line: s.Line.String(), Description: s.Description}
					if s.Mask != nil {
						r.MaskUM = s.Mask.Thickness * 1e6
					}
					rows = append(rows, r)
				}
				return printJSON(cmd.OutOrStdout(), rows)
			}
			tw := tabwriter.NewWriter(cmd.OutOrStdout(), 0, 0, 2, ' ', 0)
			fmt.Fprintln(tw, "preset\tεr\ttanδ\th (mm)\tcopper (µm)\tmask (µm)\tline\tdescription")
			for _, s := range presets {
				mask := "-"
				if s.Mask != nil {
					mask = fmt.Sprintf("%.0f", s.Mask.Thickness*1e6)
				}
				fmt.Fprintf(tw, "%s\t%.2f\t%.4f\t%.3f\t%.1f\t%s\t%s\t%s\n", s.Name, s.Dielectric.Er,
					s.Dielectric.LossTangent, s.Dielectric.Thickness*1e3, s.Copper.Thickness*1e6, mask, s.Line, s.Description)
			}
			return tw.Flush()
		},
	}
	cmd.Flags().BoolVar(&asJSON, "json", false, "print JSON instead of a table")
	show := &cobra.Command{
		Use:   "show NAME",
		Short: "Print one preset as stackup TOML",
		Args:  cobra.ExactArgs(1),
		ValidArgsFunction: func(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
			return presetNames(), cobra.ShellCompDirectiveNoFileComp
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			s, ok := stackups.Preset(args[0])
			if !ok {
				return fmt.Errorf("no preset named %q (known: %v)", args[0], presetNames())
			}
			fmt.Fprintf(cmd.OutOrStdout(), "# Preset %s: typical values of its material class, from memory, not a datasheet.\n# Check your laminate's data; save this as a file and edit it to use your own.\n", s.Name)
			return stackups.Encode(cmd.OutOrStdout(), s)
		},
	}
	cmd.AddCommand(show)
	return cmd
}

func presetNames() []string {
	var names []string
	for _, s := range stackups.Presets() {
		names = append(names, s.Name)
	}
	return names
}

// completeStackup offers the preset names and files for a --stackup flag.
func completeStackup(cmd *cobra.Command, args []string, toComplete string) ([]string, cobra.ShellCompDirective) {
	return presetNames(), cobra.ShellCompDirectiveDefault
}
