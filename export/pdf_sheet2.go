package export

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/plot/plotter"

	"stubcraft/physical/units"
)

// dataSheets draws the sheet of stackup, elements and response, and as
// many continuation sheets as the notes need.
func (d *doc) dataSheets(b boardModel) {
	d.newSheet("Stackup, elements and response", fmt.Sprintf("%s, %s", d.rep.Name, formatFreq(d.rep.FrequencyHz)))
	x, y, w, _ := d.contentBox()
	y = d.elementTable(x, y, w)
	half := (w - 8) / 2
	d.stackup(x, y+3, half, 52)
	d.s11Chart(x+half+8+9, y+8, half-9, 43)
	y += 62
	d.smith(x, y+3, half, 74)
	d.histogram(x+half+8+9, y+8, half-9, 40)
	d.results(x+half+8, y+59, half)
	y += 91
	d.notes(x, y, w)
}

// elementTable draws the table of elements and returns the y below it.
func (d *doc) elementTable(x, y, w float64) float64 {
	f := d.pdf
	type col struct {
		head, unit string
		w          float64
		val        func(e ReportElement) string
	}
	cols := []col{
		{"element", "", 24, func(e ReportElement) string { return e.ID }},
		{"role", "", 19, func(e ReportElement) string {
			if e.End != "" {
				return e.Role + ", " + e.End
			}
			if e.Feed {
				return "feed line"
			}
			return e.Role
		}},
		{"Z0", "(Ω)", 13, func(e ReportElement) string { return fmt.Sprintf("%.2f", e.Z0Ohm) }},
		{"εeff", "(—)", 12, func(e ReportElement) string { return fmt.Sprintf("%.3f", e.EpsEffF0) }},
		{"width", "(mm)", 14, func(e ReportElement) string { return mm3(e.WidthMM) }},
		{"electrical", "(°)", 14, func(e ReportElement) string { return fmt.Sprintf("%.2f", e.ElectricalDeg) }},
		{"electrical", "(λ)", 14, func(e ReportElement) string { return fmt.Sprintf("%.4f", e.ElectricalDeg/360) }},
		{"line", "(mm)", 14, func(e ReportElement) string { return mm3(e.LineLengthMM) }},
		{"open end", "(mm)", 14, func(e ReportElement) string { return signed3(e.OpenEndMM) }},
		{"tee", "(mm)", 13, func(e ReportElement) string { return signed3(e.TeeMM) }},
		{"via", "(mm)", 13, func(e ReportElement) string { return signed3(e.ViaMM) }},
		{"re-centre", "(mm)", 14, func(e ReportElement) string { return signed3(e.RecentreMM) }},
		{"drawn", "(mm)", 14, func(e ReportElement) string { return mm3(e.DrawnLengthMM) }},
	}
	var sum float64
	for _, c := range cols {
		sum += c.w
	}
	k := w / sum
	f.SetFont(fontSans, "B", 7.5)
	setText(f, colInk)
	f.Text(x, y+3, "Elements of the corrected network (line length + corrections = drawn length)")
	y += 5
	setFill(f, colPaperTint)
	f.Rect(x, y, w, 7.5, "F")
	cx := x
	for i, c := range cols {
		cw := c.w * k
		f.SetFont(fontSans, "B", 6.2)
		setText(f, colAccent)
		al := "R"
		if i < 2 {
			al = "L"
		}
		txt(f, c.head, cx, cw, y+3, al)
		f.SetFont(fontSans, "", 6)
		txt(f, c.unit, cx, cw, y+6.2, al)
		cx += cw
	}
	y += 7.5
	for r, e := range d.rep.Elements {
		if r%2 == 1 {
			setFill(f, 0xf6f8f7)
			f.Rect(x, y, w, 4.3, "F")
		}
		cx = x
		for i, c := range cols {
			cw := c.w * k
			font := fontMono
			al := "R"
			if i < 2 {
				font, al = fontSans, "L"
			}
			f.SetFont(font, "", 6.4)
			setText(f, colInk)
			txt(f, c.val(e), cx, cw, y+3.1, al)
			cx += cw
		}
		y += 4.3
	}
	setDraw(f, colRule)
	f.SetLineWidth(0.2)
	f.Line(x, y, x+w, y)
	return y + 2
}

// txt writes s in a cell [x, x+w] at baseline y, aligned "L" or "R".
func txt(f interface {
	GetStringWidth(string) float64
	Text(float64, float64, string)
}, s string, x, w, y float64, align string) {
	if align == "R" {
		f.Text(x+w-1.2-f.GetStringWidth(s), y, s)
		return
	}
	f.Text(x+1.2, y, s)
}

// stackup draws the cross-section with its thicknesses and permittivities,
// not to scale.
func (d *doc) stackup(x, y, w, h float64) {
	f := d.pdf
	st := d.rep.Stackup
	pt, _ := fitText(f, "Stackup cross-section: "+st.Name, "B", 7.5, 4.5, w, 1)
	f.SetFont(fontSans, "B", pt)
	setText(f, colInk)
	f.Text(x, y+2, "Stackup cross-section: "+st.Name)
	f.SetFont(fontSans, "", 5.5)
	setText(f, colMuted)
	f.Text(x, y+5, "not to scale: layer heights are schematic, values are the stackup's")
	bx, bw := x+2, w*0.42
	top := y + 10
	const cu, mk, diel = 3.0, 2.2, 20.0
	traceW := 0.0
	if len(d.rep.Elements) > 0 {
		traceW = d.rep.Elements[0].WidthMM
	}
	tx0, tx1 := bx+bw*0.32, bx+bw*0.68
	type layer struct {
		y, hgt float64
		text   string
	}
	var layers []layer
	yy := top
	if st.MaskThicknessUM != nil && st.MaskEr != nil {
		setFill(f, colMask)
		f.Rect(bx, yy+cu-mk, bw, mk, "F")
		f.Rect(tx0-0.6, yy-0.6, tx1-tx0+1.2, cu+0.6, "F")
		layers = append(layers, layer{yy - 0.3, mk, fmt.Sprintf("solder mask: t = %.1f µm, εr = %.2f", *st.MaskThicknessUM, *st.MaskEr)})
	}
	setFill(f, colCopper)
	f.Rect(tx0, yy, tx1-tx0, cu, "F")
	if st.GapMM != nil {
		g := (tx1 - tx0) * 0.25
		f.Rect(bx, yy, tx0-g-bx, cu, "F")
		f.Rect(tx1+g, yy, bx+bw-tx1-g, cu, "F")
		layers = append(layers, layer{yy + cu + 2.5, 0, fmt.Sprintf("coplanar ground gap: %s mm", mm3(*st.GapMM))})
	}
	layers = append(layers, layer{yy + cu/2, cu, fmt.Sprintf("top copper: t = %.1f µm, roughness %.2f µm", st.CopperThicknessUM, st.RoughnessUM)})
	label(f, fmt.Sprintf("w = %s mm", mm3(traceW)), (tx0+tx1)/2, yy-2.4, "C", noteFontPt, colDim)
	yy += cu
	setFill(f, colDielec)
	f.Rect(bx, yy, bw, diel, "F")
	erAt := ""
	if st.ErFrequencyHz > 0 {
		erAt = " at " + formatFreq(st.ErFrequencyHz)
	}
	layers = append(layers, layer{yy + diel/2, diel, fmt.Sprintf("dielectric: h = %s mm, εr = %.2f%s, tan δ = %.4f", mm3(st.ThicknessMM), st.Er, erAt, st.LossTangent)})
	// Thickness dimension on the dielectric.
	(&ink{f: f}).dimV(bx, yy, bx, yy+diel, bx+3.5, "h", true)
	yy += diel
	setFill(f, colCopper)
	f.Rect(bx, yy, bw, cu, "F")
	layers = append(layers, layer{yy + cu/2, cu, fmt.Sprintf("ground plane: t = %.1f µm", st.CopperThicknessUM)})
	yy += cu
	// Labels with leaders, spread so they never overlap.
	lx := bx + bw + 6
	last := -1e9
	for i := range layers {
		l := &layers[i]
		ty := math.Max(l.y, last+5.2)
		last = ty
		setDraw(f, colRule)
		f.SetLineWidth(0.12)
		f.Line(bx+bw+0.5, l.y, lx-1, ty)
		f.SetFont(fontSans, "", 5.6)
		setText(f, colInk)
		f.SetXY(lx, ty-1.6)
		f.MultiCell(x+w-lx, 2.5, l.text, "", "L", false)
	}
	f.SetFont(fontSans, "", 5.6)
	setText(f, colMuted)
	f.Text(bx, yy+4, fmt.Sprintf("copper conductivity %.3g S/m; line type %s", st.ConductivitySPerM, st.Line))
}

// s11Chart draws |S11| in dB against frequency with the −10 dB line and f0.
func (d *doc) s11Chart(x, y, w, h float64) {
	f := d.pdf
	sw := d.rep.Sweep
	if len(sw.FreqHz) < 2 {
		f.SetFont(fontSans, "", 7)
		f.Text(x, y+5, "no frequency sweep in the report")
		return
	}
	ghz := make([]float64, len(sw.FreqHz))
	for i, v := range sw.FreqHz {
		ghz[i] = v / 1e9
	}
	lo, hi := ghz[0], ghz[len(ghz)-1]
	minDB := 0.0
	for _, v := range sw.S11DB {
		minDB = math.Min(minDB, v)
	}
	ylo := math.Max(-60, math.Min(-20, math.Floor(minDB/10)*10))
	c := chart{x: x, y: y, w: w, h: h, xlo: lo, xhi: hi, xst: niceStep(hi-lo, 5), ylo: ylo, yhi: 0, yst: niceStep(-ylo, 5),
		xlabel: "frequency (GHz)", ylabel: "|S11| (dB)"}
	if b := d.rep.Band10DBHz; d.rep.Bandwidth10DBHz > 0 {
		setFill(f, 0xe4f1ef)
		x0, x1 := c.X(math.Max(lo, b[0]/1e9)), c.X(math.Min(hi, b[1]/1e9))
		f.Rect(x0, y, x1-x0, h, "F")
	}
	d.frame(c, "Input match |S11| across the band", func(v float64) string { return Minus(trimFloat(v)) })
	dashed(f, c.x, c.Y(-10), c.x+w, c.Y(-10), colLimit)
	label(f, "−10 dB", c.x+w-1, c.Y(-10)-1.8, "R", noteFontPt, colLimit)
	if b := d.rep.Band; b != nil {
		// The design band: its edges, and the goal across it.
		b0, b1 := math.Max(lo, b.StartHz/1e9), math.Min(hi, b.StopHz/1e9)
		if b1 > b0 {
			dashed(f, c.X(b0), y, c.X(b0), y+h, colLimit)
			dashed(f, c.X(b1), y, c.X(b1), y+h, colLimit)
			label(f, "band", c.X(b0)-0.8, y+h-1.5, "R", noteFontPt, colLimit)
			if g := b.GoalDB; g != nil && *g > ylo && *g < 0 {
				f.SetLineWidth(0.35)
				setDraw(f, colLimit)
				f.Line(c.X(b0), c.Y(*g), c.X(b1), c.Y(*g))
				label(f, Minus(fmt.Sprintf("goal %g dB", *g)), c.X(b0)-0.8, c.Y(*g)+1, "R", noteFontPt, colLimit)
			}
		}
	}
	f0 := d.rep.FrequencyHz / 1e9
	if f0 >= lo && f0 <= hi {
		dashed(f, c.X(f0), y, c.X(f0), y+h, colCurveB)
		label(f, "f0 "+formatFreq(d.rep.FrequencyHz), c.X(f0)+1, y+2.5, "L", noteFontPt, colCurveB)
	}
	clamped := make([]float64, len(sw.S11DB))
	for i, v := range sw.S11DB {
		clamped[i] = math.Max(v, ylo)
	}
	d.polyline(c, ghz, clamped, colCurveA, 0.45)
	if f0 >= lo && f0 <= hi {
		yv := math.Max(d.rep.S11DBF0, ylo)
		setFill(f, colCurveA)
		f.Circle(c.X(f0), c.Y(yv), 0.7, "F")
		label(f, ModelDB(d.rep.S11DBF0)+" at f0", c.X(f0)+1.5, math.Min(c.Y(yv)+2.5, y+h-2), "L", noteFontPt, colCurveA)
	}
}

// trimFloat formats a tick value without trailing zeros.
func trimFloat(v float64) string {
	s := fmt.Sprintf("%.4f", v)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		s = "0"
	}
	return s
}

// smith draws a Smith chart of our own: the constant-resistance and
// constant-reactance circles, the load's reflection across the band and the
// matched input's trajectory, with f0 marked on both.
func (d *doc) smith(x, y, w, h float64) {
	f := d.pdf
	f.SetFont(fontSans, "B", 7.5)
	setText(f, colInk)
	f.Text(x, y+2, fmt.Sprintf("Smith chart, Z0 = %.4g Ω", d.rep.Z0Ohm))
	R := math.Min(w*0.5-8, (h-12)/2)
	cx, cy := x+R+8, y+8+R
	P := func(g complex128) (float64, float64) { return cx + R*real(g), cy - R*imag(g) }
	setFill(f, 0xfbfaf6)
	setDraw(f, colInk)
	f.SetLineWidth(0.25)
	f.Circle(cx, cy, R, "FD")
	f.ClipCircle(cx, cy, R, false)
	setDraw(f, colGrid)
	f.SetLineWidth(0.12)
	for _, v := range smithValues() {
		c := resistanceCircle(v)
		f.Circle(cx+R*c.cx, cy, R*c.r, "D")
		for _, s := range []float64{1, -1} {
			c := reactanceCircle(s * v)
			f.Circle(cx+R*c.cx, cy-R*c.cy, R*c.r, "D")
		}
	}
	f.Line(cx-R, cy, cx+R, cy)
	f.ClipEnd()
	// The grid values are fixed text the f0 labels keep clear of.
	k := &ink{f: f, pl: newPlacer(pdfWidth(f), rect{x, y, x + w, y + h})}
	em := 4.8 * 25.4 / 72
	fixed := func(s string, bx, by float64) {
		f.Text(bx, by, s)
		k.pl.reserve(rect{bx, by - ascentEm*em, bx + f.GetStringWidth(s), by + descentEm*em})
	}
	f.SetFont(fontSans, "", 4.8)
	setText(f, colMuted)
	for _, v := range smithValues() {
		px, py := P(gammaOf(complex(v, 0)))
		fixed(trimFloat(v), px+0.4, py-0.5)
		f.SetFont(fontSans, "", 4.8)
		setText(f, colMuted)
		for _, s := range []float64{1, -1} {
			gx, gy := P(gammaOf(complex(0, s*v)))
			t := trimFloat(s*v) + "j"
			if s < 0 {
				t = Minus(t)
			}
			dx := (gx - cx) / R * 2.4
			dy := (gy - cy) / R * 2.4
			tw := f.GetStringWidth(t)
			fixed(t, gx+dx-tw/2, gy+dy+0.8)
		}
	}
	sw := d.rep.Sweep
	i0 := nearest(sw.FreqHz, d.rep.FrequencyHz)
	trace := func(re, im []float64, col rgb, name string) {
		if len(re) < 1 || len(re) != len(im) {
			return
		}
		setDraw(f, col)
		f.SetLineWidth(0.45)
		pts := make(plotter.XYs, len(re))
		for i := range re {
			pts[i] = plotter.XY{X: re[i], Y: im[i]}
		}
		pts = thinPath(pts, 1e-3) // a long sweep, drawn at page resolution
		f.MoveTo(P(complex(pts[0].X, pts[0].Y)))
		for _, q := range pts[1:] {
			f.LineTo(P(complex(q.X, q.Y)))
		}
		f.DrawPath("D")
		setFill(f, col)
		if i0 >= 0 && i0 < len(re) {
			px, py := P(complex(re[i0], im[i0]))
			f.Circle(px, py, 0.9, "F")
			k.group()
			k.text(labelReq{lines: []string{name}, pt: noteFontPt, col: col, anchor: ptMM{px, py},
				spots: []spot{{x: px + 1.6, y: py - 1.6, align: 'L'}, {x: px + 1.6, y: py + 1.9, align: 'L'},
					{x: px - 1.6, y: py - 1.6, align: 'R'}, {x: px - 1.6, y: py + 1.9, align: 'R'}}})
		}
		px, py := P(complex(re[0], im[0]))
		f.Rect(px-0.5, py-0.5, 1, 1, "F")
	}
	trace(sw.LoadRe, sw.LoadIm, colCurveB, "load at f0")
	trace(sw.S11Re, sw.S11Im, colCurveA, "input at f0")
	k.flush()
	ly := cy + R + 3.5
	f.SetFont(fontSans, "", 5.5)
	legend := []struct {
		c rgb
		s string
	}{{colCurveB, "load reflection across the band"}, {colCurveA, "matched input reflection across the band"}}
	for i, l := range legend {
		setFill(f, l.c)
		f.Rect(x, ly+float64(i)*2.8-1.3, 3, 1, "F")
		setText(f, colInk)
		f.Text(x+4, ly+float64(i)*2.8, l.s)
	}
	setText(f, colMuted)
	f.Text(x, ly+5.6, "dot: f0; square: lowest frequency of the sweep")
	if len(sw.LoadRe) > 0 {
		f.Text(x, ly+8.4, fmt.Sprintf("load at f0: %s Ω, |Γ| = %.3f", units.FormatImpedanceWith(complex(d.rep.Load.ROhm, d.rep.Load.XOhm), units.ImpedanceStyle{Decimals: 2, Typeset: true}), d.rep.Load.GammaMag))
	}
}

// nearest returns the index of the value of xs nearest v, −1 for none.
func nearest(xs []float64, v float64) int {
	best, bi := math.Inf(1), -1
	for i, x := range xs {
		if dd := math.Abs(x - v); dd < best {
			best, bi = dd, i
		}
	}
	return bi
}

// histogram draws the Monte Carlo distribution of |S11| at f0.
func (d *doc) histogram(x, y, w, h float64) {
	f := d.pdf
	t := d.rep.Tolerance
	if t == nil || len(t.SamplesS11DB) == 0 {
		f.SetFont(fontSans, "B", 7.5)
		setText(f, colInk)
		f.Text(x, y-2.2, "Tolerance analysis")
		f.SetFont(fontSans, "", 6.5)
		setText(f, colMuted)
		f.Text(x, y+4, "not run for this build")
		return
	}
	bins := histBins(t.SamplesS11DB, 24)
	maxC := 0
	for _, c := range bins.counts {
		maxC = max(maxC, c)
	}
	hi := bins.lo + bins.width*float64(len(bins.counts))
	// The range takes in the yield threshold so its line is always seen.
	xlo, xhi := math.Min(bins.lo, t.YieldBelowDB-1), math.Max(hi, t.YieldBelowDB+1)
	c := chart{x: x, y: y, w: w, h: h, xlo: xlo, xhi: xhi, xst: niceStep(xhi-xlo, 5),
		ylo: 0, yhi: float64(maxC) * 1.1, yst: niceStep(float64(maxC)*1.1, 4), xlabel: "|S11| at f0 (dB)", ylabel: "boards"}
	c.yst = math.Max(1, c.yst)
	d.frame(c, fmt.Sprintf("Monte Carlo |S11| at f0, %d boards (seed %d)", t.Samples, t.Seed), func(v float64) string { return Minus(trimFloat(v)) })
	setFill(f, colCurveA)
	setDraw(f, 0xffffff)
	f.SetLineWidth(0.1)
	for i, n := range bins.counts {
		if n == 0 {
			continue
		}
		x0 := c.X(bins.lo + float64(i)*bins.width)
		x1 := c.X(bins.lo + float64(i+1)*bins.width)
		f.Rect(x0, c.Y(float64(n)), x1-x0, c.Y(0)-c.Y(float64(n)), "FD")
	}
	mark := func(v float64, col rgb, s string, row int) {
		if v < c.xlo || v > c.xhi {
			return
		}
		dashed(f, c.X(v), y, c.X(v), y+h, col)
		label(f, s, c.X(v)+0.8, y+2.3+float64(row)*2.6, "L", noteFontPt, col)
	}
	mark(t.YieldBelowDB, colLimit, Minus(fmt.Sprintf("%.0f dB", t.YieldBelowDB)), 0)
	mark(t.P50S11DB, colCurveB, "median", 1)
	mark(t.P90S11DB, colCurveB, "90 %", 2)
}

// results writes the figures of merit of the build.
func (d *doc) results(x, y, w float64) {
	f := d.pdf
	r := d.rep
	lines := append(headlineFigures(r),
		fmt.Sprintf("model |S11| at f0: %s drawn, %s without the discontinuity corrections, %s before re-centring", ModelDB(r.S11DBF0), ModelDB(r.S11DBF0Uncorr), ModelDB(r.Recentring.S11DBBefore)),
		Minus(fmt.Sprintf("return loss %s, VSWR %.2f, network loss %.3f dB at f0", returnLossText(float64(r.ReturnLossDBF0)), r.VSWRF0, r.NetworkLossDBF0)))
	if r.Bandwidth10DBHz > 0 {
		lines = append(lines, Minus(fmt.Sprintf("band |S11| < −10 dB: %s (%.1f MHz)", units.FormatFrequencyRange(r.Band10DBHz[0], r.Band10DBHz[1], 4), r.Bandwidth10DBHz/1e6)))
	}
	if t := r.Tolerance; t != nil {
		lines = append(lines, Minus(fmt.Sprintf("spreads: εr ±%.1f %%, h ±%.1f %%, width ±%.0f µm, copper ±%.1f %%; median %.1f dB, 90 %% %.1f dB, yield below %.0f dB %.1f %%",
			100*t.ErRel, 100*t.ThicknessRel, t.WidthUM, 100*t.CopperRel, t.P50S11DB, t.P90S11DB, t.YieldBelowDB, 100*t.Yield)))
	}
	lines = append(lines, "line model: "+r.Model)
	f.SetFont(fontSans, "", 5.8)
	setText(f, colInk)
	f.SetXY(x, y)
	for _, l := range lines {
		f.SetX(x)
		f.MultiCell(w, 2.6, l, "", "L", false)
	}
}

// notes writes the RF safety cautions, the notes and the warnings from y
// down, continuing on further sheets when they do not fit.
func (d *doc) notes(x, y, w float64) {
	f := d.pdf
	_, cy, _, ch := d.contentBox()
	bottom := cy + ch
	const lh = 2.9
	type block struct {
		head  string
		col   rgb
		items []string
	}
	blocks := []block{
		{"Sensitivity at the bench (what one step moves)", colInk, sensitivityLines(d.rep.Sensitivity)},
		{"RF safety", colWarn, Cautions()},
		{"Notes", colInk, d.rep.Notes},
		{"Warnings", colWarn, d.rep.Warnings},
	}
	more := func() {
		d.newSheet("Notes (continued)", d.rep.Name)
		d.tailPage = d.pdf.PageNo()
	}
	for _, b := range blocks {
		if len(b.items) == 0 {
			continue
		}
		if y+8 > bottom {
			more()
			_, y, _, _ = d.contentBox()
		}
		f.SetFont(fontSans, "B", 7.5)
		setText(f, b.col)
		f.Text(x, y+3, b.head)
		y += 4.5
		f.SetFont(fontSans, "", 6.5)
		for _, it := range b.items {
			lines := f.SplitText(it, w-4)
			if y+float64(len(lines))*lh > bottom {
				more()
				_, y, _, _ = d.contentBox()
				f.SetFont(fontSans, "", 6.5)
			}
			setText(f, colInk)
			f.Text(x, y+2.2, "–")
			for i, l := range lines {
				f.Text(x+3, y+2.2+float64(i)*lh, l)
			}
			y += float64(len(lines))*lh + 0.6
		}
		y += 2
	}
	d.tailY = y
}

// histBinsT is a histogram: counts of equal bins from lo, each width wide.
type histBinsT struct {
	lo, width float64
	counts    []int
}

// histBins bins xs into n equal bins spanning their range; a value on a
// bin edge goes to the upper bin, the maximum to the last bin.
func histBins(xs []float64, n int) histBinsT {
	if len(xs) == 0 || n < 1 {
		return histBinsT{}
	}
	lo, hi := xs[0], xs[0]
	for _, v := range xs {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if hi == lo {
		lo, hi = lo-0.5, hi+0.5
	}
	h := histBinsT{lo: lo, width: (hi - lo) / float64(n), counts: make([]int, n)}
	for _, v := range xs {
		k := int(math.Floor((v - lo) / h.width))
		h.counts[min(max(k, 0), n-1)]++
	}
	return h
}

// sensitivityLines words the sensitivity table for the drawing, one line
// per element and quantity.
func sensitivityLines(sens []ReportSensitivity) []string {
	var out []string
	for _, s := range sens {
		move := ""
		switch {
		case s.WorstInBandDB != nil:
			move = fmt.Sprintf("worst |S11| in the band becomes %.2f dB; ", *s.WorstInBandDB)
		case s.BestMatchShiftMHz != nil:
			move = fmt.Sprintf("best match %+.2f MHz; ", *s.BestMatchShiftMHz)
		}
		out = append(out, Minus(fmt.Sprintf("%s, %s: %s|S11| at f0 becomes %s", s.ID, s.Step, move, ModelDB(s.S11DBF0AfterStep))))
	}
	return out
}
