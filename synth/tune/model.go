package tune

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"stubcraft/physical"
)

// Model is a drawn matching network with everything needed to simulate it.
type Model struct {
	Board physical.Board
	// Lines makes the line model of a strip on a (perturbed) substrate. For
	// a field-solver stackup it is the tolerance maker (closed forms scaled
	// to the solver's nominal lines), so perturbed boards cost no new solves.
	Lines physical.LineMaker
	// Load returns the load impedance at a frequency, ohm.
	Load func(freq float64) (complex128, error)
	Z0   float64 // reference impedance, ohm
	F0   float64 // design frequency, Hz
	// Band, when set (Hz, start and stop), makes the design a band match:
	// its sensitivities state the worst |S11| in the band after a step
	// instead of a best-match frequency, which a flat broadband response
	// does not have.
	Band [2]float64
	// ThroughIDs and StubIDs name Board.Through and Board.Stubs in order,
	// for reports (the IDs of the build's elements).
	ThroughIDs, StubIDs []string
}

// State is how an etched board differs from the drawing.
type State struct {
	// ErRatio is the board's εr over the design's (1 = as designed).
	ErRatio float64
	// Etch is the copper removed from each edge of every line, m: positive
	// when over-etched (lines narrower than drawn), negative when
	// under-etched. A line's width changes by −2·Etch.
	Etch float64
	// LoadScale multiplies the load impedance (1 = the load as given).
	LoadScale float64
}

// Nominal returns the state of the board exactly as drawn.
func Nominal() State { return State{ErRatio: 1, LoadScale: 1} }

// ErrNoSolution is returned when a search finds nothing in its range (no
// best match inside the band, no trim that reaches f0).
var ErrNoSolution = errors.New("no solution in range")

// board returns m.Board perturbed by s.
func (m Model) board(s State) (physical.Board, error) {
	b := m.Board
	b.Sub.Er = m.Board.Sub.Er * s.ErRatio
	if !(b.Sub.Er >= 1) {
		return b, fmt.Errorf("εr ratio %.4g gives εr %.4g, below 1", s.ErRatio, b.Sub.Er)
	}
	b.Through = append([]physical.Trace(nil), m.Board.Through...)
	b.Stubs = append([]physical.Stub(nil), m.Board.Stubs...)
	for i := range b.Through {
		b.Through[i].Width -= 2 * s.Etch
		if !(b.Through[i].Width > 0) {
			return b, fmt.Errorf("etch %.3g µm per edge leaves line %s %.3g µm wide", s.Etch*1e6, m.throughID(i), b.Through[i].Width*1e6)
		}
	}
	for i := range b.Stubs {
		b.Stubs[i].Width -= 2 * s.Etch
		if !(b.Stubs[i].Width > 0) {
			return b, fmt.Errorf("etch %.3g µm per edge leaves stub %s %.3g µm wide", s.Etch*1e6, m.stubID(i), b.Stubs[i].Width*1e6)
		}
	}
	return b, nil
}

func (m Model) throughID(i int) string {
	if i < len(m.ThroughIDs) {
		return m.ThroughIDs[i]
	}
	return fmt.Sprintf("through %d", i+1)
}

func (m Model) stubID(i int) string {
	if i < len(m.StubIDs) {
		return m.StubIDs[i]
	}
	return fmt.Sprintf("stub %d", i+1)
}

// Response is the simulated input reflection of one board state.
type Response struct {
	sim       *physical.Sim
	model     Model
	loadScale float64
}

// Simulate makes the response of the board in state s.
func (m Model) Simulate(s State) (Response, error) {
	if s.LoadScale == 0 {
		s.LoadScale = 1
	}
	b, err := m.board(s)
	if err != nil {
		return Response{}, err
	}
	sim, err := physical.NewSim(b, m.Lines)
	if err != nil {
		return Response{}, err
	}
	return Response{sim: sim, model: m, loadScale: s.LoadScale}, nil
}

// WithLengths returns the response of the same board with other drawn
// lengths (through lines, then stubs, in Board order).
func (r Response) WithLengths(through, stubs []float64) (Response, error) {
	sim, err := r.sim.Relength(through, stubs)
	if err != nil {
		return Response{}, err
	}
	r.sim = sim
	return r, nil
}

// Board returns the simulated board.
func (r Response) Board() physical.Board { return r.sim.Board() }

// S11 returns the input reflection at freq, referred to the model's Z0.
func (r Response) S11(freq float64) (complex128, error) {
	zl, err := r.model.Load(freq)
	if err != nil {
		return 0, err
	}
	g := r.sim.InputReflection(freq, zl*complex(r.loadScale, 0), r.model.Z0)
	if cmplx.IsNaN(g) || cmplx.IsInf(g) {
		return 0, fmt.Errorf("the model gives no finite S11 at %.6g GHz", freq/1e9)
	}
	return g, nil
}

// mag2 returns |S11|² at freq, or +Inf when the model cannot say.
func (r Response) mag2(freq float64) float64 {
	g, err := r.S11(freq)
	if err != nil {
		return math.Inf(1)
	}
	return real(g)*real(g) + imag(g)*imag(g)
}
