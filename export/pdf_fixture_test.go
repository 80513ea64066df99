package export

import (
	"math"
	"math/cmplx"
	"testing"
	"time"

	"stubcraft/synth/geom"
)

// drawingSpec is a hand-made network: feed (5 mm), one line section
// (7.345 mm), feed (5 mm), all 2.985 mm wide, with one stub at the
// boundary after the line section. Sizes in mm.
type drawingSpec struct {
	line, stubW, stubL float64
	via                bool
	side               int
}

// fixtureLayout builds the layout of ds with geom.Build, 5 mm margin and
// 1 mm port pads.
func fixtureLayout(t testing.TB, ds drawingSpec) geom.Layout {
	t.Helper()
	s := geom.Spec{
		Name: "fixture",
		Segments: []geom.Segment{
			{ID: "feed-load", Width: 2.985e-3, Length: 5e-3},
			{ID: "line-1", Width: 2.985e-3, Length: ds.line * 1e-3},
			{ID: "feed-source", Width: 2.985e-3, Length: 5e-3},
		},
		Stubs:         []geom.Stub{{ID: "stub-1", At: 1, Width: ds.stubW * 1e-3, Length: ds.stubL * 1e-3, Side: ds.side}},
		PortPad:       geom.PadSpec{Width: 2.985e-3, Length: 1e-3},
		Margin:        5e-3,
		Height:        1.6e-3,
		Mask:          "open",
		MaskExpansion: 50e-6,
	}
	if ds.via {
		s.Stubs[0].Via = &geom.ViaSpec{Drill: 0.4e-3, Pad: 0.8e-3}
	}
	lay, err := geom.Build(s)
	if err != nil {
		t.Fatal(err)
	}
	return lay
}

// fixtureReport is a report consistent with fixtureLayout(ds): the values
// a build would have reported for that layout, chosen by hand.
func fixtureReport(ds drawingSpec) Report {
	mask, maskEr := 20.0, 3.5
	drawn := ds.stubL
	if ds.via {
		drawn = ds.stubL - 0.4 // the drawn length ends at the via centre
	}
	end := "open"
	if ds.via {
		end = "short"
	}
	rep := Report{
		Tool: "stubcraft", Version: "0.0.0-test", Name: "fixture-match", FrequencyHz: 2.45e9, Z0Ohm: 50,
		Model: "Hammerstad-Jensen static, Kirschning-Jansen dispersion",
		Stackup: ReportStackup{Name: "fr4-1.6mm", Line: "microstrip", Er: 4.3, ErFrequencyHz: 1e9, LossTangent: 0.02,
			ThicknessMM: 1.6, CopperThicknessUM: 35, RoughnessUM: 1.2, ConductivitySPerM: 5.8e7, MaskThicknessUM: &mask, MaskEr: &maskEr},
		Load: ReportLoad{ROhm: 31, XOhm: -24, GammaMag: 0.3756, VSWR: 2.2, ReturnLossDB: 8.5},
		Elements: []ReportElement{
			{ID: "feed-load", Role: "line", Feed: true, Z0Ohm: 50, Z0F0Ohm: 49.87, EpsEffF0: 3.337, WidthMM: 2.985, ElectricalDeg: 26.91, LineLengthMM: 5, DrawnLengthMM: 5},
			{ID: "line-1", Role: "line", Z0Ohm: 50, Z0F0Ohm: 49.87, EpsEffF0: 3.337, WidthMM: 2.985, ElectricalDeg: 41.27, LineLengthMM: ds.line + 0.654,
				TeeMM: -0.789, RecentreMM: 0.135, DrawnLengthMM: ds.line},
			{ID: "feed-source", Role: "line", Feed: true, Z0Ohm: 50, Z0F0Ohm: 49.87, EpsEffF0: 3.337, WidthMM: 2.985, ElectricalDeg: 26.91, LineLengthMM: 5, DrawnLengthMM: 5},
			{ID: "stub-1", Role: "stub", End: end, Z0Ohm: 50, Z0F0Ohm: 49.87, EpsEffF0: 3.337, WidthMM: ds.stubW, ElectricalDeg: 58.36,
				LineLengthMM: drawn + 0.512 + 0.221, OpenEndMM: -0.512, TeeMM: -0.221, DrawnLengthMM: drawn, AttachedTo: "line-1"},
		},
		StubFromLoadMM: []float64{5 + ds.line},
		S11DBF0:        -31.4, S11DBF0Uncorr: -14.2, ReturnLossDBF0: 31.4, VSWRF0: 1.054, NetworkLossDBF0: 0.071,
		Bandwidth10DBHz: 0.41e9, Band10DBHz: [2]float64{2.27e9, 2.68e9},
		Recentring: ReportRecentring{S11DBBefore: -24.6, S11DBAfter: -31.4, Evaluations: 42},
		Notes:      []string{"re-centred line-1 by +0.135 mm in the full model"},
		Warnings:   []string{"the stackup's εr is specified at 1 GHz; its value at 2.45 GHz is extrapolated (±0.05)"},
		Cautions:   Cautions(),
	}
	// A smooth synthetic band response: a load drifting with frequency and
	// an input reflection crossing near the centre of the chart at f0.
	for i := 0; i <= 90; i++ {
		f := 2.0e9 + float64(i)*0.01e9
		u := (f - 2.45e9) / 0.45e9
		zl := complex(31+6*u, -24+20*u)
		gl := (zl - 50) / (zl + 50)
		gi := complex(0.027+0.55*u*u, 0.62*u)
		rep.Sweep.FreqHz = append(rep.Sweep.FreqHz, f)
		rep.Sweep.S11DB = append(rep.Sweep.S11DB, 20*math.Log10(cmplx.Abs(gi)))
		rep.Sweep.S11Re = append(rep.Sweep.S11Re, real(gi))
		rep.Sweep.S11Im = append(rep.Sweep.S11Im, imag(gi))
		rep.Sweep.LoadRe = append(rep.Sweep.LoadRe, real(gl))
		rep.Sweep.LoadIm = append(rep.Sweep.LoadIm, imag(gl))
	}
	tol := &ReportTolerance{Samples: 400, Seed: 7, ErRel: 0.05, ThicknessRel: 0.1, WidthUM: 25, CopperRel: 0.1,
		P50S11DB: -24.5, P90S11DB: -17.8, Yield: 0.97, YieldBelowDB: -15}
	for i := 0; i < tol.Samples; i++ {
		// A deterministic spread: a bent ramp between −40 and −12 dB.
		q := (float64(i) + 0.5) / float64(tol.Samples)
		tol.SamplesS11DB = append(tol.SamplesS11DB, -40+28*math.Pow(q, 0.6))
	}
	rep.Tolerance = tol
	return rep
}

// fixtureOptions are the drawing options of the tests.
func fixtureOptions(page, fit string) DrawingOptions {
	return DrawingOptions{Page: PageSize(page), Fit: Fit(fit), Created: time.Date(2024, 5, 17, 8, 30, 0, 0, time.UTC), Version: "0.0.0-test"}
}

// openStub is the default fixture: an open stub 9.876 mm long, 2.985 mm
// wide, upward.
func openStub() drawingSpec { return drawingSpec{line: 7.345, stubW: 2.985, stubL: 9.876, side: 1} }
