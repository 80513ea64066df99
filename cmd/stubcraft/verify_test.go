package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
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
