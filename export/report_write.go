package export

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
)

// WriteReport writes rep as indented JSON, byte for byte as
// encoding/json's Encoder with SetIndent("", "  ") writes it: two spaces
// per level, one array element per line, a newline at the end. Values
// that JSON cannot hold (an infinite VSWR) are Numbers, written as null.
//
// The sweep's six arrays are most of the file for a long sweep (100,001
// points make 15 MB), so they are streamed number by number with
// strconv.AppendFloat into a buffered writer; the rest of the report goes
// through encoding/json. Re-indenting the whole document, as the Encoder
// does, cost more than marshalling it.
func WriteReport(w io.Writer, rep Report) error {
	sweep := rep.Sweep
	rep.Sweep = ReportSweep{}
	head, err := json.MarshalIndent(rep, "", "  ")
	if err != nil {
		return err
	}
	empty, err := json.MarshalIndent(ReportSweep{}, "  ", "  ")
	if err != nil {
		return err
	}
	// Keys at the top level are the only ones indented by exactly two
	// spaces after a newline, so this finds the report's own sweep.
	key := []byte("\n  \"sweep\": ")
	at := bytes.Index(head, append(key, empty...))
	if at < 0 {
		return errors.New("report: the sweep is missing from the encoded report")
	}
	bw := bufio.NewWriterSize(w, 64<<10)
	bw.Write(head[:at+len(key)])
	if err := writeSweepJSON(bw, sweep); err != nil {
		return err
	}
	bw.Write(head[at+len(key)+len(empty):])
	bw.WriteByte('\n')
	return bw.Flush()
}

// writeSweepJSON writes s as the value of the top-level key "sweep":
// the object's members indented by four spaces, array elements by six.
func writeSweepJSON(bw *bufio.Writer, s ReportSweep) error {
	fields := []struct {
		key string
		v   []float64
	}{
		{"freq_hz", s.FreqHz}, {"s11_db", s.S11DB}, {"s11_re", s.S11Re},
		{"s11_im", s.S11Im}, {"load_gamma_re", s.LoadRe}, {"load_gamma_im", s.LoadIm},
	}
	bw.WriteString("{")
	var line []byte
	for i, f := range fields {
		if i > 0 {
			bw.WriteByte(',')
		}
		bw.WriteString("\n    \"" + f.key + "\": ")
		switch {
		case f.v == nil:
			bw.WriteString("null")
			continue
		case len(f.v) == 0:
			bw.WriteString("[]")
			continue
		}
		bw.WriteByte('[')
		for k, x := range f.v {
			line = append(line[:0], "\n      "...)
			if k > 0 {
				line = append(line[:0], ",\n      "...)
			}
			var err error
			if line, err = appendJSONFloat(line, x); err != nil {
				return fmt.Errorf("report: sweep %s[%d]: %w", f.key, k, err)
			}
			bw.Write(line)
		}
		bw.WriteString("\n    ]")
	}
	bw.WriteString("\n  }")
	return nil
}

// appendJSONFloat appends x as encoding/json writes a float64: the
// shortest form that reads back exactly, in plain notation except below
// 1e-6 or from 1e21 in magnitude, where an exponent without leading
// zeros is used. JSON has no infinities or NaN: those are an error, as
// in encoding/json.
func appendJSONFloat(b []byte, x float64) ([]byte, error) {
	if math.IsInf(x, 0) || math.IsNaN(x) {
		return b, fmt.Errorf("json: unsupported value: %s", strconv.FormatFloat(x, 'g', -1, 64))
	}
	format := byte('f')
	if abs := math.Abs(x); abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, x, format, -1, 64)
	if format == 'e' {
		// e-09 → e-9, as encoding/json does.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b, nil
}
