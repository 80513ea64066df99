package export

import (
	"fmt"
	"strings"

	"stubcraft/physical/units"
)

// ModelFloorDB is the |S11| below which a simulated figure is printed as
// "below −40 dB": deeper digits say more about the model than about any
// board. The line models state their accuracy (from memory of the
// papers): Hammerstad and Jensen 1980 give Z0 and the static εeff to
// about 0.2 % over 0.01 ≤ w/h ≤ 100, Kirschning and Jansen 1982 the
// dispersive εeff(f) to about 0.6 %. A Z0 error ε alone leaves
// |Γ| ≈ ε/2 = 0.001 (−60 dB). An εeff error of 0.6 % stretches every
// electrical length by 0.3 %; on a network of about 100 electrical degrees
// that is 0.3° = 0.005 rad, and a single-stub match turns a phase error δ
// into |Γ| of order 2δ·|Γload| ≈ 0.005 for a load with |Γ| ≈ 0.5, about
// −46 dB. The discontinuity models (open end, T-junction, via) add more,
// and the T-junction model is fitted to the project's full-wave tee sweep
// (0.95° on the stub; DEVELOPERS.md). −40 dB
// (|Γ| = 0.01) is the round figure above all of these: a model figure
// below it is reported as "below −40 dB". See DEVELOPERS.md.
const ModelFloorDB = -40.0

// ModelDB prints a simulated |S11| in dB with a true minus sign (Minus),
// as "below −40 dB" under ModelFloorDB; its callers need not apply Minus
// again.
func ModelDB(db float64) string {
	if db < ModelFloorDB {
		return Minus(fmt.Sprintf("below %.0f dB", ModelFloorDB))
	}
	return Minus(fmt.Sprintf("%.1f dB", db))
}

// ReportSummary leads report.json with what a board can reach: the
// predicted as-built |S11| at f0 (median and 90th percentile of the
// tolerance analysis), the model's nominal figure floored at
// ModelFloorDB, the verdict and the warnings that bear on it.
type ReportSummary struct {
	AsBuiltBoards   int      `json:"as_built_boards"`
	AsBuiltP50S11DB *float64 `json:"as_built_median_s11_db_f0,omitempty"`
	AsBuiltP90S11DB *float64 `json:"as_built_p90_s11_db_f0,omitempty"`
	ModelS11DBF0    float64  `json:"model_s11_db_f0_floored"`
	// ModelWorstBandDB is the model's worst |S11| across [match] band
	// (nominal board), when the design gives a band.
	ModelWorstBandDB *float64 `json:"model_worst_s11_db_band,omitempty"`
	// AsBuiltP50BandDB and AsBuiltP90BandDB are the as-built median and
	// 90th percentile of the worst |S11| across the band, with a band.
	AsBuiltP50BandDB *float64 `json:"as_built_median_worst_s11_db_band,omitempty"`
	AsBuiltP90BandDB *float64 `json:"as_built_p90_worst_s11_db_band,omitempty"`
	ModelFloorDB     float64  `json:"model_floor_db"`
	Verdict          string   `json:"verdict"`
	VerdictWarnings  []string `json:"verdict_warnings"`
}

// verdictLossDB is the network loss at f0 from which the verdict says the
// network burns the power it matches (common practice, no source: half
// the power).
const verdictLossDB = 3.0

// summarize fills rep.Summary from the rest of rep.
func summarize(rep *Report) {
	s := ReportSummary{ModelS11DBF0: rep.S11DBF0, ModelFloorDB: ModelFloorDB, VerdictWarnings: []string{}}
	if s.ModelS11DBF0 < ModelFloorDB {
		s.ModelS11DBF0 = ModelFloorDB
	}
	if t := rep.Tolerance; t != nil && t.Samples > 0 {
		p50, p90 := t.P50S11DB, t.P90S11DB
		s.AsBuiltBoards, s.AsBuiltP50S11DB, s.AsBuiltP90S11DB = t.Samples, &p50, &p90
		s.AsBuiltP50BandDB, s.AsBuiltP90BandDB = t.P50WorstBandDB, t.P90WorstBandDB
	}
	if b := rep.Band; b != nil {
		v := b.WorstS11DB
		s.ModelWorstBandDB = &v
	}
	switch {
	case rep.S11DBF0 > -10:
		s.Verdict = "does not match: |S11| at f0 above −10 dB in the model"
	case s.AsBuiltP90S11DB != nil && *s.AsBuiltP90S11DB > -10:
		s.Verdict = "matches on the nominal board, but more than 1 board in 10 is above −10 dB at f0"
	default:
		s.Verdict = "matches"
	}
	if rep.NetworkLossDBF0 >= verdictLossDB {
		s.Verdict += fmt.Sprintf("; the network itself loses %.1f dB at f0", rep.NetworkLossDBF0)
	}
	for _, w := range rep.Warnings {
		if !strings.Contains(w, "reaches the edge of the sweep") {
			s.VerdictWarnings = append(s.VerdictWarnings, w)
		}
	}
	rep.Summary = s
}

// Headline is the one-line account of what a board can reach: the
// as-built median and 90th percentile at f0 when the tolerance analysis
// ran, and the model's nominal figure, floored.
func Headline(rep Report) string {
	s := rep.Summary
	model := "model (nominal board): |S11| at f0 " + ModelDB(rep.S11DBF0)
	if b := rep.Band; b != nil && s.ModelWorstBandDB != nil {
		model += ", worst in " + units.FormatFrequencyRange(b.StartHz, b.StopHz, 4) + " " + ModelDB(*s.ModelWorstBandDB)
	}
	if s.AsBuiltP50S11DB == nil {
		return "as built: not predicted (no tolerance analysis); " + model
	}
	band := ""
	if b := rep.Band; b != nil && s.AsBuiltP50BandDB != nil {
		band = fmt.Sprintf(", worst across %s median %.1f dB, 90th percentile %.1f dB",
			units.FormatFrequencyRange(b.StartHz, b.StopHz, 4), *s.AsBuiltP50BandDB, *s.AsBuiltP90BandDB)
	}
	return Minus(fmt.Sprintf("as built (%d boards): |S11| at f0 median %.1f dB, 90th percentile %.1f dB%s; %s",
		s.AsBuiltBoards, *s.AsBuiltP50S11DB, *s.AsBuiltP90S11DB, band, model))
}

// bodeFanoLine sets the Bode-Fano limit beside the headline figures: the
// best worst |S11| across the band that any lossless network can hold on
// the fitted load. It is "" unless report.json quotes the limit
// (bode_fano_status "quoted": the load fit within 5 % of |Z| and the limit
// above −60 dB), the rule the notes and the CLI follow.
func bodeFanoLine(rep Report) string {
	b := rep.Band
	if b == nil || b.BodeFanoS11DB == nil {
		return ""
	}
	return fmt.Sprintf("Bode-Fano limit across %s: %s, the best worst |S11| any lossless network can hold on this load (Fano 1950; the load fits %s within %.2g %% of |Z|)",
		units.FormatFrequencyRange(b.StartHz, b.StopHz, 4), Minus(fmt.Sprintf("%.2f dB", *b.BodeFanoS11DB)), b.LoadFitCircuit, b.LoadFitMisfitPct)
}

// Headline strip on sheet 1, mm and pt.
const (
	headlinePt    = 6.5
	headlinePitch = 3.0
	headlineChars = 130 // characters per line, at most, for the height estimate
)

// headlineFigures are the figure lines of the headline strip: the
// as-built and model figures, and the Bode-Fano limit when it is quoted.
func headlineFigures(rep Report) []string {
	lines := []string{Headline(rep)}
	if l := bodeFanoLine(rep); l != "" {
		lines = append(lines, l)
	}
	return lines
}

// headlineLines are the lines of sheet 1's headline strip: the as-built
// figures, the verdict and every warning that bears on it.
func headlineLines(rep Report) []string {
	lines := append(headlineFigures(rep), "verdict: "+rep.Summary.Verdict)
	for _, w := range rep.Summary.VerdictWarnings {
		lines = append(lines, "warning: "+w)
	}
	return lines
}

// headlineHeight is the paper height the headline strip takes: each line
// at headlinePitch, a long one wrapped (estimated at headlineChars a
// line), and a little room around.
func headlineHeight(rep Report) float64 {
	n := 0
	for _, l := range headlineLines(rep) {
		n += (len([]rune(l)) + headlineChars - 1) / headlineChars
	}
	return float64(n)*headlinePitch + 3
}

// headlineStrip writes the headline lines from (x, y) across width w: the
// figures in ink, the verdict and warnings in the warning colour unless
// the verdict is a plain match.
func (d *doc) headlineStrip(x, y, w float64) {
	f := d.pdf
	figures := len(headlineFigures(d.rep))
	for i, l := range headlineLines(d.rep) {
		style, col := "", colInk
		switch {
		case i == 0:
			style = "B"
		case i < figures:
			// The Bode-Fano limit: plain ink, as the figures.
		case i == figures && d.rep.Summary.Verdict == "matches":
			col = colAccent
		default:
			col = colWarn
		}
		f.SetFont(fontSans, style, headlinePt)
		setText(f, col)
		f.SetXY(x, y)
		f.MultiCell(w, headlinePitch, l, "", "L", false)
		y = f.GetY()
	}
}
