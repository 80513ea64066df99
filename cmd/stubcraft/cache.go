package main

import (
	"fmt"
	"os"
	"path/filepath"

	"stubcraft/synth"
)

// cacheDirEnv names the environment variable that moves the on-disk cache
// of solved cross-sections ("off" turns it off); tests and benchmarks point
// it at an empty temporary directory.
const cacheDirEnv = "STUBCRAFT_CACHE_DIR"

// newSolverCache returns the field solver's cache for one command: in
// memory, and on disk in $STUBCRAFT_CACHE_DIR or else the user's cache
// directory (os.UserCacheDir()/stubcraft/fieldsolve) when there is one.
func newSolverCache() *synth.SolverCache {
	dir := os.Getenv(cacheDirEnv)
	switch dir {
	case "off":
		dir = ""
	case "":
		if base, err := os.UserCacheDir(); err == nil {
			dir = filepath.Join(base, "stubcraft", "fieldsolve")
		}
	}
	return synth.NewSolverCacheDir(dir)
}

// cacheNotes says how many solved cross-sections came from the on-disk
// cache, if any did.
func cacheNotes(c *synth.SolverCache) []string {
	n := c.DiskHits()
	if n == 0 {
		return nil
	}
	return []string{fmt.Sprintf("field solver: %d of %d cross-sections read from the cache in %s (%s=off to solve afresh)", n, c.Len(), c.Dir(), cacheDirEnv)}
}
