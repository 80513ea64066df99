package records

import (
	"os"
	"path/filepath"
	"testing"
)

// The reader the record tests share: a recording appended under its own
// "# made by:" line repeats the header, which is no row; rows count the
// "# made by:" lines above them; other comments are kept apart; a failed
// run's row says so.
func TestRead(t *testing.T) {
	path := filepath.Join(t.TempDir(), "r.tsv")
	text := "# made by: one\n# f0_hz\t2e9\ndesign\tf0_hz\n\ndemo\t2.45e9\nminimal\tfailed: no\n# made by: two\ndesign\tf0_hz\ndemo\t9.15e8\n"
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	r := Read(t, path, "none")
	if len(r.Made) != 2 || r.Made[1] != "# made by: two" || len(r.Comments) != 1 || r.Comments[0] != "# f0_hz\t2e9" || len(r.Header) != 2 || len(r.Rows) != 3 {
		t.Fatalf("made %q, comments %q, header %q, %d rows; want 2 made-by lines, 1 comment, 2 columns, 3 rows", r.Made, r.Comments, r.Header, len(r.Rows))
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
		row := r.Rows[c.row]
		why, failed := row.Failed()
		if row.Made != c.made || why != c.failed || failed != (c.failed != "") {
			t.Errorf("row %d: under %d made-by lines, failed %q; want %d, %q", c.row, row.Made, why, c.made, c.failed)
		}
		if c.f0 != 0 {
			if f0 := row.Num(t, "f0_hz"); f0 != c.f0 {
				t.Errorf("row %d: f0_hz %g, want %g", c.row, f0, c.f0)
			}
		}
	}
}
