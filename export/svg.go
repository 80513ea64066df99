package export

import (
	"bufio"
	"fmt"
	"html"
	"io"
	"math"
	"strings"

	"golang.org/x/image/font"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"

	"stubcraft/synth/geom"
)

// svgMargin is the room around the board for dimensions in layout.svg, mm.
const svgMargin = 14.0

// WriteSVG writes layout.svg: the board outline, copper, pads, vias and
// the main dimensions at true size. The document's width and height are in
// millimetres and its viewBox is in millimetres too, so one user unit is
// one millimetre; the board's y axis (up) is flipped to SVG's (down) by
// writing y' = height − y.
func WriteSVG(w io.Writer, rep Report, lay geom.Layout) error {
	b, err := newBoardModel(lay)
	if err != nil {
		return fmt.Errorf("layout.svg: %w", err)
	}
	s := &svgDoc{b: b, top: svgMargin + stubReach(b), left: svgMargin + 6, titles: map[int]string{}}
	bottom := svgMargin + 6*float64(len(b.stubs))
	W := s.left + b.w + svgMargin + 8
	H := s.top + b.h + bottom
	bw := bufio.NewWriter(w)
	s.w = bw
	width, err := svgWidth()
	if err != nil {
		return fmt.Errorf("layout.svg: %w", err)
	}
	s.pl = newPlacer(width, rect{0, 0, W, H})
	fmt.Fprintf(bw, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n")
	fmt.Fprintf(bw, "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%smm\" height=\"%smm\" viewBox=\"0 0 %s %s\" font-family=\"Go, sans-serif\">\n",
		num(W), num(H), num(W), num(H))
	fmt.Fprintf(bw, "<title>%s — top copper, true size (1 unit = 1 mm)</title>\n", html.EscapeString(nonEmpty(rep.Name, b.name)))
	fmt.Fprintf(bw, "<rect id=\"board-outline\" x=\"%s\" y=\"%s\" width=\"%s\" height=\"%s\" fill=\"#%06x\" stroke=\"#%06x\" stroke-width=\"0.15\"/>\n",
		num(s.X(0)), num(s.Y(b.h)), num(b.w), num(b.h), uint32(colBoard), uint32(colBoardEdge))
	for i, poly := range b.copper {
		var p strings.Builder
		area := make([]ptMM, len(poly))
		for k, q := range poly {
			area[k] = ptMM{s.X(q.x), s.Y(q.y)}
			if k == 0 {
				p.WriteString("M")
			} else {
				p.WriteString(" L")
			}
			fmt.Fprintf(&p, "%s %s", num(s.X(q.x)), num(s.Y(q.y)))
		}
		p.WriteString(" Z")
		fill := colCopper
		if b.pour[i] {
			fill = colPour
		}
		fmt.Fprintf(bw, "<path id=\"copper-%d\" d=\"%s\" fill=\"#%06x\" stroke=\"#%06x\" stroke-width=\"0.05\"/>\n", i, p.String(), uint32(fill), uint32(colCopperEdg))
		s.pl.add(newObstacle(obsCopper, 0, true, area...))
	}
	for _, p := range b.pads {
		if p.round {
			fmt.Fprintf(bw, "<circle class=\"pad\" cx=\"%s\" cy=\"%s\" r=\"%s\" fill=\"#%06x\"/>\n", num(s.X(p.c.x)), num(s.Y(p.c.y)), num(p.w/2), uint32(colCopper))
			s.pl.add(newObstacle(obsCopper, 0, true, square(s.X(p.c.x), s.Y(p.c.y), p.w/2)...))
		}
	}
	for _, v := range b.vias {
		fmt.Fprintf(bw, "<circle class=\"drill\" cx=\"%s\" cy=\"%s\" r=\"%s\" fill=\"#ffffff\" stroke=\"#%06x\" stroke-width=\"0.05\"/>\n", num(s.X(v.c.x)), num(s.Y(v.c.y)), num(v.drill/2), uint32(colInk))
	}
	fmt.Fprintf(bw, "<g class=\"dimensions\" stroke=\"#%06x\" fill=\"#%06x\" stroke-width=\"0.1\" font-size=\"1.8\">\n", uint32(colDim), uint32(colDim))
	for _, g := range b.segs {
		x := (g.x0 + g.x1) / 2
		for _, st := range b.stubs {
			if math.Abs(x-st.cx) < (st.x1-st.x0)/2+1 {
				x = g.x0 + (g.x1-g.x0)/4
			}
		}
		s.dimV(x, g.lo, g.hi, x, mm3(g.hi-g.lo), "width "+g.id)
	}
	row := -6.0
	for _, g := range b.segs {
		s.dimH(g.x0, g.x1, row, mm3(g.x1-g.x0), "length "+g.id)
	}
	for _, st := range b.stubs {
		if st.bend != nil {
			s.bentStub(st)
			row -= 6
			s.dimH(0, st.cx, row, mm3(st.cx), "stub "+st.id+" from load port")
			continue
		}
		s.dimH(st.x0, st.x1, st.tip+st.side*3, mm3(st.x1-st.x0), "width "+st.id)
		s.dimV(st.x1+3, st.ref, st.end, st.x1+3, mm3(math.Abs(st.end-st.ref)), "drawn length "+st.id)
		row -= 6
		s.dimH(0, st.cx, row, mm3(st.cx), "stub "+st.id+" from load port")
	}
	if x, lo, hi, ok := b.pourGap(); ok {
		s.dimV(x, lo, hi, x, "gap "+mm3(hi-lo), "coplanar gap, line edge to pour edge")
	}
	if p, q, vertical, ok := b.stitchPitch(); ok {
		if vertical {
			s.dimV(p.x-1.5, p.y, q.y, p.x-1.5, "via pitch "+mm3(q.y-p.y), "stitching via pitch, centre to centre")
		} else {
			s.dimH(p.x, q.x, p.y+1.5, "via pitch "+mm3(q.x-p.x), "stitching via pitch, centre to centre")
		}
	}
	s.dimH(0, b.w, row-6, mm3(b.w), "board length")
	s.dimV(b.w+8, 0, b.h, b.w+8, mm3(b.h), "board height")
	fmt.Fprintf(bw, "</g>\n")
	s.flush()
	fmt.Fprintf(bw, "</svg>\n")
	return bw.Flush()
}

// bentStub dimensions a bent stub: its first leg from the through line's
// edge to the bend's centre line beside the leg's outer edge, its second
// leg from the bend's centre line to the end (the via centre of a shorted
// stub) beyond the leg's outer edge, its width across the second leg
// beyond the end, and the miter's fraction beside the cut corner.
func (s *svgDoc) bentStub(st stubMM) {
	k := st.bend
	tw, sd := k.toward, st.side
	x1 := k.firstX - tw*3
	s.dimV(x1, st.ref, k.center.y, x1, mm3(k.leg1), "first leg "+st.id+", through line's edge to bend centre")
	endX := k.end.x
	what := "end"
	if k.via != nil {
		endX, what = k.via.c.x, "via centre"
	}
	s.dimH(k.center.x, endX, st.tip+sd*3, mm3(k.drawn2), "second leg "+st.id+", bend centre to "+what)
	xw := k.end.x + tw*3
	if k.via != nil {
		xw += tw * k.via.pad / 2
	}
	s.dimV(xw, k.inner, k.outer, xw, mm3(math.Abs(k.outer-k.inner)), "width "+st.id)
	cx, cy := k.corner.x-tw*1.5, k.corner.y+sd*1.5
	align := byte('R')
	if tw < 0 {
		align = 'L'
	}
	s.owner = s.pl.group()
	s.label(fmt.Sprintf("miter %.0f %%", math.Round(100*k.miter)),
		fmt.Sprintf("Douville and James 1978 optimal miter, cut %s mm along each edge", mm3(k.chamferLeg)),
		ptMM{s.X(k.corner.x), s.Y(k.corner.y)}, spot{x: s.X(cx), y: s.Y(cy), align: align})
}

// stubReach is how far stub dimensions reach above the board top, mm.
func stubReach(b boardModel) float64 {
	r := 0.0
	for _, s := range b.stubs {
		r = math.Max(r, s.tip+5-b.h)
		if s.bend != nil {
			r = math.Max(r, s.tip+8-b.h) // the second leg's dimension and the miter's label
		}
	}
	return r
}

// svgDoc writes board-millimetre geometry into SVG user units. Its
// dimension values are placed clear of each other and of copper by the
// drawing's label placer and written, after the lines, by flush.
type svgDoc struct {
	w         *bufio.Writer
	b         boardModel
	top, left float64
	pl        *placer
	owner     int
	queue     []labelReq
	titles    map[int]string // a label's owner → its dimension's title
}

func (s *svgDoc) X(x float64) float64 { return s.left + x }
func (s *svgDoc) Y(y float64) float64 { return s.top + s.b.h - y }

// svgFontMM is the font size of layout.svg's dimension values, mm.
const svgFontMM = 1.8

// svgWidth measures text in layout.svg's font: Go Regular, whose metrics
// the SVG's font-family names first.
func svgWidth() (func(string, float64, bool) float64, error) {
	fnt, err := sfnt.Parse(goregular.TTF)
	if err != nil {
		return nil, err
	}
	var buf sfnt.Buffer
	upem := float64(fnt.UnitsPerEm())
	return func(s string, pt float64, _ bool) float64 {
		w := 0.0
		for _, r := range s {
			g, err := fnt.GlyphIndex(&buf, r)
			if err != nil {
				continue
			}
			adv, err := fnt.GlyphAdvance(&buf, g, fixed.I(int(upem)), font.HintingNone)
			if err != nil {
				continue
			}
			w += float64(adv) / 64 / upem
		}
		return w * pt * 25.4 / 72
	}, nil
}

// line writes a line of the current dimension and registers it.
func (s *svgDoc) line(x1, y1, x2, y2 float64) {
	fmt.Fprintf(s.w, "<line x1=\"%s\" y1=\"%s\" x2=\"%s\" y2=\"%s\"/>", num(x1), num(y1), num(x2), num(y2))
	s.pl.line(obsLine, s.owner, x1, y1, x2, y2)
}

// label queues a value of the current dimension.
func (s *svgDoc) label(text, title string, anchor ptMM, spots ...spot) {
	s.titles[s.owner] = title
	s.queue = append(s.queue, labelReq{lines: []string{text}, pt: svgFontMM * 72 / 25.4, owner: s.owner, anchor: anchor, spots: spots, priority: 1})
}

// flush places the queued values and writes them, each with its
// dimension's title and a leader where it stands off its line.
func (s *svgDoc) flush() {
	fmt.Fprintf(s.w, "<g class=\"values\" fill=\"#%06x\" stroke=\"#%06x\" stroke-width=\"0.08\" font-size=\"%s\">\n", uint32(colDim), uint32(colDim), num(svgFontMM))
	for _, p := range s.pl.placeAll(s.queue) {
		l := p.req
		fmt.Fprintf(s.w, "<g><title>%s</title>", html.EscapeString(s.titles[l.owner]))
		if p.leader {
			a := p.box.nearest(l.anchor)
			fmt.Fprintf(s.w, "<line x1=\"%s\" y1=\"%s\" x2=\"%s\" y2=\"%s\"/>", num(l.anchor.x), num(l.anchor.y), num(a.x), num(a.y))
		}
		anchor := map[byte]string{'L': "start", 'C': "middle", 'R': "end"}[p.at.align]
		base := p.at.y + capEm*svgFontMM/2
		fmt.Fprintf(s.w, "<text x=\"%s\" y=\"%s\" text-anchor=\"%s\" stroke=\"none\">%s</text></g>\n", num(p.at.x), num(base), anchor, html.EscapeString(l.lines[0]))
	}
	fmt.Fprintf(s.w, "</g>\n")
	s.queue = nil
}

// dimH draws a horizontal dimension from x1 to x2 at board height y.
func (s *svgDoc) dimH(x1, x2, y float64, text, title string) {
	X1, X2, Y := s.X(x1), s.X(x2), s.Y(y)
	s.owner = s.pl.group()
	fmt.Fprintf(s.w, "<g><title>%s</title>", html.EscapeString(title))
	s.line(X1, Y, X2, Y)
	s.head(X1, Y, -1, 0)
	s.head(X2, Y, 1, 0)
	fmt.Fprintf(s.w, "</g>\n")
	tw := s.pl.width(text, svgFontMM*72/25.4, false)
	s.label(text, title, ptMM{(X1 + X2) / 2, Y}, hSpots(X1, X2, Y, tw, 0.6+capEm*svgFontMM/2, 0.6+capEm*svgFontMM/2+0.4, 1.6, false)...)
}

// dimV draws a vertical dimension from y1 to y2 at board x, text beside.
func (s *svgDoc) dimV(x, y1, y2, tx float64, text, title string) {
	X, Y1, Y2 := s.X(x), s.Y(y1), s.Y(y2)
	if Y2 < Y1 {
		Y1, Y2 = Y2, Y1
	}
	s.owner = s.pl.group()
	fmt.Fprintf(s.w, "<g><title>%s</title>", html.EscapeString(title))
	s.line(X, Y1, X, Y2)
	s.head(X, Y1, 0, -1)
	s.head(X, Y2, 0, 1)
	fmt.Fprintf(s.w, "</g>\n")
	s.label(text, title, ptMM{X, (Y1 + Y2) / 2}, vSpots(s.X(tx), Y1, Y2, 0.6, 2.2, true)...)
}

// head draws an arrowhead with its tip at (x, y) pointing along (dx, dy).
func (s *svgDoc) head(x, y, dx, dy float64) {
	const l, h = 1.2, 0.35
	bx, by := x-dx*l, y-dy*l
	fmt.Fprintf(s.w, "<path stroke=\"none\" d=\"M%s %s L%s %s L%s %s Z\"/>", num(x), num(y),
		num(bx-dy*h), num(by+dx*h), num(bx+dy*h), num(by-dx*h))
}

// num writes a coordinate in mm to the micrometre, without trailing zeros.
func num(v float64) string {
	s := fmt.Sprintf("%.4f", v)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" || s == "" {
		s = "0"
	}
	return s
}

func nonEmpty(a, b string) string {
	if a != "" {
		return a
	}
	return b
}
