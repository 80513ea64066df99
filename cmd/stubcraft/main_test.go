package main

import (
	"fmt"
	"os"
	"testing"
)

// TestMain points the on-disk solver cache at an empty temporary directory,
// so that no test reads or fills the user's cache.
func TestMain(m *testing.M) {
	dir, err := os.MkdirTemp("", "stubcraft-test-cache")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
	os.Setenv(cacheDirEnv, dir)
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}
