//go:build linux || darwin || dragonfly || freebsd || netbsd || openbsd

package outdir

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"golang.org/x/sys/unix"
)

// dirLock is an flock on ".NAME.lock" beside the target.
type dirLock struct {
	f    *os.File
	path string
}

// lockPath is the lock file of dir.
func lockPath(dir string) string {
	return filepath.Join(filepath.Dir(dir), "."+filepath.Base(dir)+".lock")
}

// lockDir takes the lock of dir, waiting up to wait. The holder writes
// its process id into the lock file and removes the file when it lets go;
// a waiter that wins the lock on a file already removed tries again.
func lockDir(ctx context.Context, dir string, wait time.Duration) (*dirLock, error) {
	path := lockPath(dir)
	deadline := time.Now().Add(wait)
	for {
		f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			return nil, fmt.Errorf("lock: %w", err)
		}
		err = unix.Flock(int(f.Fd()), unix.LOCK_EX|unix.LOCK_NB)
		if err == nil {
			if sameFile(f, path) {
				f.Truncate(0)
				f.WriteAt([]byte(strconv.Itoa(os.Getpid())+"\n"), 0)
				return &dirLock{f: f, path: path}, nil
			}
			f.Close() // removed by its last holder: lock the new one
			continue
		}
		if !errors.Is(err, unix.EWOULDBLOCK) {
			f.Close()
			return nil, fmt.Errorf("lock %s: %w", path, err)
		}
		holder := readPID(f)
		f.Close()
		if time.Now().After(deadline) {
			return nil, &InUseError{Dir: dir, PID: holder, Wait: wait}
		}
		select {
		case <-ctx.Done():
			return nil, context.Cause(ctx)
		case <-time.After(50 * time.Millisecond):
		}
	}
}

// sameFile reports whether the open f is still the file at path.
func sameFile(f *os.File, path string) bool {
	a, err := f.Stat()
	if err != nil {
		return false
	}
	b, err := os.Stat(path)
	return err == nil && os.SameFile(a, b)
}

// readPID reads the holder's process id from a lock file, 0 if none.
func readPID(f *os.File) int {
	buf := make([]byte, 32)
	n, _ := f.ReadAt(buf, 0)
	pid, err := strconv.Atoi(strings.TrimSpace(string(buf[:n])))
	if err != nil {
		return 0
	}
	return pid
}

// release removes the lock file and lets go of the lock.
func (l *dirLock) release() error {
	os.Remove(l.path)
	return l.f.Close()
}

// processRunning reports whether a process with id pid exists.
func processRunning(pid int) bool {
	err := unix.Kill(pid, 0)
	return err == nil || errors.Is(err, unix.EPERM)
}

// syncDir flushes a directory's entries to disk.
func syncDir(dir string) error {
	f, err := os.Open(dir)
	if err != nil {
		return err
	}
	defer f.Close()
	return f.Sync()
}
