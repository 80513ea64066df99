package export

import (
	"strconv"
	"strings"
	"testing"
)

// The Bode-Fano limit stands beside the headline figures of sheets 1 and 2
// when report.json quotes it, and not otherwise (the notes' rule: a limit
// only on a load fit within 5 % of |Z| and above −60 dB). The expected
// line is written out by hand from the fixture's values (U+2212 for the
// minus, the band as an en-dash range).
func TestPDFBodeFanoLimit(t *testing.T) {
	limit := -10.4576
	cases := []struct {
		name   string
		band   ReportBand
		want   string // on sheets 1 and 2, "" for no limit line
		absent string
	}{
		{"quoted", ReportBand{StartHz: 2.2e9, StopHz: 2.7e9, WorstS11DB: -8.83, BodeFanoS11DB: &limit, BodeFanoStatus: "quoted",
			LoadFitCircuit: "parallel RC", LoadFitMisfitPct: 0.31},
			"Bode-Fano limit across 2.2–2.7 GHz: −10.46 dB, the best worst |S11| any lossless network can hold on this load (Fano 1950; the load fits parallel RC within 0.31 % of |Z|)", ""},
		{"below the floor", ReportBand{StartHz: 2.4e9, StopHz: 2.4835e9, WorstS11DB: -36, BodeFanoStatus: "below_floor",
			BodeFanoNote: "below -60 dB: over this band the fitted load's reactance sets no practical limit", LoadFitCircuit: "series RC", LoadFitMisfitPct: 1.1},
			"", "Bode-Fano limit across"},
		{"poor fit", ReportBand{StartHz: 2e9, StopHz: 3e9, WorstS11DB: -12, BodeFanoStatus: "poor_fit",
			BodeFanoNote: "not quoted: the best fit (series RC) misses the load by 13 % of |Z|", LoadFitCircuit: "series RC", LoadFitMisfitPct: 13},
			"", "Bode-Fano limit across"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			rep := fixtureReport(openStub())
			band := c.band
			rep.Band = &band
			path, _ := writeReportDrawing(t, rep, openStub(), "a4", "scale")
			for page := 1; page <= 2; page++ {
				text := strings.Join(strings.Fields(run(t, poppler(t, "pdftotext"), "-enc", "UTF-8", "-f", strconv.Itoa(page), "-l", strconv.Itoa(page), path, "-")), " ")
				if c.want != "" && !strings.Contains(text, c.want) {
					t.Errorf("sheet %d does not read %q", page, c.want)
				}
				if c.absent != "" && strings.Contains(text, c.absent) {
					t.Errorf("sheet %d reads %q with the limit %s", page, c.absent, c.band.BodeFanoStatus)
				}
			}
		})
	}
}
