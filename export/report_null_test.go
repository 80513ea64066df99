package export

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// Values JSON cannot hold (RFC 8259 has no infinity or NaN) are written as
// null; finite ones exactly as encoding/json writes a float64.
func TestReportNonFiniteIsNull(t *testing.T) {
	rep := Report{VSWRF0: Number(math.Inf(1)), NetworkLossDBF0: Number(math.NaN()), ReturnLossDBF0: Number(math.Inf(-1))}
	rep.Load.VSWR = 1.5
	var buf bytes.Buffer
	if err := WriteReport(&buf, rep); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`"vswr_f0": null`, `"network_loss_db_f0": null`, `"return_loss_db_f0": null`, `"vswr": 1.5`} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("report lacks %s", want)
		}
	}
	for _, v := range []float64{0, -0.5, 1e-9, 123456789e20, 1.0 / 3} {
		a, _ := json.Marshal(v)
		b, _ := json.Marshal(Number(v))
		if !bytes.Equal(a, b) {
			t.Errorf("%g: Number writes %s, float64 %s", v, b, a)
		}
	}
}
