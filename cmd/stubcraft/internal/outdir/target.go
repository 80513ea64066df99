package outdir

import (
	"bufio"
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"
)

// File is one file of an output directory: its name (no path separator)
// and the function that writes its bytes.
type File struct {
	Name  string
	Write func(io.Writer) error
}

// Options says how a target may be treated.
type Options struct {
	// Force allows replacing an existing target that this package wrote.
	Force bool
	// Inputs are the files the build reads (design, stackup, Touchstone).
	// A target that holds one of them is refused; paths that do not name an
	// existing file (a preset name) are ignored.
	Inputs []string
	// LockWait is how long Open waits for another build of the same
	// target; 0 means DefaultLockWait.
	LockWait time.Duration
	// Note receives remarks for the user (stale temporary directories
	// removed, changed outputs replaced); nil discards them.
	Note func(string)
}

// DefaultLockWait is how long a build waits for another build of the same
// target to finish before it gives up.
const DefaultLockWait = 3 * time.Second

// Target is an output directory, locked for one build from Open to Close.
type Target struct {
	name string // the path as given, for messages
	dir  string // the directory that is replaced: absolute, symbolic links resolved
	opt  Options
	lock *dirLock
	// created lists the parent directories Open made, deepest last; Close
	// removes them again when no build was placed.
	created []string
	placed  bool
}

// InUseError is the refusal of a target another build holds.
type InUseError struct {
	Dir  string
	PID  int // 0 when the holder had not yet written its id
	Wait time.Duration
}

func (e *InUseError) Error() string {
	who := "another process"
	if e.PID > 0 {
		who = "process " + strconv.Itoa(e.PID)
	}
	return fmt.Sprintf("in use by %s (another build to it; waited %s)", who, e.Wait)
}

// ExistsError is the refusal of an existing target without Force.
type ExistsError struct{ Dir string }

func (e *ExistsError) Error() string {
	return fmt.Sprintf("output directory %s already exists (--force replaces a directory stubcraft wrote)", e.Dir)
}

// ForeignError is the refusal to replace a target that holds files the
// last build did not write: replacing it would lose them.
type ForeignError struct {
	Dir    string
	Reason string   // why the target counts as not ours
	Files  []string // what would be lost, relative to Dir; directories end in "/"
}

func (e *ForeignError) Error() string {
	const show = 12
	list := e.Files
	more := ""
	if len(list) > show {
		more = fmt.Sprintf(" and %d more", len(list)-show)
		list = list[:show]
	}
	return fmt.Sprintf("refusing to replace %s: %s; replacing it would lose %s%s (move them out of it, or choose another --out)",
		e.Dir, e.Reason, strings.Join(list, ", "), more)
}

// InputInsideError is the refusal to replace a target that holds one of
// the build's own input files.
type InputInsideError struct {
	Dir   string
	Input string // the input as the caller named it
	Entry string // where it lies in Dir, relative
}

func (e *InputInsideError) Error() string {
	return fmt.Sprintf("refusing to replace %s: it holds the input file %s (as %s); choose an --out that holds no input", e.Dir, e.Input, e.Entry)
}

// Open locks the target at path for one build, removes temporary
// directories that earlier, no longer running builds left beside it, and
// checks that the target may be written (see Target.Check). Close releases
// the lock; call it after the output has been reported.
func Open(ctx context.Context, path string, opt Options) (*Target, error) {
	if path == "" {
		return nil, errors.New("output directory: empty path")
	}
	dir, err := resolve(path)
	if err != nil {
		return nil, fmt.Errorf("output directory %s: %w", path, err)
	}
	if dir == filepath.Dir(dir) {
		return nil, fmt.Errorf("output directory %s: a file system root cannot be replaced", path)
	}
	created, err := mkdirAll(filepath.Dir(dir))
	if err != nil {
		return nil, fmt.Errorf("output directory %s: %w", path, err)
	}
	wait := opt.LockWait
	if wait <= 0 {
		wait = DefaultLockWait
	}
	lock, err := lockDir(ctx, dir, wait)
	if err != nil {
		removeCreated(created)
		return nil, fmt.Errorf("output directory %s: %w", path, err)
	}
	t := &Target{name: filepath.Clean(path), dir: dir, opt: opt, lock: lock, created: created}
	t.removeStale()
	if err := t.Check(); err != nil {
		t.Close()
		return nil, err
	}
	return t, nil
}

// Close releases the lock. It is safe to call more than once.
func (t *Target) Close() error {
	if t.lock == nil {
		return nil
	}
	err := t.lock.release()
	t.lock = nil
	if !t.placed {
		removeCreated(t.created)
	}
	return err
}

// mkdirAll is os.MkdirAll that returns the directories it made, outermost
// first.
func mkdirAll(dir string) ([]string, error) {
	var missing []string
	for d := dir; ; d = filepath.Dir(d) {
		if _, err := os.Stat(d); err == nil || d == filepath.Dir(d) {
			break
		}
		missing = append([]string{d}, missing...)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, err
	}
	return missing, nil
}

// removeCreated removes the directories mkdirAll made, innermost first,
// as far as they are still empty.
func removeCreated(dirs []string) {
	for i := len(dirs) - 1; i >= 0; i-- {
		if os.Remove(dirs[i]) != nil {
			return
		}
	}
}

func (t *Target) note(format string, args ...any) {
	if t.opt.Note != nil {
		t.opt.Note(fmt.Sprintf(format, args...))
	}
}

// Check reports whether the target may be written: it does not exist, or
// Force is set and it is a directory this package wrote that holds
// nothing else and none of the inputs (or it is empty).
func (t *Target) Check() error {
	_, err := t.check(false)
	return err
}

// check is Check that also returns whether the target exists and, with
// noteChanged, notes the listed files that changed since they were built.
func (t *Target) check(noteChanged bool) (exists bool, err error) {
	info, err := os.Stat(t.dir)
	if errors.Is(err, fs.ErrNotExist) {
		return false, nil
	}
	if err != nil {
		return false, fmt.Errorf("output directory %s: %w", t.name, err)
	}
	if !info.IsDir() {
		return true, fmt.Errorf("output path %s exists and is not a directory", t.name)
	}
	if !t.opt.Force {
		return true, &ExistsError{Dir: t.name}
	}
	if wd, err := os.Getwd(); err == nil {
		if _, ok := within(t.dir, wd); ok {
			return true, fmt.Errorf("refusing to replace %s: it holds the current directory %s; run the build from outside it", t.name, wd)
		}
	}
	entries, err := os.ReadDir(t.dir)
	if err != nil {
		return true, fmt.Errorf("output directory %s: %w", t.name, err)
	}
	if err := t.checkInputs(entries); err != nil {
		return true, err
	}
	if len(entries) == 0 {
		return true, nil
	}
	listed, err := readManifest(filepath.Join(t.dir, ManifestName))
	if errors.Is(err, fs.ErrNotExist) {
		return true, &ForeignError{Dir: t.name, Reason: "it holds no " + ManifestName + ", so stubcraft did not write it", Files: describe(t.dir, entries)}
	}
	if err != nil {
		return true, &ForeignError{Dir: t.name, Reason: err.Error(), Files: describe(t.dir, entries)}
	}
	var foreign []os.DirEntry
	var changed []string
	for _, e := range entries {
		if e.Name() == ManifestName {
			continue
		}
		sum, ok := listed[e.Name()]
		if !ok || e.IsDir() {
			foreign = append(foreign, e)
			continue
		}
		if !e.Type().IsRegular() {
			continue // a link or special file in its place: removing it loses nothing it points to
		}
		if !noteChanged {
			continue
		}
		if got, err := hashFile(filepath.Join(t.dir, e.Name())); err != nil || got != sum {
			changed = append(changed, e.Name())
		}
	}
	if len(foreign) > 0 {
		return true, &ForeignError{Dir: t.name, Reason: "it holds files the last build did not write", Files: describe(t.dir, foreign)}
	}
	if len(changed) > 0 && noteChanged {
		t.note("replacing %d output file(s) in %s that changed since they were built: %s", len(changed), t.name, strings.Join(changed, ", "))
	}
	return true, nil
}

// checkInputs refuses a target that holds one of the inputs: by path at
// any depth (symbolic links resolved), and under any name among the
// target's own entries (a hard link). Deeper entries under other names lie
// in subdirectories, which the manifest check refuses anyway.
func (t *Target) checkInputs(entries []os.DirEntry) error {
	for _, in := range t.opt.Inputs {
		if in == "" {
			continue
		}
		info, err := os.Stat(in)
		if err != nil {
			continue // a preset name, not a file
		}
		if abs, err := filepath.Abs(in); err == nil {
			if real, err := filepath.EvalSymlinks(abs); err == nil {
				if rel, ok := within(t.dir, real); ok {
					return &InputInsideError{Dir: t.name, Input: in, Entry: rel}
				}
			}
		}
		for _, e := range entries {
			if ei, err := e.Info(); err == nil && os.SameFile(ei, info) {
				return &InputInsideError{Dir: t.name, Input: in, Entry: e.Name()}
			}
		}
	}
	return nil
}

// within reports whether path lies in dir (or is dir), and where.
func within(dir, path string) (rel string, ok bool) {
	rel, err := filepath.Rel(dir, path)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return "", false
	}
	return rel, true
}

// describe names each entry, a directory with a trailing "/" and the
// number of files it holds.
func describe(dir string, entries []os.DirEntry) []string {
	var names []string
	for _, e := range entries {
		if !e.IsDir() {
			names = append(names, e.Name())
			continue
		}
		const most = 1000 // counting stops here: a target may be a whole home directory
		n := 0
		filepath.WalkDir(filepath.Join(dir, e.Name()), func(_ string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() {
				n++
			}
			if n >= most {
				return filepath.SkipAll
			}
			return nil
		})
		count := fmt.Sprintf("%d files", n)
		switch {
		case n == 1:
			count = "1 file"
		case n >= most:
			count = fmt.Sprintf("%d or more files", most)
		}
		names = append(names, fmt.Sprintf("%s/ (%s)", e.Name(), count))
	}
	sort.Strings(names)
	return names
}

// Write writes files into a temporary directory beside the target, adds
// the manifest, and puts the directory in place of the target. Nothing
// changes at the target unless every file was written; a cancelled ctx
// stops the build before the target is touched.
func (t *Target) Write(ctx context.Context, files []File) error {
	if t.lock == nil {
		return errors.New("output directory: Write after Close")
	}
	seen := map[string]bool{ManifestName: true}
	for _, f := range files {
		if !validName(f.Name) || seen[f.Name] {
			return fmt.Errorf("output directory: bad or repeated file name %q", f.Name)
		}
		seen[f.Name] = true
	}
	if err := context.Cause(ctx); err != nil {
		return err
	}
	exists, err := t.check(true)
	if err != nil {
		return err
	}
	parent := filepath.Dir(t.dir)
	tmp, err := os.MkdirTemp(parent, tempPrefix(t.dir)+fmt.Sprint(os.Getpid())+"-")
	if err != nil {
		return fmt.Errorf("output directory %s: %w", t.name, err)
	}
	placed := false
	defer func() {
		if !placed {
			os.RemoveAll(tmp)
		}
	}()
	entries, err := writeFiles(ctx, tmp, files)
	if err != nil {
		return err
	}
	if _, err := writeFile(filepath.Join(tmp, ManifestName), func(w io.Writer) error { return writeManifest(w, entries) }); err != nil {
		return fmt.Errorf("writing %s: %w", ManifestName, err)
	}
	if err := os.Chmod(tmp, 0o755); err != nil {
		return fmt.Errorf("output directory %s: %w", t.name, err)
	}
	if err := syncDir(tmp); err != nil {
		return fmt.Errorf("output directory %s: %w", t.name, err)
	}
	if err := context.Cause(ctx); err != nil {
		return err
	}
	old, err := place(tmp, t.dir, exists)
	if err != nil {
		return fmt.Errorf("output directory %s: %w", t.name, err)
	}
	placed = true
	t.placed = true
	if err := syncDir(parent); err != nil {
		return fmt.Errorf("output directory %s: %w", t.name, err)
	}
	if old != "" {
		if err := os.RemoveAll(old); err != nil {
			t.note("could not remove the previous output %s: %v", old, err)
		}
	}
	return nil
}

// writeFile creates path, fills it by write and syncs it, returning the
// SHA-256 of what was written; it removes the file on failure.
func writeFile(path string, write func(io.Writer) error) (sum [32]byte, err error) {
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return sum, err
	}
	h := sha256.New()
	bw := bufio.NewWriterSize(io.MultiWriter(f, h), 64<<10)
	err = write(bw)
	if err == nil {
		err = bw.Flush()
	}
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(path)
		return sum, err
	}
	return [32]byte(h.Sum(nil)), nil
}

// hashFile returns the SHA-256 of the file at path.
func hashFile(path string) ([32]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return [32]byte{}, err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return [32]byte{}, err
	}
	return [32]byte(h.Sum(nil)), nil
}

// resolve returns the absolute directory a build to path replaces: path
// itself, or, when it is a symbolic link (dangling or not), the directory
// the link names, with the parent's own links resolved.
func resolve(path string) (string, error) {
	p, err := filepath.Abs(path)
	if err != nil {
		return "", err
	}
	for range 40 {
		info, err := os.Lstat(p)
		if err == nil && info.Mode()&fs.ModeSymlink != 0 {
			link, err := os.Readlink(p)
			if err != nil {
				return "", err
			}
			if !filepath.IsAbs(link) {
				link = filepath.Join(filepath.Dir(p), link)
			}
			p = filepath.Clean(link)
			continue
		}
		if err != nil && !errors.Is(err, fs.ErrNotExist) {
			return "", err
		}
		if parent, err := filepath.EvalSymlinks(filepath.Dir(p)); err == nil {
			p = filepath.Join(parent, filepath.Base(p))
		}
		return p, nil
	}
	return "", errors.New("too many levels of symbolic links")
}
