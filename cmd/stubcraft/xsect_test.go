package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

func runXsect(t *testing.T, args ...string) (string, error) {
	t.Helper()
	cmd := newXsectCmd()
	var out, errb bytes.Buffer
	cmd.SetArgs(args)
	cmd.SetOut(&out)
	cmd.SetErr(&errb)
	cmd.SilenceUsage, cmd.SilenceErrors = true, true
	err := cmd.Execute()
	return out.String(), err
}

func TestXsectJSON(t *testing.T) {
	// Source: exact, Cohn 1954 — a zero-thickness strip centred between
	// planes: Z0 = (η0/4√εr)·K(k)/K(k′), k = sech(πW/2b); for W = b and
	// εr = 1 that is 65.354 Ω (AGM evaluation, η0 = 376.730 Ω).
	out, err := runXsect(t, "--geometry", "stripline", "--width", "1mm", "--height", "1mm",
		"--er", "1", "--copper", "0", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var got map[string]any
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatalf("output is not JSON: %v\n%s", err, out)
	}
	for _, k := range []string{"z0_ohm", "eps_eff", "c_pf_per_m", "c_air_pf_per_m", "error_estimate", "geometry", "cells"} {
		if _, ok := got[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if z := got["z0_ohm"].(float64); math.Abs(z-65.354)/65.354 > 0.005 {
		t.Errorf("z0_ohm = %g, Cohn 65.354", z)
	}
	if g := got["geometry"]; g != "stripline" {
		t.Errorf("geometry = %v", g)
	}
	if e := got["error_estimate"].(float64); !(e > 0 && e < 0.005) {
		t.Errorf("error_estimate = %g, want in (0, 0.005)", e)
	}
	// Exact: C = 1/(c0·Z0) for a vacuum line, so c_pf_per_m·z0_ohm = 1e12/c0.
	if cz := got["c_pf_per_m"].(float64) * got["z0_ohm"].(float64); math.Abs(cz-1e12/299792458)/cz > 1e-9 {
		t.Errorf("C·Z0 = %g, want 1e12/c0", cz)
	}
}

func TestXsectTable(t *testing.T) {
	out, err := runXsect(t, "--width", "3mm", "--height", "1.6mm", "--er", "4.4", "--copper", "35um",
		"--mask-thickness", "25um", "--etch-angle", "30")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Z0", "εeff", "pF/m", "microstrip", "mask 25 µm εr 3.5", "etch 30°"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
}

func TestXsectStackup(t *testing.T) {
	out, err := runXsect(t, "--stackup", "fr4-1.6mm", "--width", "3mm", "--json")
	if err != nil {
		t.Fatal(err)
	}
	var got struct {
		Z0 float64 `json:"z0_ohm"`
	}
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	// Common practice, no source: 3 mm on 1.6 mm FR-4 is a 50 Ω line.
	if math.Abs(got.Z0-50) > 3 {
		t.Errorf("z0 %g Ω on fr4-1.6mm, expected about 50", got.Z0)
	}
}

func TestXsectErrors(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string // must appear in the error
	}{
		{[]string{"--height", "1mm", "--er", "4"}, "--width"},
		{[]string{"--width", "abc", "--height", "1mm", "--er", "4"}, `--width "abc"`},
		{[]string{"--width", "3", "--height", "1mm", "--er", "4"}, `--width "3"`},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "0.5"}, "--er"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "x"}, `--er "x"`},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--geometry", "coax"}, "--geometry"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--geometry", "gcpw"}, "--gap"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--gap", "0.2mm"}, "--gap"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--geometry", "stripline", "--offset", "0.6mm"}, "--offset"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--copper", "-1um"}, "--copper"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--etch-angle", "95"}, "--etch-angle"},
		{[]string{"--width", "1mm", "--height", "1mm", "--er", "4", "--tolerance", "2"}, "--tolerance"},
		{[]string{"--width", "1mm", "--stackup", "no-such-stackup"}, "--stackup"},
	} {
		_, err := runXsect(t, tc.args...)
		if err == nil {
			t.Errorf("%v: no error", tc.args)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%v: error %q does not name %s", tc.args, err, tc.want)
		}
	}
}

func TestTraceSolverCacheAcrossRuns(t *testing.T) {
	// A second run reads the solved cross-sections from the on-disk cache,
	// says so in the notes, and prints the same numbers.
	t.Setenv(cacheDirEnv, filepath.Join(t.TempDir(), "cache"))
	args := []string{"trace", "--stackup", "fr4-1.6mm-masked", "--z0", "50", "--freq", "2.45GHz", "--json"}
	var reps [2]map[string]any
	for i := range reps {
		out, err := runRoot(t, args...)
		if err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal([]byte(out), &reps[i]); err != nil {
			t.Fatalf("%v\n%s", err, out)
		}
	}
	notes := fmt.Sprint(reps[1]["notes"])
	if strings.Contains(fmt.Sprint(reps[0]["notes"]), "cache") || !strings.Contains(notes, "read from the cache") {
		t.Errorf("notes: first run %v, second run %v", reps[0]["notes"], notes)
	}
	for _, k := range []string{"width_mm", "z0_ohm", "eps_eff", "z0_static_ohm"} {
		if reps[0][k] != reps[1][k] {
			t.Errorf("%s: %v from the solver, %v from the cache", k, reps[0][k], reps[1][k])
		}
	}
}
