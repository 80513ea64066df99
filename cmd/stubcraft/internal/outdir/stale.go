package outdir

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
)

// tempPrefix is the name prefix of the temporary directories beside dir;
// the writer's process id and a random part follow.
func tempPrefix(dir string) string {
	return "." + filepath.Base(dir) + ".tmp-"
}

// removeStale removes the temporary directories beside the target that
// processes no longer running left behind (killed mid-build, or between
// the exchange and removing the old output). It runs under the lock, so no
// live build of this target can own one; it still leaves those of running
// processes alone, since a process id alone cannot prove a directory stale.
func (t *Target) removeStale() {
	parent := filepath.Dir(t.dir)
	entries, err := os.ReadDir(parent)
	if err != nil {
		return
	}
	prefix := tempPrefix(t.dir)
	self := os.Getpid()
	for _, e := range entries {
		rest, ok := strings.CutPrefix(e.Name(), prefix)
		if !ok || !e.IsDir() {
			continue
		}
		pidText, _, _ := strings.Cut(rest, "-")
		pid, err := strconv.Atoi(pidText)
		if err != nil || pid <= 0 {
			continue
		}
		if pid != self && processRunning(pid) {
			continue
		}
		path := filepath.Join(parent, e.Name())
		if err := os.RemoveAll(path); err != nil {
			t.note("could not remove the stale temporary directory %s: %v", path, err)
			continue
		}
		t.note("removed %s, a temporary directory left by an interrupted build (process %d)", path, pid)
	}
}
