package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"
)

func runSolveCmd(args ...string) (string, error) {
	cmd := newSolveCmd()
	var out, errOut bytes.Buffer
	cmd.SetArgs(args)
	cmd.SetOut(&out)
	cmd.SetErr(&errOut)
	err := cmd.Execute()
	return out.String() + errOut.String(), err
}

// Pozar, Microwave Engineering 4th ed., Example 5.2 (from memory): 15 + j10
// Ω on 50 Ω with open stubs: d = 0.044 λ, l = 0.147 λ and d = 0.387 λ,
// l = 0.353 λ.
func TestSolveJSONPozar(t *testing.T) {
	out, err := runSolveCmd("--load", "15+j10", "--z0", "50", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var raw map[string]any
	if err := json.Unmarshal([]byte(out), &raw); err != nil {
		t.Fatalf("%v in %s", err, out)
	}
	for _, k := range []string{"load_ohm", "z0_ohm", "gamma_mag", "vswr", "return_loss_db", "solutions"} {
		if _, ok := raw[k]; !ok {
			t.Errorf("key %q missing in %s", k, out)
		}
	}
	var res struct {
		Load struct{ Re, Im float64 } `json:"load_ohm"`
		Z0   float64                  `json:"z0_ohm"`
		G    float64                  `json:"gamma_mag"`
		VSWR float64                  `json:"vswr"`
		RL   float64                  `json:"return_loss_db"`
		Sols []map[string]any         `json:"solutions"`
	}
	if err := json.Unmarshal([]byte(out), &res); err != nil {
		t.Fatal(err)
	}
	// exact: |Γ| = |(−35+j10)/(65+j10)| = sqrt(1325/4325)
	g := math.Sqrt(1325.0 / 4325)
	if res.Load.Re != 15 || res.Load.Im != 10 || res.Z0 != 50 || math.Abs(res.G-g) > 1e-12 ||
		math.Abs(res.VSWR-(1+g)/(1-g)) > 1e-9 || math.Abs(res.RL+20*math.Log10(g)) > 1e-9 {
		t.Errorf("load report %+v", res)
	}
	want := []struct{ line, stub float64 }{{0.044, 0.147}, {0.387, 0.353}} // Pozar Example 5.2 (from memory)
	if len(res.Sols) != 2 {
		t.Fatalf("solutions %v", res.Sols)
	}
	for i, w := range want {
		s := res.Sols[i]
		for _, k := range []string{"line_wl", "line_deg", "stub_wl", "stub_deg", "stub_end"} {
			if _, ok := s[k]; !ok {
				t.Errorf("solution %d: key %q missing", i+1, k)
			}
		}
		if math.Abs(s["line_wl"].(float64)-w.line) > 0.001 || math.Abs(s["stub_wl"].(float64)-w.stub) > 0.001 || s["stub_end"] != "open" {
			t.Errorf("solution %d: %v, want d = %g λ, l = %g λ", i+1, s, w.line, w.stub)
		}
		if math.Abs(s["line_deg"].(float64)-360*s["line_wl"].(float64)) > 1e-9 {
			t.Errorf("solution %d: degrees and wavelengths disagree: %v", i+1, s)
		}
	}
}

// The table shows both solutions, the same numbers as the JSON, and units
// in its header.
func TestSolveTable(t *testing.T) {
	out, err := runSolveCmd("--load", "15+j10", "--stub", "short")
	if err != nil {
		t.Fatal(err)
	}
	js, err := runSolveCmd("--load", "15+j10", "--stub", "short", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var res struct {
		Sols []struct {
			LineWL  float64 `json:"line_wl"`
			LineDeg float64 `json:"line_deg"`
			StubWL  float64 `json:"stub_wl"`
			StubDeg float64 `json:"stub_deg"`
			End     string  `json:"stub_end"`
		} `json:"solutions"`
	}
	if err := json.Unmarshal([]byte(js), &res); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"(λ)", "(°)", "|Γ|", "VSWR", "return loss", "dB", "short"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	if len(res.Sols) != 2 {
		t.Fatalf("%d solutions", len(res.Sols))
	}
	for i, s := range res.Sols {
		if s.End != "short" {
			t.Errorf("solution %d end %q", i+1, s.End)
		}
		for _, v := range []string{fmt.Sprintf("%.4f", s.LineWL), fmt.Sprintf("%.2f", s.LineDeg), fmt.Sprintf("%.4f", s.StubWL), fmt.Sprintf("%.2f", s.StubDeg)} {
			if !strings.Contains(out, v) {
				t.Errorf("solution %d: table lacks %s:\n%s", i+1, v, out)
			}
		}
	}
}

func TestSolveMatchedLoad(t *testing.T) {
	out, err := runSolveCmd("--load", "50", "--z0", "50")
	if err != nil || !strings.Contains(out, "already matched") {
		t.Errorf("%v: %s", err, out)
	}
	js, err := runSolveCmd("--load", "50", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var raw map[string]any
	if err := json.Unmarshal([]byte(js), &raw); err != nil {
		t.Fatal(err)
	}
	if sols, ok := raw["solutions"].([]any); !ok || len(sols) != 0 || raw["return_loss_db"] != nil {
		t.Errorf("matched JSON: %s", js)
	}
}

func TestSolveBadFlags(t *testing.T) {
	cases := []struct {
		args []string
		want []string // all in the error
	}{
		{[]string{}, []string{"--load"}},
		{[]string{"--load", "abc"}, []string{"--load", `"abc"`}},
		{[]string{"--load", "-5+j3"}, []string{"--load", `"-5+j3"`, "negative resistance"}},
		{[]string{"--load", "0-j40"}, []string{"--load", `"0-j40"`, "reactive"}},
		{[]string{"--load", "inf"}, []string{"--load", `"inf"`}},
		{[]string{"--load", "20-j5", "--z0", "0"}, []string{"--z0", `"0"`}},
		{[]string{"--load", "20-j5", "--z0", "fifty"}, []string{"--z0", `"fifty"`}},
		{[]string{"--load", "20-j5", "--z0", "50+j2"}, []string{"--z0", "real"}},
		{[]string{"--load", "20-j5", "--line-z0", "-50"}, []string{"--line-z0", `"-50"`}},
		{[]string{"--load", "20-j5", "--stub-z0", "x"}, []string{"--stub-z0", `"x"`}},
		{[]string{"--load", "20-j5", "--stub", "via"}, []string{"--stub", `"via"`, "open or short"}},
		{[]string{"--load", "55", "--line-z0", "100"}, []string{"--load", "cannot be matched"}},
		{[]string{"--load", "20-j5", "extra"}, []string{"extra"}},
		{[]string{"--load", "20-j5", "--frequency", "1GHz"}, []string{"--frequency"}},
	}
	for _, c := range cases {
		_, err := runSolveCmd(c.args...)
		if err == nil {
			t.Errorf("%q: no error", c.args)
			continue
		}
		for _, w := range c.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%q: error %q does not say %q", c.args, err, w)
			}
		}
	}
}
