package export

import (
	"math"
	"math/cmplx"

	"stubcraft/synth"
)

// ReportFullwaveCentre is the record of build --fullwave-centre: each
// full-wave run of a drawn layout, the mapping of the circuit model fitted
// after it, and whether the full-wave best match came within the
// tolerance of f0. The run times are left out, so that report.json stays
// reproducible.
type ReportFullwaveCentre struct {
	Mesh         string              `json:"mesh"`
	TolerancePct float64             `json:"tolerance_pct"`
	MaxRuns      int                 `json:"max_runs"`
	Converged    bool                `json:"converged"`
	KeptRun      int                 `json:"kept_run"` // 1-based: the run whose copper is drawn
	Runs         []ReportFullwaveRun `json:"runs"`
}

// ReportFullwaveRun is one full-wave run of the centring.
type ReportFullwaveRun struct {
	Run                int     `json:"run"`
	BestMatchHz        float64 `json:"best_match_hz"`
	BestMatchOffsetPct float64 `json:"best_match_offset_pct"` // (best match / f0 − 1) × 100
	S11DBF0            float64 `json:"s11_db_f0"`
	// The mapped circuit model's figures of the same layout.
	CircuitBestMatchHz float64 `json:"circuit_best_match_hz"`
	CircuitS11DBF0     float64 `json:"circuit_s11_db_f0"`
	MaxSDifference     float64 `json:"max_s_difference"`
	// Map is the mapping the layout was drawn with (null for none), Drawn
	// its drawn lengths by element.
	Map     *ReportFullwaveMap `json:"map"`
	DrawnMM map[string]float64 `json:"drawn_mm"`
	// The mapping fitted after this run, and how well its offsets fit the
	// full-wave network (RMS |ΔS| within ±10 % of f0); absent after the
	// last run.
	NextMap      *ReportFullwaveMap `json:"next_map,omitempty"`
	FitRMSBefore *float64           `json:"fit_rms_s_difference_before,omitempty"`
	FitRMSAfter  *float64           `json:"fit_rms_s_difference_after,omitempty"`
	Cells        int                `json:"cells"`
	Steps        int                `json:"steps"`
}

// ReportFullwaveMap is a full-wave mapping of the circuit model: a length
// offset per element (model less drawn) and the S11 residual at f0 the
// re-centring aimed off by.
type ReportFullwaveMap struct {
	OffsetsMM      map[string]float64 `json:"offsets_mm"`
	S11ResidualMag float64            `json:"s11_residual_f0_mag"`
	S11ResidualDeg float64            `json:"s11_residual_f0_deg"`
}

func reportFullwaveMap(m *synth.FullwaveMapping) *ReportFullwaveMap {
	if m == nil {
		return nil
	}
	out := &ReportFullwaveMap{OffsetsMM: map[string]float64{}, S11ResidualMag: cmplx.Abs(m.Residual), S11ResidualDeg: cmplx.Phase(m.Residual) * 180 / math.Pi}
	for id, v := range m.Offsets {
		out.OffsetsMM[id] = v * 1e3
	}
	return out
}

// reportFullwaveCentre returns the report of c; nil for a plain build.
func reportFullwaveCentre(c *synth.FullwaveCentring, f0 float64) *ReportFullwaveCentre {
	if c == nil {
		return nil
	}
	out := &ReportFullwaveCentre{Mesh: c.Mesh, TolerancePct: 100 * c.Tolerance, MaxRuns: c.MaxRuns, Converged: c.Converged, KeptRun: c.Kept + 1}
	for i, r := range c.Runs {
		rr := ReportFullwaveRun{Run: i + 1, BestMatchHz: r.BestMatchHz, BestMatchOffsetPct: 100 * r.Offset(f0), S11DBF0: r.S11DBF0,
			CircuitBestMatchHz: r.CircuitBestMatchHz, CircuitS11DBF0: r.CircuitS11DBF0, MaxSDifference: r.MaxSDifference,
			Map: reportFullwaveMap(r.Map), DrawnMM: map[string]float64{}, NextMap: reportFullwaveMap(r.NextMap), Cells: r.Cells, Steps: r.Steps}
		for id, v := range r.Drawn {
			rr.DrawnMM[id] = v * 1e3
		}
		if r.NextMap != nil {
			before, after := r.FitRMSBefore, r.FitRMSAfter
			rr.FitRMSBefore, rr.FitRMSAfter = &before, &after
		}
		out.Runs = append(out.Runs, rr)
	}
	return out
}
