package tomlx

import (
	"strings"
	"testing"
)

func TestIndexKeys(t *testing.T) {
	// Line numbers counted by hand in this text.
	src := `# comment with key = 1
top = 1
"quoted key" = 'x'   # trailing comment [not.a.table]
dotted . path = "a # not a comment"
multi = """
inside = 1
"""
lit = '''
inside2 = 2'''
arr = [
  "s = 1",
  { inner = 1 },
]
inl = { a = 1, b = { c = 2 } }

[ table . "sub" ]
key = "v"
[[aot]]
k = 1
[x]
esc = "\"quoted = 1\""
'q.k' = 1
"\u0041" = 1
`
	tests := []struct {
		path []string
		line int
	}{
		{[]string{"top"}, 2},
		{[]string{"quoted key"}, 3},
		{[]string{"dotted"}, 4},
		{[]string{"dotted", "path"}, 4},
		{[]string{"multi"}, 5},
		{[]string{"inside"}, 0}, // inside a multi-line string
		{[]string{"lit"}, 8},
		{[]string{"inside2"}, 0},
		{[]string{"arr"}, 10},
		{[]string{"s"}, 0},
		{[]string{"arr", "inner"}, 12},
		{[]string{"inl", "a"}, 14},
		{[]string{"inl", "b", "c"}, 14},
		{[]string{"table"}, 16},
		{[]string{"table", "sub"}, 16},
		{[]string{"table", "sub", "key"}, 17},
		{[]string{"table", "sub", "missing"}, 16}, // falls back to its table
		{[]string{"aot[1]", "k"}, 19},
		{[]string{"aot", "k"}, 18}, // a key of an element is found under its index
		{[]string{"x", "esc"}, 21},
		{[]string{"x", "quoted"}, 20}, // only the table x matches
		{[]string{"x", "q.k"}, 22},
		{[]string{"x", "A"}, 23},
		{[]string{"nowhere"}, 0},
		{[]string{"not"}, 0},
	}
	for _, text := range []string{src, "\ufeff" + src, strings.ReplaceAll(src, "\n", "\r\n")} {
		lines, _ := indexKeys(text)
		for _, tt := range tests {
			if got := lines.line(tt.path); got != tt.line {
				t.Errorf("line(%q) = %d, want %d (text starts %q)", tt.path, got, tt.line, text[:8])
			}
		}
	}
}
