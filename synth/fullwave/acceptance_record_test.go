package fullwave

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"stubcraft/physical/fdtd/records"
)

// acceptanceGaps are the designs known to miss issue 11 §5, each with its
// recorded figure and what is known of the cause (DEVELOPERS.md). They are
// logged, not held; one that meets the criteria when re-recorded fails the
// test, so that the list cannot go stale.
var acceptanceGaps = map[string]string{
	// gcpw-probe left the list with its coplanar gap counted in the edge
	// cell (83ef663: −0.51 %, −33.5 dB, max |ΔS| 0.187); with the gap in
	// two cells its line's εeff was 1.7 % above the field solver's, and its
	// best match −1.28 % (99f29ce).
	// sensor-antenna-by-hand left the list with the thin-wire via's column
	// a disc round the drill (99f29ce: +0.51 %, −23.2 dB, max |ΔS| 0.103;
	// +1.89 %, −19.1 dB with the column mirrored by grid index).
}

// trimmedDesigns are the designs drawn with a trim allowance: their open
// stubs are drawn longer than their design length on purpose, so the
// copper's best match lies below f0 until it is trimmed at the bench. Their
// full-wave best match is held to the circuit model's of the same copper
// (verify's circuit_best_match_hz for such a design), which must itself lie
// below f0.
var trimmedDesigns = map[string]bool{"trim-allowance": true}

// TestRecordedAcceptance holds testdata/fdtd/acceptance.tsv (written by
// testdata/fdtd/acceptance.sh, `stubcraft verify --mesh normal` on the
// layout as built) to issue 11 §5: the full-wave best match within 1 % of
// f0 (of the circuit's best match of the drawn copper for a design with a
// trim allowance) and the full-wave |S11| at f0 at most −20 dB. Band
// designs (band-*) are held to the |S11| at f0 only: their match is spread
// across the band, so the best match is not their criterion. Designs whose
// circuit model itself does not match at f0 (|S11| above −20 dB: a
// [[section]] network drawn as worked by hand) are logged only: there is
// no match for the full-wave to confirm. Every example design under
// testdata/designs (but the bad-* inputs) and the demo must have a row.
func TestRecordedAcceptance(t *testing.T) {
	rec := records.Read(t, "../../testdata/fdtd/acceptance.tsv", "testdata/fdtd/acceptance.sh")
	examples, err := filepath.Glob("../../testdata/designs/*.toml")
	if err != nil {
		t.Fatal(err)
	}
	missing := map[string]bool{"demo": true}
	for _, p := range examples {
		if name := strings.TrimSuffix(filepath.Base(p), ".toml"); !strings.HasPrefix(name, "bad-") {
			missing[name] = true
		}
	}
	for _, row := range rec.Rows {
		if why, failed := row.Failed(); failed {
			t.Errorf("%s: the recorded verify failed: %s", row.Cells[0], why)
			continue
		}
		num := func(name string) float64 { return row.Num(t, name) }
		d := row.Cells[0]
		f0, best, s11 := num("f0_hz"), num("fullwave_best_match_hz"), num("fullwave_s11_db_f0")
		target, from := f0, "f0"
		if trimmedDesigns[d] {
			target, from = num("circuit_best_match_hz"), "the circuit model's best match of the copper as drawn (trim allowance)"
			if !(target < 0.995*f0) {
				t.Errorf("%s: the circuit best match of the copper drawn with its trim allowance is %.6g Hz, want below f0 (%.6g Hz): the record predates verify comparing the drawn copper", d, target, f0)
			}
		}
		off := 100 * (best/target - 1)
		ok := math.Abs(off) <= 1 && s11 <= -20
		t.Logf("%s: best match %+.2f %% from %s, |S11| at f0 %.1f dB, max |ΔS| %.3f", d, off, from, s11, num("max_s_difference"))
		delete(missing, d)
		if strings.HasPrefix(d, "band-") {
			if s11 > -20 {
				t.Errorf("%s: full-wave |S11| at f0 %.1f dB, want ≤ −20 dB", d, s11)
			}
			continue
		}
		if num("circuit_s11_db_f0") > -20 {
			continue
		}
		if gap, known := acceptanceGaps[d]; known {
			if ok {
				t.Errorf("%s meets the criteria now (%+.2f %%, %.1f dB): remove it from acceptanceGaps", d, off, s11)
			} else {
				t.Logf("%s: known gap: %s", d, gap)
			}
			continue
		}
		if !ok {
			t.Errorf("%s: full-wave best match %+.2f %% from f0 and |S11| at f0 %.1f dB, want within ±1 %% and ≤ −20 dB", d, off, s11)
		}
	}
	if len(rec.Made) == 0 {
		t.Error("acceptance.tsv has no '# made by:' line with the command and date")
	}
	for d := range missing {
		t.Errorf("acceptance.tsv has no row for %s (testdata/fdtd/acceptance.sh %s records it)", d, d)
	}
}
