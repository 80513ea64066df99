package synth

import (
	"fmt"
	"math/cmplx"
	"strings"

	"stubcraft/physical"
	"stubcraft/physical/units"
)

// The refusals of Build. Each carries its figures and is found with
// errors.As; Build returns it wrapped in a *DesignError that names the
// design file.

// MatchedError reports a load that is already matched: its reflection
// against z0 is below MatchedGamma, so there is nothing to build. It
// matches ErrMatched under errors.Is.
type MatchedError struct {
	Load  complex128 // the load impedance, ohm
	Z0    float64    // the reference impedance, ohm
	Gamma float64    // |Γ| of the load against Z0
}

func (e *MatchedError) Error() string {
	return fmt.Sprintf("load %s ohm on %g ohm: %v (|Γ| = %.2g), no stub is needed", units.FormatImpedance(e.Load), e.Z0, ErrMatched, e.Gamma)
}

// Is reports whether target is ErrMatched.
func (e *MatchedError) Is(target error) bool { return target == ErrMatched }

// MismatchError reports a built layout whose |S11| at f0 is above
// MismatchLimitDB; BuildInput.AcceptMismatch turns the refusal off.
type MismatchError struct {
	FreqHz          float64 // the design frequency
	S11DB           float64 // |S11| of the drawn layout at f0, dB
	ElectricalGamma float64 // |Γ| of the electrical network alone at f0
	LossDB          float64 // the network's own dissipation at f0, dB
}

// MismatchLimitDB is the |S11| at f0 above which Build refuses a layout
// (common practice, no source: −10 dB is the usual "matched" threshold).
const MismatchLimitDB = -10

func (e *MismatchError) Error() string {
	s11 := strings.Replace(fmt.Sprintf("%.1f", e.S11DB), "-", "−", 1) // a true minus sign, as the reports write it
	return fmt.Sprintf("the layout does not match: |S11| at %s is %s dB, the electrical network alone gives |Γ| = %.3f and the lines lose %.2f dB",
		units.FormatFrequency(e.FreqHz, 6), s11, e.ElectricalGamma, e.LossDB)
}

// NarrowElement is one element narrower than the fab minimum.
type NarrowElement struct {
	ID    string
	Width float64 // m
}

// FabMinimumError reports the elements narrower than the design's fab
// minimum track width ([fab] min_width).
type FabMinimumError struct {
	MinWidth float64 // m
	Narrow   []NarrowElement
}

func (e *FabMinimumError) Error() string {
	var parts []string
	for _, n := range e.Narrow {
		parts = append(parts, fmt.Sprintf("%s is %.3f mm wide, below the fab minimum %.3f mm", n.ID, n.Width*1e3, e.MinWidth*1e3))
	}
	return strings.Join(parts, "; ")
}

// MaxBoardSize is the largest board Build draws, m: beyond it no panel,
// plotter or drawing sheet makes sense, and the frequency is usually wrong.
const MaxBoardSize = 0.5

// BoardSizeError reports a layout larger than MaxBoardSize.
type BoardSizeError struct {
	Width, Height float64 // the board, m
	Max           float64 // MaxBoardSize, m
}

func (e *BoardSizeError) Error() string {
	return fmt.Sprintf("the board would be %.4g × %.4g mm, larger than %.0f mm: check the frequency and the lengths", e.Width*1e3, e.Height*1e3, e.Max*1e3)
}

// CheckFabMinimum returns a *FabMinimumError listing the elements of r
// narrower than minWidth (m), or nil when every track is wide enough.
func (r *Result) CheckFabMinimum(minWidth float64) error {
	if f := fabMinimum(r.Physical, minWidth); f != nil {
		return f
	}
	return nil
}

// fabMinimum returns the elements of ph narrower than minWidth, or nil.
func fabMinimum(ph Physical, minWidth float64) *FabMinimumError {
	var narrow []NarrowElement
	for _, e := range ph.Elements {
		if e.Width < minWidth {
			narrow = append(narrow, NarrowElement{ID: e.ID, Width: e.Width})
		}
	}
	if narrow == nil {
		return nil
	}
	return &FabMinimumError{MinWidth: minWidth, Narrow: narrow}
}

// mismatch returns the refusal of r when its |S11| at f0 is above
// MismatchLimitDB, else nil.
func (r *Result) mismatch() *MismatchError {
	db := physical.MagDB(r.S11F0)
	if db <= MismatchLimitDB {
		return nil
	}
	g := physical.Reflection(SectionsInput(r.Sections, r.LoadF0), r.Design.Z0)
	return &MismatchError{FreqHz: r.Design.Freq, S11DB: db, ElectricalGamma: cmplx.Abs(g), LossDB: r.LossF0DB}
}
