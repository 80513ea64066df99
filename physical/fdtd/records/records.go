// Package records reads the tab-separated records that the long full-wave
// scripts under testdata write (testdata/fdtd, testdata/tee,
// testdata/discontinuities), for the tests that hold the recorded figures
// to their criteria: column names to values, the "# made by:" lines that
// name each recording's command, commit and date collected apart.
package records

import (
	"bufio"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// File is a record as the record tests read it: comment lines start with
// "#" (the "# made by:" lines, which name the command, commit and date of
// each recording, are collected apart), the first other line names the
// columns, and the lines after it are rows. A line equal to the header (a recording appended under its own
// "# made by:" line repeats it) and an empty line are no rows.
type File struct {
	Name     string   // the file's base name, for messages
	Made     []string // the "# made by:" lines, in order
	Comments []string // the other comment lines, in order
	Header   []string // the column names
	Rows     []Row
}

// Row is one row of a record.
type Row struct {
	file  string
	cols  map[string]int // column name → index in Cells
	Cells []string
	Made  int    // how many "# made by:" lines come before it
	Line  string // the row as written
}

// Read reads the record at path; script is what writes it, named when the
// file cannot be read. Any fault stops the test.
func Read(t testing.TB, path, script string) File {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("%v (%s writes it)", err, script)
	}
	defer f.Close()
	r := File{Name: filepath.Base(path)}
	var cols map[string]int
	var header string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		switch {
		case strings.HasPrefix(line, "# made by:"):
			r.Made = append(r.Made, line)
		case strings.HasPrefix(line, "#"):
			r.Comments = append(r.Comments, line)
		case line == "" || line == header:
		case cols == nil:
			header = line
			r.Header = strings.Split(line, "\t")
			cols = map[string]int{}
			for i, name := range r.Header {
				cols[name] = i
			}
		default:
			r.Rows = append(r.Rows, Row{file: r.Name, cols: cols, Cells: strings.Split(line, "\t"), Made: len(r.Made), Line: line})
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatalf("%s: %v", r.Name, err)
	}
	return r
}

// Failed returns what a row that records a failed run says ("name\tfailed
// …"), and whether it is one.
func (r Row) Failed() (string, bool) {
	if len(r.Cells) == 2 && strings.HasPrefix(r.Cells[1], "failed") {
		return r.Cells[1], true
	}
	return "", false
}

// Text returns the row's value in column name; the test stops when the
// record has no such column.
func (r Row) Text(t testing.TB, name string) string {
	t.Helper()
	i, ok := r.cols[name]
	if !ok || i >= len(r.Cells) {
		t.Fatalf("%s: no column %q in %q", r.file, name, r.Line)
	}
	return r.Cells[i]
}

// Num returns the row's value in column name as a number; the test stops
// when it is missing or not a number.
func (r Row) Num(t testing.TB, name string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(r.Text(t, name), 64)
	if err != nil {
		t.Fatalf("%s: column %s of %q: %v", r.file, name, r.Line, err)
	}
	return v
}
