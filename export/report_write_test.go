package export

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// encodeReport is the reference: encoding/json's Encoder with the indent
// WriteReport promises to reproduce.
func encodeReport(t *testing.T, rep Report) []byte {
	t.Helper()
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	if err := enc.Encode(rep); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// WriteReport streams the sweep itself; the file must be byte for byte
// what encoding/json writes (the reference), for every kind of number
// json formats differently (exponent cut-offs at 1e-6 and 1e21, negative
// zero, exponent with one digit) and for nil, empty and full arrays.
func TestWriteReportMatchesEncodingJSON(t *testing.T) {
	odd := []float64{0, math.Copysign(0, -1), 1, -1.5, 1e-6, 9.99999e-7, -1e-7, 1e21, 9.999e20, 2.45e9, 1.0 / 3, -123.456e-300, math.MaxFloat64, 5e-324}
	cases := map[string]ReportSweep{
		"nil":   {},
		"empty": {FreqHz: []float64{}, S11DB: []float64{}, S11Re: []float64{}, S11Im: []float64{}, LoadRe: []float64{}, LoadIm: []float64{}},
		"mixed": {FreqHz: odd, S11DB: []float64{-40.5}, S11Re: nil, S11Im: []float64{}, LoadRe: odd[:3], LoadIm: odd[5:]},
	}
	for name, sw := range cases {
		t.Run(name, func(t *testing.T) {
			rep := Report{Tool: "stubcraft", Name: "a<b>&c", Sweep: sw, Notes: []string{"x\ny", "\u2028"},
				Recentring: ReportRecentring{ChangesMM: map[string]float64{"b": 1, "a": 2}},
				Tolerance:  &ReportTolerance{SamplesS11DB: []float64{-30, -20}}, VSWRF0: Number(math.Inf(1))}
			var got bytes.Buffer
			if err := WriteReport(&got, rep); err != nil {
				t.Fatal(err)
			}
			if want := encodeReport(t, rep); !bytes.Equal(got.Bytes(), want) {
				t.Errorf("WriteReport differs from encoding/json:\n%s\nwant\n%s", got.Bytes(), want)
			}
		})
	}
}

// A sweep value JSON cannot hold is an error, as with encoding/json.
func TestWriteReportRejectsNonFiniteSweep(t *testing.T) {
	rep := Report{Sweep: ReportSweep{FreqHz: []float64{1, 2}, S11DB: []float64{-10, math.Inf(-1)}}}
	err := WriteReport(&bytes.Buffer{}, rep)
	if err == nil || !strings.Contains(err.Error(), "s11_db[1]") {
		t.Errorf("error %v, want one naming s11_db[1]", err)
	}
}
