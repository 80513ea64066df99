package fullwave

import (
	"bufio"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// record is a tab-separated record of testdata/fdtd as the record tests
// read it: comment lines start with "#" (the "# made by:" lines, which
// name the command, commit and date of each recording, are collected
// apart), the first other line names the columns, and the lines after it
// are rows. A line equal to the header (a recording appended under its own
// "# made by:" line repeats it) and an empty line are no rows.
type record struct {
	name     string   // the file's base name, for messages
	made     []string // the "# made by:" lines, in order
	comments []string // the other comment lines, in order
	header   []string // the column names
	rows     []recordRow
}

// recordRow is one row of a record.
type recordRow struct {
	file  string
	cols  map[string]int // column name → index in cells
	cells []string
	made  int    // how many "# made by:" lines come before it
	line  string // the row as written
}

// readRecord reads the record at path; script is what writes it, named
// when the file cannot be read.
func readRecord(t *testing.T, path, script string) record {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatalf("%v (%s writes it)", err, script)
	}
	defer f.Close()
	r := record{name: filepath.Base(path)}
	var cols map[string]int
	var header string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		switch {
		case strings.HasPrefix(line, "# made by:"):
			r.made = append(r.made, line)
		case strings.HasPrefix(line, "#"):
			r.comments = append(r.comments, line)
		case line == "" || line == header:
		case cols == nil:
			header = line
			r.header = strings.Split(line, "\t")
			cols = map[string]int{}
			for i, name := range r.header {
				cols[name] = i
			}
		default:
			r.rows = append(r.rows, recordRow{file: r.name, cols: cols, cells: strings.Split(line, "\t"), made: len(r.made), line: line})
		}
	}
	if err := sc.Err(); err != nil {
		t.Fatalf("%s: %v", r.name, err)
	}
	return r
}

// failed returns what a row that records a failed run says ("name\tfailed
// …"), and whether it is one.
func (r recordRow) failed() (string, bool) {
	if len(r.cells) == 2 && strings.HasPrefix(r.cells[1], "failed") {
		return r.cells[1], true
	}
	return "", false
}

// text returns the row's value in column name; the test stops when the
// record has no such column.
func (r recordRow) text(t *testing.T, name string) string {
	t.Helper()
	i, ok := r.cols[name]
	if !ok || i >= len(r.cells) {
		t.Fatalf("%s: no column %q in %q", r.file, name, r.line)
	}
	return r.cells[i]
}

// num returns the row's value in column name as a number; the test stops
// when it is missing or not a number.
func (r recordRow) num(t *testing.T, name string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(r.text(t, name), 64)
	if err != nil {
		t.Fatalf("%s: column %s of %q: %v", r.file, name, r.line, err)
	}
	return v
}

// The reader the record tests share: a recording appended under its own
// "# made by:" line repeats the header, which is no row; rows count the
// "# made by:" lines above them; other comments are kept apart; a failed
// run's row says so.
func TestReadRecord(t *testing.T) {
	path := filepath.Join(t.TempDir(), "r.tsv")
	text := "# made by: one\n# f0_hz\t2e9\ndesign\tf0_hz\n\ndemo\t2.45e9\nminimal\tfailed: no\n# made by: two\ndesign\tf0_hz\ndemo\t9.15e8\n"
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	r := readRecord(t, path, "none")
	if len(r.made) != 2 || r.made[1] != "# made by: two" || len(r.comments) != 1 || r.comments[0] != "# f0_hz\t2e9" || len(r.header) != 2 || len(r.rows) != 3 {
		t.Fatalf("made %q, comments %q, header %q, %d rows; want 2 made-by lines, 1 comment, 2 columns, 3 rows", r.made, r.comments, r.header, len(r.rows))
	}
	cases := []struct {
		row    int
		made   int
		f0     float64 // 0: a failed run
		failed string
	}{
		{0, 1, 2.45e9, ""},
		{1, 1, 0, "failed: no"},
		{2, 2, 9.15e8, ""},
	}
	for _, c := range cases {
		row := r.rows[c.row]
		why, failed := row.failed()
		if row.made != c.made || why != c.failed || failed != (c.failed != "") {
			t.Errorf("row %d: under %d made-by lines, failed %q; want %d, %q", c.row, row.made, why, c.made, c.failed)
		}
		if c.f0 != 0 {
			if f0 := row.num(t, "f0_hz"); f0 != c.f0 {
				t.Errorf("row %d: f0_hz %g, want %g", c.row, f0, c.f0)
			}
		}
	}
}
