package fullwave

import (
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"testing"

	"stubcraft/physical/fdtd/records"
)

// fenceS21Limit is how far the via fence may move the network's S21 near
// f0 (within ±10 %) for leaving it out of the circuit model to be fair:
// 0.0175 is 1° of phase at |S21| ≈ 1, the tolerance the project holds its
// junction models to (1 % of f0 on about 100° of network is about 1°).
const fenceS21Limit = 0.0175

// fenceGap, when not empty, says that the record exceeds fenceS21Limit and
// what is known of it; the test then logs it and fails if the record no
// longer exceeds the limit, so that the note cannot go stale.
const fenceGap = "recorded on the coarse mesh with thin-wire vias whose columns are discs round the drill (99f29ce): the fence moves S21 by up to 0.045 (2.6°) within ±10 % of f0 and the full-wave best match from 5.810 to 5.771 GHz (−0.68 %); with 8c0742a's columns (mirrored by grid index) 0.056 (3.3°), 5.807 → 5.758 GHz; with its vias drawn as one grid node each (a3fcb36, posts of about 0.2 of the local cell) it was 0.045 (2.6°) and 5.770 → 5.732 GHz (−0.65 %): vias of their drilled radius ground better and the effect grew; not separated: the rows along the through line from those round the shorted stub"

// TestRecordedFence reads testdata/fdtd/fence.sh's record (fence.tsv): the
// full-wave network of testdata/designs/edge-launch-fence.toml (edge-launch
// landings at both ports, a via fence along the lines) with and without
// its fence, on the same mesh level. It checks that both runs are passive
// (|S11|² + |S21|² ≤ 1 within 0.01, the solver's lossless check) and holds
// the fence's change of S21 within ±10 % of f0 to fenceS21Limit.
func TestRecordedFence(t *testing.T) {
	rec := records.Read(t, "../../testdata/fdtd/fence.tsv", "testdata/fdtd/fence.sh")
	var f0 float64
	var worst, worstF, worst11, worstPhase float64
	for _, line := range rec.Made {
		t.Log(line)
	}
	for _, line := range rec.Comments {
		if v, ok := strings.CutPrefix(line, "# f0_hz\t"); ok {
			var err error
			if f0, err = strconv.ParseFloat(v, 64); err != nil {
				t.Fatalf("fence.tsv: %q: %v", line, err)
			}
			continue
		}
		t.Log(line)
	}
	made, rows := len(rec.Made) > 0, 0
	columns := [...]string{"f_hz", "s11_fence_re", "s11_fence_im", "s21_fence_re", "s21_fence_im", "s11_bare_re", "s11_bare_im", "s21_bare_re", "s21_bare_im"}
	for _, r := range rec.Rows {
		var v [len(columns)]float64
		if len(r.Cells) != len(v) {
			t.Fatalf("fence.tsv: %q: want %d columns", r.Line, len(v))
		}
		for i, name := range columns {
			v[i] = r.Num(t, name)
		}
		rows++
		s11f, s21f := complex(v[1], v[2]), complex(v[3], v[4])
		s11b, s21b := complex(v[5], v[6]), complex(v[7], v[8])
		for _, p := range [][2]complex128{{s11f, s21f}, {s11b, s21b}} {
			if e := sq(cmplx.Abs(p[0])) + sq(cmplx.Abs(p[1])); e > 1.01 {
				t.Errorf("%.4g GHz: |S11|² + |S21|² = %.4f, above 1.01", v[0]/1e9, e)
			}
		}
		if f0 > 0 && math.Abs(v[0]/f0-1) <= 0.1 {
			if d := cmplx.Abs(s21f - s21b); d > worst {
				worst, worstF = d, v[0]
				worstPhase = math.Abs(cmplx.Phase(s21f/s21b)) * 180 / math.Pi
			}
			worst11 = math.Max(worst11, cmplx.Abs(s11f-s11b))
		}
	}
	if !made || f0 == 0 || rows < 10 {
		t.Fatalf("fence.tsv: made-by line %v, f0 %g Hz, %d rows: incomplete record", made, f0, rows)
	}
	t.Logf("within ±10 %% of f0: the fence moves S21 by up to %.4f (%.2f° at %.4g GHz) and S11 by up to %.4f; limit %.4f",
		worst, worstPhase, worstF/1e9, worst11, fenceS21Limit)
	switch {
	case fenceGap == "" && worst > fenceS21Limit:
		t.Errorf("the fence moves S21 by %.4f near f0, above %.4f: the circuit model, which leaves it out, is off by that much", worst, fenceS21Limit)
	case fenceGap != "" && worst <= fenceS21Limit:
		t.Errorf("fence.tsv now meets the limit (%.4f ≤ %.4f): remove the known gap (%s)", worst, fenceS21Limit, fenceGap)
	case fenceGap != "":
		t.Logf("known gap: %s", fenceGap)
	}
}

func sq(x float64) float64 { return x * x }
