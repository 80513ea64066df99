// Package gerberread reads back the Gerber X2 and Excellon files that
// package export writes, for its tests: the regions as polygons, the flashed
// pads and the draws, with their attributes, in integer nanometres. It knows
// the subset of the Gerber Layer Format that export uses (millimetres, any
// FSLAX format, C and R apertures, G01, G36/G37, D01/D02/D03, TF/TA/TO/TD)
// and refuses anything else, so a writer that strays from it fails its
// tests.
package gerberread

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"

	"stubcraft/synth/geom"
)

// Aperture is a standard aperture: a circle of diameter W, or a W×H
// rectangle.
type Aperture struct {
	Shape string // "C" or "R"
	W, H  int64  // nm
	Attrs map[string]string
}

// Region is one G36/G37 contour, the closing vertex dropped.
type Region struct {
	Outline geom.Polygon
	Attrs   map[string]string // aperture and object attributes in force
}

// Flash is one D03.
type Flash struct {
	D     int
	At    geom.Point
	Attrs map[string]string // object attributes in force
}

// Draw is one D01 outside a region.
type Draw struct {
	D        int
	From, To geom.Point
}

// File is a parsed Gerber file.
type File struct {
	FileAttrs map[string]string // ".FileFunction" → "Copper,L1,Top"
	Apertures map[int]Aperture
	Regions   []Region
	Flashes   []Flash
	Draws     []Draw
	Ended     bool // M02 seen
}

// Read parses a Gerber file.
func Read(r io.Reader) (*File, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	f := &File{FileAttrs: map[string]string{}, Apertures: map[int]Aperture{}}
	st := state{f: f, aper: map[string]string{}, obj: map[string]string{}, cur: -1}
	var ext bool
	var word strings.Builder
	for _, c := range string(data) {
		switch {
		case c == '%':
			ext = !ext
		case c == '*':
			if err := st.word(word.String(), ext); err != nil {
				return nil, fmt.Errorf("gerberread: %q: %w", word.String(), err)
			}
			word.Reset()
		case c == '\n' || c == '\r':
		default:
			word.WriteRune(c)
		}
	}
	if !f.Ended {
		return nil, fmt.Errorf("gerberread: no M02")
	}
	return f, nil
}

type state struct {
	f         *File
	intDigits int
	decDigits int
	mm        bool
	aper, obj map[string]string
	cur       int
	pos       geom.Point
	inRegion  bool
	contour   geom.Polygon
	g01       bool
}

func copyAttrs(a ...map[string]string) map[string]string {
	m := map[string]string{}
	for _, x := range a {
		for k, v := range x {
			m[k] = v
		}
	}
	return m
}

func (s *state) word(w string, ext bool) error {
	if ext {
		return s.extended(w)
	}
	if s.decDigits == 0 || !s.mm {
		if !strings.HasPrefix(w, "G04") && w != "" {
			return fmt.Errorf("operation before %%FS and %%MOMM")
		}
	}
	switch {
	case w == "":
		return nil
	case strings.HasPrefix(w, "G04"):
		return nil
	case w == "G01":
		s.g01 = true
		return nil
	case w == "G36":
		s.inRegion, s.contour = true, nil
		return nil
	case w == "G37":
		if err := s.closeContour(); err != nil {
			return err
		}
		s.inRegion = false
		return nil
	case w == "M02":
		s.f.Ended = true
		return nil
	case strings.HasPrefix(w, "D") && !strings.ContainsAny(w, "XY"):
		d, err := strconv.Atoi(w[1:])
		if err != nil || d < 10 {
			return fmt.Errorf("bad aperture selection")
		}
		if _, ok := s.f.Apertures[d]; !ok {
			return fmt.Errorf("aperture D%d not defined", d)
		}
		s.cur = d
		return nil
	case strings.HasPrefix(w, "X") || strings.HasPrefix(w, "Y"):
		return s.operation(w)
	}
	return fmt.Errorf("unsupported command")
}

func (s *state) operation(w string) error {
	var op string
	p := s.pos
	for len(w) > 0 {
		k := w[0]
		j := 1
		for j < len(w) && (w[j] == '-' || w[j] == '+' || (w[j] >= '0' && w[j] <= '9')) {
			j++
		}
		switch k {
		case 'X', 'Y':
			v, err := strconv.ParseInt(w[1:j], 10, 64)
			if err != nil {
				return err
			}
			for i := s.decDigits; i < 6; i++ {
				v *= 10
			}
			for i := 6; i < s.decDigits; i++ {
				v /= 10
			}
			if k == 'X' {
				p.X = v
			} else {
				p.Y = v
			}
		case 'D':
			op = w[:j]
		default:
			return fmt.Errorf("unexpected %c", k)
		}
		w = w[j:]
	}
	switch op {
	case "D02":
		if s.inRegion {
			if err := s.closeContour(); err != nil {
				return err
			}
			s.contour = geom.Polygon{p}
		}
	case "D01":
		if !s.g01 {
			return fmt.Errorf("D01 without G01")
		}
		if s.inRegion {
			if len(s.contour) == 0 {
				return fmt.Errorf("D01 in a region before D02")
			}
			s.contour = append(s.contour, p)
		} else {
			if s.cur < 0 {
				return fmt.Errorf("draw without aperture")
			}
			s.f.Draws = append(s.f.Draws, Draw{s.cur, s.pos, p})
		}
	case "D03":
		if s.inRegion || s.cur < 0 {
			return fmt.Errorf("flash in a region or without aperture")
		}
		s.f.Flashes = append(s.f.Flashes, Flash{s.cur, p, copyAttrs(s.obj)})
	default:
		return fmt.Errorf("coordinates without D01/D02/D03")
	}
	s.pos = p
	return nil
}

func (s *state) closeContour() error {
	c := s.contour
	s.contour = nil
	if len(c) == 0 {
		return nil
	}
	if len(c) < 4 || c[0] != c[len(c)-1] {
		return fmt.Errorf("region contour %v is not closed", c)
	}
	s.f.Regions = append(s.f.Regions, Region{c[:len(c)-1], copyAttrs(s.aper, s.obj)})
	return nil
}

func (s *state) extended(w string) error {
	switch {
	case strings.HasPrefix(w, "FSLA"):
		var xi, xd, yi, yd int
		if _, err := fmt.Sscanf(w, "FSLAX%1d%1dY%1d%1d", &xi, &xd, &yi, &yd); err != nil || xi != yi || xd != yd {
			return fmt.Errorf("unsupported format")
		}
		s.intDigits, s.decDigits = xi, xd
	case w == "MOMM":
		s.mm = true
	case w == "LPD":
	case strings.HasPrefix(w, "TF."):
		k, v, _ := strings.Cut(w[2:], ",")
		s.f.FileAttrs[k] = v
	case strings.HasPrefix(w, "TA."):
		k, v, _ := strings.Cut(w[2:], ",")
		s.aper[k] = v
	case strings.HasPrefix(w, "TO."):
		k, v, _ := strings.Cut(w[2:], ",")
		s.obj[k] = v
	case w == "TD":
		s.aper, s.obj = map[string]string{}, map[string]string{}
	case strings.HasPrefix(w, "TD."):
		delete(s.aper, w[2:])
		delete(s.obj, w[2:])
	case strings.HasPrefix(w, "ADD"):
		return s.aperture(w[3:])
	default:
		return fmt.Errorf("unsupported extended command")
	}
	return nil
}

func (s *state) aperture(w string) error {
	i := 0
	for i < len(w) && w[i] >= '0' && w[i] <= '9' {
		i++
	}
	d, err := strconv.Atoi(w[:i])
	if err != nil || d < 10 {
		return fmt.Errorf("bad D-code")
	}
	if _, dup := s.f.Apertures[d]; dup {
		return fmt.Errorf("aperture D%d defined twice", d)
	}
	shape, params, ok := strings.Cut(w[i:], ",")
	if !ok {
		return fmt.Errorf("aperture without parameters")
	}
	a := Aperture{Shape: shape, Attrs: copyAttrs(s.aper)}
	ps := strings.Split(params, "X")
	switch {
	case shape == "C" && len(ps) == 1:
		a.W, err = ParseMM(ps[0])
		a.H = a.W
	case shape == "R" && len(ps) == 2:
		if a.W, err = ParseMM(ps[0]); err == nil {
			a.H, err = ParseMM(ps[1])
		}
	default:
		return fmt.Errorf("unsupported aperture")
	}
	if err != nil {
		return err
	}
	s.f.Apertures[d] = a
	return nil
}

// ParseMM reads a decimal number of millimetres ("1.25", "-0.000001") as
// exact nanometres, refusing digits below a nanometre.
func ParseMM(t string) (int64, error) {
	neg := strings.HasPrefix(t, "-")
	t = strings.TrimPrefix(strings.TrimPrefix(t, "-"), "+")
	ip, fp, _ := strings.Cut(t, ".")
	if ip == "" && fp == "" {
		return 0, fmt.Errorf("empty number")
	}
	if len(fp) > 6 {
		if strings.Trim(fp[6:], "0") != "" {
			return 0, fmt.Errorf("%q has digits below a nanometre", t)
		}
		fp = fp[:6]
	}
	fp += strings.Repeat("0", 6-len(fp))
	if ip == "" {
		ip = "0"
	}
	v, err := strconv.ParseInt(ip+fp, 10, 64)
	if err != nil {
		return 0, fmt.Errorf("%q: %w", t, err)
	}
	if neg {
		v = -v
	}
	return v, nil
}

// Hit is one drill hit.
type Hit struct {
	Tool  int
	Drill int64 // nm
	At    geom.Point
}

// Drill is a parsed Excellon file.
type Drill struct {
	Tools map[int]int64 // tool number → diameter, nm
	Hits  []Hit
	// FileAttrs are the X2 file attributes written as "; #@! TF.name,value"
	// comments; ToolAttrs the "; #@! TA.name,value" comments in force when
	// each tool was defined.
	FileAttrs map[string]string
	ToolAttrs map[int]map[string]string
}

// ReadExcellon parses the Excellon subset export writes: M48, METRIC,
// TnnC<d> tools, %, G90, G05, Tnn selections, decimal X…Y… hits, M30.
func ReadExcellon(r io.Reader) (*Drill, error) {
	d := &Drill{Tools: map[int]int64{}, FileAttrs: map[string]string{}, ToolAttrs: map[int]map[string]string{}}
	sc := bufio.NewScanner(r)
	header, metric, ended, tool := false, false, false, -1
	ta := map[string]string{}
	n := 0
	for sc.Scan() {
		n++
		line := strings.TrimSpace(sc.Text())
		bad := func(why string) error { return fmt.Errorf("gerberread: excellon line %d %q: %s", n, line, why) }
		switch {
		case strings.HasPrefix(line, "; #@! T"):
			kind, rest := line[len("; #@! T"):len("; #@! T")+1], line[len("; #@! T")+1:]
			name, value, _ := strings.Cut(rest, ",")
			switch kind {
			case "F":
				d.FileAttrs[name] = value
			case "A":
				ta[name] = value
			default:
				return nil, bad("unknown attribute comment")
			}
		case line == "" || strings.HasPrefix(line, ";"):
		case n == 1:
			if line != "M48" {
				return nil, bad("want M48 first")
			}
			header = true
		case header && (line == "METRIC,TZ" || line == "METRIC,LZ" || line == "METRIC"):
			metric = true
		case header && line == "FMAT,2":
		case header && line == "%":
			header = false
		case header && strings.HasPrefix(line, "T"):
			num, size, ok := strings.Cut(line[1:], "C")
			t, err := strconv.Atoi(num)
			if !ok || err != nil {
				return nil, bad("bad tool")
			}
			if d.Tools[t], err = ParseMM(size); err != nil {
				return nil, bad(err.Error())
			}
			d.ToolAttrs[t] = copyAttrs(ta)
		case header:
			return nil, bad("unsupported header line")
		case line == "G90" || line == "G05":
		case line == "M30":
			ended = true
		case strings.HasPrefix(line, "T"):
			t, err := strconv.Atoi(line[1:])
			if _, ok := d.Tools[t]; err != nil || !ok {
				return nil, bad("undefined tool")
			}
			tool = t
		case strings.HasPrefix(line, "X"):
			xs, ys, ok := strings.Cut(line[1:], "Y")
			if !ok || tool < 0 || !strings.Contains(xs, ".") || !strings.Contains(ys, ".") {
				return nil, bad("want a decimal X…Y… hit after a tool")
			}
			x, err1 := ParseMM(xs)
			y, err2 := ParseMM(ys)
			if err1 != nil || err2 != nil {
				return nil, bad("bad coordinate")
			}
			d.Hits = append(d.Hits, Hit{tool, d.Tools[tool], geom.Point{X: x, Y: y}})
		default:
			return nil, bad("unsupported")
		}
	}
	if !metric || !ended {
		return nil, fmt.Errorf("gerberread: excellon without METRIC or M30")
	}
	return d, sc.Err()
}
