package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestVerifyRefusals checks verify's refusals before any full-wave run: an
// unknown mesh name, and a grid above the memory limit, which names the
// options that lower it and leaves no output directory behind.
func TestVerifyRefusals(t *testing.T) {
	dir := t.TempDir()
	out := filepath.Join(dir, "fw")
	if _, err := runRoot(t, "verify", "-o", out, "--mesh", "medium"); err == nil || !strings.Contains(err.Error(), "--mesh") {
		t.Errorf("--mesh medium: err = %v, want a refusal naming --mesh", err)
	}
	_, err := runRoot(t, "verify", "-o", out, "--mesh", "coarse", "--memory", "1")
	if err == nil {
		t.Fatal("--memory 1: no refusal")
	}
	for _, want := range []string{"MiB", "coarse", "--memory"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("memory refusal %q does not mention %q", err, want)
		}
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Errorf("output directory exists after a refusal (stat: %v)", err)
	}
}

// verify --json prints the keys flat, beside the design's.
func TestVerifyReportKeys(t *testing.T) {
	b, err := json.Marshal(verifyReport{Design: "d", Mesh: "coarse", FrequencyHz: 1e9})
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"design", "mesh", "frequency_hz", "s11_db_f0", "best_match_hz", "circuit_s11_db_f0", "circuit_best_match_hz", "max_s_difference", "cells", "steps", "seconds"} {
		if _, ok := m[k]; !ok {
			t.Errorf("key %q missing from %s", k, b)
		}
	}
}

// TestVerifyCancelledWritesNothing: a verify stopped before its full-wave
// runs finish (here by a deadline of 1.5 s on the demo's normal-mesh solve
// of about 7 s on two cores; on a slow machine it may stop in the build
// instead) returns the context's error and leaves no output directory
// behind.
func TestVerifyCancelledWritesNothing(t *testing.T) {
	out := filepath.Join(t.TempDir(), "fw")
	ctx, cancel := context.WithTimeout(context.Background(), 1500*time.Millisecond)
	defer cancel()
	cmd := newRootCmd()
	var buf bytes.Buffer
	cmd.SetArgs([]string{"verify", "-o", out, "--mesh", "normal"})
	cmd.SetOut(&buf)
	cmd.SetErr(&buf)
	if err := cmd.ExecuteContext(ctx); !errors.Is(err, context.DeadlineExceeded) {
		t.Errorf("error %v, want the deadline's", err)
	}
	if _, err := os.Stat(out); !os.IsNotExist(err) {
		t.Errorf("output directory exists after a cancelled verify (stat: %v)", err)
	}
}
