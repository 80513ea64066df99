package inputfile

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// Named pipes, devices and directories are refused by name without
// blocking, files over the limit by size, and a regular file is read.
func TestOpenRefusesWhatIsNotAFile(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "design.toml")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	big := filepath.Join(dir, "big.s1p")
	if err := os.WriteFile(big, make([]byte, 2049), 0o600); err != nil {
		t.Fatal(err)
	}
	good := filepath.Join(dir, "good.toml")
	if err := os.WriteFile(good, []byte("name = \"x\"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		path string
		is   error
		says string
	}{
		{fifo, ErrNotRegular, "named pipe"},
		{dir, ErrNotRegular, "directory"},
		{"/dev/zero", ErrNotRegular, "character device"},
		{big, ErrTooLarge, "2049 bytes"},
	}
	for _, c := range cases {
		done := make(chan error, 1)
		go func() { _, err := Read(c.path, 2048); done <- err }()
		select {
		case err := <-done:
			if !errors.Is(err, c.is) || !strings.Contains(err.Error(), c.says) || !strings.Contains(err.Error(), c.path) {
				t.Errorf("%s: got %v, want %v saying %q and the path", c.path, err, c.is, c.says)
			}
		case <-time.After(5 * time.Second):
			t.Fatalf("%s: Read hangs", c.path)
		}
	}
	b, err := Read(good, 2048)
	if err != nil || string(b) != "name = \"x\"\n" {
		t.Errorf("good file: %q, %v", b, err)
	}
}

// Reader stops a file that grows past the limit after it was checked.
func TestReaderKeepsTheLimit(t *testing.T) {
	r := Reader(strings.NewReader(strings.Repeat("x", 100)), "grown.s1p", 10)
	buf := make([]byte, 64)
	total := 0
	var err error
	for err == nil {
		var n int
		n, err = r.Read(buf)
		total += n
	}
	if !errors.Is(err, ErrTooLarge) || total > 10 {
		t.Errorf("read %d bytes, error %v; want at most 10 and ErrTooLarge", total, err)
	}
	r = Reader(strings.NewReader("0123456789"), "exact.s1p", 10)
	b := make([]byte, 64)
	n, err := r.Read(b)
	if n != 10 || (err != nil && err.Error() != "EOF") {
		t.Errorf("exactly the limit: %d bytes, %v", n, err)
	}
}
