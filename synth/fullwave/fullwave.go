// Package fullwave checks a build's drawn copper with the three-dimensional
// FDTD solver of physical/fdtd: it turns the layout into the solver's
// description of the board, runs the solve, attaches the load by network
// math and compares the result with the circuit model's.
//
// What the full-wave model leaves out, and says so in Report.Notes: the
// copper's conductivity (it is a perfect conductor; its thickness, the
// stackup's, is drawn where the mesh's substrate cells are no taller, as
// on thin boards, and on a grounded-coplanar board, a solder mask then
// following it over its top and down its walls; elsewhere it is a
// zero-thickness sheet), the solder mask's
// openings (a mask over the RF copper is one layer over the whole top
// face, port pads included, as the circuit model's masked lines are), and
// the board's outline (the substrate and
// the ground plane run on into the absorbing layers on every side).
package fullwave

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"stubcraft/physical"

	"stubcraft/physical/fdtd"
	"stubcraft/stackups"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// ErrNoPort is returned when no copper meets a port's board edge.
var ErrNoPort = errors.New("fullwave: no copper at a port")

// Structure returns the full-wave description of res's drawn layout, swept
// at freqs. Port 1 is the source port (the board's right edge), port 2
// the load port (x = 0), as in network.s2p.
func Structure(res *synth.Result, freqs []float64) (fdtd.Structure, error) {
	l := res.Layout
	// The laminate at f0, as the circuit model sees it: a stackup that
	// gives εr and tanδ at another frequency (er_frequency) has them moved
	// to f0 by the same wideband Debye model.
	sub, _ := synth.SubstrateAt(res.Stackup, res.Design.Freq)
	bmin, bmax := l.Board.Bounds()
	s := fdtd.Structure{
		Er: sub.Er, TanD: sub.LossTangent, F0: res.Design.Freq,
		H: sub.Height, BoardMinX: bmin.X, BoardMaxX: bmax.X,
		Freqs: freqs, Zref: res.Design.Z0, Mask: maskOf(res), CopperThickness: sub.CopperThickness,
	}
	for _, n := range l.Copper {
		s.Copper = append(s.Copper, polygon(n.Outline))
	}
	for _, p := range l.Pads {
		if p.Round {
			s.Copper = append(s.Copper, disc(p.Center, p.W))
			continue
		}
		s.Copper = append(s.Copper, fdtd.RectPolygon(p.Center.X-p.W/2, p.Center.Y-p.H/2, p.Center.X-p.W/2+p.W, p.Center.Y-p.H/2+p.H))
	}
	for _, v := range l.Vias {
		s.Vias = append(s.Vias, fdtd.Via{Center: fdtd.Point{X: v.Center.X, Y: v.Center.Y}, Diameter: v.Drill, Stitch: v.Net == geom.NetGround})
	}
	if len(l.Copper) == 0 {
		return s, fmt.Errorf("%w: the layout has no copper", ErrNoPort)
	}
	rf := l.Copper[0].Outline
	for i, q := range []struct {
		side fdtd.Side
		at   geom.Point
	}{{fdtd.Right, l.Marks.Ports[1]}, {fdtd.Left, l.Marks.Ports[0]}} {
		x := q.at.X + 1000 // 1 µm inside the board
		if q.side == fdtd.Right {
			x = q.at.X - 1000
		}
		lo, hi, ok := span(rf, x, q.at.Y)
		if !ok {
			return s, fmt.Errorf("%w: nothing at x = %.3f mm, y = %.3f mm", ErrNoPort, float64(q.at.X)/1e6, float64(q.at.Y)/1e6)
		}
		s.Ports[i] = fdtd.Port{Side: q.side, Y: (lo + hi) / 2, Width: hi - lo}
	}
	coplanarPorts(&s, res, bmin, bmax)
	return s, s.Validate()
}

// coplanarPorts makes a grounded-coplanar board's ports coplanar, as its
// lines were sized: each port line runs on into the absorbing layer with
// side grounds at the stackup's gap, as wide as the pour beside the strip
// allows on both sides, held to the plane (fdtd.Port.Gap). The pour keeps
// the edge clearance from the board edge; the side grounds are drawn on
// over that strip of bare substrate to the edge, so that the line is
// coplanar right up to the reference plane, where the circuit model takes
// it. A microstrip board is left as it is.
func coplanarPorts(s *fdtd.Structure, res *synth.Result, bmin, bmax geom.Point) {
	st := res.Stackup
	if st.Line != stackups.GCPW || !(st.Gap > 0) {
		return
	}
	gap := geom.Nanometres(st.Gap)
	clr := geom.Nanometres(res.Design.Layout.EdgeClearance)
	for i := range s.Ports {
		p := &s.Ports[i]
		lo := p.Y - p.Width/2 - gap - (bmin.Y + clr)
		hi := bmax.Y - clr - (p.Y - p.Width/2 + p.Width + gap)
		gw := min(lo, hi)
		if gw <= 0 {
			continue
		}
		p.Gap, p.GroundWidth = gap, gw
		x0, x1 := bmin.X, bmin.X+clr+1000 // 1 µm into the pour
		if p.Side == fdtd.Right {
			x0, x1 = bmax.X-clr-1000, bmax.X
		}
		ya := p.Y - p.Width/2 - gap
		yb := p.Y - p.Width/2 + p.Width + gap
		s.Copper = append(s.Copper, fdtd.RectPolygon(x0, ya-gw, x1, ya), fdtd.RectPolygon(x0, yb, x1, yb+gw))
	}
}

// maskOf returns the solder mask over res's RF copper: the stackup's
// [mask] when the layout covers the copper with it (layout.mask cover, or
// auto on a masked stackup), the lines having been sized under it; none
// when the copper is bare (open), however the rest of the board is masked.
func maskOf(res *synth.Result) fdtd.Mask {
	m := res.Stackup.Mask
	if m == nil || res.Design.Layout.Mask != synth.MaskCover {
		return fdtd.Mask{}
	}
	return fdtd.Mask{Thickness: m.Thickness, Er: m.Er, TanD: m.LossTangent}
}

func polygon(p geom.Polygon) fdtd.Polygon {
	out := make(fdtd.Polygon, len(p))
	for i, q := range p {
		out[i] = fdtd.Point{X: q.X, Y: q.Y}
	}
	return out
}

// disc returns a 16-sided polygon of diameter d round c.
func disc(c geom.Point, d int64) fdtd.Polygon {
	out := make(fdtd.Polygon, 16)
	for i := range out {
		a := 2 * math.Pi * float64(i) / 16
		out[i] = fdtd.Point{X: c.X + int64(math.Round(float64(d)/2*math.Cos(a))), Y: c.Y + int64(math.Round(float64(d)/2*math.Sin(a)))}
	}
	return out
}

// span returns the y extent of p's interior on the vertical line at x that
// contains y (the strip that reaches the port).
func span(p geom.Polygon, x, y int64) (lo, hi int64, ok bool) {
	var ys []int64
	n := len(p)
	for i := 0; i < n; i++ {
		a, b := p[i], p[(i+1)%n]
		if (a.X <= x) == (b.X <= x) {
			continue
		}
		t := float64(x-a.X) / float64(b.X-a.X)
		ys = append(ys, a.Y+int64(math.Round(t*float64(b.Y-a.Y))))
	}
	sort.Slice(ys, func(i, j int) bool { return ys[i] < ys[j] })
	for i := 0; i+1 < len(ys); i += 2 {
		if ys[i] <= y && y <= ys[i+1] {
			return ys[i], ys[i+1], true
		}
	}
	return 0, 0, false
}

// Report is a full-wave check of one build.
type Report struct {
	Freqs          []float64          // Hz
	Network        [][2][2]complex128 // full-wave S of the network alone, port 1 the source side, referred to Zref
	Circuit        [][2][2]complex128 // the circuit model's, at the same frequencies
	Matched        []complex128       // full-wave S11 with the load attached
	CircuitMatched []complex128       // the circuit model's S11 with the load
	Zref           float64            // ohm
	MatchedF0      complex128         // full-wave S11 with the load at f0, interpolated as S11DBF0
	CellUpdates    int64              // cells × steps summed over the solver's runs (Verify only)
	Summary
}

// Summary is the figures of a full-wave check, as `verify --json` prints
// them.
type Summary struct {
	S11DBF0            float64  `json:"s11_db_f0"`
	BestMatchHz        float64  `json:"best_match_hz"`
	CircuitS11DBF0     float64  `json:"circuit_s11_db_f0"`
	CircuitBestMatchHz float64  `json:"circuit_best_match_hz"`
	MaxSDifference     float64  `json:"max_s_difference"`
	Cells              int      `json:"cells"`
	Steps              int      `json:"steps"`
	Seconds            float64  `json:"seconds"`
	Notes              []string `json:"notes"`
}

// Verify runs the full-wave solve of res's drawn copper at the build's
// sweep frequencies and compares it with the circuit model (see Compare).
func Verify(ctx context.Context, res *synth.Result, o fdtd.Options) (*Report, error) {
	if err := checkSweep(res); err != nil {
		return nil, err
	}
	s, err := Structure(res, res.Sweep.Freqs)
	if err != nil {
		return nil, err
	}
	r, err := fdtd.Solve(ctx, s, o)
	if err != nil {
		return nil, err
	}
	drawn := 0.0
	if g := r.Grid; g != nil && g.KT > g.KH {
		drawn = g.Z[g.KT] - g.Z[g.KH]
	}
	rep, err := compare(res, r.S, drawn)
	if err != nil {
		return nil, err
	}
	rep.Zref, rep.Cells, rep.Steps, rep.Seconds = r.Zref, r.Cells, r.Steps, r.Seconds
	rep.CellUpdates = r.CellUpdates
	rep.Notes = append(append([]string(nil), r.Warnings...), rep.Notes...)
	return rep, nil
}

// checkSweep refuses a sweep that cannot locate a best match round f0.
func checkSweep(res *synth.Result) error {
	f0, freqs := res.Design.Freq, res.Sweep.Freqs
	if len(freqs) < 3 || f0 < freqs[0] || f0 > freqs[len(freqs)-1] {
		return fmt.Errorf("fullwave: the sweep (%d points) must hold f0 = %.6g GHz and at least 3 points", len(freqs), f0/1e9)
	}
	return nil
}

// Compare returns the check of res's drawn copper from its full-wave
// network S-matrix s at res.Sweep.Freqs (port 1 the source side, referred
// to the design's z0): the load attached by network math, and the figures
// beside the circuit model's. The full-wave |S11| at f0 is interpolated
// (complex, linear) between the two sweep points round f0; the circuit's
// is the build's own value at f0. The run's figures (cells, steps,
// seconds) are left to the caller.
func Compare(res *synth.Result, s [][2][2]complex128) (*Report, error) {
	return compare(res, s, 0)
}

// compare is Compare for a solve that drew the copper drawn thick (m; 0
// for a sheet), which its notes say.
func compare(res *synth.Result, s [][2][2]complex128, drawn float64) (*Report, error) {
	if err := checkSweep(res); err != nil {
		return nil, err
	}
	f0 := res.Design.Freq
	sw := res.Sweep
	freqs := append([]float64(nil), sw.Freqs...)
	if len(s) != len(freqs) {
		return nil, fmt.Errorf("fullwave: %d S-matrices for %d sweep frequencies", len(s), len(freqs))
	}
	z0 := res.Design.Z0
	dc, err := drawnCircuit(res, freqs)
	if err != nil {
		return nil, err
	}
	rep := &Report{Freqs: freqs, Network: s, Circuit: dc.network, CircuitMatched: dc.matched, Zref: z0}
	mask := "no solder mask over the RF copper"
	if m := maskOf(res); m.Thickness > 0 {
		mask = fmt.Sprintf("the %.3g µm solder mask (εr %.3g) over the whole top face, its openings at the port pads left out", m.Thickness*1e6, m.Er)
		if drawn > 0 {
			mask = fmt.Sprintf("the %.3g µm solder mask (εr %.3g) over the whole top face following the copper (on the substrate, over the copper and down its walls), its openings at the port pads left out", m.Thickness*1e6, m.Er)
		}
	}
	copper := "perfect zero-thickness copper"
	if drawn > 0 {
		copper = fmt.Sprintf("perfect copper %.3g µm thick", drawn*1e6)
	}
	rep.Notes = append(rep.Notes, "full-wave model: "+copper+", "+mask+", substrate and ground plane unbounded beside the board")
	if share, ok := ThicknessShare(res); ok && drawn == 0 {
		rep.Notes = append(rep.Notes, fmt.Sprintf("the full-wave copper has zero thickness: with the stackup's %.1f µm copper the lines are %.2f %% electrically shorter (Hammerstad-Jensen thickness correction, weighted by electrical length), so the drawn board's best match lies about %.2f %% above the full-wave's on that account", res.Physical.Board.Sub.CopperThickness*1e6, 100*share, 100*share))
	}
	if dc.note != "" {
		rep.Notes = append(rep.Notes, dc.note)
	}
	for k := range freqs {
		sc := dc.network[k]
		rep.Matched = append(rep.Matched, terminate(s[k], loadGamma(sw.ZLoad[k], z0)))
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				rep.MaxSDifference = math.Max(rep.MaxSDifference, cmplx.Abs(s[k][i][j]-sc[i][j]))
			}
		}
	}
	ik := sort.SearchFloat64s(freqs, f0)
	if ik == 0 {
		ik = 1
	}
	t := (f0 - freqs[ik-1]) / (freqs[ik] - freqs[ik-1])
	rep.MatchedF0 = rep.Matched[ik-1] + complex(t, 0)*(rep.Matched[ik]-rep.Matched[ik-1])
	rep.S11DBF0 = physical.MagDB(rep.MatchedF0)
	rep.CircuitS11DBF0 = physical.MagDB(dc.s11F0)
	rep.BestMatchHz = bestMatch(freqs, rep.Matched)
	rep.CircuitBestMatchHz = bestMatch(freqs, rep.CircuitMatched)
	return rep, nil
}

// ThicknessShare returns how much electrically longer, relatively, res's
// microstrip lines are with zero-thickness copper (as the full-wave draws
// them) than with the stackup's copper: the Hammerstad-Jensen thickness
// correction of εeff at f0 (bare microstrip), as √(εeff(0)/εeff(t)) − 1,
// averaged over the elements weighted by electrical length. It is false
// for a grounded coplanar stackup or one without copper thickness.
func ThicknessShare(res *synth.Result) (float64, bool) {
	sub := res.Physical.Board.Sub
	if res.Stackup.Line == stackups.GCPW || !(sub.CopperThickness > 0) {
		return 0, false
	}
	thin := sub
	thin.CopperThickness = 0
	f0 := res.Design.Freq
	sum, weight := 0.0, 0.0
	for _, e := range res.Physical.Elements {
		mt, err := physical.NewMicrostrip(e.Width, sub)
		if err != nil {
			return 0, false
		}
		m0, err := physical.NewMicrostrip(e.Width, thin)
		if err != nil {
			return 0, false
		}
		pt, p0 := mt.At(f0), m0.At(f0)
		theta := pt.Beta() * math.Abs(e.Drawn())
		sum += theta * (math.Sqrt(p0.EpsEff/pt.EpsEff) - 1)
		weight += theta
	}
	if !(weight > 0) {
		return 0, false
	}
	return sum / weight, true
}

// drawnModel is the circuit model of a build's copper as drawn.
type drawnModel struct {
	network [][2][2]complex128 // the two-port at the sweep frequencies
	matched []complex128       // its S11 with the load, at the same frequencies
	s11F0   complex128         // its S11 with the load at f0
	note    string             // how the copper differs from the build's model; "" when it does not
}

// drawnCircuit returns the circuit model of res's copper as drawn, at
// freqs: the build's own sweep and S11 at f0, except that open stubs drawn
// with a trim allowance ([layout] trim) carry it, as the full-wave's
// copper does, which its note says.
func drawnCircuit(res *synth.Result, freqs []float64) (drawnModel, error) {
	trim := res.Design.Layout.Trim
	if !(trim > 0) {
		return drawnModel{network: res.Sweep.Network, matched: append([]complex128(nil), res.Sweep.S11...), s11F0: res.S11F0}, nil
	}
	extra := make([]float64, len(res.Physical.Elements))
	for i, e := range res.Physical.Elements {
		if e.Role == synth.RoleStub && e.End != synth.Short {
			extra[i] = trim
		}
	}
	net, err := res.ModelNetwork(extra, append(append([]float64(nil), freqs...), res.Design.Freq))
	if err != nil {
		return drawnModel{}, fmt.Errorf("fullwave: the circuit model of the drawn copper: %w", err)
	}
	z0 := res.Design.Z0
	m := drawnModel{network: net[:len(freqs)], s11F0: terminate(net[len(freqs)], loadGamma(res.LoadF0, z0)),
		note: fmt.Sprintf("the open stubs are drawn %.2f mm beyond their design length for trimming at the bench: the full-wave solves the copper as drawn, and the circuit figures here are the circuit model's of the same copper, so both best matches lie below f0 until the stubs are trimmed", trim*1e3)}
	for k, sc := range m.network {
		m.matched = append(m.matched, terminate(sc, loadGamma(res.Sweep.ZLoad[k], z0)))
	}
	return m, nil
}

// loadGamma is the reflection of load zl against z0.
func loadGamma(zl complex128, z0 float64) complex128 {
	return (zl - complex(z0, 0)) / (zl + complex(z0, 0))
}

// terminate returns the input reflection at port 1 of s with port 2
// terminated in reflection gl: S11 + S12·S21·Γ/(1 − S22·Γ).
func terminate(s [2][2]complex128, gl complex128) complex128 {
	return s[0][0] + s[0][1]*s[1][0]*gl/(1-s[1][1]*gl)
}

// bestMatch returns the frequency of the smallest |S11|, refined by a
// parabola through its neighbours.
func bestMatch(freqs []float64, s11 []complex128) float64 {
	b := 0
	for i := range s11 {
		if cmplx.Abs(s11[i]) < cmplx.Abs(s11[b]) {
			b = i
		}
	}
	if b == 0 || b == len(s11)-1 {
		return freqs[b]
	}
	y0, y1, y2 := cmplx.Abs(s11[b-1]), cmplx.Abs(s11[b]), cmplx.Abs(s11[b+1])
	den := y0 - 2*y1 + y2
	if den <= 0 {
		return freqs[b]
	}
	// Non-uniform spacing: fit on the index and map back linearly.
	t := 0.5 * (y0 - y2) / den
	if t < 0 {
		return freqs[b] + t*(freqs[b]-freqs[b-1])
	}
	return freqs[b] + t*(freqs[b+1]-freqs[b])
}
