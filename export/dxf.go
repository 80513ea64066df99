package export

import (
	"bufio"
	"fmt"
	"io"
	"strconv"

	"stubcraft/synth/geom"
)

// DXF layer names of WriteDXF.
const (
	DXFCopperTop    = "COPPER_TOP"
	DXFCopperBottom = "COPPER_BOTTOM"
	DXFMaskTop      = "MASK_TOP_OPENINGS"
	DXFLegendTop    = "LEGEND_TOP"
	DXFOutline      = "OUTLINE"
	DXFDrill        = "DRILL"
)

// DXFFileName returns the name of the DXF export of a board called base.
func DXFFileName(base string) string { return baseName(base) + ".dxf" }

// WriteDXF writes the layout as an ASCII DXF file (AutoCAD R12 entities,
// the subset every PCB editor imports) in millimetres, for bringing the RF
// copper into a PCB editor: one layer each for the top copper (every net
// outline and every pad), the bottom copper, the mask openings, the legend
// strokes, the board outline and the drill holes. Every shape is a closed
// POLYLINE; a round pad or hole is a closed polyline of two half-circle
// arcs (vertex bulge 1, exact). Legend strokes are open polylines. The
// output depends only on its argument.
func WriteDXF(w io.Writer, l geom.Layout) error {
	b := bufio.NewWriter(w)
	g := func(code int, v string) { fmt.Fprintf(b, "%3d\n%s\n", code, v) }
	g(0, "SECTION")
	g(2, "HEADER")
	g(9, "$ACADVER")
	g(1, "AC1009")
	g(9, "$INSUNITS")
	g(70, "4") // millimetres
	g(9, "$MEASUREMENT")
	g(70, "1") // metric
	g(0, "ENDSEC")
	layers := []string{DXFCopperTop, DXFCopperBottom, DXFMaskTop, DXFLegendTop, DXFOutline, DXFDrill}
	g(0, "SECTION")
	g(2, "TABLES")
	g(0, "TABLE")
	g(2, "LAYER")
	g(70, strconv.Itoa(len(layers)))
	for i, name := range layers {
		g(0, "LAYER")
		g(2, name)
		g(70, "0")
		g(62, strconv.Itoa(i+1)) // colour
		g(6, "CONTINUOUS")
	}
	g(0, "ENDTAB")
	g(0, "ENDSEC")
	g(0, "SECTION")
	g(2, "ENTITIES")
	type vtx struct {
		p     geom.Point
		bulge bool
	}
	poly := func(layer string, vs []vtx, closed bool) {
		g(0, "POLYLINE")
		g(8, layer)
		g(66, "1")
		g(10, "0.0")
		g(20, "0.0")
		g(30, "0.0")
		if closed {
			g(70, "1")
		} else {
			g(70, "0")
		}
		for _, v := range vs {
			g(0, "VERTEX")
			g(8, layer)
			g(10, geom.FormatMM(v.p.X))
			g(20, geom.FormatMM(v.p.Y))
			g(30, "0.0")
			if v.bulge {
				g(42, "1.0")
			}
		}
		g(0, "SEQEND")
		g(8, layer)
	}
	polygon := func(layer string, p geom.Polygon) {
		vs := make([]vtx, len(p))
		for i, q := range p {
			vs[i] = vtx{p: q}
		}
		poly(layer, vs, true)
	}
	circle := func(layer string, c geom.Point, d int64) {
		r := d / 2
		poly(layer, []vtx{{geom.Point{X: c.X - r, Y: c.Y}, true}, {geom.Point{X: c.X - r + d, Y: c.Y}, true}}, true)
	}
	for _, n := range l.Copper {
		polygon(DXFCopperTop, n.Outline)
	}
	for _, p := range l.Pads {
		if p.Round {
			circle(DXFCopperTop, p.Center, p.W)
			continue
		}
		polygon(DXFCopperTop, geom.Rect{Min: geom.Point{X: p.Center.X - p.W/2, Y: p.Center.Y - p.H/2},
			Max: geom.Point{X: p.Center.X - p.W/2 + p.W, Y: p.Center.Y - p.H/2 + p.H}}.Polygon())
	}
	if len(l.Ground) >= 3 {
		polygon(DXFCopperBottom, l.Ground)
	}
	for _, p := range l.MaskOpenings {
		polygon(DXFMaskTop, p)
	}
	for _, s := range l.Legend {
		vs := make([]vtx, len(s))
		for i, q := range s {
			vs[i] = vtx{p: q}
		}
		poly(DXFLegendTop, vs, false)
	}
	polygon(DXFOutline, l.Board)
	for _, v := range l.Vias {
		circle(DXFDrill, v.Center, v.Drill)
	}
	g(0, "ENDSEC")
	g(0, "EOF")
	if err := b.Flush(); err != nil {
		return fmt.Errorf("export: writing DXF: %w", err)
	}
	return nil
}
