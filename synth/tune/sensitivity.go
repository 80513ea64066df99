package tune

import (
	"context"
	"fmt"
	"math"
	"math/cmplx"

	"stubcraft/physical"
)

// The steps in which sensitivities are stated: what a bench trims or a fab
// misses by (common practice, no source).
const (
	LengthStep = 0.1e-3 // m of drawn length
	WidthStep  = 10e-6  // m of drawn width
	ErStep     = 0.01   // relative εr (+1 %)
	EtchStep   = 10e-6  // m removed per edge
)

// Quantity names what a sensitivity perturbs.
type Quantity int

// The perturbed quantities.
const (
	Length Quantity = iota // an element's drawn length, +LengthStep
	Width                  // an element's drawn width, +WidthStep
	Er                     // the board's εr, +ErStep relative
	Etch                   // the board's etch, +EtchStep per edge
)

// String returns the quantity's report name.
func (q Quantity) String() string {
	switch q {
	case Length:
		return "length"
	case Width:
		return "width"
	case Er:
		return "er"
	case Etch:
		return "etch"
	}
	return fmt.Sprintf("Quantity(%d)", int(q))
}

// Step returns the size of the step in which q's sensitivity is stated
// (m, or relative for Er).
func (q Quantity) Step() float64 {
	return [...]float64{LengthStep, WidthStep, ErStep, EtchStep}[q]
}

// Sensitivity says how the match moves for one step of one quantity.
type Sensitivity struct {
	ID       string // element ID, or "board" for Er and Etch
	Quantity Quantity
	// BestMatchShift is the move of the best-match frequency per step, Hz,
	// from the derivative (a central difference a tenth of the step wide).
	BestMatchShift float64
	// S11F0 is the predicted S11 at f0 after one step, to first order:
	// S11(f0) + step·dS11/dp.
	S11F0 complex128
	// WorstInBand is, for a band match, the largest |S11| across the band
	// after one whole step (simulated at BandPoints frequencies); then
	// BestMatchShift is NaN.
	WorstInBand float64
}

// BandPoints is the number of frequencies, band edges included, at which
// the worst |S11| in a band is taken.
const BandPoints = 61

// worstInBand returns the largest |S11| of r across band.
func (r Response) worstInBand(band [2]float64) (float64, error) {
	worst := 0.0
	for i := 0; i < BandPoints; i++ {
		g, err := r.S11(band[0] + (band[1]-band[0])*float64(i)/(BandPoints-1))
		if err != nil {
			return 0, err
		}
		worst = max(worst, cmplx.Abs(g))
	}
	return worst, nil
}

// Sensitivities returns, for every element, how the best-match frequency
// and S11 at f0 move per +0.1 mm of drawn length and per +10 µm of width,
// then the board's per +1 % εr and per +10 µm etch. lo and hi bound the
// search for the best match (the build's sweep).
func (m Model) Sensitivities(ctx context.Context, lo, hi float64) ([]Sensitivity, error) {
	base, err := m.Simulate(Nominal())
	if err != nil {
		return nil, err
	}
	banded := m.Band[1] > m.Band[0]
	if !banded {
		if _, _, err := base.BestMatch(lo, hi); err != nil {
			return nil, fmt.Errorf("sensitivities: the drawn board: %w", err)
		}
	}
	s0, err := base.S11(m.F0)
	if err != nil {
		return nil, err
	}
	type probe struct {
		id  string
		q   Quantity
		sim func(h float64) (Response, error) // the board moved by h (in the quantity's SI unit)
	}
	var probes []probe
	b := m.Board
	for i := range b.Through {
		i := i
		probes = append(probes,
			probe{m.throughID(i), Length, func(h float64) (Response, error) { return m.relength(base, i, -1, h) }},
			probe{m.throughID(i), Width, func(h float64) (Response, error) { return m.rewidth(i, -1, h) }})
	}
	for k := range b.Stubs {
		k := k
		probes = append(probes,
			probe{m.stubID(k), Length, func(h float64) (Response, error) { return m.relength(base, -1, k, h) }},
			probe{m.stubID(k), Width, func(h float64) (Response, error) { return m.rewidth(-1, k, h) }})
	}
	probes = append(probes,
		probe{"board", Er, func(h float64) (Response, error) { return m.Simulate(State{ErRatio: 1 + h, LoadScale: 1}) }},
		probe{"board", Etch, func(h float64) (Response, error) { return m.Simulate(State{ErRatio: 1, Etch: h, LoadScale: 1}) }})

	out := make([]Sensitivity, 0, len(probes))
	for _, p := range probes {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		step := p.q.Step()
		h := step / 10
		up, err := p.sim(h)
		if err != nil {
			return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
		}
		down, err := p.sim(-h)
		if err != nil {
			return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
		}
		shift, worst := math.NaN(), 0.0
		if banded {
			full, err := p.sim(step)
			if err != nil {
				return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
			}
			if worst, err = full.worstInBand(m.Band); err != nil {
				return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
			}
		} else {
			fu, _, err := up.BestMatch(lo, hi)
			if err != nil {
				return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
			}
			fd, _, err := down.BestMatch(lo, hi)
			if err != nil {
				return nil, fmt.Errorf("sensitivity of %s to %s: %w", p.id, p.q, err)
			}
			shift = (fu - fd) * step / (2 * h)
		}
		su, err := up.S11(m.F0)
		if err != nil {
			return nil, err
		}
		sd, err := down.S11(m.F0)
		if err != nil {
			return nil, err
		}
		scale := step / (2 * h)
		out = append(out, Sensitivity{
			ID:             p.id,
			Quantity:       p.q,
			BestMatchShift: shift,
			S11F0:          s0 + (su-sd)*complex(scale, 0),
			WorstInBand:    worst,
		})
	}
	return out, nil
}

// relength returns base with through line i (or stub k) longer by h.
func (m Model) relength(base Response, i, k int, h float64) (Response, error) {
	b := base.Board()
	through := make([]float64, len(b.Through))
	for j, t := range b.Through {
		through[j] = t.Length
	}
	stubs := make([]float64, len(b.Stubs))
	for j, s := range b.Stubs {
		stubs[j] = s.Length
	}
	if i >= 0 {
		through[i] += h
	} else {
		stubs[k] += h
	}
	return base.WithLengths(through, stubs)
}

// rewidth returns the board with through line i (or stub k) wider by h.
func (m Model) rewidth(i, k int, h float64) (Response, error) {
	q := m
	q.Board.Through = append([]physical.Trace(nil), m.Board.Through...)
	q.Board.Stubs = append([]physical.Stub(nil), m.Board.Stubs...)
	if i >= 0 {
		q.Board.Through[i].Width += h
	} else {
		q.Board.Stubs[k].Width += h
	}
	return q.Simulate(Nominal())
}
