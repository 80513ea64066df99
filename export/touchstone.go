package export

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"stubcraft/physical"
)

// WriteTouchstone writes t as a Touchstone 1.1 file (Touchstone File Format
// Specification 1.1, EIA/IBIS 2002): each comment as a "!" line, the option
// line "# Hz S RI R <Z0>", then one record per frequency. A one- or
// two-port record is one line, the two-port in the order S11 S21 S12 S22;
// with three or more ports each matrix row starts a new line and carries
// at most four pairs per line, as the specification asks. Numbers are
// written in the shortest form that reads back to the same float64, so a
// file read with physical.ReadTouchstone gives t back exactly.
func WriteTouchstone(w io.Writer, t *physical.Touchstone, comments []string) error {
	if t == nil {
		return fmt.Errorf("touchstone: no network")
	}
	return writeTouchstone(w, touchRecords{ports: t.Ports, z0: t.Z0, freqs: t.Freqs, n: len(t.S),
		row: func(k int, _ []complex128) []complex128 { return t.S[k] }}, comments)
}

// touchRecords is what a Touchstone file holds: n matrices of ports²
// values at freqs, row k written into (or returned instead of) dst, so
// that a caller can write a sweep without copying it first.
type touchRecords struct {
	ports int
	z0    float64
	freqs []float64
	n     int
	row   func(k int, dst []complex128) []complex128
}

// writeTouchstone is WriteTouchstone on records.
func writeTouchstone(w io.Writer, t touchRecords, comments []string) error {
	if err := checkTouchstone(t); err != nil {
		return fmt.Errorf("touchstone: %w", err)
	}
	bw := bufio.NewWriter(w)
	for _, c := range comments {
		for _, line := range strings.Split(c, "\n") {
			bw.WriteString("! " + strings.TrimRight(line, "\r") + "\n")
		}
	}
	fmt.Fprintf(bw, "# Hz S RI R %s\n", touchNum(t.z0))
	n := t.ports
	// One record at a time into line, with strconv.AppendFloat: no string
	// per number.
	var line []byte
	buf := make([]complex128, n*n)
	for k, f := range t.freqs {
		s := t.row(k, buf)
		line = strconv.AppendFloat(line[:0], f, 'f', -1, 64) // plain Hz, shortest exact
		switch n {
		case 1:
			line = touchPairs(line, s[0])
		case 2:
			line = touchPairs(line, s[0], s[2], s[1], s[3])
		default:
			for i := 0; i < n; i++ {
				row := s[i*n : (i+1)*n]
				for j := 0; j < n; j += 4 {
					if i > 0 || j > 0 {
						line = append(line, "\n "...)
					}
					line = touchPairs(line, row[j:min(j+4, n)]...)
				}
			}
		}
		line = append(line, '\n')
		bw.Write(line)
	}
	if err := bw.Flush(); err != nil {
		return fmt.Errorf("touchstone: %w", err)
	}
	return nil
}

// checkTouchstone rejects a value that would not make a readable file.
func checkTouchstone(t touchRecords) error {
	if t.ports < 1 {
		return fmt.Errorf("port count %d, need at least 1", t.ports)
	}
	if !(t.z0 > 0) || math.IsInf(t.z0, 0) {
		return fmt.Errorf("reference impedance %g ohm, need a positive finite value", t.z0)
	}
	if len(t.freqs) == 0 || len(t.freqs) != t.n {
		return fmt.Errorf("%d frequencies and %d matrices, need as many and at least one", len(t.freqs), t.n)
	}
	buf := make([]complex128, t.ports*t.ports)
	for k, f := range t.freqs {
		if math.IsNaN(f) || math.IsInf(f, 0) || f < 0 || (k > 0 && !(f > t.freqs[k-1])) {
			return fmt.Errorf("frequency %d (%g Hz) is not finite, non-negative and increasing", k, f)
		}
		s := t.row(k, buf)
		if len(s) != t.ports*t.ports {
			return fmt.Errorf("frequency %d has %d S values, want %d", k, len(s), t.ports*t.ports)
		}
		for _, v := range s {
			if math.IsNaN(real(v)) || math.IsNaN(imag(v)) || math.IsInf(real(v), 0) || math.IsInf(imag(v), 0) {
				return fmt.Errorf("frequency %d (%g Hz) has a value that is not finite", k, f)
			}
		}
	}
	return nil
}

// touchPairs appends " re im" for each value, each number in the shortest
// form that parses back to it.
func touchPairs(line []byte, vs ...complex128) []byte {
	for _, v := range vs {
		line = append(line, ' ')
		line = strconv.AppendFloat(line, real(v), 'g', -1, 64)
		line = append(line, ' ')
		line = strconv.AppendFloat(line, imag(v), 'g', -1, 64)
	}
	return line
}

// touchNum formats v in the shortest form that parses back to v.
func touchNum(v float64) string {
	return strconv.FormatFloat(v, 'g', -1, 64)
}
