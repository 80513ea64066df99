package tomlx

import (
	"strconv"
	"strings"
	"unicode/utf8"
)

// keyLines maps a key path to the 1-based line where it first appears in a
// TOML text. BurntSushi/toml reports undecoded keys as paths without
// positions, so the lines are found by scanning the source once more. An
// element of an array of tables is recorded both as the array ("section")
// and with its 1-based index ("section[2]", and "section[2].length" for a
// key in it).
type keyLines map[string]int

// pathKey is the map key of a path. No TOML key contains a NUL byte that
// could make two paths collide: a NUL must be escaped in a quoted key, and
// the escape yields a NUL only in the decoded path, which is what both
// sides of the lookup hold.
func pathKey(path []string) string { return strings.Join(path, "\x00") }

// line returns the line of path, or of its longest prefix that is in the
// text (the table a missing key belongs to), or 0.
func (kl keyLines) line(path []string) int {
	for n := len(path); n > 0; n-- {
		if l, ok := kl[pathKey(path[:n])]; ok {
			return l
		}
	}
	return 0
}

// record notes the line of path and of each of its prefixes not yet seen.
func (kl keyLines) record(path []string, line int) {
	for n := 1; n <= len(path); n++ {
		k := pathKey(path[:n])
		if _, ok := kl[k]; !ok {
			kl[k] = line
		}
	}
}

// frame is an open inline table or array: the path its keys or elements
// belong to.
type frame struct {
	table bool
	base  []string
}

// scanner walks a TOML text that BurntSushi/toml has already accepted, so
// it can be lenient about errors: it only needs to find where keys are.
type scanner struct {
	src    string
	pos    int
	line   int
	lines  keyLines
	arrays map[string]int // elements seen of each array of tables, by pathKey
}

func (sc *scanner) peek(n int) byte {
	if sc.pos+n < len(sc.src) {
		return sc.src[sc.pos+n]
	}
	return 0
}

func (sc *scanner) advance() {
	if sc.src[sc.pos] == '\n' {
		sc.line++
	}
	sc.pos++
}

// skipSpace skips blanks and comments, and newlines too when newlines is
// true. It reports whether it crossed a newline.
func (sc *scanner) skipSpace(newlines bool) bool {
	crossed := false
	for sc.pos < len(sc.src) {
		switch c := sc.src[sc.pos]; {
		case c == ' ' || c == '\t' || c == '\r':
			sc.pos++
		case c == '#':
			for sc.pos < len(sc.src) && sc.src[sc.pos] != '\n' {
				sc.pos++
			}
		case c == '\n' && newlines:
			sc.advance()
			crossed = true
		default:
			return crossed
		}
	}
	return crossed
}

func (sc *scanner) run() {
	var table []string // the current [table]
	var stack []frame
	var valueKey []string // the key whose value is being read
	expectKey := true
	for {
		crossed := sc.skipSpace(true)
		if sc.pos >= len(sc.src) {
			return
		}
		if crossed && len(stack) == 0 {
			expectKey = true
		}
		c := sc.src[sc.pos]
		if expectKey {
			expectKey = false
			if len(stack) == 0 && c == '[' {
				table = sc.header()
				continue
			}
			if c == '}' { // an empty inline table, or a trailing comma (TOML 1.1)
				stack = stack[:len(stack)-1]
				sc.pos++
				continue
			}
			base := table
			if len(stack) > 0 {
				base = stack[len(stack)-1].base
			}
			startLine := sc.line
			key := append(append([]string(nil), base...), sc.keyPath()...)
			sc.lines.record(key, startLine)
			valueKey = key
			sc.skipSpace(false)
			if sc.peek(0) == '=' {
				sc.pos++
			}
			continue
		}
		switch c {
		case '"', '\'':
			sc.str()
		case '{':
			base := valueKey
			if len(stack) > 0 && !stack[len(stack)-1].table {
				base = stack[len(stack)-1].base
			}
			stack = append(stack, frame{table: true, base: base})
			sc.pos++
			expectKey = true
		case '[':
			base := valueKey
			if len(stack) > 0 && !stack[len(stack)-1].table {
				base = stack[len(stack)-1].base
			}
			stack = append(stack, frame{table: false, base: base})
			sc.pos++
		case ']', '}':
			if len(stack) > 0 {
				stack = stack[:len(stack)-1]
			}
			sc.pos++
		case ',':
			sc.pos++
			if len(stack) > 0 && stack[len(stack)-1].table {
				expectKey = true
			}
		default:
			sc.advance()
		}
	}
}

// header reads "[a.b]" or "[[a.b]]", records it and returns its path; the
// path of an element of an array of tables ends in its index, "b[2]".
func (sc *scanner) header() []string {
	startLine := sc.line
	sc.pos++ // [
	array := sc.peek(0) == '['
	if array {
		sc.pos++
	}
	sc.skipSpace(false)
	path := sc.keyPath()
	sc.skipSpace(false)
	for sc.pos < len(sc.src) && sc.src[sc.pos] == ']' {
		sc.pos++
	}
	sc.lines.record(path, startLine)
	if array {
		k := pathKey(path)
		sc.arrays[k]++
		path = append(path[:len(path)-1:len(path)-1], path[len(path)-1]+"["+strconv.Itoa(sc.arrays[k])+"]")
		sc.lines.record(path, startLine)
	}
	return path
}

// keyPath reads a possibly dotted, possibly quoted key.
func (sc *scanner) keyPath() []string {
	var path []string
	for {
		sc.skipSpace(false)
		path = append(path, sc.keyPart())
		sc.skipSpace(false)
		if sc.peek(0) != '.' {
			return path
		}
		sc.pos++
	}
}

// keyPart reads one bare or quoted key component.
func (sc *scanner) keyPart() string {
	switch sc.peek(0) {
	case '"', '\'':
		start := sc.pos
		sc.str()
		return unquote(sc.src[start:sc.pos])
	}
	start := sc.pos
	for sc.pos < len(sc.src) && !strings.ContainsRune(" \t\r\n=.[]\"'#,{}", rune(sc.src[sc.pos])) {
		sc.pos++
	}
	return sc.src[start:sc.pos]
}

// str skips one basic, literal or multi-line string, counting its lines.
func (sc *scanner) str() {
	q := sc.src[sc.pos]
	multi := strings.HasPrefix(sc.src[sc.pos:], strings.Repeat(string(q), 3))
	if multi {
		sc.pos += 3
	} else {
		sc.pos++
	}
	for sc.pos < len(sc.src) {
		c := sc.src[sc.pos]
		switch {
		case c == '\\' && q == '"':
			sc.pos++
			if sc.pos < len(sc.src) {
				sc.advance()
			}
		case c == q && !multi:
			sc.pos++
			return
		case c == q && strings.HasPrefix(sc.src[sc.pos:], strings.Repeat(string(q), 3)):
			sc.pos += 3
			// Up to two more quotes may belong to the content: """a"""".
			for i := 0; i < 2 && sc.peek(0) == q; i++ {
				sc.pos++
			}
			return
		default:
			sc.advance()
		}
	}
}

// unquote decodes a one-line quoted key: 'literal' as is, "basic" with the
// TOML escapes. Anything it cannot decode is kept as written; the lookup
// then misses and the error carries line 0, which is honest.
func unquote(s string) string {
	if len(s) < 2 {
		return s
	}
	if s[0] == '\'' {
		return s[1 : len(s)-1]
	}
	body := s[1 : len(s)-1]
	var b strings.Builder
	for i := 0; i < len(body); i++ {
		c := body[i]
		if c != '\\' || i+1 >= len(body) {
			b.WriteByte(c)
			continue
		}
		i++
		switch body[i] {
		case 'b':
			b.WriteByte('\b')
		case 't':
			b.WriteByte('\t')
		case 'n':
			b.WriteByte('\n')
		case 'f':
			b.WriteByte('\f')
		case 'r':
			b.WriteByte('\r')
		case 'e':
			b.WriteByte(0x1b)
		case '"', '\\':
			b.WriteByte(body[i])
		case 'x', 'u', 'U':
			n := 2
			switch body[i] {
			case 'u':
				n = 4
			case 'U':
				n = 8
			}
			if i+1+n > len(body) {
				return s
			}
			v, err := strconv.ParseUint(body[i+1:i+1+n], 16, 32)
			if err != nil || !utf8.ValidRune(rune(v)) {
				return s
			}
			b.WriteRune(rune(v))
			i += n
		default:
			return s
		}
	}
	return b.String()
}

// indexKeys returns the line of every key and table header in src, which
// must be valid TOML, and the element count of each array of tables.
func indexKeys(src string) (keyLines, map[string]int) {
	src = strings.TrimPrefix(src, "\ufeff") // a byte-order mark, which TOML allows
	sc := &scanner{src: src, line: 1, lines: keyLines{}, arrays: map[string]int{}}
	sc.run()
	return sc.lines, sc.arrays
}
