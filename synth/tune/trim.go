package tune

import (
	"context"
	"fmt"
	"math"

	"gonum.org/v1/gonum/optimize"
)

// Trim is the change advised for one open stub.
type Trim struct {
	ID string
	// Cut is the length to remove from the stub's open end, m; negative
	// when the stub would have to grow, which a knife cannot do.
	Cut float64
}

// CanCut reports whether the trim is a cut (a knife can do it).
func (t Trim) CanCut() bool { return t.Cut >= 0 }

// TrimResult is what trimming the open stubs of a board in a fitted state
// achieves.
type TrimResult struct {
	Trims []Trim
	// BestMatch is the predicted best-match frequency after the trims, Hz,
	// and S11F0 the predicted S11 at f0.
	BestMatch float64
	S11F0     complex128
	// Notes say what the trims cannot do: elements that cannot be trimmed,
	// stubs that would have to grow.
	Notes []string
}

// maxCutFraction bounds a stub's cut to this fraction of its drawn length:
// a stub cut to nothing is not a trim.
const maxCutFraction = 0.8

// Trims returns the cuts of the open stubs that bring the best match of
// the board in state s back to f0. With one open stub its length is the
// only freedom and the cut is the root of f_best(cut) = f0 (bisection);
// with two or more, the cuts minimise |S11(f0)| (Nelder-Mead, gonum
// optimize). lo and hi bound the search for the best match. A board with no
// open stub returns ErrNoSolution with a note of what could be done.
func (m Model) Trims(ctx context.Context, s State, lo, hi float64) (TrimResult, error) {
	base, err := m.Simulate(s)
	if err != nil {
		return TrimResult{}, err
	}
	b := base.Board()
	var open []int
	var res TrimResult
	for k, st := range b.Stubs {
		if st.Short {
			res.Notes = append(res.Notes, fmt.Sprintf("%s ends in a via and cannot be trimmed; a small capacitor or a copper tab at its via end changes it", m.stubID(k)))
			continue
		}
		open = append(open, k)
	}
	if len(open) == 0 {
		res.Notes = append(res.Notes, "no open stub to trim: the through lines cannot be changed on the board; re-spin with the fitted εr and etch")
		return res, fmt.Errorf("trims: %w: the board has no open stub", ErrNoSolution)
	}
	through := make([]float64, len(b.Through))
	for j, t := range b.Through {
		through[j] = t.Length
	}
	stubs := make([]float64, len(b.Stubs))
	for j, st := range b.Stubs {
		stubs[j] = st.Length
	}
	cutBoard := func(cuts []float64) (Response, error) {
		ls := append([]float64(nil), stubs...)
		for i, k := range open {
			ls[k] = stubs[k] - cuts[i]
		}
		return base.WithLengths(through, ls)
	}
	var cuts []float64
	if len(open) == 1 {
		k := open[0]
		c, err := m.singleCut(ctx, cutBoard, stubs[k], lo, hi)
		if err != nil {
			return TrimResult{}, err
		}
		cuts = []float64{c}
	} else {
		cuts, err = m.multiCut(ctx, cutBoard, open, stubs)
		if err != nil {
			return TrimResult{}, err
		}
	}
	final, err := cutBoard(cuts)
	if err != nil {
		return TrimResult{}, err
	}
	res.BestMatch, _, err = final.BestMatch(lo, hi)
	if err != nil {
		return TrimResult{}, fmt.Errorf("trims: after trimming: %w", err)
	}
	if res.S11F0, err = final.S11(m.F0); err != nil {
		return TrimResult{}, err
	}
	for i, k := range open {
		t := Trim{ID: m.stubID(k), Cut: cuts[i]}
		if !t.CanCut() {
			res.Notes = append(res.Notes, fmt.Sprintf("%s would have to grow by %.2f mm: bridge its end with copper tape or a soldered tab, or re-spin with a trim allowance ([layout] trim)", t.ID, -t.Cut*1e3))
		}
		res.Trims = append(res.Trims, t)
	}
	return res, nil
}

// singleCut finds the cut of one stub (drawn length l) whose best match
// lies at f0.
func (m Model) singleCut(ctx context.Context, cutBoard func([]float64) (Response, error), l, lo, hi float64) (float64, error) {
	miss := func(c float64) (float64, bool) {
		r, err := cutBoard([]float64{c})
		if err != nil {
			return 0, false
		}
		f, _, err := r.BestMatch(lo, hi)
		if err != nil {
			return 0, false
		}
		return f - m.F0, true
	}
	// Scan outward from no cut for the nearest sign change.
	const n = 60
	lowC, highC := -0.5*l, maxCutFraction*l
	step := (highC - lowC) / n
	type pt struct {
		c, v float64
		ok   bool
	}
	v0, ok0 := miss(0)
	if ok0 && v0 == 0 {
		return 0, nil
	}
	prevUp, prevDown := pt{0, v0, ok0}, pt{0, v0, ok0}
	for i := 1; i <= n; i++ {
		if err := ctx.Err(); err != nil {
			return 0, err
		}
		for _, dir := range []float64{1, -1} {
			c := float64(i) * step * dir
			if c > highC || c < lowC {
				continue
			}
			v, ok := miss(c)
			prev := &prevUp
			if dir < 0 {
				prev = &prevDown
			}
			if ok && prev.ok && (v > 0) != (prev.v > 0) {
				return bisectCut(miss, prev.c, c, prev.v)
			}
			*prev = pt{c, v, ok}
		}
	}
	return 0, fmt.Errorf("trims: %w: no cut of the stub between %.2f and %.2f mm puts the best match at %.6g GHz", ErrNoSolution, lowC*1e3, highC*1e3, m.F0/1e9)
}

// bisectCut narrows a bracketed sign change of miss to 0.1 µm.
func bisectCut(miss func(float64) (float64, bool), a, b, va float64) (float64, error) {
	for i := 0; i < 100 && math.Abs(b-a) > 1e-7; i++ {
		c := (a + b) / 2
		v, ok := miss(c)
		if !ok {
			return 0, fmt.Errorf("trims: the model failed at a cut of %.4f mm", c*1e3)
		}
		if (v > 0) == (va > 0) {
			a, va = c, v
		} else {
			b = c
		}
	}
	return (a + b) / 2, nil
}

// multiCut minimises |S11(f0)|² over the cuts of the open stubs.
func (m Model) multiCut(ctx context.Context, cutBoard func([]float64) (Response, error), open []int, stubs []float64) ([]float64, error) {
	obj := func(x []float64) float64 {
		for i, k := range open {
			if x[i] > maxCutFraction*stubs[k] || x[i] < -0.5*stubs[k] {
				return 10
			}
		}
		r, err := cutBoard(x)
		if err != nil {
			return 10
		}
		return r.mag2(m.F0)
	}
	x0 := make([]float64, len(open))
	res, err := optimize.Minimize(optimize.Problem{Func: obj}, x0,
		&optimize.Settings{FuncEvaluations: 4000, Converger: &optimize.FunctionConverge{Absolute: 1e-16, Iterations: 100}},
		&optimize.NelderMead{SimplexSize: 0.2e-3})
	if err != nil && res == nil {
		return nil, fmt.Errorf("trims: %w", err)
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return res.X, nil
}
