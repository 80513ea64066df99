package fieldsolve

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"

	"stubcraft/physical"
)

// Model is a physical.LineModel whose static impedance and effective
// permittivity come from the field solver, and whose frequency dependence is
// borrowed from the closed-form model of the equivalent bare microstrip (the
// same strip, dielectric and copper, without mask or side grounds;
// physical.NewMicrostrip: Hammerstad-Jensen 1980 statics with
// Kirschning-Jansen 1982/1984 dispersion):
//
//	Z0(f)   = Z0s · Zm(f)/Zm(0)
//	εeff(f) = εr − (εr − εs)·(εr − εm(f))/(εr − εm(0))
//
// where s marks the solver's static values and m the equivalent microstrip's:
// the microstrip's relative dispersion is applied to the solved line, and
// εeff still rises towards εr. Stripline is TEM in a homogeneous dielectric
// and has no dispersion. The conductor attenuation is the equivalent
// microstrip's scaled by Zm(f)/Z0(f) (αc ∝ Rs/(Z0·W)); the dielectric
// attenuation is (π f/c0)·(εr/√εs)·(εs−1)/(εr−1)·tanδ with the solver's εs
// (Welch & Pratt 1966), which for stripline is the exact π f √εr tanδ/c0.
// Solder-mask losses are not included. Warnings says which of these
// approximations apply. A Model is immutable and safe for concurrent use.
type Model struct {
	cs  CrossSection
	sub physical.Substrate
	res Result
	tol float64                   // the relative accuracy of Z0 the solve was asked for
	ref *physical.MicrostripModel // nil for stripline
	z0m float64                   // ref static Z0
	e0m float64                   // ref static εeff
}

// NewLineModel solves cs (through cache, which may be nil) with the default
// options and returns its line model. sub supplies the loss data
// (LossTangent, Conductivity, Roughness); its Er, Height, CopperThickness
// and mask are taken from cs, which wins where they differ.
func NewLineModel(cs CrossSection, sub physical.Substrate, cache *Cache) (physical.LineModel, error) {
	return NewLineModelOptions(cs, sub, cache, Options{})
}

// NewLineModelOptions is NewLineModel with solver options.
func NewLineModelOptions(cs CrossSection, sub physical.Substrate, cache *Cache, opt Options) (*Model, error) {
	return NewLineModelContext(context.Background(), cs, sub, cache, opt)
}

// NewLineModelContext is NewLineModelOptions with a context that cancels
// the solve.
func NewLineModelContext(ctx context.Context, cs CrossSection, sub physical.Substrate, cache *Cache, opt Options) (*Model, error) {
	res, err := cache.SolveContext(ctx, cs, opt)
	if err != nil && !errors.Is(err, ErrNotConverged) {
		return nil, err
	}
	m := &Model{cs: cs, sub: sub, res: res, tol: opt.Tolerance}
	if m.tol == 0 {
		m.tol = DefaultTolerance
	}
	m.sub.Er, m.sub.CopperThickness = cs.Er, cs.Thickness
	m.sub.MaskThickness, m.sub.MaskEr = cs.MaskThickness, cs.MaskEr
	if cs.Geometry == Stripline {
		m.sub.Height = cs.Spacing
		m.sub.MaskThickness, m.sub.MaskEr, m.sub.MaskLossTangent = 0, 0, 0
	} else {
		m.sub.Height = cs.Height
	}
	bare := m.sub
	bare.MaskThickness, bare.MaskEr, bare.MaskLossTangent = 0, 0, 0
	if cs.Geometry == Stripline {
		// Conductor loss reference only: a microstrip at half the spacing.
		bare.Height = cs.Spacing / 2
	}
	ref, rerr := physical.NewMicrostrip(cs.Width, bare)
	if rerr != nil {
		return nil, fmt.Errorf("fieldsolve: equivalent microstrip: %w", rerr)
	}
	m.ref = ref
	m.z0m, m.e0m = ref.Static()
	return m, nil
}

// Result returns the field solution behind the model.
func (m *Model) Result() Result { return m.res }

// Accuracy returns the relative accuracy of Z0 the solve was asked for
// (Options.Tolerance); Result().ErrorEstimate is what it reached.
func (m *Model) Accuracy() float64 { return m.tol }

// CrossSection returns the solved cross-section.
func (m *Model) CrossSection() CrossSection { return m.cs }

// Static returns the solver's quasi-static Z0 (ohm) and εeff.
func (m *Model) Static() (z0, epsEff float64) { return m.res.Z0, m.res.EpsEff }

// Strip returns the strip's bottom width (m) and the substrate.
func (m *Model) Strip() (width float64, sub physical.Substrate) { return m.cs.Width, m.sub }

// Name names the models used.
func (m *Model) Name() string {
	if m.cs.Geometry == Stripline {
		return "2-D field solver (finite differences), stripline (TEM, no dispersion)"
	}
	return "2-D field solver (finite differences) + Kirschning-Jansen dispersion of the equivalent microstrip"
}

// At returns the line's properties at freq (Hz); at freq ≤ 0 the static
// values with no attenuation.
func (m *Model) At(freq float64) physical.LineParams {
	zs, es := m.res.Z0, m.res.EpsEff
	er := m.cs.Er
	if !(freq > 0) {
		return physical.LineParams{Freq: freq, Z0: zs, EpsEff: es}
	}
	p := physical.LineParams{Freq: freq, Z0: zs, EpsEff: es}
	rp := m.ref.At(freq)
	if m.cs.Geometry != Stripline {
		p.Z0 = zs * rp.Z0 / m.z0m
		if d := er - m.e0m; d > 0 {
			p.EpsEff = er - (er-es)*(er-rp.EpsEff)/d
		}
	}
	p.AlphaConductor = rp.AlphaConductor * rp.Z0 / p.Z0
	fill := 1.0
	if er > 1 {
		fill = (es - 1) / (er - 1)
	}
	p.AlphaDielectric = math.Pi * freq / physical.C0 * er / math.Sqrt(es) * fill * m.sub.LossTangent
	return p
}

// Warnings lists the approximations and range limits that apply at freq.
func (m *Model) Warnings(freq float64) []string {
	var w []string
	if m.res.ErrorEstimate > DefaultTolerance {
		w = append(w, fmt.Sprintf("the field solution's estimated error is %.2g %%", 100*m.res.ErrorEstimate))
	}
	if !(freq > 0) {
		return w
	}
	for _, s := range m.ref.Warnings(freq) {
		if strings.Contains(s, "narrower than thick") {
			continue // the field solution sizes a thin strip itself
		}
		w = append(w, "equivalent microstrip: "+s)
	}
	switch m.cs.Geometry {
	case Stripline:
		w = append(w, "stripline conductor loss is approximated by a microstrip at half the plane spacing")
	case GCPW:
		w = append(w, "GCPW dispersion and conductor loss are scaled from the equivalent bare microstrip, not modelled for the side grounds")
	default:
		if m.cs.MaskThickness > 0 || m.cs.EtchAngleDeg > 0 {
			w = append(w, "dispersion is scaled from the equivalent bare rectangular microstrip (Kirschning-Jansen)")
		}
	}
	if m.cs.MaskThickness > 0 {
		w = append(w, "solder-mask dielectric loss is not included")
	}
	return w
}

var _ physical.LineModel = (*Model)(nil)

// Maker returns a physical.LineMaker that builds field-solver models of the
// given geometry (gap for GCPW, else 0) from a width and a substrate,
// sharing cache between them. Its models keep their full type, *Model.
func Maker(g Geometry, gap float64, cache *Cache) physical.LineMaker {
	return MakerContext(context.Background(), g, gap, cache)
}

// MakerContext is Maker whose solves stop once ctx is done.
func MakerContext(ctx context.Context, g Geometry, gap float64, cache *Cache) physical.LineMaker {
	return func(width float64, sub physical.Substrate) (physical.LineModel, error) {
		cs, err := FromSubstrate(g, width, gap, sub)
		if err != nil {
			return nil, err
		}
		return NewLineModelContext(ctx, cs, sub, cache, Options{})
	}
}
