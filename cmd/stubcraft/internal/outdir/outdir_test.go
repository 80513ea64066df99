package outdir

import (
	"context"
	"crypto/sha256"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"
)

// build returns the files of a small build whose contents carry tag.
func build(tag string) []File {
	var files []File
	for _, name := range []string{"report.json", "board-copper-top.gbr", "drawing.pdf"} {
		files = append(files, File{name, func(w io.Writer) error {
			_, err := io.WriteString(w, name+" of build "+tag+"\n")
			return err
		}})
	}
	return files
}

// write opens dir with opt and writes files, as one build does.
func write(t *testing.T, dir string, opt Options, files []File) error {
	t.Helper()
	tgt, err := Open(context.Background(), dir, opt)
	if err != nil {
		return err
	}
	defer tgt.Close()
	return tgt.Write(context.Background(), files)
}

// snapshot maps every file under dir (relative path) to its SHA-256, and
// every directory to "dir".
func snapshot(t *testing.T, dir string) map[string]string {
	t.Helper()
	got := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		if d.IsDir() {
			got[rel] = "dir"
			return nil
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		sum := sha256.Sum256(data)
		got[rel] = string(sum[:])
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return got
}

func sameSnapshot(a, b map[string]string) bool {
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if b[k] != v {
			return false
		}
	}
	return true
}

// checkComplete fails unless dir holds exactly the files of build tag and
// a manifest that lists each with its SHA-256 (checked here by hashing
// the files independently of the writer).
func checkComplete(t *testing.T, dir, tag string) {
	t.Helper()
	listed, err := readManifest(filepath.Join(dir, ManifestName))
	if err != nil {
		t.Fatalf("%s: %v", dir, err)
	}
	want := build(tag)
	if len(listed) != len(want) {
		t.Fatalf("%s: manifest lists %d files, want %d", dir, len(listed), len(want))
	}
	for _, f := range want {
		data, err := os.ReadFile(filepath.Join(dir, f.Name))
		if err != nil {
			t.Fatal(err)
		}
		if string(data) != f.Name+" of build "+tag+"\n" {
			t.Errorf("%s: %s holds %q, not build %s", dir, f.Name, data, tag)
		}
		if listed[f.Name] != sha256.Sum256(data) {
			t.Errorf("%s: manifest hash of %s does not match the file", dir, f.Name)
		}
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != len(want)+1 {
		t.Errorf("%s: %d entries, want %d files and the manifest", dir, len(entries), len(want))
	}
}

// checkNoLeftovers fails if a temporary directory or the lock file of
// dir remains beside it.
func checkNoLeftovers(t *testing.T, dir string) {
	t.Helper()
	entries, err := os.ReadDir(filepath.Dir(dir))
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), "."+filepath.Base(dir)+".") {
			t.Errorf("left beside the target: %s", e.Name())
		}
	}
}

func TestWriteNewAndReplace(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := write(t, dir, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, dir, "1")
	var exists *ExistsError
	if err := write(t, dir, Options{}, build("2")); !errors.As(err, &exists) {
		t.Fatalf("existing target without Force: got %v, want *ExistsError", err)
	}
	checkComplete(t, dir, "1")
	if err := write(t, dir, Options{Force: true}, build("2")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, dir, "2")
	checkNoLeftovers(t, dir)
}

func TestForceReplacesEmptyDirectory(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := write(t, dir, Options{Force: true}, build("1")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, dir, "1")
}

func TestForceNotesChangedOutputs(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := write(t, dir, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "report.json"), []byte("edited\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	var notes []string
	if err := write(t, dir, Options{Force: true, Note: func(s string) { notes = append(notes, s) }}, build("2")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, dir, "2")
	if len(notes) != 1 || !strings.Contains(notes[0], "report.json") {
		t.Errorf("notes %q: want one naming the changed report.json", notes)
	}
}

func TestForceRefusesForeignFiles(t *testing.T) {
	tests := []struct {
		name    string
		prepare func(t *testing.T, dir string) // dir holds build "1"
		lost    []string                       // fragments the refusal must name
	}{
		{"a file the build did not write", func(t *testing.T, dir string) {
			mustWrite(t, filepath.Join(dir, "notes.txt"), "mine")
		}, []string{"notes.txt"}},
		{"a subdirectory", func(t *testing.T, dir string) {
			mustWrite(t, filepath.Join(dir, "src", "main.c"), "int main;")
		}, []string{"src/ (1 file)"}},
		{"a directory under a listed name", func(t *testing.T, dir string) {
			os.Remove(filepath.Join(dir, "drawing.pdf"))
			mustWrite(t, filepath.Join(dir, "drawing.pdf", "sheet.txt"), "mine")
		}, []string{"drawing.pdf/"}},
		{"no manifest", func(t *testing.T, dir string) {
			os.Remove(filepath.Join(dir, ManifestName))
		}, []string{"holds no " + ManifestName, "report.json"}},
		{"a manifest not written by stubcraft", func(t *testing.T, dir string) {
			mustWrite(t, filepath.Join(dir, ManifestName), "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855  notes.txt\n")
		}, []string{"not a stubcraft manifest"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "out")
			if err := write(t, dir, Options{}, build("1")); err != nil {
				t.Fatal(err)
			}
			tt.prepare(t, dir)
			before := snapshot(t, dir)
			err := write(t, dir, Options{Force: true}, build("2"))
			var foreign *ForeignError
			if !errors.As(err, &foreign) {
				t.Fatalf("got %v, want *ForeignError", err)
			}
			for _, frag := range tt.lost {
				if !strings.Contains(err.Error(), frag) {
					t.Errorf("refusal %q does not name %q", err, frag)
				}
			}
			if !sameSnapshot(before, snapshot(t, dir)) {
				t.Errorf("the refused target changed")
			}
			checkNoLeftovers(t, dir)
		})
	}
}

func mustWrite(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

func TestForceRefusesTargetHoldingAnInput(t *testing.T) {
	tests := []struct {
		name  string
		input func(dir, elsewhere string) string // creates the input, returns its path as the caller names it
	}{
		{"the design at the top", func(dir, _ string) string { return filepath.Join(dir, "design.toml") }},
		{"a stackup in a subdirectory", func(dir, _ string) string { return filepath.Join(dir, "boards", "stackup.toml") }},
		{"a hard link to the Touchstone file", func(dir, elsewhere string) string {
			src := filepath.Join(elsewhere, "load.s1p")
			os.Link(src, filepath.Join(dir, "copy.s1p"))
			return src
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			root := t.TempDir()
			dir, elsewhere := filepath.Join(root, "out"), filepath.Join(root, "src")
			mustWrite(t, filepath.Join(elsewhere, "load.s1p"), "! load\n")
			if err := os.Mkdir(dir, 0o755); err != nil {
				t.Fatal(err)
			}
			in := tt.input(dir, elsewhere)
			if _, err := os.Stat(in); err != nil {
				mustWrite(t, in, "input")
			}
			before := snapshot(t, dir)
			err := write(t, dir, Options{Force: true, Inputs: []string{"2.45GHz-preset", in}}, build("2"))
			var inside *InputInsideError
			if !errors.As(err, &inside) || !strings.Contains(err.Error(), in) {
				t.Fatalf("got %v, want *InputInsideError naming %s", err, in)
			}
			if !sameSnapshot(before, snapshot(t, dir)) {
				t.Errorf("the refused target changed")
			}
		})
	}
}

func TestSymlinkedTargetIsWrittenThrough(t *testing.T) {
	root := t.TempDir()
	real := filepath.Join(root, "elsewhere", "boards")
	link := filepath.Join(root, "out")
	if err := os.MkdirAll(filepath.Dir(real), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(filepath.Join("elsewhere", "boards"), link); err != nil {
		t.Fatal(err)
	}
	// dangling: the first build creates the directory the link names
	if err := write(t, link, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, real, "1")
	if err := write(t, link, Options{Force: true}, build("2")); err != nil {
		t.Fatal(err)
	}
	info, err := os.Lstat(link)
	if err != nil || info.Mode()&fs.ModeSymlink == 0 {
		t.Fatalf("the link was replaced: %v %v", info.Mode(), err)
	}
	checkComplete(t, real, "2")
	checkComplete(t, link, "2")
	checkNoLeftovers(t, real)
}

func TestCancelledWriteLeavesTargetAndNoTemporaries(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := write(t, dir, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithCancelCause(context.Background())
	stop := errors.New("interrupt")
	files := build("2")
	files[1].Write = func(w io.Writer) error { // the signal arrives while the files are written
		cancel(stop)
		_, err := io.WriteString(w, "partial")
		return err
	}
	tgt, err := Open(ctx, dir, Options{Force: true})
	if err != nil {
		t.Fatal(err)
	}
	err = tgt.Write(ctx, files)
	tgt.Close()
	if !errors.Is(err, stop) {
		t.Fatalf("got %v, want the cancellation cause", err)
	}
	checkComplete(t, dir, "1")
	checkNoLeftovers(t, dir)
}

func TestStaleTemporariesRemoved(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("no way to tell a running process here")
	}
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	dead := exec.Command("true")
	if err := dead.Run(); err != nil {
		t.Skip("no true command:", err)
	}
	deadPID := dead.ProcessState.Pid() // exited and reaped: not running (unless its id was reused meanwhile)
	stale := filepath.Join(root, ".out.tmp-"+strconv.Itoa(deadPID)+"-123")
	live := filepath.Join(root, ".out.tmp-"+strconv.Itoa(os.Getppid())+"-456")
	other := filepath.Join(root, ".outer.tmp-"+strconv.Itoa(deadPID)+"-789")
	for _, d := range []string{stale, live, other} {
		mustWrite(t, filepath.Join(d, "report.json"), "half")
	}
	var notes []string
	if err := write(t, dir, Options{Note: func(s string) { notes = append(notes, s) }}, build("1")); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(stale); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("the dead process's temporary directory remains: %v", err)
	}
	for _, d := range []string{live, other} {
		if _, err := os.Stat(d); err != nil {
			t.Errorf("%s: removed, though it is not stale or not this target's: %v", d, err)
		}
	}
	if len(notes) != 1 || !strings.Contains(notes[0], stale) {
		t.Errorf("notes %q: want one naming %s", notes, stale)
	}
}

func TestSecondBuildWaitsThenSaysInUse(t *testing.T) {
	if runtime.GOOS == "windows" {
		t.Skip("no flock here")
	}
	dir := filepath.Join(t.TempDir(), "out")
	first, err := Open(context.Background(), dir, Options{})
	if err != nil {
		t.Fatal(err)
	}
	start := time.Now()
	_, err = Open(context.Background(), dir, Options{LockWait: 200 * time.Millisecond})
	var inUse *InUseError
	if !errors.As(err, &inUse) || inUse.PID != os.Getpid() || !strings.Contains(err.Error(), "in use by process "+strconv.Itoa(os.Getpid())) {
		t.Fatalf("got %v, want in use by process %d", err, os.Getpid())
	}
	if waited := time.Since(start); waited < 200*time.Millisecond {
		t.Errorf("gave up after %v, before the wait", waited)
	}
	// once the first lets go, the second gets the target
	done := make(chan error, 1)
	go func() {
		second, err := Open(context.Background(), dir, Options{LockWait: 5 * time.Second})
		if err == nil {
			err = second.Write(context.Background(), build("2"))
			second.Close()
		}
		done <- err
	}()
	time.Sleep(100 * time.Millisecond)
	if err := first.Write(context.Background(), build("1")); err != nil {
		t.Fatal(err)
	}
	first.Close()
	var exists *ExistsError
	if err := <-done; !errors.As(err, &exists) {
		t.Fatalf("second build after the first: got %v, want *ExistsError", err)
	}
	checkComplete(t, dir, "1")
	checkNoLeftovers(t, dir)
}

func TestManifestRoundTrip(t *testing.T) {
	dir := t.TempDir()
	entries := []manifestEntry{{"a.gbr", sha256.Sum256([]byte("a"))}, {"b c.pdf", sha256.Sum256(nil)}}
	f, err := os.Create(filepath.Join(dir, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if err := writeManifest(f, entries); err != nil {
		t.Fatal(err)
	}
	f.Close()
	got, err := readManifest(filepath.Join(dir, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if len(got) != 2 || got["a.gbr"] != entries[0].sha256 || got["b c.pdf"] != entries[1].sha256 {
		t.Errorf("read back %v", got)
	}
	// sha256sum -c reads the same file (GNU coreutils, an independent reader)
	if _, err := exec.LookPath("sha256sum"); err == nil {
		mustWrite(t, filepath.Join(dir, "a.gbr"), "a")
		mustWrite(t, filepath.Join(dir, "b c.pdf"), "")
		cmd := exec.Command("sha256sum", "-c", "--strict", ManifestName)
		cmd.Dir = dir
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Errorf("sha256sum -c: %v\n%s", err, out)
		}
	}
}

func TestFailedBuildRemovesTheParentsItMade(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "a", "b", "out")
	tgt, err := Open(context.Background(), dir, Options{})
	if err != nil {
		t.Fatal(err)
	}
	fail := errors.New("plot failed")
	err = tgt.Write(context.Background(), []File{{"report.json", func(io.Writer) error { return fail }}})
	tgt.Close()
	if !errors.Is(err, fail) {
		t.Fatalf("got %v, want the writer's error", err)
	}
	if entries, _ := os.ReadDir(root); len(entries) != 0 {
		t.Errorf("a failed build left %v in %s", entries[0].Name(), root)
	}
	// a build that lands keeps them
	if err := write(t, dir, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	checkComplete(t, dir, "1")
}

func TestForceRefusesTargetHoldingTheWorkingDirectory(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if err := write(t, dir, Options{}, build("1")); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	err := write(t, ".", Options{Force: true}, build("2"))
	if err == nil || !strings.Contains(err.Error(), "current directory") {
		t.Fatalf("got %v, want a refusal naming the current directory", err)
	}
	checkComplete(t, dir, "1")
}

// The portable fallback (systems without RENAME_EXCHANGE): a new target is
// renamed in without replacing anything; an existing one moves aside and
// is handed back for removal.
func TestPlaceByRenames(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	tmp := filepath.Join(root, ".out.tmp-1-a")
	mustWrite(t, filepath.Join(tmp, "report.json"), "new")
	if old, err := placeByRenames(tmp, dir, false); err != nil || old != "" {
		t.Fatalf("new target: old %q, %v", old, err)
	}
	tmp2 := filepath.Join(root, ".out.tmp-1-b")
	mustWrite(t, filepath.Join(tmp2, "report.json"), "newer")
	if _, err := placeByRenames(tmp2, dir, false); err == nil {
		t.Fatal("a target that appeared meanwhile was replaced")
	}
	old, err := placeByRenames(tmp2, dir, true)
	if err != nil {
		t.Fatal(err)
	}
	if data, _ := os.ReadFile(filepath.Join(dir, "report.json")); string(data) != "newer" {
		t.Errorf("target holds %q", data)
	}
	if data, _ := os.ReadFile(filepath.Join(old, "report.json")); string(data) != "new" || !strings.HasPrefix(filepath.Base(old), ".out.tmp-1-") {
		t.Errorf("old output at %s holds %q", old, data)
	}
}

// Files are written several at once: one failing among many is the error
// returned (naming it), and nothing reaches the target or stays behind.
func TestFailureAmongConcurrentFiles(t *testing.T) {
	root := t.TempDir()
	dir := filepath.Join(root, "out")
	tgt, err := Open(context.Background(), dir, Options{})
	if err != nil {
		t.Fatal(err)
	}
	fail := errors.New("drawing failed")
	var files []File
	var started atomic.Int32
	for i := range 40 {
		name := fmt.Sprintf("f%02d.txt", i)
		files = append(files, File{name, func(w io.Writer) error {
			started.Add(1)
			if i == 7 {
				return fail
			}
			_, err := fmt.Fprintln(w, name)
			return err
		}})
	}
	err = tgt.Write(context.Background(), files)
	tgt.Close()
	if !errors.Is(err, fail) || !strings.Contains(err.Error(), "writing f07.txt") {
		t.Fatalf("got %v, want the writer's error naming f07.txt", err)
	}
	if n := started.Load(); n < 8 {
		t.Errorf("only %d files started, want at least the eight up to the failing one", n)
	}
	if entries, _ := os.ReadDir(root); len(entries) != 0 {
		t.Errorf("a failed build left %v in %s", entries[0].Name(), root)
	}
}
