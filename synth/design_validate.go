package synth

import (
	"cmp"
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"

	"stubcraft/physical/units"
)

// Line impedances a design may ask for, ohm. Printed microstrip outside
// this range is either too wide to be a line or too narrow to etch on
// ordinary boards (common practice, no source).
const (
	MinLineZ0 = 10.0
	MaxLineZ0 = 200.0
)

// designCheck collects the first fault found by Validate.
type designCheck struct {
	d   *Design
	err error
}

// fail records a fault at key path; fallback is the value in TOML syntax
// when the design was not decoded from a file (or the key was defaulted).
func (c *designCheck) fail(path, fallback string, format string, args ...any) {
	if c.err != nil {
		return
	}
	value, ok := c.d.values[path]
	if !ok {
		value = fallback
	}
	c.err = &DesignError{Source: cmp.Or(c.d.Source, "design"), Line: c.d.file.Line(path), Key: path, Value: value, Err: fmt.Errorf(format, args...)}
}

func (c *designCheck) failErr(path, fallback string, err error) {
	c.fail(path, fallback, "%w", err)
}

func designFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

func designQuote(v float64, unit string) string {
	return strconv.Quote(strconv.FormatFloat(v, 'g', -1, 64) + unit)
}

func designMM(v float64) string { return designQuote(v*1e3, "mm") }

func designOhmText(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func designPct(v float64) string { return designQuote(v*100, "%") }

// checkZ0 checks a line impedance against MinLineZ0..MaxLineZ0.
func (c *designCheck) checkZ0(path string, z float64, what string) {
	if !(z >= MinLineZ0 && z <= MaxLineZ0) {
		c.failErr(path, designOhmText(z), rangeError("the %s must be from %g to %g ohm for a printable microstrip", what, MinLineZ0, MaxLineZ0))
	}
}

// Validate checks that every value of d is usable: the frequency and
// impedances in range, exactly one of Match and Sections, a load that the
// asked-for topology can match, consistent layout, sweep and tolerances.
// Faults are *DesignError values; for a decoded design they carry the line
// of the key at fault.
func (d Design) Validate() error {
	c := &designCheck{d: &d}
	if strings.TrimSpace(d.Name) == "" {
		c.fail("name", "", "%w; for example name = \"sensor-antenna-match\"", ErrMissingKey)
	}
	if !(d.Freq > 0) || !designFinite(d.Freq) {
		c.fail("frequency", designQuote(d.Freq, "Hz"), "the design frequency must be positive, for example frequency = \"2.45GHz\"")
	} else if err := CheckFrequency(d.Freq); err != nil {
		c.failErr("frequency", designQuote(d.Freq, "Hz"), fmt.Errorf("%w; for example frequency = \"2.45GHz\"", err))
	}
	c.checkZ0("z0", d.Z0, "reference impedance")
	if strings.TrimSpace(d.Stackup) == "" {
		c.fail("stackup", "", "%w; name a preset or a stackup file", ErrMissingKey)
	}
	zText := strconv.Quote(units.FormatImpedance(d.Load.Impedance))
	if d.Load.Touchstone == "" {
		z := d.Load.Impedance
		switch {
		case cmplx.IsNaN(z) || cmplx.IsInf(z):
			c.fail("load.impedance", zText, "the load impedance must be finite")
		case real(z) < 0:
			c.fail("load.impedance", zText, "the load has a negative resistance (an active load); a passive match cannot be made for it")
		}
	}
	switch {
	case d.Match != nil && len(d.Sections) > 0:
		c.fail("match", "", "give either a [match] table or [[section]] tables, not both")
	case d.Match != nil:
		c.checkMatch(*d.Match)
	case len(d.Sections) > 0:
		for i, s := range d.Sections {
			c.checkSection(i+1, s)
		}
	default:
		c.fail("match", "", "%w: the design needs a [match] table or [[section]] tables", ErrMissingKey)
	}
	// A load past the loss rule's |Γ| limit is left to Build, which refuses
	// it with the network's dissipation unless the loss is accepted.
	if c.err == nil && d.Match != nil && d.Load.Touchstone == "" && d.Match.Topology == TopologyShuntStub && LoadGamma(d.Load.Impedance, d.Z0) <= MaxLoadGamma {
		m := *d.Match
		if _, err := SolveShuntStubZ(d.Load.Impedance, d.Z0, m.LineZ0, m.StubZ0, m.End); err != nil {
			c.failErr("load.impedance", zText, fmt.Errorf("topology %s: %w", m.Topology, err))
		}
	}
	c.checkLayout(d.Layout)
	if !(d.Fab.MinWidth >= MinFabWidth && d.Fab.MinWidth <= MaxFabWidth) {
		c.failErr("fab.min_width", designMM(d.Fab.MinWidth), rangeError("the narrowest track must be from %s to %s, for example min_width = \"0.15mm\"", formatMM(MinFabWidth), formatMM(MaxFabWidth)))
	}
	if FinishJobName(d.Fab.Finish) == "" {
		c.fail("fab.finish", strconv.Quote(d.Fab.Finish), "use one of %s", strings.Join(Finishes(), ", "))
	}
	c.checkSweep(d.Sweep, d.Freq)
	c.checkTolerance(d.Tolerance)
	if c.err == nil && d.Match != nil && d.Match.HasBand() {
		b := d.Match.Band
		if b[0] < d.Sweep.Start || b[1] > d.Sweep.Stop {
			c.fail("match.band", designBandText(b), "the band must lie inside the sweep (%.6g–%.6g GHz); widen [sweep]", d.Sweep.Start/1e9, d.Sweep.Stop/1e9)
		}
		if !(b[0] <= d.Freq && d.Freq <= b[1]) {
			c.fail("frequency", designQuote(d.Freq, "Hz"), "the design frequency must lie inside match.band (%.6g–%.6g GHz); leave frequency out to take the band's centre", b[0]/1e9, b[1]/1e9)
		}
		if d.Match.Objective == ObjectiveYield && d.Tolerance.Samples == 0 {
			c.fail("match.objective", `"yield"`, "a yield objective needs [tolerance] samples above 0")
		}
	}
	return c.err
}

func designBandText(b [2]float64) string {
	return fmt.Sprintf("[%s, %s]", designQuote(b[0], "Hz"), designQuote(b[1], "Hz"))
}

func (c *designCheck) checkMatch(m MatchSpec) {
	known := false
	for _, t := range Topologies() {
		known = known || m.Topology == t
	}
	if !known {
		c.fail("match.topology", strconv.Quote(m.Topology), "unknown topology (the topologies are: %s)", strings.Join(Topologies(), ", "))
	}
	if m.HasBand() {
		b := m.Band
		if !(b[0] > 0 && b[1] > b[0]) || !designFinite(b[1]) {
			c.fail("match.band", designBandText(b), "the band needs 0 < start < stop")
		}
	}
	if m.GoalDB != 0 && !(m.GoalDB < 0) || !designFinite(m.GoalDB) {
		c.fail("match.goal", designQuote(m.GoalDB, "dB"), "the goal is a worst |S11| in the band, below 0 dB, for example \"-15dB\"")
	}
	if m.GoalDB != 0 && !m.HasBand() {
		c.fail("match.goal", designQuote(m.GoalDB, "dB"), "a goal needs match.band, the band it holds across")
	}
	if m.Response != 0 && m.Response != Binomial && m.Response != Chebyshev {
		c.fail("match.response", "", "use binomial or chebyshev")
	}
	if m.Topology == TopologyQuarterWave && m.Response == Chebyshev && !m.HasBand() && c.d.Written("match.response") {
		c.fail("match.response", `"chebyshev"`, "a Chebyshev transformer needs match.band, the band of its ripple")
	}
	if m.Sections != 0 && (m.Sections < 1 || m.Sections > MaxTransformerSections) {
		c.fail("match.sections", strconv.Itoa(m.Sections), "a quarter-wave transformer has 1 to %d sections", MaxTransformerSections)
	}
	if sd := math.Sin(m.SpacingDeg * math.Pi / 180); m.SpacingDeg != 0 && (!(m.SpacingDeg > 0 && m.SpacingDeg <= MaxSectionDeg) || math.Abs(sd) < 0.1) {
		c.fail("match.spacing", designQuote(m.SpacingDeg/360, "wl"), "the stub spacing must be positive, at most %g°, and not near a multiple of half a wavelength (the forbidden region would cover everything)", float64(MaxSectionDeg))
	}
	if m.Objective != "" && m.Objective != ObjectiveWorst && m.Objective != ObjectiveYield {
		c.fail("match.objective", strconv.Quote(m.Objective), "use worst (the worst |S11| across the band) or yield (its 90th percentile over the [tolerance] spreads)")
	}
	if m.Objective == ObjectiveYield && !m.HasBand() {
		c.fail("match.objective", strconv.Quote(m.Objective), "a yield objective needs match.band")
	}
	if m.End != Open && m.End != Short {
		c.fail("match.stub", "", "the stub end must be open or short")
	}
	if _, err := PickSolution([]StubSolution{{}, {}}, m.Pick); err != nil {
		c.failErr("match.pick", strconv.Quote(m.Pick.String()), err)
	}
	c.checkZ0("match.stub_z0", m.StubZ0, "stub impedance")
	c.checkZ0("match.line_z0", m.LineZ0, "line impedance")
}

func (c *designCheck) checkSection(n int, s Section) {
	p := "section[" + strconv.Itoa(n) + "]."
	switch s.Kind {
	case SeriesLine:
		if s.End != 0 {
			c.fail(p+"end", strconv.Quote(s.End.String()), "only a stub has an end")
		}
	case ShuntStub:
		if s.End != Open && s.End != Short {
			c.fail(p+"end", "", "a stub's end must be open or short")
		}
	default:
		c.fail(p+"kind", "", "unknown section kind (use line or stub)")
	}
	c.checkZ0(p+"z0", s.Z0, "section impedance")
	if !(s.LengthDeg > 0) || !designFinite(s.LengthDeg) {
		c.fail(p+"length", designQuote(s.LengthDeg, "deg"), "the electrical length must be positive")
	} else if s.LengthDeg > MaxSectionDeg {
		c.fail(p+"length", designQuote(s.LengthDeg, "deg"), "the electrical length must be at most %g° (two wavelengths); a matching section is rarely longer than half a wavelength", float64(MaxSectionDeg))
	}
}

// MaxSectionDeg is the longest electrical length a section may have
// (common practice, no source: beyond two wavelengths a stub network only
// narrows the band).
const MaxSectionDeg = 720

func (c *designCheck) checkLayout(l LayoutSpec) {
	if !(l.FeedLength > 0 && l.FeedLength <= MaxFeedLength) {
		c.failErr("layout.feed_length", designMM(l.FeedLength), rangeError("the feed length must be more than 0 mm and at most %s, for example feed_length = \"5mm\"", formatMM(MaxFeedLength)))
	}
	if _, err := ParseStubSide(l.StubSide.String()); err != nil {
		c.failErr("layout.stub_side", strconv.Quote(l.StubSide.String()), err)
	}
	if !(l.Margin >= 0 && l.Margin <= MaxMargin) {
		c.failErr("layout.margin", designMM(l.Margin), rangeError("the margin must be from 0 mm to %s, for example margin = \"5mm\"", formatMM(MaxMargin)))
	}
	if !(l.Trim >= 0) || !designFinite(l.Trim) || l.Trim > 10e-3 {
		c.fail("layout.trim", designMM(l.Trim), "the trim allowance must be 0–10 mm")
	}
	if !(l.EdgeClearance >= 0) || !designFinite(l.EdgeClearance) || l.EdgeClearance > 5e-3 {
		c.fail("layout.edge_clearance", designMM(l.EdgeClearance), "the copper pull-back from the routed edge must be 0–5 mm")
	} else if l.Margin < l.EdgeClearance {
		c.fail("layout.margin", designMM(l.Margin), "the margin must be at least the edge clearance %s", designMM(l.EdgeClearance))
	}
	if _, err := ParseMaskMode(l.Mask.String()); err != nil {
		c.failErr("layout.mask", strconv.Quote(l.Mask.String()), err)
	}
	if _, err := ParsePortKind(l.Port.String()); err != nil {
		c.failErr("layout.port", strconv.Quote(l.Port.String()), err)
	}
	c.checkLaunch(l)
	c.checkFence(l)
	if l.MaxBoard != [2]float64{} {
		for i, v := range l.MaxBoard {
			if !(v >= MinBoardSide && v <= MaxBoardSide) {
				c.failErr("layout.max_board", fmt.Sprintf("[%s, %s]", designMM(l.MaxBoard[0]), designMM(l.MaxBoard[1])), rangeError("the board %s must be from %s to %s, for example max_board = [\"60mm\", \"40mm\"] (width, height)",
					[2]string{"width (first value)", "height (second value)"}[i], formatMM(MinBoardSide), formatMM(MaxBoardSide)))
			}
		}
	}
	if !(l.ViaDrill >= MinViaDrill && l.ViaDrill <= MaxViaDrill) {
		c.failErr("layout.via_drill", designMM(l.ViaDrill), rangeError("the via drill must be from %s to %s, for example via_drill = \"0.3mm\"", formatMM(MinViaDrill), formatMM(MaxViaDrill)))
	}
	if !(l.ViaPad > l.ViaDrill && l.ViaPad <= MaxViaPad) {
		c.failErr("layout.via_pad", designMM(l.ViaPad), rangeError("the via pad must be larger than the drill (%gmm) and at most %s, for example via_pad = \"%gmm\"", l.ViaDrill*1e3, formatMM(MaxViaPad), 2*l.ViaDrill*1e3))
	}
	if l.ViaPitch != 0 && !(l.ViaPitch >= l.ViaPad && l.ViaPitch <= MaxViaPitch) {
		c.failErr("layout.via_pitch", designMM(l.ViaPitch), rangeError("the via row pitch must be at least the via pad (%gmm) and at most %s, for example via_pitch = \"%gmm\" (leave it out for twice the pad)", l.ViaPad*1e3, formatMM(MaxViaPitch), 2*l.ViaPad*1e3))
	}
}

// MaxSweepPoints is the most points a sweep may have.
const MaxSweepPoints = 100001

func (c *designCheck) checkSweep(s SweepSpec, f0 float64) {
	if s.Span != 0 && !(s.Span > 0 && s.Span < 1) {
		c.fail("sweep.span", designPct(s.Span), "the span must be more than 0%% and less than 100%%")
	}
	if !(s.Start > 0) || !(s.Stop > s.Start) || !designFinite(s.Stop) {
		c.fail("sweep.start", designQuote(s.Start, "Hz"), "the sweep needs 0 < start < stop (stop = %gHz)", s.Stop)
	}
	if !(s.Start >= MinSweepFrequency) {
		c.failErr("sweep.start", designQuote(s.Start, "Hz"), rangeError("the sweep must start at %s or above", FormatHz(MinSweepFrequency)))
	}
	if !(s.Stop <= MaxSweepFrequency) {
		c.failErr("sweep.stop", designQuote(s.Stop, "Hz"), rangeError("the sweep must stop at %s or below", FormatHz(MaxSweepFrequency)))
	}
	if !(s.Start <= f0 && f0 <= s.Stop) {
		c.fail("sweep.start", designQuote(s.Start, "Hz"), "the sweep must include the design frequency %gHz (stop = %gHz)", f0, s.Stop)
	}
	if s.Points < 2 || s.Points > MaxSweepPoints {
		c.fail("sweep.points", strconv.Itoa(s.Points), "the sweep needs 2 to %d points", MaxSweepPoints)
	}
}

// MaxToleranceSamples is the most boards a tolerance analysis may draw.
const MaxToleranceSamples = 1000000

func (c *designCheck) checkTolerance(t ToleranceSpec) {
	if t.Samples < 0 || t.Samples > MaxToleranceSamples {
		c.fail("tolerance.samples", strconv.Itoa(t.Samples), "use 0 (no analysis) to %d samples", MaxToleranceSamples)
	}
	for _, f := range []struct {
		key string
		v   float64
	}{{"tolerance.er", t.Er}, {"tolerance.thickness", t.Thickness}, {"tolerance.copper", t.Copper}} {
		if !(f.v >= 0 && f.v < 1) {
			c.fail(f.key, designPct(f.v), "a spread must be from 0%% to less than 100%%")
		}
	}
	if !(t.Width >= 0 && t.Width <= MaxEtchSpread) {
		c.failErr("tolerance.width", designMM(t.Width), rangeError("the width spread must be from 0 mm to %s, for example width = \"0.02mm\"", formatMM(MaxEtchSpread)))
	}
}

// Electrical returns the design's electrical network at the design
// frequency, from the load toward the source, and notes for the report.
// zLoadAtF0 is the load impedance at d.Freq (Load.Impedance, or the
// Touchstone data read by the caller). For a [match] design it is the
// picked single-shunt-stub solution as a series line then a shunt stub;
// for [[section]] tables it is those sections, and a note gives the match
// they reach. An already matched load is an error wrapping ErrMatched.
func (d Design) Electrical(zLoadAtF0 complex128) ([]Section, []string, error) {
	return d.ElectricalWith(zLoadAtF0, ElectricalOptions{})
}

// ElectricalOptions carry what the electrical solution needs to know of
// the layout.
type ElectricalOptions struct {
	// FeedDeg is the electrical length of the load-side feed at f0: a
	// double stub puts its first stub no nearer the load than this, so
	// the feed need not move it half a wavelength away.
	FeedDeg float64
}

// loadNote says how badly the load at f0 is matched to z0.
func (d Design) loadNote(zl complex128) string {
	g, _, rl := LoadReport(zl, d.Z0)
	return fmt.Sprintf("load %s ohm at %s on %g ohm: |Γ| = %.4f, return loss %.2f dB",
		units.FormatImpedance(zl), units.FormatFrequency(d.Freq, 6), d.Z0, g, rl)
}

// ElectricalWith is Electrical with the layout's options.
func (d Design) ElectricalWith(zLoadAtF0 complex128, opt ElectricalOptions) ([]Section, []string, error) {
	if err := d.Validate(); err != nil {
		return nil, nil, err
	}
	notes := []string{d.loadNote(zLoadAtF0)}
	if d.Match != nil {
		m := d.Match.Resolved()
		secs, more, err := d.matchSections(m, m.Topology, m.End, zLoadAtF0, opt)
		return secs, append(notes, more...), err
	}
	if cmplx.IsNaN(zLoadAtF0) || cmplx.IsInf(zLoadAtF0) || real(zLoadAtF0) < 0 {
		return nil, nil, fmt.Errorf("%s: load %s ohm: %w", d.Source, units.FormatImpedance(zLoadAtF0), ErrBadLoad)
	}
	secs := append([]Section(nil), d.Sections...)
	for i, s := range secs {
		if s.LengthDeg > 180 {
			notes = append(notes, fmt.Sprintf("section %d is %.1f° long: more than half a wavelength, which only narrows the bandwidth", i+1, s.LengthDeg))
		}
	}
	zin := SectionsInput(secs, zLoadAtF0)
	gin, _, rlin := LoadReport(zin, d.Z0)
	if cmplx.IsInf(zin) {
		gin, rlin = 1, 0
	}
	notes = append(notes, fmt.Sprintf("the given sections present %s ohm at the input: |Γ| = %.4f, return loss %.2f dB",
		units.FormatImpedance(zin), gin, rlin))
	return secs, notes, nil
}

// matchSections solves one topology (not auto) at f0 for the load zl.
func (d Design) matchSections(m MatchSpec, topology string, end StubEnd, zl complex128, opt ElectricalOptions) ([]Section, []string, error) {
	var notes []string
	switch topology {
	case TopologyShuntStub:
		sols, err := SolveShuntStubZ(zl, d.Z0, m.LineZ0, m.StubZ0, end)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", d.Source, err)
		}
		s, err := PickSolution(sols, m.Pick)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: match.pick: %w", d.Source, err)
		}
		n := 1
		for i := range sols {
			if sols[i] == s {
				n = i + 1
				break
			}
		}
		notes = append(notes, fmt.Sprintf("shunt-stub solution %d of %d (pick %s): line %.4f λ (%.2f°) of %g ohm, %s stub %.4f λ (%.2f°) of %g ohm",
			n, len(sols), m.Pick, s.LineWL(), s.LineDeg, s.LineZ0, s.End, s.StubWL(), s.StubDeg, s.StubZ0))
		return []Section{
			{Kind: SeriesLine, Z0: s.LineZ0, LengthDeg: s.LineDeg},
			{Kind: ShuntStub, End: s.End, Z0: s.StubZ0, LengthDeg: s.StubDeg},
		}, notes, nil
	case TopologyDoubleStub:
		sols, note, err := d.doubleStubSolutions(m, end, zl, opt)
		if note != "" {
			notes = append(notes, note)
		}
		if err != nil {
			return nil, nil, err
		}
		s := doubleStubPick(sols, m.Pick)
		notes = append(notes, fmt.Sprintf("double-stub match: %.2f° of %g ohm line, %s stub %.2f°, %.2f° spacing, %s stub %.2f° (of %d solutions)",
			s.LineDeg, d.Z0, end, s.Stub1Deg, s.SpacingDeg, end, s.Stub2Deg, len(sols)))
		return s.Sections(), notes, nil
	case TopologyQuarterWave:
		frac := 0.0
		if m.HasBand() {
			frac = (m.Band[1] - m.Band[0]) / d.Freq
		}
		resp := m.Response
		if resp == Chebyshev && frac == 0 {
			resp = Binomial
			notes = append(notes, "no match.band: the transformer is binomial (a Chebyshev one needs the band of its ripple)")
		}
		secs, more, err := QuarterWaveMatch(zl, d.Z0, m.Sections, resp, frac)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", d.Source, err)
		}
		for i, s := range secs {
			if s.Z0 < MinLineZ0 || s.Z0 > MaxLineZ0 {
				return nil, nil, d.KeyError("match.sections", fmt.Errorf("transformer section %d needs %.4g ohm, outside the printable %g–%g ohm: use more sections or another topology", i+1, s.Z0, MinLineZ0, MaxLineZ0))
			}
		}
		return secs, append(notes, more...), nil
	}
	return nil, nil, d.KeyError("match.topology", fmt.Errorf("topology %q has no single electrical solution", topology))
}

// SectionsInput returns the impedance looking into lossless sections (from
// the load toward the source) that end in zLoad, at the frequency their
// electrical lengths are given for. An open circuit comes back as complex
// infinity.
func SectionsInput(secs []Section, zLoad complex128) complex128 {
	z := zLoad
	for _, s := range secs {
		th := s.LengthDeg * math.Pi / 180
		cs, sn := complex(math.Cos(th), 0), complex(0, math.Sin(th))
		zc := complex(s.Z0, 0)
		switch s.Kind {
		case SeriesLine:
			if cmplx.IsInf(z) {
				z = zc * cs / sn
				continue
			}
			z = zc * (z*cs + zc*sn) / (zc*cs + z*sn)
		case ShuntStub:
			// The stub's input impedance as num/den, so that the
			// parallel combination stays finite at 90° and 180°.
			num, den := zc*cs, sn // open: Zs·cos/(j sin)
			if s.End == Short {
				num, den = zc*sn, cs // short: j Zs sin/cos
			}
			if cmplx.IsInf(z) {
				z = num / den
				continue
			}
			z = z * num / (z*den + num)
		}
	}
	return z
}
