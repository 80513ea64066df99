package physical

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"math/cmplx"
	"path/filepath"
	"sort"
	"strconv"
	"strings"

	"stubcraft/physical/inputfile"
)

// Touchstone is an N-port network's S parameters over frequency, as read
// from or written to a Touchstone file.
type Touchstone struct {
	Ports int            // number of ports
	Z0    float64        // reference impedance of every port, ohm
	Freqs []float64      // increasing frequencies, Hz
	S     [][]complex128 // per frequency, row-major Ports×Ports: S[k][i*Ports+j] is S(i+1)(j+1)
}

// TouchstoneError reports a malformed Touchstone file: the source named by
// the caller, the 1-based line and what is wrong there.
type TouchstoneError struct {
	Source string
	Line   int
	Msg    string
	Err    error // an underlying error (a number that did not parse), or nil
}

// Error formats the error as "source:line: message".
func (e *TouchstoneError) Error() string {
	return fmt.Sprintf("%s:%d: %s", e.Source, e.Line, e.Msg)
}

// Unwrap returns the underlying error, if any.
func (e *TouchstoneError) Unwrap() error { return e.Err }

// TouchstonePorts returns the port count that a Touchstone 1.1 file name
// announces by its extension, ".s<n>p" in any letter case.
func TouchstonePorts(name string) (int, error) {
	ext := strings.ToLower(filepath.Ext(name))
	if len(ext) < 4 || ext[1] != 's' || ext[len(ext)-1] != 'p' {
		return 0, fmt.Errorf("%s: not a Touchstone extension (.s<n>p)", name)
	}
	n, err := strconv.Atoi(ext[2 : len(ext)-1])
	if err != nil || n < 1 {
		return 0, fmt.Errorf("%s: bad port count in extension %q", name, ext)
	}
	return n, nil
}

// touchOptions is the content of a Touchstone option line.
type touchOptions struct {
	freqScale float64
	format    string // "MA", "DB" or "RI"
	z0        float64
}

// parseOptions reads "# <unit> <param> <format> R <n>", fields in any
// order and any letter case, each optional with the defaults GHz, S, MA,
// R 50 (Touchstone File Format Specification 1.1, EIA/IBIS 2002).
func parseOptions(fields []string, source string, line int) (touchOptions, error) {
	o := touchOptions{freqScale: 1e9, format: "MA", z0: 50}
	bad := func(msg string, err error) error {
		return &TouchstoneError{Source: source, Line: line, Msg: msg, Err: err}
	}
	for i := 0; i < len(fields); i++ {
		f := strings.ToUpper(fields[i])
		switch f {
		case "HZ":
			o.freqScale = 1
		case "KHZ":
			o.freqScale = 1e3
		case "MHZ":
			o.freqScale = 1e6
		case "GHZ":
			o.freqScale = 1e9
		case "S":
		case "Y", "Z", "H", "G":
			return o, bad(fmt.Sprintf("option line: %s parameters are not supported, only S", fields[i]), nil)
		case "MA", "DB", "RI":
			o.format = f
		case "R":
			if i+1 >= len(fields) {
				return o, bad("option line: R needs a reference impedance", nil)
			}
			i++
			v, err := strconv.ParseFloat(fields[i], 64)
			if err != nil || !(v > 0) || math.IsInf(v, 0) {
				return o, bad(fmt.Sprintf("option line: bad reference impedance %q", fields[i]), err)
			}
			o.z0 = v
		default:
			return o, bad(fmt.Sprintf("option line: unknown field %q", fields[i]), nil)
		}
	}
	return o, nil
}

// pair turns two numbers in the file's format into a complex value.
func (o touchOptions) pair(a, b float64) complex128 {
	switch o.format {
	case "RI":
		return complex(a, b)
	case "DB":
		return cmplx.Rect(math.Pow(10, a/20), b*math.Pi/180)
	default:
		return cmplx.Rect(a, b*math.Pi/180)
	}
}

// ReadTouchstone reads a Touchstone 1.1 file of S parameters for a network
// of the given number of ports (which the caller takes from the file's
// extension, see TouchstonePorts). source names the file in errors.
//
// The option line must come before the data; comments run from "!" to the
// end of a line. Each frequency's record is the frequency followed by
// ports² pairs in the option line's format: for two ports in the order
// S11 S21 S12 S22, otherwise row by row. A record starts on a new line and
// may be wrapped over several. Frequencies must increase; in a two-port
// file a line of five numbers whose frequency does not increase starts the
// noise parameters, which are skipped. A malformed file gives a
// *TouchstoneError naming source and line.
func ReadTouchstone(r io.Reader, source string, ports int) (*Touchstone, error) {
	if ports < 1 {
		return nil, fmt.Errorf("%s: port count %d, need at least 1", source, ports)
	}
	per := 1 + 2*ports*ports
	t := &Touchstone{Ports: ports}
	var (
		opts     touchOptions
		haveOpts bool
		rec      []float64 // numbers of the record being read
		recLine  int       // line on which it started
		noise    bool
		lineNo   int
		br       = bufio.NewReaderSize(r, 64*1024)
		errAt    = func(line int, err error, format string, a ...any) error {
			return &TouchstoneError{Source: source, Line: line, Msg: fmt.Sprintf(format, a...), Err: err}
		}
	)
	for {
		text, err := touchLine(br)
		if err == io.EOF {
			break
		}
		lineNo++
		if errors.Is(err, errLineTooLong) {
			return nil, errAt(lineNo, err, "the line is longer than %d bytes; a Touchstone record line is a few hundred", maxTouchstoneLine)
		}
		if err != nil {
			return nil, fmt.Errorf("%s: reading line %d: %w", source, lineNo, err)
		}
		if i := strings.IndexByte(text, '!'); i >= 0 {
			text = text[:i]
		}
		fields := strings.Fields(text)
		if len(fields) == 0 {
			continue
		}
		if strings.HasPrefix(fields[0], "#") {
			if haveOpts {
				return nil, errAt(lineNo, nil, "a second option line")
			}
			if fields[0] != "#" {
				fields = append([]string{strings.TrimPrefix(fields[0], "#")}, fields[1:]...)
			} else {
				fields = fields[1:]
			}
			o, err := parseOptions(fields, source, lineNo)
			if err != nil {
				return nil, err
			}
			opts, haveOpts, t.Z0 = o, true, o.z0
			continue
		}
		if !haveOpts {
			return nil, errAt(lineNo, nil, "data before the option line (# <unit> S <format> R <n>)")
		}
		nums := make([]float64, len(fields))
		for i, f := range fields {
			v, err := strconv.ParseFloat(f, 64)
			if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
				return nil, errAt(lineNo, err, "cannot read %q as a number", f)
			}
			nums[i] = v
		}
		if noise {
			if len(nums) != 5 {
				return nil, errAt(lineNo, nil, "noise parameter line has %d values, want 5", len(nums))
			}
			continue
		}
		if len(rec) == 0 {
			recLine = lineNo
			if nums[0] < 0 {
				return nil, errAt(lineNo, nil, "negative frequency %s", fields[0])
			}
			if f := nums[0] * opts.freqScale; math.IsInf(f, 0) {
				return nil, errAt(lineNo, nil, "frequency %s in the option line's unit is not a finite number of hertz", fields[0])
			}
			if n := len(t.Freqs); n > 0 && nums[0]*opts.freqScale <= t.Freqs[n-1] {
				if ports == 2 && len(nums) == 5 {
					noise = true
					continue
				}
				return nil, errAt(lineNo, nil, "frequency %s does not increase", fields[0])
			}
		}
		rec = append(rec, nums...)
		if len(rec) > per {
			return nil, errAt(recLine, nil, "record starting here has %d values by line %d, want %d (frequency and %d pairs)", len(rec), lineNo, per, ports*ports)
		}
		if len(rec) < per {
			continue
		}
		sm, err := recordS(opts, rec[1:], ports)
		if err != nil {
			return nil, errAt(recLine, err, "record starting here: %v", err)
		}
		t.Freqs = append(t.Freqs, rec[0]*opts.freqScale)
		t.S = append(t.S, sm)
		rec = rec[:0]
	}
	if len(rec) > 0 {
		return nil, errAt(recLine, nil, "record starting here ends with %d values, want %d (frequency and %d pairs)", len(rec), per, ports*ports)
	}
	if !haveOpts {
		return nil, errAt(lineNo, nil, "no option line")
	}
	if len(t.Freqs) == 0 {
		return nil, errAt(lineNo, errors.New("empty"), "no data")
	}
	return t, nil
}

// recordS turns a record's pairs into a row-major S matrix, refusing a
// value that is not finite once converted (a dB figure of thousands) and a
// negative magnitude.
func recordS(o touchOptions, v []float64, ports int) ([]complex128, error) {
	s := make([]complex128, ports*ports)
	for k := 0; k < ports*ports; k++ {
		a, b := v[2*k], v[2*k+1]
		if o.format == "MA" && a < 0 {
			return nil, fmt.Errorf("pair %d: magnitude %g is negative", k+1, a)
		}
		s[k] = o.pair(a, b)
		if cmplx.IsInf(s[k]) || cmplx.IsNaN(s[k]) {
			return nil, fmt.Errorf("pair %d (%g, %g in %s) is not a finite S parameter", k+1, a, b, o.format)
		}
	}
	if ports == 2 {
		s[1], s[2] = s[2], s[1] // file order S11 S21 S12 S22
	}
	return s, nil
}

// maxTouchstoneLine is the longest line ReadTouchstone reads, bytes.
const maxTouchstoneLine = 1 << 20

var errLineTooLong = errors.New("line too long")

// touchLine returns the next line of br without its end, or io.EOF after
// the last; a line longer than maxTouchstoneLine gives errLineTooLong.
func touchLine(br *bufio.Reader) (string, error) {
	var line []byte
	for {
		chunk, err := br.ReadSlice('\n')
		if len(line)+len(chunk) > maxTouchstoneLine {
			return "", errLineTooLong
		}
		line = append(line, chunk...)
		switch {
		case err == bufio.ErrBufferFull:
			continue
		case err == io.EOF && len(line) > 0:
			return string(line), nil
		case err != nil:
			return "", err
		}
		return string(line[:len(line)-1]), nil
	}
}

// ReadTouchstoneFile reads the Touchstone file at path, which must be a
// regular file of at most inputfile.TouchstoneLimit bytes, for a network of
// the port count its extension announces; want, when above 0, is the port
// count the caller needs.
func ReadTouchstoneFile(path string, want int) (*Touchstone, error) {
	ports, err := TouchstonePorts(path)
	if err != nil {
		return nil, err
	}
	if want > 0 && ports != want {
		return nil, fmt.Errorf("%s: a %d-port file; a %d-port (.s%dp) file is needed here", path, ports, want, want)
	}
	f, err := inputfile.Open(path, inputfile.TouchstoneLimit)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return ReadTouchstone(inputfile.Reader(f, path, inputfile.TouchstoneLimit), path, ports)
}

// Reflection returns S11 at freq (Hz), interpolated linearly in real and
// imaginary part between the two nearest frequencies (exact at a listed
// frequency). A frequency outside the file's range is an error.
func (t *Touchstone) Reflection(freq float64) (complex128, error) {
	n := len(t.Freqs)
	if n == 0 || len(t.S) != n {
		return 0, errors.New("touchstone: no data")
	}
	if freq < t.Freqs[0] || freq > t.Freqs[n-1] || math.IsNaN(freq) {
		return 0, fmt.Errorf("%.6g GHz is outside the data, which run from %.6g to %.6g GHz; give data that cover it", freq/1e9, t.Freqs[0]/1e9, t.Freqs[n-1]/1e9)
	}
	k := sort.SearchFloat64s(t.Freqs, freq)
	if t.Freqs[k] == freq {
		return t.S[k][0], nil
	}
	x := (freq - t.Freqs[k-1]) / (t.Freqs[k] - t.Freqs[k-1])
	a, b := t.S[k-1][0], t.S[k][0]
	return a + (b-a)*complex(x, 0), nil
}

// LoadImpedance returns the impedance Z0·(1 + S11)/(1 − S11) at freq (Hz)
// of the network's port 1, with S11 from Reflection. S11 = 1 (an open
// circuit) is an error.
func (t *Touchstone) LoadImpedance(freq float64) (complex128, error) {
	g, err := t.Reflection(freq)
	if err != nil {
		return 0, err
	}
	if g == 1 {
		return 0, fmt.Errorf("touchstone: S11 = 1 at %.6g Hz, an open circuit", freq)
	}
	return complex(t.Z0, 0) * (1 + g) / (1 - g), nil
}
