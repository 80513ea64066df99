// Package inputfile opens the files a user names as input (stackups,
// designs, Touchstone data) safely: only a regular file is read, so a
// named pipe, a device or a directory is refused by name instead of
// hanging or filling memory, and only up to a size limit.
package inputfile

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"
)

// Size limits of the inputs, bytes (common practice, no source: a
// hand-written TOML file is a few kilobytes, and a Touchstone file of a
// million frequency points is about 60 MB).
const (
	TOMLLimit       = 16 << 20
	TouchstoneLimit = 64 << 20
)

// Reasons carried by Error.Err, for errors.Is.
var (
	ErrNotRegular = errors.New("not a regular file")
	ErrTooLarge   = errors.New("file too large")
)

// Error reports an input file that was refused before it was read.
type Error struct {
	Path string
	Kind string // what the file is instead: "directory", "named pipe (FIFO)", "device", ...; "" for a size refusal
	Size int64  // bytes, for a size refusal
	Max  int64  // the limit, bytes
	Err  error  // ErrNotRegular or ErrTooLarge
}

// Error names the file and says what to give instead.
func (e *Error) Error() string {
	if errors.Is(e.Err, ErrTooLarge) {
		return fmt.Sprintf("%s: %s of %s, larger than the %s this input may be; give the right file, or a smaller one", e.Path, mib(e.Size), e.Err, mib(e.Max))
	}
	return fmt.Sprintf("%s: %v but a %s; give the path of a file", e.Path, e.Err, e.Kind)
}

// Unwrap returns the reason.
func (e *Error) Unwrap() error { return e.Err }

func mib(n int64) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%.4g MiB", float64(n)/(1<<20))
	}
	return fmt.Sprintf("%d bytes", n)
}

// kind names the type of a file that is not regular.
func kind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "directory"
	case m&fs.ModeNamedPipe != 0:
		return "named pipe (FIFO)"
	case m&fs.ModeSocket != 0:
		return "socket"
	case m&fs.ModeCharDevice != 0:
		return "character device"
	case m&fs.ModeDevice != 0:
		return "device"
	}
	return "special file"
}

// check refuses a file that is not regular or is larger than limit.
func check(path string, fi fs.FileInfo, limit int64) error {
	if !fi.Mode().IsRegular() {
		return &Error{Path: path, Kind: kind(fi.Mode()), Err: ErrNotRegular}
	}
	if fi.Size() > limit {
		return &Error{Path: path, Size: fi.Size(), Max: limit, Err: ErrTooLarge}
	}
	return nil
}

// Open opens path for reading when it is a regular file of at most limit
// bytes. The file's type is checked before it is opened (so a named pipe
// is never opened and cannot block) and again on the open file (so a file
// swapped in between is caught). The caller closes the file; reading it
// through Reader keeps to the limit even if the file grows.
func Open(path string, limit int64) (*os.File, error) {
	fi, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if err := check(path, fi, limit); err != nil {
		return nil, err
	}
	// O_NONBLOCK: should a FIFO appear between the two checks, opening it
	// does not wait for a writer.
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	if fi, err = f.Stat(); err == nil {
		err = check(path, fi, limit)
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}

// Reader returns r limited to limit bytes; reading past the limit gives
// an *Error wrapping ErrTooLarge instead of more data.
func Reader(r io.Reader, path string, limit int64) io.Reader {
	return &limited{r: r, path: path, left: limit, max: limit}
}

type limited struct {
	r         io.Reader
	path      string
	left, max int64
}

func (l *limited) Read(p []byte) (int, error) {
	if l.left < 0 {
		return 0, &Error{Path: l.path, Size: l.max + 1, Max: l.max, Err: ErrTooLarge}
	}
	if int64(len(p)) > l.left+1 {
		p = p[:l.left+1]
	}
	n, err := l.r.Read(p)
	l.left -= int64(n)
	if l.left < 0 {
		return n - int(-l.left), &Error{Path: l.path, Size: l.max + 1, Max: l.max, Err: ErrTooLarge}
	}
	return n, err
}

// Read returns the content of path when it is a regular file of at most
// limit bytes.
func Read(path string, limit int64) ([]byte, error) {
	f, err := Open(path, limit)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return io.ReadAll(Reader(f, path, limit))
}
