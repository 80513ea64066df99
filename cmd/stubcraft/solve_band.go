package main

import (
	"errors"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"stubcraft/export"
	"stubcraft/physical/units"
	"stubcraft/synth"
)

// solveBandOptions are the band flags of the solve command, as typed.
type solveBandOptions struct {
	band, topology, touchstone, response string
	sections                             int
}

// parseBand reads "2.4GHz..2.4835GHz".
func parseBand(text string) (float64, float64, error) {
	lo, hi, ok := strings.Cut(text, "..")
	if !ok {
		return 0, 0, fmt.Errorf("--band %q: write the band as START..STOP, for example 2.4GHz..2.4835GHz", text)
	}
	f1, err := units.ParseFrequency(strings.TrimSpace(lo))
	if err != nil {
		return 0, 0, fmt.Errorf("--band %q: %w", text, err)
	}
	f2, err := units.ParseFrequency(strings.TrimSpace(hi))
	if err != nil {
		return 0, 0, fmt.Errorf("--band %q: %w", text, err)
	}
	if !(f2 > f1) {
		return 0, 0, fmt.Errorf("--band %q: the stop must be above the start", text)
	}
	return f1, f2, nil
}

// runSolveBand lists every candidate network for a match across a band.
func runSolveBand(w io.Writer, o solveOptions, b solveBandOptions) error {
	f1, f2, err := parseBand(b.band)
	if err != nil {
		return err
	}
	z0, err := solveOhms("z0", o.z0)
	if err != nil {
		return err
	}
	var load synth.Load
	switch {
	case (o.load == "") == (b.touchstone == ""):
		return errors.New(`give the load as --load "22-j31" or --touchstone FILE (one of them)`)
	case o.load != "":
		zl, err := units.ParseImpedance(o.load)
		if err != nil {
			return fmt.Errorf("--load %q: %w", o.load, err)
		}
		load = synth.ConstantLoad(zl)
	default:
		l, err := synth.OpenLoad(synth.Design{Load: synth.LoadSpec{Touchstone: b.touchstone}})
		if err != nil {
			return fmt.Errorf("--touchstone %q: %w", b.touchstone, err)
		}
		if t, ok := l.(synth.TouchstoneLoad); ok && len(t.File.Freqs) > 0 {
			lo, hi := t.File.Freqs[0], t.File.Freqs[len(t.File.Freqs)-1]
			if f1 < lo || f2 > hi {
				return fmt.Errorf("--touchstone %q: the band %s is not covered by the file's data, which spans %s", b.touchstone,
					units.FormatFrequencyRange(f1, f2, 6), units.FormatFrequencyRange(lo, hi, 6))
			}
		}
		load = l
	}
	var end synth.StubEnd
	if o.stubSet {
		if end, err = synth.ParseStubEnd(o.stub); err != nil {
			return fmt.Errorf("--stub %q: %w", o.stub, err)
		}
	}
	var resp synth.Response
	if b.response != "" {
		if resp, err = synth.ParseResponse(b.response); err != nil {
			return fmt.Errorf("--response %q: %w", b.response, err)
		}
	}
	known := false
	for _, t := range synth.Topologies() {
		known = known || t == b.topology
	}
	if !known {
		return fmt.Errorf("--topology %q: unknown topology (the topologies are: %s)", b.topology, strings.Join(synth.Topologies(), ", "))
	}
	if b.sections < 0 || b.sections > synth.MaxTransformerSections {
		return fmt.Errorf("--sections %d: a quarter-wave transformer has 1 to %d sections", b.sections, synth.MaxTransformerSections)
	}
	res, err := synth.SolveBand(load, z0, f1, f2, b.topology, end, b.sections, resp)
	if err != nil {
		return err
	}
	if o.asJSON {
		return printJSON(w, solveBandJSON(res, z0))
	}
	fmt.Fprintf(w, "band %s (f0 %s) on %g Ω\n", units.FormatFrequencyRange(f1, f2, 6), units.FormatFrequency(res.F0, 6), z0)
	fmt.Fprintf(w, "load: %s\n", res.BodeFano.FitText())
	fmt.Fprintf(w, "Bode-Fano limit (lossless network, Fano 1950): %s\n\n", export.BodeFanoNote(res.BodeFano))
	var table strings.Builder
	tw := tabwriter.NewWriter(&table, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "candidate\tworst |S11| in band (dB)\ttotal electrical length (°)\t")
	for _, s := range res.Solutions {
		if s.Err != "" {
			fmt.Fprintf(tw, "%s\t—\t—\t%s\n", s.Name(), export.Minus(s.Err))
			continue
		}
		printfMinus(tw, "%s\t%.2f\t%.1f\t\n", s.Name(), s.WorstS11DB, s.TotalDeg)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	writeTrimmedLines(w, table.String())
	for _, s := range res.Solutions {
		if s.Note != "" {
			fmt.Fprintf(w, "\n%s: %s", s.Name(), export.Minus(s.Note))
		}
	}
	fmt.Fprintln(w, "\nideal lossless lines, lengths optimised for the worst |S11| at 41 points across the band; ranked by that, then by total electrical length (there is no board yet: build a design to rank by board area)")
	return nil
}

type solveBandResult struct {
	StartHz          float64 `json:"start_hz"`
	StopHz           float64 `json:"stop_hz"`
	F0Hz             float64 `json:"f0_hz"`
	Z0Ohm            float64 `json:"z0_ohm"`
	LoadFit          string  `json:"load_fit"`
	LoadFitCircuit   string  `json:"load_fit_circuit"`    // "" when no circuit fits
	LoadFitMisfitPct float64 `json:"load_fit_misfit_pct"` // worst across the band, % of |Z|
	// BodeFanoS11DB is null unless BodeFanoStatus is "quoted" (see
	// report.json's band).
	BodeFanoS11DB  *float64         `json:"bode_fano_s11_db"`
	BodeFanoStatus string           `json:"bode_fano_status"`
	BodeFanoNote   string           `json:"bode_fano_note"`
	Candidates     []solveCandidate `json:"candidates"`
}

type solveCandidate struct {
	Name       string         `json:"name"`
	Topology   string         `json:"topology"`
	WorstS11DB *float64       `json:"worst_s11_db"`
	TotalDeg   float64        `json:"total_electrical_deg"`
	Sections   []solveSection `json:"sections"`
	Note       string         `json:"note,omitempty"`
	Error      string         `json:"error,omitempty"`
}

type solveSection struct {
	Kind  string  `json:"kind"`
	End   string  `json:"end,omitempty"`
	Z0Ohm float64 `json:"z0_ohm"`
	Deg   float64 `json:"length_deg"`
}

func solveBandJSON(res synth.BandSolve, z0 float64) solveBandResult {
	bf := res.BodeFano
	out := solveBandResult{StartHz: res.Start, StopHz: res.Stop, F0Hz: res.F0, Z0Ohm: z0,
		LoadFit: bf.FitText(), LoadFitCircuit: bf.FitCircuit(), LoadFitMisfitPct: 100 * bf.Fit.MaxRelErr,
		BodeFanoStatus: bf.Status.String(), BodeFanoNote: export.BodeFanoNote(bf), Candidates: []solveCandidate{}}
	if v, ok := bf.Quoted(); ok {
		out.BodeFanoS11DB = &v
	}
	for _, s := range res.Solutions {
		c := solveCandidate{Name: s.Name(), Topology: s.Topology, TotalDeg: s.TotalDeg, Sections: []solveSection{}, Note: export.Minus(s.Note), Error: export.Minus(s.Err)}
		if s.Err == "" {
			c.WorstS11DB = solveFinite(s.WorstS11DB)
		}
		for _, sec := range s.Sections {
			x := solveSection{Kind: sec.Kind.String(), Z0Ohm: sec.Z0, Deg: sec.LengthDeg}
			if sec.Kind == synth.ShuntStub {
				x.End = sec.End.String()
			}
			c.Sections = append(c.Sections, x)
		}
		out.Candidates = append(out.Candidates, c)
	}
	return out
}
