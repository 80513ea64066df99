//go:build !(linux || darwin || dragonfly || freebsd || netbsd || openbsd)

package outdir

import (
	"context"
	"time"
)

// dirLock stands in for the flock of Unix systems: without flock there
// is no lock here, and two builds to one target are not kept apart.
type dirLock struct{}

func lockDir(ctx context.Context, dir string, wait time.Duration) (*dirLock, error) {
	return &dirLock{}, nil
}

func (l *dirLock) release() error { return nil }

// processRunning cannot tell here, so no temporary directory counts as
// stale and none is removed.
func processRunning(pid int) bool { return true }

// syncDir does nothing: directories cannot be opened for syncing here.
func syncDir(dir string) error { return nil }
