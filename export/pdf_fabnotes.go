package export

import (
	"fmt"
	"math"
	"strings"
)

// fabNotesSheet draws the fab notes: below the notes or the structures
// that ended on the current sheet when they fit in its free space,
// otherwise on a sheet of their own. They hold the facts, the controlled-impedance table, the
// drill table, the rules and the files, as WriteFabNotes prints them.
func (d *doc) fabNotesSheet(n FabNotes) {
	x, y, w, h := d.contentBox()
	bottom := y + h
	if y, ok := d.joinSheet("Fabrication notes", d.fabNotes(n, x, 0, w, math.Inf(1), false)); ok {
		d.fabNotes(n, x, y, w, bottom, true)
		return
	}
	d.newSheet("Fabrication notes", n.Board)
	d.fabNotes(n, x, y, w, bottom, true)
}

// fabNotes lays the fab notes out from y down to bottom, continuing on
// further sheets, and returns the height they take. With draw false it
// only measures: nothing is written and no sheet is added.
func (d *doc) fabNotes(n FabNotes, x, y, w, bottom float64, draw bool) float64 {
	f := d.pdf
	y0, pages := y, 0
	const lh = 3.4
	text := func(tx, ty float64, s string) {
		if draw {
			f.Text(tx, ty, s)
		}
	}
	next := func(dy float64) {
		y += dy
		if y > bottom-lh {
			d.newSheet("Fabrication notes (continued)", n.Board)
			_, y, _, _ = d.contentBox()
			pages++
		}
	}
	head := func(s string) {
		next(2)
		f.SetFont(fontSans, "B", 8.5)
		setText(f, colAccent)
		text(x, y+3, s)
		next(5)
		f.SetFont(fontSans, "", 7.5)
		setText(f, colInk)
	}
	para := func(indent float64, s string) {
		for _, line := range f.SplitText(s, w-indent) {
			text(x+indent, y+3, line)
			next(lh)
		}
	}
	head("Board")
	for _, fa := range n.Facts {
		f.SetFont(fontSans, "B", 7.5)
		text(x, y+3, fa[0])
		f.SetFont(fontSans, "", 7.5)
		para(32, fa[1])
	}
	head(fmt.Sprintf("Controlled impedance (target Z0 ±%.0f %%)", 100*ImpedanceTolerance))
	cols := []float64{0, 20, 38, 52, 72, 140}
	row := func(cells ...string) {
		for i, c := range cells {
			text(x+cols[i], y+3, c)
		}
		next(lh)
	}
	f.SetFont(fontSans, "B", 7.5)
	row("width (mm)", "Z0 (Ω)", "tolerance", "layer", "reference", "elements")
	f.SetFont(fontSans, "", 7.5)
	for _, r := range n.Impedance {
		row(fmt.Sprintf("%.3f", r.WidthMM), fmt.Sprintf("%.2f", r.Z0Ohm), fmt.Sprintf("±%.0f %%", 100*r.Tolerance), r.Layer,
			clip(f.GetStringWidth, r.Reference, cols[5]-cols[4]-2), clip(f.GetStringWidth, strings.Join(r.Elements, ", "), w-cols[5]))
	}
	if len(n.Drills) > 0 {
		head("Drills")
		cols = []float64{0, 20, 42, 56, 72}
		f.SetFont(fontSans, "B", 7.5)
		row("tool", "diameter (mm)", "count", "plated", "function")
		f.SetFont(fontSans, "", 7.5)
		for _, dr := range n.Drills {
			plated := "no"
			if dr.Plated {
				plated = "yes"
			}
			row(fmt.Sprintf("T%02d", dr.Tool), fmt.Sprintf("%.3f", dr.DiameterMM), fmt.Sprint(dr.Count), plated, dr.Function)
		}
	}
	head("Rules")
	for _, r := range n.Rules {
		para(0, "• "+r)
	}
	head("Files")
	for _, fl := range n.Files {
		text(x, y+3, clip(f.GetStringWidth, fl[0], w))
		if f.GetStringWidth(fl[0]) > 70 {
			next(lh) // a long name: its function on the next line
		}
		para(72, fl[1])
	}
	if pages > 0 {
		return math.Inf(1) // spread over sheets: no single height
	}
	return y - y0
}

// clip shortens s with an ellipsis to fit width w (mm) as measured by
// width.
func clip(width func(string) float64, s string, w float64) string {
	if width(s) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 0 && width(string(r)+"…") > w {
		r = r[:len(r)-1]
	}
	return string(r) + "…"
}
