package synth

import (
	"fmt"
	"math"
	"math/cmplx"

	"stubcraft/physical"
)

// Role says what an element of the physical network does.
type Role string

// The roles of physical elements.
const (
	RoleFeed Role = "feed" // a line to a port, drawn to a fixed length
	RoleLine Role = "line" // a series line of the electrical solution
	RoleStub Role = "stub" // a shunt stub of the electrical solution
)

// Element is one line of the physical network, with what was done to its
// length. Lengths are metres; the corrections are signed changes, and the
// copper drawn is their sum (Drawn), never stored, so every change of length
// is a change of one named part.
//
// A through element's drawn length runs along the centre line between its
// ends (a port edge or a tee's centre line); a stub's runs from the through
// line's edge to its open end, or to the centre of its via.
type Element struct {
	ID            string
	Role          Role
	End           StubEnd // stubs only
	Z0            float64 // target characteristic impedance at f0, ohm
	Width         float64 // m
	ElectricalDeg float64 // at f0, of the electrical solution
	LineLength    float64 // the length of this width with ElectricalDeg at f0, m
	OpenEnd       float64 // open-end shortening (Kirschning-Jansen-Koster), m
	Tee           float64 // T-junction compensation (physical.Tee: Hammerstad, fitted to full-wave), m
	Via           float64 // via-inductance compensation (Goldfarb-Pucel), m
	Step          float64 // width-step compensation (Gupta, Garg, Bahl and Bhartia), m
	Recentre      float64 // change made by the re-centring optimiser, m
	Trim          float64 // change from the design length after trimming at the bench, m; zero in a build
	At            int     // stubs: index of the through element on the load side of the tee
	Params        physical.LineParams
	Model         string
	// Bend is the mitred-bend compensation, m: a stub the layout bends is
	// drawn this much longer (bends × physical.MitredBendShortening, a fit
	// to the full-wave record testdata/discontinuities/bend.tsv), because
	// each bend acts that much shorter than its centre-line length. It is
	// copper, so part of Drawn, but no electrical length: ModelLength
	// leaves it out. Set by Build once the layout is drawn; zero before.
	Bend float64
	// FullwaveMap is the full-wave mapping of build --fullwave-centre: the
	// circuit model's length of this element less its drawn length (less
	// Bend), m, fitted so that the circuit model reproduces a full-wave
	// solve of the drawn copper. It is never drawn; zero in a plain build.
	FullwaveMap float64
}

// Drawn returns the length of copper drawn, m, along its centre line:
//
//	LineLength + OpenEnd + Tee + Via + Step + Recentre + Trim + Bend.
func (e Element) Drawn() float64 {
	return e.LineLength + e.OpenEnd + e.Tee + e.Via + e.Step + e.Recentre + e.Trim + e.Bend
}

// ModelLength returns the length the circuit model gives the element, m:
// the drawn length less what its mitred bends take off (Bend), plus the
// full-wave mapping.
func (e Element) ModelLength() float64 { return e.Drawn() - e.Bend + e.FullwaveMap }

// Physical is the corrected physical network of an electrical solution.
type Physical struct {
	Elements []Element // through elements from the load port to the source port, then the stubs
	Board    physical.Board
	Notes    []string // what was moved or decided, for the report
	Warnings []string // validity and fab warnings
}

// PhysicalOptions are the layout choices that change the electrical network.
type PhysicalOptions struct {
	FeedLength float64 // drawn length of the feed line at each port, m
	Via        physical.Via
}

// ThroughIndex returns the indices into Elements of the through elements, in order from the load port.
func (p Physical) ThroughIndex() []int {
	var idx []int
	for i, e := range p.Elements {
		if e.Role != RoleStub {
			idx = append(idx, i)
		}
	}
	return idx
}

// ToPhysical turns an electrical network, listed from the load toward the
// source, into drawn copper on sub at f0: a width for each impedance, a
// length for each electrical length with dispersion, and the corrections
// for the T-junctions (Hammerstad 1981, fitted to the full-wave tee sweep), open ends (Kirschning, Jansen and
// Koster 1981) and vias (Goldfarb and Pucel 1991).
//
// A feed line of opt.FeedLength joins each port. On the load side the feed
// is the first part of the first line section (same width), so the
// electrical network is unchanged; a correction that would make a length
// negative moves that element to the next solution, half a guided
// wavelength longer, and says so in Notes.
func ToPhysical(sections []Section, f0, z0 float64, sub physical.Substrate, mk physical.LineMaker, opt PhysicalOptions) (Physical, error) {
	if len(sections) == 0 {
		return Physical{}, fmt.Errorf("the electrical network has no sections")
	}
	if sections[0].Kind != SeriesLine {
		return Physical{}, fmt.Errorf("the electrical network starts with a stub at the load port; start it with a line from the load (the load-side feed of %.3g mm is carved from that line)", opt.FeedLength*1e3)
	}
	for i := 1; i < len(sections); i++ {
		if sections[i].Kind == ShuntStub && sections[i-1].Kind == ShuntStub {
			return Physical{}, fmt.Errorf("sections %d and %d are two stubs at one point; one stub per tee is supported", i, i+1)
		}
	}
	var p Physical
	widths := map[float64]WidthResult{} // one synthesis per impedance
	line := func(z float64) (WidthResult, error) {
		if r, ok := widths[z]; ok {
			return r, nil
		}
		r, err := WidthWith(mk, sub, z, f0)
		if err != nil {
			return WidthResult{}, fmt.Errorf("%.4g Ω line: %w", z, err)
		}
		for _, w := range r.Warnings {
			p.warn(fmt.Sprintf("%.4g Ω line: %s", z, w))
		}
		widths[z] = r
		return r, nil
	}
	element := func(id string, role Role, z, deg float64) (Element, error) {
		r, err := line(z)
		if err != nil {
			return Element{}, err
		}
		l := PhysicalLength(r.Params, deg)
		return Element{ID: id, Role: role, Z0: z, Width: r.Width, ElectricalDeg: deg,
			LineLength: l, Params: r.Params, Model: r.Model.Name()}, nil
	}

	// Through elements and stubs, in order from the load.
	var through, stubs []Element
	first, err := line(sections[0].Z0)
	if err != nil {
		return Physical{}, err
	}
	feedDeg := ElectricalDegrees(first.Params, opt.FeedLength)
	if opt.FeedLength > 0 {
		e, err := element("feed-load", RoleFeed, sections[0].Z0, feedDeg)
		if err != nil {
			return Physical{}, err
		}
		through = append(through, e)
	}
	nLine, nStub := 0, 0
	for i, s := range sections {
		switch s.Kind {
		case SeriesLine:
			nLine++
			deg := s.LengthDeg
			if i == 0 && opt.FeedLength > 0 {
				deg -= feedDeg
				if deg < 0 {
					n := halfWaves(-deg, 180)
					deg += n * 180
					p.note(fmt.Sprintf("line%d: the load-side feed (%.3g mm, %.2f°) is longer than the line's %.2f°; the line moved %s",
						nLine, opt.FeedLength*1e3, feedDeg, s.LengthDeg, moved(n, "180° longer", "%.0f° longer", n*180)))
				}
			}
			e, err := element(fmt.Sprintf("line%d", nLine), RoleLine, s.Z0, deg)
			if err != nil {
				return Physical{}, err
			}
			through = append(through, e)
		case ShuntStub:
			nStub++
			e, err := element(fmt.Sprintf("stub%d", nStub), RoleStub, s.Z0, s.LengthDeg)
			if err != nil {
				return Physical{}, err
			}
			e.End = s.End
			e.At = len(through) - 1
			stubs = append(stubs, e)
		default:
			return Physical{}, fmt.Errorf("section %d: unknown kind %v", i+1, s.Kind)
		}
	}
	feed, err := element("feed-source", RoleFeed, z0, 0)
	if err != nil {
		return Physical{}, err
	}
	feed.LineLength = opt.FeedLength
	feed.ElectricalDeg = ElectricalDegrees(feed.Params, opt.FeedLength)
	through = append(through, feed)
	if feed.Drawn() <= 0 && stubs != nil && stubs[len(stubs)-1].At == len(through)-2 {
		return Physical{}, fmt.Errorf("the last stub sits at the source port: give the source-side feed a length")
	}

	// Corrections at each tee.
	for k := range stubs {
		st := &stubs[k]
		arm := &through[st.At]
		tee := physical.Tee{ThroughZ0: arm.Params.Z0, ThroughEpsEff: arm.Params.EpsEff,
			StubZ0: st.Params.Z0, StubEpsEff: st.Params.EpsEff, H: sub.Height, Er: sub.Er}.At(f0)
		for _, w := range tee.Warnings {
			p.warn(st.ID + " tee: " + w)
		}
		if other := through[st.At+1].Params.Z0; math.Abs(other-arm.Params.Z0) > 0.1*arm.Params.Z0 {
			p.warn(fmt.Sprintf("%s tee: its through arms differ (%.1f Ω and %.1f Ω); the symmetric T-junction model takes the load-side arm", st.ID, arm.Params.Z0, other))
		}
		if tee.N <= 0 {
			return Physical{}, fmt.Errorf("%s: the T-junction model fails at %.4g GHz (n² ≤ 0): the lines are too wide for this frequency", st.ID, f0/1e9)
		}
		// Through arms on both sides of the tee are measured to its centre
		// line; the model's arms begin ThroughShift from it.
		for _, j := range []int{st.At, st.At + 1} {
			if through[j].Role == RoleLine {
				through[j].Tee += tee.ThroughShift
			}
		}
		edge := max(arm.Width, through[st.At+1].Width)
		if err := p.correctStub(st, tee, edge, sub, f0, opt.Via); err != nil {
			return Physical{}, err
		}
	}
	p.compensateSteps(through, stubs, widths, sub)
	for j := range through {
		e := &through[j]
		if e.Role == RoleLine && e.Drawn() < 0 {
			half := e.Params.GuidedWavelength() / 2
			n := halfWaves(-e.Drawn(), half)
			e.ElectricalDeg += n * 180
			e.LineLength += n * half
			p.note(fmt.Sprintf("%s: the tee correction made the line negative; it moved %s", e.ID, moved(n, fmt.Sprintf("half a guided wavelength (%.3f mm) longer", half*1e3), "%.0f half guided wavelengths (%.3f mm) longer", n, n*half*1e3)))
		}
	}

	if err := p.makeRoom(through, stubs); err != nil {
		return Physical{}, err
	}

	p.Elements = append(through, stubs...)
	p.Board = p.board(sub, opt.Via)
	return p, nil
}

// compensateSteps shortens the through lines on each side of a change of
// width where no stub sits by the step's equivalent lengths
// (physical.StepParams.Lengths). A feed keeps its drawn length: its share
// goes to the line on the other side, as the same phase.
func (p *Physical) compensateSteps(through, stubs []Element, widths map[float64]WidthResult, sub physical.Substrate) {
	hasStub := map[int]bool{}
	for _, st := range stubs {
		hasStub[st.At] = true
	}
	for j := 0; j+1 < len(through); j++ {
		b, a := &through[j], &through[j+1] // side B toward the load, side A toward the source
		if hasStub[j] || a.Width == b.Width {
			continue
		}
		wa, wb := widths[a.Z0], widths[b.Z0]
		step := physical.Step{WA: a.Width, WB: b.Width, ZA: wa.Z0Static, ZB: wb.Z0Static,
			EpsEffA: wa.EpsEffStatic, EpsEffB: wb.EpsEffStatic, H: sub.Height, Er: sub.Er}
		sp := step.Params()
		for _, w := range sp.Warnings {
			p.warn(fmt.Sprintf("%s/%s: %s", b.ID, a.ID, w))
		}
		dA, dB := sp.Lengths(step)
		switch {
		case a.Role == RoleFeed && b.Role == RoleFeed:
		case a.Role == RoleFeed:
			dB += dA * a.Params.Beta() / b.Params.Beta()
			dA = 0
		case b.Role == RoleFeed:
			dA += dB * b.Params.Beta() / a.Params.Beta()
			dB = 0
		}
		a.Step -= dA
		b.Step -= dB
	}
}

// halfWaves returns the number of periods (half wavelengths, of size
// period) to add to a length short by deficit > 0 so that it is no longer
// negative: ⌈deficit/period⌉, at least 1. It is computed in one step, so a
// deficit of many wavelengths costs no loop.
func halfWaves(deficit, period float64) float64 {
	return max(1, math.Ceil(deficit/period))
}

// moved ends a note on a length moved by n half wavelengths: "to the next
// solution, " and one for n = 1, otherwise "n solutions on, " and many
// formatted with args.
func moved(n float64, one, many string, args ...any) string {
	if n == 1 {
		return "to the next solution, " + one
	}
	return fmt.Sprintf("%.0f solutions on, ", n) + fmt.Sprintf(many, args...)
}

// minLengths returns, per element, the shortest drawn length the layout
// allows: through lines must hold half of each stub at their ends, stubs
// must be longer than zero (shorted ones longer than half the via pad).
func (p Physical) minLengths() []float64 {
	m := make([]float64, len(p.Elements))
	through := p.ThroughIndex()
	for i, e := range p.Elements {
		if e.Role != RoleStub {
			continue
		}
		m[through[e.At]] += e.Width / 2
		m[through[e.At+1]] += e.Width / 2
		if e.End == Short {
			m[i] = p.Board.Via.Pad / 2
		} else {
			m[i] = 1e-6
		}
	}
	return m
}

// makeRoom makes every through element long enough for the stubs at its
// ends: a stub's copper must lie on the two lines that meet at its tee.
// The first line borrows the length it lacks from the load-side feed, which
// is the same line (the electrical network is unchanged); another line moves
// to its next solution, half a guided wavelength longer; a feed that is too
// short is an error.
func (p *Physical) makeRoom(through, stubs []Element) error {
	need := make([]float64, len(through))
	for _, st := range stubs {
		need[st.At] += st.Width / 2
		need[st.At+1] += st.Width / 2
	}
	for j := range through {
		e := &through[j]
		short := need[j] - e.Drawn()
		if short <= 0 {
			continue
		}
		if j == 1 && through[0].Role == RoleFeed && through[0].Width == e.Width && through[0].Drawn()-short >= PortPadLength {
			feed := &through[0]
			feed.LineLength -= short
			feed.ElectricalDeg = ElectricalDegrees(feed.Params, feed.LineLength)
			e.LineLength += short
			e.ElectricalDeg = ElectricalDegrees(e.Params, e.LineLength)
			p.note(fmt.Sprintf("%s: lengthened by %.3f mm taken from the load-side feed (the same line) to leave room for the stub", e.ID, short*1e3))
			continue
		}
		if e.Role != RoleLine {
			return fmt.Errorf("%s is %.3f mm long, less than the %.3f mm the stubs at its ends need: lengthen [layout] feed_length", e.ID, e.Drawn()*1e3, need[j]*1e3)
		}
		half := e.Params.GuidedWavelength() / 2
		n := halfWaves(need[j]-e.Drawn(), half)
		e.ElectricalDeg += n * 180
		e.LineLength += n * half
		p.note(fmt.Sprintf("%s: too short for the stubs at its ends; it moved %s", e.ID, moved(n, fmt.Sprintf("half a guided wavelength (%.3f mm) longer", half*1e3), "%.0f half guided wavelengths (%.3f mm) longer", n, n*half*1e3)))
	}
	return nil
}

// correctStub sets the open-end, tee and via corrections of a stub hung on
// a through line of width throughW (the wider of the two arms, whose edge
// the stub's drawn length starts from). The tee's susceptance and turns ratio
// are compensated exactly at f0: the stub is given the length whose
// admittance, seen through the transformer (n²·y) and beside jB, equals
// the ideal stub's.
func (p *Physical) correctStub(st *Element, tee physical.TeeParams, throughW float64, sub physical.Substrate, f0 float64, via physical.Via) error {
	beta := st.Params.Beta()
	zs := st.Z0
	theta := st.ElectricalDeg * math.Pi / 180
	var bIdeal float64 // the ideal stub's susceptance, S
	if st.End == Short {
		bIdeal = -1 / (zs * math.Tan(theta))
	} else {
		bIdeal = math.Tan(theta) / zs
	}
	// At the node the stub appears as n²·y beside jB.
	bRef := (bIdeal - tee.B) / (tee.N * tee.N)
	// The angle a stub with an ideal end needs to present jbRef.
	var thetaRef float64
	if st.End == Short {
		thetaRef = math.Atan(-1 / (zs * bRef))
	} else {
		thetaRef = math.Atan(zs * bRef)
	}
	// Take the branch nearest to the ideal solution.
	thetaRef += math.Pi * math.Round((theta-thetaRef)/math.Pi)
	// The end's own reactance as a length.
	var endLen float64
	if st.End == Short {
		zv := (physical.Board{Sub: sub, Via: via}).ViaToGround(f0, st.Width)
		// A load jX at the end of a shorted stub acts as extra line of
		// length atan(X/Zs)/β.
		endLen = math.Atan2(imag(zv), zs) / beta
		if cmplx.Abs(zv) == 0 {
			endLen = 0
		}
		st.Via = -endLen
		if w := physical.ViaRangeWarning(sub.Height, via.Drill/2); w != "" {
			p.warn(st.ID + ": " + w)
		}
		if n, sp := physical.ViaRow(st.Width, via.Drill, via.Pad, via.Pitch); n > 1 {
			p.warn(st.ID + ": " + physical.ViaRowWarning(n))
			p.note(fmt.Sprintf("%s: %.3g mm wide, ends in a row of %d vias at %.3g mm; modelled in parallel with their mutual inductance (filament form after Grover), %.3g pH against %.3g pH for one via",
				st.ID, st.Width*1e3, n, sp*1e3, imag(zv)/(2*math.Pi*f0)*1e12, physical.ViaInductance(sub.Height, via.Drill/2)*1e12))
		}
	} else {
		dl, warns := physical.OpenEndExtension(st.Width, sub.Height, sub.Er, st.Params.EpsEff, f0)
		for _, w := range warns {
			p.warn(st.ID + ": " + w)
		}
		endLen = dl
		st.OpenEnd = -dl
	}
	lRef := thetaRef/beta - endLen
	drawn := lRef + tee.StubShift - throughW/2
	minLen := 0.0
	if st.End == Short {
		minLen = via.Pad / 2
	}
	if drawn <= minLen {
		half := math.Pi / beta
		// The stub must end up strictly longer than minLen.
		n := math.Floor((minLen-drawn)/half) + 1
		drawn += n * half
		st.ElectricalDeg += n * 180
		st.LineLength += n * half
		p.note(fmt.Sprintf("%s: the corrections left too little stub; it moved %s", st.ID, moved(n, fmt.Sprintf("half a guided wavelength (%.3f mm) longer", half*1e3), "%.0f half guided wavelengths (%.3f mm) longer", n, n*half*1e3)))
	}
	// The tee takes what is left, so that Drawn is drawn.
	st.Tee = drawn - st.LineLength - st.OpenEnd - st.Via
	return nil
}

// board returns the drawn network as a physical.Board, each element at its
// model length (the drawn length unless a full-wave mapping is set).
func (p Physical) board(sub physical.Substrate, via physical.Via) physical.Board {
	b := physical.Board{Sub: sub, Via: via}
	for _, e := range p.Elements {
		if e.Role == RoleStub {
			b.Stubs = append(b.Stubs, physical.Stub{At: e.At, Width: e.Width, Length: e.ModelLength(), Short: e.End == Short})
			continue
		}
		b.Through = append(b.Through, physical.Trace{Width: e.Width, Length: e.ModelLength()})
	}
	return b
}

// Uncorrected returns the board an engineer would draw without the
// discontinuity corrections: every element at its LineLength, stubs
// measured from the through line's edge.
func (p Physical) Uncorrected() physical.Board {
	q := p
	q.Elements = append([]Element(nil), p.Elements...)
	for i := range q.Elements {
		e := &q.Elements[i]
		e.OpenEnd, e.Tee, e.Via, e.Step, e.Recentre, e.Trim, e.Bend = 0, 0, 0, 0, 0, 0, 0
	}
	return q.board(p.Board.Sub, p.Board.Via)
}

func (p *Physical) note(s string) { p.Notes = append(p.Notes, s) }
func (p *Physical) warn(s string) {
	for _, w := range p.Warnings {
		if w == s {
			return
		}
	}
	p.Warnings = append(p.Warnings, s)
}
