package synth

import (
	"context"
	"fmt"
	"math"

	"stubcraft/physical"
	"stubcraft/physical/fieldsolve"
	"stubcraft/physical/units"
	"stubcraft/stackups"
)

// SolverCache keeps the field solver's answers for the length of one run,
// so that a width searched for once is not solved again.
type SolverCache = fieldsolve.Cache

// NewSolverCache returns an empty cache for one run.
func NewSolverCache() *SolverCache { return fieldsolve.NewCache() }

// NewSolverCacheDir returns a cache that also keeps solved cross-sections
// in dir across runs (fieldsolve.NewCacheDir); "" keeps them in memory only.
func NewSolverCacheDir(dir string) *SolverCache { return fieldsolve.NewCacheDir(dir) }

// UsesFieldSolver reports whether lines on st need the field solver: the
// closed forms know neither solder mask nor grounded coplanar lines.
func UsesFieldSolver(st stackups.Stackup) bool {
	return st.Mask != nil || st.Line == stackups.GCPW
}

// LineMakerFor returns the line model for strips on st: the closed-form
// microstrip models for a bare microstrip, else the 2-D field solver
// (results kept in cache), whose solves stop once ctx is done.
func LineMakerFor(ctx context.Context, st stackups.Stackup, cache *SolverCache) physical.LineMaker {
	if !UsesFieldSolver(st) {
		return physical.MicrostripMaker
	}
	cs := CrossSectionOf(st)
	solve := fieldsolve.MakerContext(ctx, cs.Geometry, cs.Gap, cache)
	// Proportions outside what the solver is meant for are refused before
	// a grid is built (CheckCrossSection).
	return func(width float64, sub physical.Substrate) (physical.LineModel, error) {
		c, err := fieldsolve.FromSubstrate(cs.Geometry, width, cs.Gap, sub)
		if err != nil {
			return nil, err
		}
		if err := CheckCrossSection(c); err != nil {
			return nil, err
		}
		return solve(width, sub)
	}
}

// CrossSectionOf returns the field solver's cross-section of a line on st,
// without its width: geometry (microstrip or grounded coplanar), gap,
// dielectric, copper and mask.
func CrossSectionOf(st stackups.Stackup) fieldsolve.CrossSection {
	sub := st.Substrate()
	cs := fieldsolve.CrossSection{Geometry: fieldsolve.Microstrip, Er: sub.Er, Height: sub.Height, Thickness: sub.CopperThickness,
		MaskThickness: sub.MaskThickness, MaskEr: sub.MaskEr}
	if st.Line == stackups.GCPW {
		cs.Geometry, cs.Gap = fieldsolve.GCPW, st.Gap
	}
	return cs
}

// SubstrateAt returns the cross-section data of st for a design at f0:
// when the stackup gives the frequency its εr and loss tangent were
// measured at, they are moved to f0 by the wideband Debye model
// (physical.WidebandDebye), and a note says so.
func SubstrateAt(st stackups.Stackup, f0 float64) (physical.Substrate, []string) {
	sub := st.Substrate()
	fr := st.Dielectric.ErFrequency
	if fr <= 0 || fr == f0 {
		return sub, nil
	}
	at := sub.At(fr, f0)
	return at, []string{fmt.Sprintf("dielectric: εr %.3f and tanδ %.4f at %s become %.3f and %.4f at %s (wideband Debye model, Djordjevic-Sarkar 2001)",
		sub.Er, sub.LossTangent, units.FormatFrequency(fr, 4), at.Er, at.LossTangent, units.FormatFrequency(f0, 6))}
}

// ToleranceMaker returns the line maker the tolerance analysis uses for
// board b. For the closed-form models it is mk itself. For the field solver
// a thousand boards of solves would take minutes, so each perturbed line is
// the closed-form microstrip on the perturbed board, scaled by the ratios of
// the solver model's Z0, εeff and attenuations at f0 to the closed form's on
// the nominal board at the nearest nominal width: the closed forms carry the
// sensitivities, the solver the values. A sample with no spread is the
// nominal board at f0.
func ToleranceMaker(b physical.Board, mk physical.LineMaker, solver bool, f0 float64) (physical.LineMaker, error) {
	if !solver {
		return mk, nil
	}
	var widths []float64
	ratios := map[float64]lineRatio{}
	add := func(w float64) error {
		if _, ok := ratios[w]; ok {
			return nil
		}
		m, err := mk(w, b.Sub)
		if err != nil {
			return err
		}
		cf, err := physical.NewMicrostrip(w, b.Sub)
		if err != nil {
			return err
		}
		pm, pc := m.At(f0), cf.At(f0)
		ratios[w] = lineRatio{z: pm.Z0 / pc.Z0, e: pm.EpsEff / pc.EpsEff,
			ac: ratioOr1(pm.AlphaConductor, pc.AlphaConductor), ad: ratioOr1(pm.AlphaDielectric, pc.AlphaDielectric)}
		widths = append(widths, w)
		return nil
	}
	for _, t := range b.Through {
		if err := add(t.Width); err != nil {
			return nil, err
		}
	}
	for _, s := range b.Stubs {
		if err := add(s.Width); err != nil {
			return nil, err
		}
	}
	return func(w float64, sub physical.Substrate) (physical.LineModel, error) {
		nearest := widths[0]
		for _, n := range widths[1:] {
			if math.Abs(n-w) < math.Abs(nearest-w) {
				nearest = n
			}
		}
		cf, err := physical.NewMicrostrip(w, sub)
		if err != nil {
			return nil, err
		}
		return scaledLine{cf, ratios[nearest]}, nil
	}, nil
}

// lineRatio scales a closed-form line to another model's values.
type lineRatio struct{ z, e, ac, ad float64 }

func ratioOr1(a, b float64) float64 {
	if b == 0 {
		return 1
	}
	return a / b
}

// scaledLine is a closed-form line whose impedance, effective permittivity
// and attenuations are scaled by fixed ratios.
type scaledLine struct {
	*physical.MicrostripModel
	k lineRatio
}

func (s scaledLine) At(freq float64) physical.LineParams {
	p := s.MicrostripModel.At(freq)
	p.Z0 *= s.k.z
	p.EpsEff *= s.k.e
	p.AlphaConductor *= s.k.ac
	p.AlphaDielectric *= s.k.ad
	return p
}

func (s scaledLine) Static() (z0, epsEff float64) {
	z, e := s.MicrostripModel.Static()
	return z * s.k.z, e * s.k.e
}

func (s scaledLine) Name() string {
	return "closed form scaled to the field solver (tolerance analysis)"
}
