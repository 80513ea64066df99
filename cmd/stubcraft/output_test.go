package main

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"

	"stubcraft/cmd/stubcraft/internal/outdir"
)

// manifestOf reads the manifest of dir on its own terms (the sha256sum
// format, not the writer's reader) and fails unless dir holds exactly
// the listed files, each with its listed SHA-256, and the manifest. It
// returns the manifest's bytes.
func manifestOf(t *testing.T, dir string) []byte {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, outdir.ManifestName))
	if err != nil {
		t.Fatalf("no complete build in %s: %v", dir, err)
	}
	listed := map[string]bool{outdir.ManifestName: true}
	sc := bufio.NewScanner(bytes.NewReader(data))
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			continue
		}
		sum, name, ok := strings.Cut(line, "  ")
		if !ok {
			t.Fatalf("%s: manifest line %q", dir, line)
		}
		file, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatalf("%s: a listed file is missing: %v", dir, err)
		}
		if got := sha256.Sum256(file); hex.EncodeToString(got[:]) != sum {
			t.Fatalf("%s: %s does not match its manifest entry", dir, name)
		}
		listed[name] = true
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		if !listed[e.Name()] {
			t.Fatalf("%s: %s is not in the manifest", dir, e.Name())
		}
	}
	if len(listed) < 10 {
		t.Fatalf("%s: the manifest lists only %d files", dir, len(listed)-1)
	}
	return data
}

// temporaries lists what a build of dir may leave beside it: temporary
// directories (".NAME.tmp-…").
func temporaries(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(filepath.Dir(dir))
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), "."+filepath.Base(dir)+".tmp-") {
			names = append(names, e.Name())
		}
	}
	return names
}

// tree maps every path under dir to its content, to show a refused build
// changed nothing.
func tree(t *testing.T, dir string) map[string]string {
	t.Helper()
	got := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		got[p] = string(data)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return got
}

func sameTree(a, b map[string]string) bool {
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if w, ok := b[k]; !ok || w != v {
			return false
		}
	}
	return true
}

// --force replaces a directory a build wrote, and refuses one that holds
// anything else, naming what would be lost and leaving it as it was.
func TestBuildForceReplacesOnlyItsOwnOutput(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if out, err := runRoot(t, "build", "-o", dir, "--no-tolerance"); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	manifestOf(t, dir)
	if _, err := runRoot(t, "build", "-o", dir, "--no-tolerance"); err == nil || !strings.Contains(err.Error(), "--force") {
		t.Fatalf("an existing directory without --force: want a refusal naming --force, got %v", err)
	}
	if out, err := runRoot(t, "build", "-o", dir, "--no-tolerance", "--force"); err != nil {
		t.Fatalf("--force over its own output: %v\n%s", err, out)
	}
	manifestOf(t, dir)
	if err := os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Join(dir, "src"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "src", "main.c"), []byte("int main(void) { return 0; }\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	before := tree(t, dir)
	_, err := runRoot(t, "build", "-o", dir, "--no-tolerance", "--force")
	if err == nil || !strings.Contains(err.Error(), "notes.txt") || !strings.Contains(err.Error(), "src/") {
		t.Fatalf("--force over foreign files: want a refusal naming notes.txt and src/, got %v", err)
	}
	if !sameTree(before, tree(t, dir)) {
		t.Error("the refused directory changed")
	}
	if left := temporaries(t, dir); len(left) > 0 {
		t.Errorf("left beside the target: %v", left)
	}
	// a directory someone else made is not ours either
	foreign := filepath.Join(t.TempDir(), "mine")
	if err := os.MkdirAll(foreign, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(foreign, "keep.txt"), []byte("mine"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := runRoot(t, "build", "-o", foreign, "--no-tolerance", "--force"); err == nil || !strings.Contains(err.Error(), "keep.txt") {
		t.Fatalf("--force over a directory without a manifest: want a refusal naming keep.txt, got %v", err)
	}
	if data, err := os.ReadFile(filepath.Join(foreign, "keep.txt")); err != nil || string(data) != "mine" {
		t.Errorf("keep.txt after the refusal: %q %v", data, err)
	}
}

// The audit's case: the design, its stackup and a source tree in one
// directory, built into that directory with --force.
func TestBuildRefusesTargetHoldingItsInputs(t *testing.T) {
	proj := t.TempDir()
	copyFile(t, filepath.Join("..", "..", "testdata", "designs", "sensor-antenna-by-hand.toml"), filepath.Join(proj, "design.toml"))
	copyFile(t, filepath.Join("..", "..", "testdata", "designs", "stackups", "thin-board.toml"), filepath.Join(proj, "stackups", "thin-board.toml"))
	if err := os.MkdirAll(filepath.Join(proj, "src"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(proj, "src", "main.c"), []byte("c\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	before := tree(t, proj)
	design := filepath.Join(proj, "design.toml")
	_, err := runRoot(t, "build", design, "-o", proj, "--force", "--no-tolerance")
	if err == nil || !strings.Contains(err.Error(), "input file "+design) {
		t.Fatalf("want a refusal naming the input %s, got %v", design, err)
	}
	if !sameTree(before, tree(t, proj)) {
		t.Error("the refused directory changed")
	}
	// the stackup alone inside the target is refused the same way
	out := filepath.Join(proj, "stackups")
	_, err = runRoot(t, "build", design, "-o", out, "--force", "--no-tolerance")
	if err == nil || !strings.Contains(err.Error(), "thin-board.toml") {
		t.Fatalf("want a refusal naming the stackup, got %v", err)
	}
	if !sameTree(before, tree(t, proj)) {
		t.Error("the refused directory changed")
	}
}

func copyFile(t *testing.T, from, to string) {
	t.Helper()
	data, err := os.ReadFile(from)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Dir(to), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(to, data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// A symbolic link as --out stays a link; the directory it names gets the build.
func TestBuildWritesThroughSymlinkedTarget(t *testing.T) {
	root := t.TempDir()
	real := filepath.Join(root, "boards", "rev-b")
	if err := os.MkdirAll(filepath.Dir(real), 0o755); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(root, "out")
	if err := os.Symlink(real, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	for _, args := range [][]string{{}, {"--force"}} {
		argv := append([]string{"build", "-o", link, "--no-tolerance"}, args...)
		if out, err := runRoot(t, argv...); err != nil {
			t.Fatalf("%v: %v\n%s", argv, err, out)
		}
		if info, err := os.Lstat(link); err != nil || info.Mode()&fs.ModeSymlink == 0 {
			t.Fatalf("%v: the link was replaced (%v)", argv, err)
		}
		manifestOf(t, real)
	}
	if left := temporaries(t, real); len(left) > 0 {
		t.Errorf("left beside the target: %v", left)
	}
}

// SOURCE_DATE_EPOCH outside 1980–9999 is refused naming the variable and
// the range. The bounds are checked against the calendar (time.Date), not
// against the constants the code uses.
func TestSourceDateEpochRange(t *testing.T) {
	first := time.Date(1980, 1, 1, 0, 0, 0, 0, time.UTC).Unix()
	last := time.Date(9999, 12, 31, 23, 59, 59, 0, time.UTC).Unix()
	tests := []struct {
		value string
		ok    bool
	}{
		{fmt.Sprint(first), true},
		{"1767225600", true},
		{fmt.Sprint(last), true},
		{fmt.Sprint(first - 1), false},
		{fmt.Sprint(last + 1), false},
		{"-99999999999", false}, // the audit's value: year −1199 in the Gerber files
		{"0", false},
		{"9223372036854775807", false},
	}
	for _, tt := range tests {
		t.Run(tt.value, func(t *testing.T) {
			t.Setenv("SOURCE_DATE_EPOCH", tt.value)
			got, err := creationTime()
			if tt.ok {
				if err != nil || fmt.Sprint(got.Unix()) != tt.value {
					t.Fatalf("got %v, %v", got, err)
				}
				return
			}
			if err == nil || !strings.Contains(err.Error(), "SOURCE_DATE_EPOCH") || !strings.Contains(err.Error(), "1980–9999") {
				t.Fatalf("want a refusal naming SOURCE_DATE_EPOCH and 1980–9999, got %v", err)
			}
		})
	}
}

// report.json names the Touchstone load relative to the design file, not
// as the path the build happened to be run with.
func TestReportTouchstoneRelativeToDesign(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	design := filepath.Join("..", "..", "testdata", "designs", "touchstone-load.toml")
	if out, err := runRoot(t, "build", design, "-o", dir, "--no-tolerance", "--accept-mismatch"); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	data, err := os.ReadFile(filepath.Join(dir, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep struct {
		Load struct {
			Touchstone string `json:"touchstone"`
		} `json:"load"`
	}
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Load.Touchstone != "antenna.s1p" { // as written in touchstone-load.toml
		t.Errorf("load.touchstone = %q, want antenna.s1p", rep.Load.Touchstone)
	}
}

// buildBinary builds the command into a temporary directory, for tests
// that run it as a process (signals, kills, concurrent builds).
func buildBinary(t *testing.T) string {
	t.Helper()
	if runtime.GOOS != "linux" {
		t.Skip("process tests use Linux signals and the atomic exchange")
	}
	bin := filepath.Join(t.TempDir(), "stubcraft")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// buildProc is one started build process with its stderr.
type buildProc struct {
	cmd    *exec.Cmd
	stderr bytes.Buffer
}

func startBuild(t *testing.T, bin, epoch string, args ...string) *buildProc {
	t.Helper()
	r := &buildProc{cmd: exec.Command(bin, append([]string{"build"}, args...)...)}
	r.cmd.Env = append(os.Environ(), "SOURCE_DATE_EPOCH="+epoch)
	r.cmd.Stderr = &r.stderr
	if err := r.cmd.Start(); err != nil {
		t.Fatal(err)
	}
	return r
}

// wait returns the exit code, -1 when a signal ended the process.
func (r *buildProc) wait() int {
	err := r.cmd.Wait()
	var exit *exec.ExitError
	if errors.As(err, &exit) {
		return exit.ExitCode()
	}
	if err != nil {
		return -2
	}
	return 0
}

// The output directory as processes see it: concurrent builds, a held
// lock, kill -9 at random moments, SIGINT and SIGTERM.
func TestBuildProcesses(t *testing.T) {
	bin := buildBinary(t)
	const epochA, epochB = "1767225600", "1767312000" // two days: the artefacts differ in their dates
	args := []string{"--samples", "20"}

	// the two complete builds the target may ever hold
	root := t.TempDir()
	refA, refB := filepath.Join(root, "a"), filepath.Join(root, "b")
	start := time.Now()
	if r := startBuild(t, bin, epochA, append(args, "-o", refA)...); r.wait() != 0 {
		t.Fatalf("build: %s", r.stderr.String())
	}
	duration := time.Since(start)
	if r := startBuild(t, bin, epochB, append(args, "-o", refB)...); r.wait() != 0 {
		t.Fatalf("build: %s", r.stderr.String())
	}
	manifests := map[string]string{string(manifestOf(t, refA)): epochA, string(manifestOf(t, refB)): epochB}
	if len(manifests) != 2 {
		t.Fatal("the two reference builds do not differ")
	}
	other := map[string]string{epochA: epochB, epochB: epochA}
	// holding checks dir holds one of the two complete builds and returns its epoch.
	holding := func(t *testing.T, dir string) string {
		t.Helper()
		epoch, ok := manifests[string(manifestOf(t, dir))]
		if !ok {
			t.Fatalf("%s holds a complete build that is neither reference", dir)
		}
		return epoch
	}

	t.Run("two concurrent builds", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "out")
		r1 := startBuild(t, bin, epochA, append(args, "-o", dir)...)
		r2 := startBuild(t, bin, epochA, append(args, "-o", dir)...)
		codes := []int{r1.wait(), r2.wait()}
		msgs := []string{r1.stderr.String(), r2.stderr.String()}
		if (codes[0] == 0) == (codes[1] == 0) {
			t.Fatalf("exit codes %v, want exactly one success\n%s\n%s", codes, msgs[0], msgs[1])
		}
		failed := msgs[0]
		if codes[0] == 0 {
			failed = msgs[1]
		}
		if !strings.Contains(failed, "already exists") && !strings.Contains(failed, "in use by process") {
			t.Errorf("the refused build does not say why: %q", failed)
		}
		holding(t, dir)
	})

	t.Run("in use by process", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "out")
		lock, err := os.OpenFile(filepath.Join(filepath.Dir(dir), ".out.lock"), os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			t.Fatal(err)
		}
		defer lock.Close()
		if err := syscall.Flock(int(lock.Fd()), syscall.LOCK_EX); err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(lock, "%d\n", os.Getpid())
		r := startBuild(t, bin, epochA, append(args, "-o", dir)...)
		if code := r.wait(); code != 1 || !strings.Contains(r.stderr.String(), fmt.Sprintf("in use by process %d", os.Getpid())) {
			t.Fatalf("exit %d, %q: want 1 and in use by process %d", code, r.stderr.String(), os.Getpid())
		}
		if _, err := os.Stat(dir); !errors.Is(err, fs.ErrNotExist) {
			t.Errorf("the refused build wrote %s: %v", dir, err)
		}
	})

	t.Run("kill -9 at random moments", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "out")
		if r := startBuild(t, bin, epochA, append(args, "-o", dir)...); r.wait() != 0 {
			t.Fatalf("build: %s", r.stderr.String())
		}
		// a replacing build's duration, so that the kills spread over all of it
		start := time.Now()
		if r := startBuild(t, bin, epochB, append(args, "-o", dir, "--force")...); r.wait() != 0 {
			t.Fatalf("build: %s", r.stderr.String())
		}
		duration := time.Since(start)
		rng := rand.New(rand.NewPCG(1, 2))
		replaced, leftovers := 0, false
		for i := 0; i < 20; i++ {
			old := holding(t, dir)
			r := startBuild(t, bin, other[old], append(args, "-o", dir, "--force")...)
			time.Sleep(time.Duration(rng.Float64() * 1.2 * float64(duration)))
			r.cmd.Process.Kill()
			r.wait()
			if holding(t, dir) != old {
				replaced++
			}
			leftovers = leftovers || len(temporaries(t, dir)) > 0
		}
		t.Logf("20 kills: the new build was in place after %d, the old one after %d; temporaries left at some point: %v", replaced, 20-replaced, leftovers)
		// the next build removes what the killed ones left, and says so;
		// a later killed build may already have removed earlier leftovers
		// (its note went with it), so look at what is left now
		leftovers = len(temporaries(t, dir)) > 0
		r := startBuild(t, bin, epochA, append(args, "-o", dir, "--force")...)
		if code := r.wait(); code != 0 {
			t.Fatalf("build after the kills: exit %d\n%s", code, r.stderr.String())
		}
		if holding(t, dir) != epochA {
			t.Error("the build after the kills is not in place")
		}
		if left := temporaries(t, dir); len(left) > 0 {
			t.Errorf("temporaries remain after the next build: %v", left)
		}
		if leftovers && !strings.Contains(r.stderr.String(), "note: removed") {
			t.Errorf("stale temporaries removed without a note: %q", r.stderr.String())
		}
	})

	for _, sig := range []struct {
		name   string
		signal syscall.Signal
		code   int
	}{{"SIGINT", syscall.SIGINT, 130}, {"SIGTERM", syscall.SIGTERM, 143}} {
		t.Run(sig.name+" while computing", func(t *testing.T) {
			dir := filepath.Join(t.TempDir(), "out")
			if r := startBuild(t, bin, epochA, append(args, "-o", dir)...); r.wait() != 0 {
				t.Fatalf("build: %s", r.stderr.String())
			}
			r := startBuild(t, bin, epochB, "-o", dir, "--force", "--samples", "100000")
			time.Sleep(duration / 2)
			r.cmd.Process.Signal(sig.signal)
			if code := r.wait(); code != sig.code {
				t.Fatalf("exit %d, want %d\n%s", code, sig.code, r.stderr.String())
			}
			if holding(t, dir) != epochA {
				t.Error("a cancelled build replaced the output")
			}
			if left := temporaries(t, dir); len(left) > 0 {
				t.Errorf("left beside the target: %v", left)
			}
		})
	}

	t.Run("SIGINT while writing", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "out")
		if r := startBuild(t, bin, epochA, append(args, "-o", dir)...); r.wait() != 0 {
			t.Fatalf("build: %s", r.stderr.String())
		}
		interrupted := 0
		for i := 0; i < 5 && interrupted < 2; i++ {
			old := holding(t, dir)
			r := startBuild(t, bin, other[old], append(args, "-o", dir, "--force")...)
			exited := make(chan int, 1)
			go func() { exited <- r.wait() }()
			code := -3
		watch:
			for deadline := time.Now().Add(10 * time.Second); time.Now().Before(deadline); {
				select {
				case code = <-exited:
					break watch
				default:
				}
				if len(temporaries(t, dir)) > 0 { // the files are being written
					r.cmd.Process.Signal(syscall.SIGINT)
					code = <-exited
					break
				}
			}
			switch code {
			case 0:
				if holding(t, dir) == old {
					t.Fatal("exit 0 but the old build is in place")
				}
			case 130:
				interrupted++
				if holding(t, dir) != old {
					t.Fatal("exit 130 but the build replaced the output")
				}
			default:
				t.Fatalf("exit %d, want 130 (or 0 when the signal came too late)\n%s", code, r.stderr.String())
			}
			if left := temporaries(t, dir); len(left) > 0 {
				t.Fatalf("left beside the target: %v", left)
			}
		}
		if interrupted == 0 {
			t.Error("no build was interrupted while writing in 5 tries")
		}
	})
}
