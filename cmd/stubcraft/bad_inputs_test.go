package main

import (
	"bufio"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
)

// TestBadInputs runs every command line of testdata/bad/manifest.tsv (made
// by testdata/bad/make_corpus.py): a bad design, stackup or Touchstone file,
// or a bad flag, each with its exit status (1 for bad input, as run maps an
// error) and the fragments its message must hold — the file, the key or
// flag, and the reason. Nothing may be written to the output directory.
func TestBadInputs(t *testing.T) {
	src, err := filepath.Abs(filepath.Join("..", "..", "testdata", "bad"))
	if err != nil {
		t.Fatal(err)
	}
	testdata := filepath.Dir(src)
	work := t.TempDir()
	if err := os.CopyFS(work, os.DirFS(src)); err != nil {
		t.Fatal(err)
	}
	for _, fifo := range []string{"fifo.toml", "fifo.s1p"} {
		if err := syscall.Mkfifo(filepath.Join(work, fifo), 0o600); err != nil {
			t.Fatalf("named pipe: %v", err)
		}
	}
	long := "# GHz S MA R 50\n0.8 0.5 30\n! " + strings.Repeat("x", 1100<<10) + "\n1 0.5 20\n"
	if err := os.WriteFile(filepath.Join(work, "ts-long.s1p"), []byte(long), 0o600); err != nil {
		t.Fatal(err)
	}
	t.Chdir(work)

	f, err := os.Open("manifest.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	n := 0
	for line := 1; sc.Scan(); line++ {
		text := sc.Text()
		if text == "" || strings.HasPrefix(text, "#") {
			continue
		}
		cols := strings.Split(text, "\t")
		if len(cols) < 3 {
			t.Fatalf("manifest.tsv:%d: want args, exit status and fragments", line)
		}
		want, err := strconv.Atoi(cols[1])
		if err != nil {
			t.Fatalf("manifest.tsv:%d: exit status %q", line, cols[1])
		}
		n++
		out := filepath.Join(t.TempDir(), "out")
		args := strings.Fields(strings.NewReplacer("{out}", out, "{testdata}", testdata).Replace(cols[0]))
		msg, err := runRoot(t, args...)
		code := 0
		if err != nil {
			code = 1 // run's mapping of an error that is not a signal
			msg = err.Error()
		}
		if code != want {
			t.Errorf("manifest.tsv:%d: %s: exit %d, want %d (%s)", line, cols[0], code, want, firstLine(msg))
			continue
		}
		for _, frag := range cols[2:] {
			if !strings.Contains(msg, frag) {
				t.Errorf("manifest.tsv:%d: %s: message %q does not hold %q", line, cols[0], msg, frag)
			}
		}
		for _, bad := range []string{"NaN", "+Inf", "struct", "map[", "[]interface", "MaxBoard", "float64", "complex128"} {
			if strings.Contains(msg, bad) && !strings.Contains(cols[0]+inputText(args), bad) {
				t.Errorf("manifest.tsv:%d: %s: message %q shows %q", line, cols[0], msg, bad)
			}
		}
		if _, err := os.Stat(out); err == nil {
			t.Errorf("manifest.tsv:%d: %s: wrote %s", line, cols[0], out)
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	if n < 120 {
		t.Errorf("%d bad inputs in the manifest, want at least 120", n)
	}
}

// inputText returns the content of the files among args, so that a value
// the user wrote (such as "NaN GHz") may be quoted back.
func inputText(args []string) string {
	var b strings.Builder
	for _, a := range args {
		if fi, err := os.Stat(a); err != nil || !fi.Mode().IsRegular() || fi.Size() > 1<<16 {
			continue
		}
		if data, err := os.ReadFile(a); err == nil {
			b.Write(data)
		}
	}
	return b.String()
}

func firstLine(s string) string {
	s, _, _ = strings.Cut(s, "\n")
	return s
}
