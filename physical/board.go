package physical

import (
	"fmt"
	"math"
	"math/cmplx"
	"slices"
)

// LineMaker makes the line model of a strip of the given width on sub.
// NewMicrostrip is one (wrapped by MicrostripMaker); a field-solver model
// is another.
type LineMaker func(width float64, sub Substrate) (LineModel, error)

// MicrostripMaker is the LineMaker of the closed-form microstrip models.
func MicrostripMaker(width float64, sub Substrate) (LineModel, error) {
	return NewMicrostrip(width, sub)
}

// Trace is one straight piece of the through line, as drawn.
type Trace struct {
	Width  float64 // m
	Length float64 // drawn, along the centre line, m
}

// Stub is a shunt stub as drawn, hung on the through line at the boundary
// after Through[At] (the load side of the tee is Through[At]).
type Stub struct {
	At     int
	Width  float64 // m
	Length float64 // drawn, from the wider through arm's edge to the open end or to the via centre, m
	Short  bool    // ends in a via to ground
}

// Via is the plated hole that grounds a shorted stub.
type Via struct {
	Drill float64 // finished hole diameter, m
	Pad   float64 // pad diameter, m
	// Pitch is the largest centre spacing of the row of vias that ends a
	// stub wider than ViaRowMinWidthRatio pads (see ViaRow), m; 0 keeps
	// one via whatever the width.
	Pitch float64
}

// Board is a matching network as drawn in copper: the through line from
// the load port (Through[0]) to the source port, the stubs on it and the
// via used by shorted stubs. Every tee, width step, open end and via is modelled from
// this geometry at each frequency, so simulating a Board checks the
// corrections rather than assuming them.
type Board struct {
	Sub     Substrate
	Through []Trace
	Stubs   []Stub
	Via     Via
}

// Validate reports a board that cannot be simulated.
func (b Board) Validate() error {
	if len(b.Through) == 0 {
		return fmt.Errorf("board: no through line")
	}
	for i, t := range b.Through {
		if !(t.Width > 0) || !(t.Length >= 0) {
			return fmt.Errorf("board: through line %d: width %g m, length %g m: sizes must be positive", i, t.Width, t.Length)
		}
	}
	seen := map[int]bool{}
	for i, s := range b.Stubs {
		if s.At < 0 || s.At >= len(b.Through)-1 {
			return fmt.Errorf("board: stub %d sits after through line %d, which has no line beyond it", i, s.At)
		}
		if seen[s.At] {
			return fmt.Errorf("board: two stubs at the tee after through line %d", s.At)
		}
		seen[s.At] = true
		if !(s.Width > 0) || !(s.Length > 0) {
			return fmt.Errorf("board: stub %d: width %g m, length %g m: sizes must be positive", i, s.Width, s.Length)
		}
		if s.Short && !(b.Via.Drill > 0) {
			return fmt.Errorf("board: stub %d is shorted but the via drill is %g m", i, b.Via.Drill)
		}
	}
	return nil
}

// Sim is a Board ready to be simulated: its line models are made once.
type Sim struct {
	board   Board
	through []LineModel
	stubs   []LineModel
	stubAt  []int // stub index at each through boundary, or -1
	// steps holds the width step at the boundary after each through
	// line (side A the source side, Through[i+1]; side B Through[i]), or
	// nil where there is a stub or no change of width.
	steps []*StepParams
}

// NewSim makes the line models of b with mk.
func NewSim(b Board, mk LineMaker) (*Sim, error) {
	if err := b.Validate(); err != nil {
		return nil, err
	}
	// The Sim keeps its own copy: the caller may go on editing b.
	b.Through = append([]Trace(nil), b.Through...)
	b.Stubs = append([]Stub(nil), b.Stubs...)
	s := &Sim{board: b, stubAt: make([]int, len(b.Through))}
	models := map[float64]LineModel{}
	get := func(w float64) (LineModel, error) {
		if m, ok := models[w]; ok {
			return m, nil
		}
		m, err := mk(w, b.Sub)
		if err != nil {
			return nil, err
		}
		models[w] = m
		return m, nil
	}
	for _, t := range b.Through {
		m, err := get(t.Width)
		if err != nil {
			return nil, err
		}
		s.through = append(s.through, m)
	}
	for i := range s.stubAt {
		s.stubAt[i] = -1
	}
	for i, st := range b.Stubs {
		m, err := get(st.Width)
		if err != nil {
			return nil, err
		}
		s.stubs = append(s.stubs, m)
		s.stubAt[st.At] = i
	}
	s.steps = make([]*StepParams, len(b.Through))
	for i := 0; i+1 < len(b.Through); i++ {
		if s.stubAt[i] >= 0 || b.Through[i].Width == b.Through[i+1].Width {
			continue
		}
		p := s.Step(i).Params()
		s.steps[i] = &p
	}
	return s, nil
}

// Step returns the width step at the boundary after Through[i], side A
// the source side (Through[i+1]), with the lines' static properties.
func (s *Sim) Step(i int) Step {
	za, ea := s.through[i+1].Static()
	zb, eb := s.through[i].Static()
	return Step{WA: s.board.Through[i+1].Width, WB: s.board.Through[i].Width,
		ZA: za, ZB: zb, EpsEffA: ea, EpsEffB: eb, H: s.board.Sub.Height, Er: s.board.Sub.Er}
}

// Relength returns the simulation of the same board with other drawn
// lengths (through lines, then stubs, in Board order). The line models
// depend only on the widths and the substrate, so they are shared.
func (s *Sim) Relength(through, stubs []float64) (*Sim, error) {
	if len(through) != len(s.board.Through) || len(stubs) != len(s.board.Stubs) {
		return nil, fmt.Errorf("board: %d through and %d stub lengths for %d and %d lines", len(through), len(stubs), len(s.board.Through), len(s.board.Stubs))
	}
	b := s.board
	b.Through = append([]Trace(nil), b.Through...)
	b.Stubs = append([]Stub(nil), b.Stubs...)
	for i, l := range through {
		b.Through[i].Length = l
	}
	for i, l := range stubs {
		b.Stubs[i].Length = l
	}
	if err := b.Validate(); err != nil {
		return nil, err
	}
	q := *s
	q.board = b
	return &q, nil
}

// ThroughModel returns the line model of Through[i].
func (s *Sim) ThroughModel(i int) LineModel { return s.through[i] }

// Board returns the board being simulated.
func (s *Sim) Board() Board { return s.board }

// junction is the state of one tee at one frequency.
type junction struct {
	tee TeeParams
	y   complex128 // stub admittance at its reference plane, S
}

// ABCD returns the chain matrix of the network from the source port
// (port 1) to the load port (port 2) at freq.
func (s *Sim) ABCD(freq float64) ABCD {
	n := len(s.board.Through)
	params := make([]LineParams, n)
	for i, m := range s.through {
		params[i] = m.At(freq)
	}
	stubs := make([]LineParams, len(s.stubs))
	for k, m := range s.stubs {
		stubs[k] = m.At(freq)
	}
	return s.abcd(freq, params, stubs, make([]junction, n))
}

// lineSweeper is a line model that evaluates many frequencies at once,
// each exactly as At would (MicrostripModel.Sweep).
type lineSweeper interface {
	Sweep(freqs []float64, dst []LineParams) []LineParams
}

// sweepBlock is the number of frequencies whose line properties ABCDSweep
// holds at once: enough for the batched line sweep, little memory.
const sweepBlock = 1024

// ABCDSweep appends the chain matrix at each of freqs to dst and returns
// the extended slice; element len(dst)+i equals ABCD(freqs[i]) bit for
// bit. Each line's properties are evaluated a block of frequencies at a
// time, with the model's batched sweep where it has one; a long sweep is
// split into one range of frequencies per processor.
func (s *Sim) ABCDSweep(freqs []float64, dst []ABCD) []ABCD {
	n0 := len(dst)
	dst = slices.Grow(dst, len(freqs))[:n0+len(freqs)]
	out := dst[n0:]
	inRanges(len(freqs), func(lo, hi int) { s.abcdRange(freqs[lo:hi], out[lo:hi]) })
	return dst
}

// abcdRange writes ABCD(freqs[i]) into out[i], a block of frequencies at
// a time.
func (s *Sim) abcdRange(freqs []float64, out []ABCD) {
	n := len(s.board.Through)
	through := make([][]LineParams, len(s.through))
	stubs := make([][]LineParams, len(s.stubs))
	params := make([]LineParams, n)
	stubAt := make([]LineParams, len(s.stubs))
	juncs := make([]junction, n)
	eval := func(m LineModel, block []float64, buf []LineParams) []LineParams {
		if sw, ok := m.(lineSweeper); ok {
			return sw.Sweep(block, buf[:0])
		}
		buf = buf[:0]
		for _, f := range block {
			buf = append(buf, m.At(f))
		}
		return buf
	}
	for lo := 0; lo < len(freqs); lo += sweepBlock {
		block := freqs[lo:min(lo+sweepBlock, len(freqs))]
		for i, m := range s.through {
			through[i] = eval(m, block, through[i])
		}
		for k, m := range s.stubs {
			stubs[k] = eval(m, block, stubs[k])
		}
		for j, f := range block {
			for i := range params {
				params[i] = through[i][j]
			}
			for k := range stubAt {
				stubAt[k] = stubs[k][j]
			}
			out[lo+j] = s.abcd(f, params, stubAt, juncs)
		}
	}
}

// abcd is ABCD at freq with the through lines' properties params and the
// stubs' stubs; juncs is scratch space of len(params), filled where a
// stub hangs (s.stubAt[i] >= 0).
func (s *Sim) abcd(freq float64, params, stubs []LineParams, juncs []junction) ABCD {
	b := s.board
	n := len(b.Through)
	// Tee at the boundary after Through[i], if any.
	for i := 0; i < n; i++ {
		k := s.stubAt[i]
		if k < 0 {
			continue
		}
		juncs[i] = s.junction(k, params[i], stubs[k], freq)
	}
	m := Identity()
	for i := n - 1; i >= 0; i-- {
		l := b.Through[i].Length
		if s.stubAt[i] >= 0 {
			l -= juncs[i].tee.ThroughShift
		}
		if i > 0 && s.stubAt[i-1] >= 0 {
			l -= juncs[i-1].tee.ThroughShift
		}
		if i < n-1 && s.stubAt[i] >= 0 {
			m = m.Mul(juncs[i].tee.ThroughWithStub(juncs[i].y))
		}
		if s.steps[i] != nil {
			m = m.Mul(s.steps[i].ABCD(freq))
		}
		m = m.Mul(Line(params[i], l))
	}
	return m
}

// junction evaluates stub k, whose line has properties sp, hung on a
// through line with properties tp.
func (s *Sim) junction(k int, tp, sp LineParams, freq float64) junction {
	st := s.board.Stubs[k]
	// The stub is drawn from the edge of the wider through arm.
	throughW := max(s.board.Through[st.At].Width, s.board.Through[st.At+1].Width)
	tee := Tee{ThroughZ0: tp.Z0, ThroughEpsEff: tp.EpsEff, StubZ0: sp.Z0, StubEpsEff: sp.EpsEff,
		H: s.board.Sub.Height, Er: s.board.Sub.Er}.At(freq)
	// The stub line runs from its reference plane to its end.
	l := st.Length + throughW/2 - tee.StubShift
	var z complex128
	if st.Short {
		z = InputImpedanceOfLine(sp, l, s.board.ViaToGround(freq, st.Width))
	} else {
		dl, _ := OpenEndExtension(st.Width, s.board.Sub.Height, s.board.Sub.Er, sp.EpsEff, freq)
		z = InputImpedanceOfLine(sp, l+dl, cmplx.Inf())
	}
	return junction{tee: tee, y: 1 / z}
}

// ViaToGround returns the impedance from the via pad at the end of a
// shorted stub of width stubWidth to ground at freq. A stub no wider than
// ViaRowMinWidthRatio pads ends in one Goldfarb-Pucel via in parallel
// with the capacitance of the part of its round pad that overhangs the
// stub (the rest is the stub's own copper, already in its line model). A
// wider one ends in the row ViaRow gives, modelled by ViaRowImpedance
// (mutual inductance included); its pads lie within the stub, so there is
// no overhang.
func (b Board) ViaToGround(freq, stubWidth float64) complex128 {
	sub := b.Sub
	if n, sp := ViaRow(stubWidth, b.Via.Drill, b.Via.Pad, b.Via.Pitch); n > 1 {
		return ViaRowImpedance(n, sp, sub.Height, b.Via.Drill/2, sub.conductivity(), freq)
	}
	zv := ViaImpedance(sub.Height, b.Via.Drill/2, sub.conductivity(), freq)
	c := 0.0
	if r, a := b.Via.Pad/2, stubWidth/2; r > a {
		// The circle's area outside the band |x| ≤ a (exact geometry).
		inBand := 2 * (a*math.Sqrt(r*r-a*a) + r*r*math.Asin(a/r))
		overhang := math.Pi*r*r - inBand
		c = Eps0 * sub.Er * overhang / sub.Height
	}
	return ViaToGround(zv, c, freq)
}

// InputReflection returns S11 at the source port at freq with zLoad on the
// load port, referred to z0.
func (s *Sim) InputReflection(freq float64, zLoad complex128, z0 float64) complex128 {
	return Reflection(s.ABCD(freq).InputImpedance(zLoad), z0)
}

// Loss returns the dissipated fraction of the available power, in dB,
// when the network is driven from z0 and terminated in zLoad: the mismatch
// is excluded, so it is the network's own loss.
func (s *Sim) Loss(freq float64, zLoad complex128, z0 float64) float64 {
	a := s.ABCD(freq)
	zin := a.InputImpedance(zLoad)
	// Power into the input per unit |V1|²: Re(1/zin); power into the load:
	// |V2|²·Re(1/zLoad) with V2 = V1·zLoad/(A·zLoad + B).
	v2 := zLoad / (a[0][0]*zLoad + a[0][1])
	pin := real(1 / zin)
	pl := cmplx.Abs(v2) * cmplx.Abs(v2) * real(1/zLoad)
	if pin <= 0 || pl <= 0 {
		return math.Inf(1)
	}
	return 10 * math.Log10(pin/pl)
}
