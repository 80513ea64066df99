package export

import (
	"encoding/json"
	"fmt"
	"math"
	"math/cmplx"
	"path/filepath"
	"stubcraft/stackups"

	"stubcraft/physical"
	"stubcraft/synth"
	"stubcraft/synth/tune"
)

// Report is the machine-readable account of a build, written as
// report.json. Every key carries its unit.
type Report struct {
	Tool            string              `json:"tool"`
	Version         string              `json:"version"`
	Name            string              `json:"name"`
	FrequencyHz     float64             `json:"frequency_hz"`
	Z0Ohm           float64             `json:"z0_ohm"`
	Model           string              `json:"line_model"`
	Summary         ReportSummary       `json:"summary"`
	Stackup         ReportStackup       `json:"stackup"`
	Load            ReportLoad          `json:"load"`
	Electrical      []ReportSection     `json:"electrical"`
	Elements        []ReportElement     `json:"elements"`
	StubFromLoadMM  []float64           `json:"stub_from_load_port_mm"`
	S11DBF0         float64             `json:"s11_db_f0"`
	S11DBF0Uncorr   float64             `json:"s11_db_f0_uncorrected"`
	Recentring      ReportRecentring    `json:"recentring"`
	ReturnLossDBF0  Number              `json:"return_loss_db_f0"`
	VSWRF0          Number              `json:"vswr_f0"`            // null when infinite (|Γ| = 1)
	NetworkLossDBF0 Number              `json:"network_loss_db_f0"` // null when not finite
	Bandwidth10DBHz float64             `json:"bandwidth_10db_hz"`
	Band10DBHz      [2]float64          `json:"band_10db_hz"`
	Bandwidth20DBHz float64             `json:"bandwidth_20db_hz"`
	Band20DBHz      [2]float64          `json:"band_20db_hz"`
	Sweep           ReportSweep         `json:"sweep"`
	Tolerance       *ReportTolerance    `json:"tolerance,omitempty"`
	Band            *ReportBand         `json:"band,omitempty"`
	Sensitivity     []ReportSensitivity `json:"sensitivity"`
	Structures      []ReportStructure   `json:"structures,omitempty"`
	// FullwaveCentre is the record of build --fullwave-centre.
	FullwaveCentre *ReportFullwaveCentre `json:"fullwave_centre,omitempty"`
	Notes          []string              `json:"notes"`
	Warnings       []string              `json:"warnings"`
	Cautions       []string              `json:"cautions"`
}

// ReportBand is the match across a band.
type ReportBand struct {
	StartHz    float64  `json:"start_hz"`
	StopHz     float64  `json:"stop_hz"`
	GoalDB     *float64 `json:"goal_db"` // null when no goal was given
	WorstS11DB float64  `json:"worst_s11_db"`
	// BodeFanoS11DB is the Bode-Fano limit of the fitted load, null unless
	// BodeFanoStatus is "quoted": "below_floor" (a limit below −60 dB, no
	// practical limit), "poor_fit" (no RC, RL or RLC circuit fits the load
	// within 5 %, no limit quoted) or "no_reactance" (nothing limits the
	// match). BodeFanoNote says the same in words.
	BodeFanoS11DB  *float64 `json:"bode_fano_s11_db"`
	BodeFanoStatus string   `json:"bode_fano_status"`
	BodeFanoNote   string   `json:"bode_fano_note"`
	// LoadFit describes the load fit; LoadFitCircuit names it
	// ("series RC", …, "resistance", or "" when none fits) and
	// LoadFitMisfitPct is its worst misfit across the band, % of |Z|.
	LoadFit          string            `json:"load_fit"`
	LoadFitCircuit   string            `json:"load_fit_circuit"`
	LoadFitMisfitPct float64           `json:"load_fit_misfit_pct"`
	Topology         string            `json:"topology"`
	Objective        string            `json:"objective"`
	Candidates       []ReportCandidate `json:"candidates,omitempty"`
}

// ReportCandidate is one network tried by topology auto, best first.
type ReportCandidate struct {
	Name       string  `json:"name"`
	Topology   string  `json:"topology"`
	WorstS11DB float64 `json:"worst_s11_db"`
	AreaMM2    float64 `json:"board_area_mm2"` // the drawn board's bounding box
	LossDB     float64 `json:"network_loss_db_f0"`
	TotalDeg   float64 `json:"total_electrical_deg"`
	Error      string  `json:"error,omitempty"`
}

// ReportStackup holds the values of the stackup used.
type ReportStackup struct {
	Name              string   `json:"name"`
	Line              string   `json:"line"`
	Er                float64  `json:"er"`
	ErFrequencyHz     float64  `json:"er_frequency_hz,omitempty"`
	LossTangent       float64  `json:"loss_tangent"`
	ErF0              float64  `json:"er_at_f0"`           // εr used at the design frequency
	LossTangentF0     float64  `json:"loss_tangent_at_f0"` // tanδ used at the design frequency
	ThicknessMM       float64  `json:"dielectric_thickness_mm"`
	CopperThicknessUM float64  `json:"copper_thickness_um"`
	RoughnessUM       float64  `json:"copper_roughness_um"`
	ConductivitySPerM float64  `json:"copper_conductivity_s_per_m"`
	MaskThicknessUM   *float64 `json:"mask_thickness_um,omitempty"`
	MaskEr            *float64 `json:"mask_er,omitempty"`
	GapMM             *float64 `json:"gcpw_gap_mm,omitempty"`
}

// ReportLoad is the load at f0.
type ReportLoad struct {
	Touchstone   string  `json:"touchstone,omitempty"`
	ROhm         float64 `json:"r_ohm"`
	XOhm         float64 `json:"x_ohm"`
	GammaMag     float64 `json:"gamma_mag"`
	VSWR         Number  `json:"vswr"` // null when infinite (a reactive load)
	ReturnLossDB Number  `json:"return_loss_db"`
}

// ReportSection is one section of the electrical solution.
type ReportSection struct {
	Kind  string  `json:"kind"`
	End   string  `json:"end"`
	Z0Ohm float64 `json:"z0_ohm"`
	Deg   float64 `json:"electrical_deg"`
	WL    float64 `json:"electrical_wl"`
}

// ReportElement is one element of the corrected physical network.
type ReportElement struct {
	ID            string  `json:"id"`
	Role          string  `json:"role"`      // "line" or "stub"
	Feed          bool    `json:"port_feed"` // a line to a port, drawn to the layout's feed length
	End           string  `json:"end"`
	Z0Ohm         float64 `json:"z0_ohm"`
	Z0F0Ohm       float64 `json:"z0_model_f0_ohm"`
	EpsEffF0      float64 `json:"eps_eff_f0"`
	WidthMM       float64 `json:"width_mm"`
	ElectricalDeg float64 `json:"electrical_deg"`
	LineLengthMM  float64 `json:"line_length_mm"`
	OpenEndMM     float64 `json:"open_end_mm"`
	TeeMM         float64 `json:"tee_mm"`
	StepMM        float64 `json:"step_mm,omitempty"`
	TrimMM        float64 `json:"trim_mm,omitempty"`
	// TrimAllowanceMM is how much longer than DrawnLengthMM an open stub
	// is etched, to be cut back at the bench ([layout] trim).
	TrimAllowanceMM float64 `json:"trim_allowance_mm,omitempty"`
	ViaMM           float64 `json:"via_mm"`
	RecentreMM      float64 `json:"recentre_mm"`
	// BendMM is how much longer a stub the layout bends is drawn than its
	// electrical length: its mitred bends' shortening (synth.Element.Bend).
	BendMM        float64 `json:"bend_mm,omitempty"`
	DrawnLengthMM float64 `json:"drawn_length_mm"`
	AttachedTo    string  `json:"attached_to,omitempty"`
	// FullwaveMapMM is the full-wave mapping's offset: the circuit model's
	// length less the drawn length (build --fullwave-centre), not drawn.
	FullwaveMapMM float64 `json:"fullwave_map_mm,omitempty"`
}

// ReportRecentring records the optimiser's work.
type ReportRecentring struct {
	S11DBBefore float64            `json:"s11_db_before"`
	S11DBAfter  float64            `json:"s11_db_after"`
	ChangesMM   map[string]float64 `json:"length_changes_mm"`
	Evaluations int                `json:"evaluations"`
}

// ReportSweep is the band response, for plots and the Smith chart.
type ReportSweep struct {
	FreqHz []float64 `json:"freq_hz"`
	S11DB  []float64 `json:"s11_db"`
	S11Re  []float64 `json:"s11_re"`
	S11Im  []float64 `json:"s11_im"`
	LoadRe []float64 `json:"load_gamma_re"`
	LoadIm []float64 `json:"load_gamma_im"`
}

// ReportSensitivity says how the match moves for one step of one
// quantity: an element's drawn length (+0.1 mm) or width (+10 µm), or the
// board's εr (+1 %) or etch (+10 µm removed per edge).
type ReportSensitivity struct {
	ID       string `json:"id"`
	Quantity string `json:"quantity"`
	// Step is the perturbation in words with its unit, e.g. "+0.1 mm".
	Step string `json:"step"`
	// BestMatchShiftMHz is the move of the best-match frequency per step;
	// null for a band match, whose flat response has no best match.
	BestMatchShiftMHz *float64 `json:"best_match_shift_mhz_per_step"`
	// WorstInBandDB is, for a band match, the worst |S11| across the band
	// after one step.
	WorstInBandDB *float64 `json:"worst_s11_db_in_band_after_step,omitempty"`
	// S11DBF0AfterStep is |S11| at f0 after one step, to first order.
	S11DBF0AfterStep float64 `json:"s11_db_f0_after_step"`
}

// ReportStructure is one calibration or test structure on the panel.
type ReportStructure struct {
	Name     string     `json:"name"` // the prefix of its files
	Kind     string     `json:"kind"` // thru, line, reflect or coupon
	WidthMM  float64    `json:"width_mm"`
	LengthMM float64    `json:"length_mm"` // copper between the port edges (reflect: each half)
	BoardMM  [2]float64 `json:"board_mm"`  // its outline, width and height
	// LineExtraMM, LineDegF0 and UsableHz describe a TRL line standard:
	// its length beyond the thru, its phase at f0 and the band where that
	// phase stays within 20°–160°.
	LineExtraMM *float64    `json:"line_extra_mm,omitempty"`
	LineDegF0   *float64    `json:"line_deg_f0,omitempty"`
	UsableHz    *[2]float64 `json:"usable_band_hz,omitempty"`
	Note        string      `json:"note"`
}

// SensitivityStep says a quantity's step in words, with its unit.
func SensitivityStep(q tune.Quantity) string {
	switch q {
	case tune.Length:
		return fmt.Sprintf("+%g mm", tune.LengthStep*1e3)
	case tune.Width:
		return fmt.Sprintf("+%g µm", tune.WidthStep*1e6)
	case tune.Er:
		return fmt.Sprintf("+%g %% εr", tune.ErStep*100)
	case tune.Etch:
		return fmt.Sprintf("+%g µm etch per edge", tune.EtchStep*1e6)
	}
	return q.String()
}

// ReportTolerance is the Monte Carlo summary.
type ReportTolerance struct {
	Samples      int     `json:"samples"`
	Seed         int64   `json:"seed"`
	ErRel        float64 `json:"er_spread_rel"`
	ThicknessRel float64 `json:"thickness_spread_rel"`
	WidthUM      float64 `json:"width_spread_um"`
	CopperRel    float64 `json:"copper_spread_rel"`
	P50S11DB     float64 `json:"p50_s11_db"`
	P90S11DB     float64 `json:"p90_s11_db"`
	// P50WorstBandDB and P90WorstBandDB are, with a band, the median and
	// 90th percentile over the boards of the worst |S11| across the band.
	P50WorstBandDB *float64  `json:"p50_worst_s11_db_band,omitempty"`
	P90WorstBandDB *float64  `json:"p90_worst_s11_db_band,omitempty"`
	Yield          float64   `json:"yield"`
	YieldBelowDB   float64   `json:"yield_threshold_db"`
	SamplesS11DB   []float64 `json:"samples_s11_db"`
}

// returnLossText prints a simulated return loss, "above 100 dB" past it.
func returnLossText(rl float64) string {
	if rl > 100 {
		return "above 100 dB"
	}
	return fmt.Sprintf("%.1f dB", rl)
}

// designRelative returns path relative to the design file's directory,
// with forward slashes, so that the report does not depend on where the
// build ran from; unchanged when the design has no directory (the demo)
// or no relative form exists.
func designRelative(d synth.Design, path string) string {
	if path == "" || d.Dir == "" {
		return path
	}
	dir, err1 := filepath.Abs(d.Dir)
	abs, err2 := filepath.Abs(path)
	if err1 != nil || err2 != nil {
		return path
	}
	rel, err := filepath.Rel(dir, abs)
	if err != nil {
		return path
	}
	return filepath.ToSlash(rel)
}

// NewReport gathers the report of a build.
func NewReport(r *synth.Result, version string) Report {
	d, st := r.Design, r.Stackup
	rep := Report{
		Tool: "stubcraft", Version: version, Name: d.Name, FrequencyHz: d.Freq, Z0Ohm: d.Z0, Model: r.Model,
		S11DBF0: physical.MagDB(r.S11F0), S11DBF0Uncorr: physical.MagDB(r.Uncorr),
		ReturnLossDBF0: Number(-physical.MagDB(r.S11F0)), VSWRF0: Number(physical.VSWR(r.S11F0)),
		NetworkLossDBF0: Number(r.LossF0DB),
		Bandwidth10DBHz: r.BW10.Width(), Band10DBHz: [2]float64{r.BW10.Lo, r.BW10.Hi},
		Bandwidth20DBHz: r.BW20.Width(), Band20DBHz: [2]float64{r.BW20.Lo, r.BW20.Hi},
		Notes: minusAll(r.Notes), Warnings: minusAll(r.Warnings), Cautions: Cautions(),
	}
	rep.Stackup = ReportStackup{Name: st.Name, Line: st.Line.String(), Er: st.Dielectric.Er, ErFrequencyHz: st.Dielectric.ErFrequency,
		LossTangent: st.Dielectric.LossTangent, ThicknessMM: st.Dielectric.Thickness * 1e3,
		CopperThicknessUM: st.Copper.Thickness * 1e6, RoughnessUM: st.Copper.Roughness * 1e6,
		ConductivitySPerM: st.Copper.Conductivity}
	rep.Stackup.ErF0, rep.Stackup.LossTangentF0 = r.Physical.Board.Sub.Er, r.Physical.Board.Sub.LossTangent
	if rep.Stackup.Line == "" {
		rep.Stackup.Line = stackups.Microstrip.String()
	}
	if st.Mask != nil {
		t, e := st.Mask.Thickness*1e6, st.Mask.Er
		rep.Stackup.MaskThicknessUM, rep.Stackup.MaskEr = &t, &e
	}
	if st.Line == stackups.GCPW {
		g := st.Gap * 1e3
		rep.Stackup.GapMM = &g
	}
	g := physical.Reflection(r.LoadF0, d.Z0)
	rep.Load = ReportLoad{Touchstone: designRelative(d, d.Load.Touchstone), ROhm: real(r.LoadF0), XOhm: imag(r.LoadF0),
		GammaMag: cmplx.Abs(g), VSWR: Number(physical.VSWR(g)), ReturnLossDB: Number(physical.ReturnLossDB(g))}
	for _, s := range r.Sections {
		end := ""
		if s.Kind == synth.ShuntStub {
			end = s.End.String()
		}
		rep.Electrical = append(rep.Electrical, ReportSection{Kind: s.Kind.String(), End: end, Z0Ohm: s.Z0, Deg: s.LengthDeg, WL: s.LengthDeg / 360})
	}
	els := r.Physical.Elements
	for _, e := range els {
		re := ReportElement{ID: e.ID, Role: string(e.Role), Feed: e.Role == synth.RoleFeed, Z0Ohm: e.Z0, Z0F0Ohm: e.Params.Z0, EpsEffF0: e.Params.EpsEff,
			WidthMM: e.Width * 1e3, ElectricalDeg: e.ElectricalDeg, LineLengthMM: e.LineLength * 1e3,
			OpenEndMM: e.OpenEnd * 1e3, TeeMM: e.Tee * 1e3, StepMM: e.Step * 1e3, ViaMM: e.Via * 1e3, RecentreMM: e.Recentre * 1e3, TrimMM: e.Trim * 1e3, BendMM: e.Bend * 1e3,
			DrawnLengthMM: e.Drawn() * 1e3, FullwaveMapMM: e.FullwaveMap * 1e3}
		if re.Feed {
			re.Role = string(synth.RoleLine)
		}
		if e.Role == synth.RoleStub {
			re.End = e.End.String()
			re.AttachedTo = throughID(els, e.At)
			if e.End == synth.Open {
				re.TrimAllowanceMM = r.Design.Layout.Trim * 1e3
			}
		}
		rep.Elements = append(rep.Elements, re)
	}
	rep.StubFromLoadMM = stubPositions(els)
	rep.FullwaveCentre = reportFullwaveCentre(r.FullwaveCentre, d.Freq)
	rep.Recentring = ReportRecentring{S11DBBefore: physical.MagDB(r.Recentre.Before), S11DBAfter: physical.MagDB(r.Recentre.After),
		ChangesMM: map[string]float64{}, Evaluations: r.Recentre.Evaluations}
	for i, id := range r.Recentre.IDs {
		rep.Recentring.ChangesMM[id] = r.Recentre.Changes[i] * 1e3
	}
	if sw := r.Sweep; len(sw.Freqs) > 0 {
		n := len(sw.Freqs)
		rep.Sweep = ReportSweep{FreqHz: make([]float64, n), S11DB: make([]float64, n), S11Re: make([]float64, n),
			S11Im: make([]float64, n), LoadRe: make([]float64, n), LoadIm: make([]float64, n)}
		for i, f := range sw.Freqs {
			gl := physical.Reflection(sw.ZLoad[i], d.Z0)
			rep.Sweep.FreqHz[i], rep.Sweep.S11DB[i] = f, physical.MagDB(sw.S11[i])
			rep.Sweep.S11Re[i], rep.Sweep.S11Im[i] = real(sw.S11[i]), imag(sw.S11[i])
			rep.Sweep.LoadRe[i], rep.Sweep.LoadIm[i] = real(gl), imag(gl)
		}
	}
	for _, s := range r.Structures {
		lo, hi := s.Layout.Board.Bounds()
		rs := ReportStructure{Name: s.Layout.Name, Kind: s.Kind.String(), WidthMM: s.Width * 1e3, LengthMM: s.Length * 1e3,
			BoardMM: [2]float64{float64(hi.X-lo.X) * 1e-6, float64(hi.Y-lo.Y) * 1e-6}, Note: s.Note}
		if t := s.TRL; t != nil {
			extra, deg, band := t.Extra*1e3, t.DegF0, [2]float64{t.Lo, t.Hi}
			rs.LineExtraMM, rs.LineDegF0, rs.UsableHz = &extra, &deg, &band
		}
		rep.Structures = append(rep.Structures, rs)
	}
	rep.Sensitivity = []ReportSensitivity{}
	for _, x := range r.Sensitivity {
		rs := ReportSensitivity{ID: x.ID, Quantity: x.Quantity.String(), Step: SensitivityStep(x.Quantity),
			S11DBF0AfterStep: physical.MagDB(x.S11F0)}
		if math.IsNaN(x.BestMatchShift) {
			w := physical.MagDB(complex(x.WorstInBand, 0))
			rs.WorstInBandDB = &w
		} else {
			mhz := x.BestMatchShift / 1e6
			rs.BestMatchShiftMHz = &mhz
		}
		rep.Sensitivity = append(rep.Sensitivity, rs)
	}
	if b := r.Band; b != nil {
		bf := b.BodeFano
		rep.Band = &ReportBand{StartHz: b.Start, StopHz: b.Stop, WorstS11DB: b.WorstS11DB,
			BodeFanoStatus: bf.Status.String(), BodeFanoNote: BodeFanoNote(bf),
			LoadFit: bf.FitText(), LoadFitCircuit: bf.FitCircuit(), LoadFitMisfitPct: 100 * bf.Fit.MaxRelErr,
			Topology: b.Topology, Objective: b.Objective}
		if b.GoalDB != 0 {
			v := b.GoalDB
			rep.Band.GoalDB = &v
		}
		if v, ok := bf.Quoted(); ok {
			rep.Band.BodeFanoS11DB = &v
		}
		for _, c := range b.Candidates {
			rep.Band.Candidates = append(rep.Band.Candidates, ReportCandidate{Name: c.Name(), Topology: c.Topology,
				WorstS11DB: c.WorstS11DB, AreaMM2: c.AreaM2 * 1e6, LossDB: c.LossDB, TotalDeg: c.TotalDeg, Error: c.Err})
		}
	}
	if t := r.Tolerance; t != nil {
		rep.Tolerance = &ReportTolerance{Samples: t.Spec.Samples, Seed: t.Spec.Seed, ErRel: t.Spec.Er,
			ThicknessRel: t.Spec.Thickness, WidthUM: t.Spec.Width * 1e6, CopperRel: t.Spec.Copper,
			P50S11DB: t.P50, P90S11DB: t.P90, Yield: t.Yield, YieldBelowDB: synth.YieldThresholdDB, SamplesS11DB: t.S11DB}
		if !math.IsNaN(t.BandP50) {
			p50, p90 := t.BandP50, t.BandP90
			rep.Tolerance.P50WorstBandDB, rep.Tolerance.P90WorstBandDB = &p50, &p90
		}
	}
	summarize(&rep)
	return rep
}

// throughID names the through element with index at among the through elements.
func throughID(els []synth.Element, at int) string {
	k := 0
	for _, e := range els {
		if e.Role == synth.RoleStub {
			continue
		}
		if k == at {
			return e.ID
		}
		k++
	}
	return ""
}

// stubPositions returns each stub's centre-line distance from the load
// port along the through line, mm.
func stubPositions(els []synth.Element) []float64 {
	var cum []float64
	x := 0.0
	for _, e := range els {
		if e.Role != synth.RoleStub {
			x += e.Drawn()
			cum = append(cum, x)
		}
	}
	var out []float64
	for _, e := range els {
		if e.Role == synth.RoleStub && e.At < len(cum) {
			out = append(out, cum[e.At]*1e3)
		}
	}
	return out
}

// Number is a report value that may be infinite or not a number; JSON
// has no such values, so it is written as null.
type Number float64

// MarshalJSON writes n as encoding/json writes a float64, or null when n
// is not finite.
func (n Number) MarshalJSON() ([]byte, error) {
	if math.IsInf(float64(n), 0) || math.IsNaN(float64(n)) {
		return []byte("null"), nil
	}
	return json.Marshal(float64(n))
}

// minusAll is s with its minus signs written by Minus, never nil.
func minusAll(s []string) []string {
	out := make([]string, len(s))
	for i, l := range s {
		out[i] = Minus(l)
	}
	return out
}
