package export

import (
	"fmt"
	"math"

	"github.com/jung-kurt/gofpdf"
)

// view maps board millimetres (y up) to paper millimetres (y down):
// paper = (ox + s·x, oy − s·y).
type view struct{ s, ox, oy float64 }

func (v view) X(x float64) float64 { return v.ox + v.s*x }
func (v view) Y(y float64) float64 { return v.oy - v.s*y }

// boardSheets draws sheet 1, or the tiles of a board drawn at 1:1 across
// several sheets.
func (d *doc) boardSheets(b boardModel, p boardPlan) {
	cw, ch := p.canvas(b)
	a := p.area
	if !p.tiled {
		sub := "scale 1:1 — true size"
		if p.scale != 1 {
			sub = "NOT TO SCALE 1:1 — drawn at " + p.ratio
		}
		d.newSheet("Copper layout, top view", sub)
		if p.scale != 1 {
			d.notToScaleBanner(p)
		}
		if p.detail == 0 {
			x0 := a.x + (a.w-cw)/2
			y0 := a.y + (a.h-ch)/2
			d.drawBoard(b, view{p.scale, x0 + p.ext.left, y0 + p.ext.top + p.scale*b.h}, true, rect{a.x, a.y, a.x + a.w, a.y + a.h}, false)
			d.scaleStrip(p, "")
			return
		}
		// A true-size view with an enlarged view of the same board under it.
		q := boardPlan{scale: p.detail, ext: b.extentsAt(p.detail)}
		dw, dh := q.canvas(b)
		gap := (a.h - ch - dh - 2*viewCaptionH) / 3
		y0 := a.y + gap
		x0 := a.x + (a.w-cw)/2
		y1 := y0 + viewCaptionH + ch + gap
		dropped := d.drawBoard(b, view{1, x0 + p.ext.left, y0 + viewCaptionH + p.ext.top + b.h}, true,
			rect{a.x, y0 + viewCaptionH - gap/2, a.x + a.w, y1 - gap/2}, true)
		remark := "measure from this view"
		if dropped > 0 {
			remark += fmt.Sprintf("; %d value(s) too tight to print at 1:1 are given in the enlarged view", dropped)
		}
		d.viewCaption(a.x, y0+4, "TRUE SIZE 1:1", remark)
		setDraw(d.pdf, colRule)
		d.pdf.SetLineWidth(0.2)
		d.pdf.SetDashPattern([]float64{1, 1}, 0)
		d.pdf.Line(a.x, y1-gap/2, a.x+a.w, y1-gap/2)
		d.pdf.SetDashPattern(nil, 0)
		d.viewCaption(a.x, y1+4, "ENLARGED VIEW "+p.detailRatio, "the same board and dimensions, magnified for reading: do not measure this view")
		x1 := a.x + (a.w-dw)/2
		d.drawBoard(b, view{p.detail, x1 + q.ext.left, y1 + viewCaptionH + q.ext.top + p.detail*b.h}, false,
			rect{a.x, y1 + viewCaptionH, a.x + a.w, a.y + a.h}, false)
		d.scaleStrip(p, "")
		return
	}
	stepX, stepY := a.w-tileOverlap, a.h-tileOverlap
	n := 0
	for j := 0; j < p.ny; j++ {
		for i := 0; i < p.nx; i++ {
			n++
			d.newSheet(fmt.Sprintf("Copper layout, top view — tile %d of %d", n, p.nx*p.ny), "scale 1:1 — true size, tiled")
			f := d.pdf
			f.ClipRect(a.x, a.y, a.w, a.h, false)
			ox := a.x - float64(i)*stepX
			oy := a.y - float64(j)*stepY
			v := view{1, ox + p.ext.left, oy + p.ext.top + b.h}
			d.drawBoard(b, v, true, rect{ox, oy, ox + math.Max(cw, a.w), oy + math.Max(ch, a.h)}, false)
			d.glueMarks(ox, oy, cw, ch, stepX, stepY, p)
			f.ClipEnd()
			setDraw(f, colRule)
			f.SetLineWidth(0.2)
			f.Rect(a.x, a.y, a.w, a.h, "D")
			d.scaleStrip(p, fmt.Sprintf("tile %d of %d: column %d of %d, row %d of %d. Neighbouring tiles overlap by %.0f mm: "+
				"trim one along its dashed glue line and lay it over the other so the + marks coincide.",
				n, p.nx*p.ny, i+1, p.nx, j+1, p.ny, tileOverlap))
			d.tileMap(p, i, j)
		}
	}
}

// notToScaleBanner states, above the drawing, that it is not at 1:1.
func (d *doc) notToScaleBanner(p boardPlan) {
	f := d.pdf
	a := p.area
	y := a.y - bannerH
	setFill(f, 0xfbe9e4)
	f.Rect(a.x, y, a.w, bannerH-2, "F")
	f.SetFont(fontSans, "B", 11)
	setText(f, colWarn)
	s := fmt.Sprintf("NOT TO SCALE 1:1 — drawn at %s (scale %s): do not take sizes from this print; read the dimensions", p.ratio, p.ratio)
	f.SetFont(fontSans, "B", 8.5)
	f.Text(a.x+2, y+4.6, s)
}

// glueMarks draws, in canvas coordinates with the canvas's top-left at
// (ox, oy), a dashed glue line and + marks down the middle of every
// overlap between tiles, so the same marks print on both neighbours.
func (d *doc) glueMarks(ox, oy, cw, ch, stepX, stepY float64, p boardPlan) {
	f := d.pdf
	setDraw(f, colAccent)
	f.SetLineWidth(0.2)
	cross := func(x, y float64) {
		f.SetDashPattern(nil, 0)
		f.Line(x-2.5, y, x+2.5, y)
		f.Line(x, y-2.5, x, y+2.5)
		f.Circle(x, y, 1.2, "D")
	}
	for i := 1; i < p.nx; i++ {
		x := ox + float64(i)*stepX + tileOverlap/2
		f.SetDashPattern([]float64{2, 1.5}, 0)
		f.Line(x, oy, x, oy+math.Max(ch, float64(p.ny)*stepY+tileOverlap))
		for y := oy + 20; y < oy+float64(p.ny)*stepY+tileOverlap; y += 40 {
			cross(x, y)
		}
	}
	for j := 1; j < p.ny; j++ {
		y := oy + float64(j)*stepY + tileOverlap/2
		f.SetDashPattern([]float64{2, 1.5}, 0)
		f.Line(ox, y, ox+math.Max(cw, float64(p.nx)*stepX+tileOverlap), y)
		for x := ox + 20; x < ox+float64(p.nx)*stepX+tileOverlap; x += 40 {
			cross(x, y)
		}
	}
	f.SetDashPattern(nil, 0)
}

// tileMap draws a small map of the tiles with this one filled.
func (d *doc) tileMap(p boardPlan, ci, cj int) {
	f := d.pdf
	a := p.area
	const cell = 4.0
	x0 := a.x + a.w - float64(p.nx)*cell
	y0 := a.y + a.h + 3
	f.SetLineWidth(0.15)
	setDraw(f, colInk)
	for j := 0; j < p.ny; j++ {
		for i := 0; i < p.nx; i++ {
			style := "D"
			if i == ci && j == cj {
				setFill(f, colAccent)
				style = "FD"
			}
			f.Rect(x0+float64(i)*cell, y0+float64(j)*cell, cell, cell, style)
		}
	}
}

// scaleStrip draws the 50 mm scale bar and the print instructions under
// the drawing area; extra is a further note (the tile's place).
func (d *doc) scaleStrip(p boardPlan, extra string) {
	f := d.pdf
	a := p.area
	d.headlineStrip(a.x, a.y+a.h+1, a.w)
	y := a.y + a.h + p.reserve + 4
	x := a.x + 2
	s := p.scale
	const seg = 10.0 // mm of board per bar segment
	f.SetLineWidth(0.15)
	setDraw(f, colInk)
	for i := 0; i < 5; i++ {
		c := rgb(0xffffff)
		if i%2 == 0 {
			c = colInk
		}
		setFill(f, c)
		f.Rect(x+float64(i)*seg*s, y, seg*s, 2.2, "FD")
	}
	// The bar's length, as one line along its foot, for a reader to
	// measure.
	f.RawWriteStr("/ScaleBar BMC\n")
	f.SetLineWidth(0.25)
	f.Line(x, y+2.2, x+50*s, y+2.2)
	f.RawWriteStr("EMC\n")
	for i := 0; i <= 5; i++ {
		tx := x + float64(i)*seg*s
		f.Line(tx, y+2.2, tx, y+3.4)
		t := fmt.Sprintf("%d", i*10)
		if i == 5 {
			t = "50 mm"
		}
		f.SetFont(fontSans, "", noteFontPt)
		setText(f, colInk)
		w := f.GetStringWidth(t)
		if i == 5 {
			w = f.GetStringWidth("50")
		}
		f.Text(tx-w/2, y+5.8, t)
	}
	nx := x + math.Max(50*s, 30) + 12
	f.SetFont(fontSans, "B", 7)
	setText(f, colInk)
	var head, body string
	if s == 1 {
		head = "Print at 100 %, no fit-to-page."
		body = "Check with a ruler after printing: the bar must measure 50 mm, the board outline the sizes dimensioned."
	} else {
		head = fmt.Sprintf("NOT TO SCALE 1:1. Scale %s: the bar is 50 mm on the board, %.1f mm on paper.", p.ratio, 50*s)
		body = "Print at 100 %, no fit-to-page; take sizes from the dimensions, never from the print. Use --fit tile for a 1:1 print."
	}
	f.Text(nx, y+1.8, head)
	f.SetFont(fontSans, "", 6.5)
	setText(f, colMuted)
	f.SetXY(nx, y+2.8)
	f.MultiCell(a.x+a.w-nx-22, 2.9, body+" "+extra, "", "L", false)
}

// viewCaption writes a view's name and a remark at (x, y).
func (d *doc) viewCaption(x, y float64, name, remark string) {
	f := d.pdf
	f.SetFont(fontSans, "B", 8)
	setText(f, colAccent)
	f.Text(x, y, name)
	w := f.GetStringWidth(name)
	f.SetFont(fontSans, "", 6.5)
	setText(f, colMuted)
	f.Text(x+w+3, y, remark)
}

// drawBoard draws the board, its copper, vias and every dimension in view
// v, its labels placed inside bounds clear of each other and of copper.
// The outline of the view to measure (measured) is tagged /BoardOutline
// in the content stream, its copper /Copper. With optional set, a value
// that finds no clear spot is left out (for an enlarged view to show); it
// returns how many were.
func (d *doc) drawBoard(b boardModel, v view, measured bool, bounds rect, optional bool) int {
	f := d.pdf
	k := &ink{f: f, pl: newPlacer(pdfWidth(f), bounds), optional: optional}
	// Board outline.
	setFill(f, colBoard)
	setDraw(f, colBoardEdge)
	f.SetLineWidth(0.3)
	tag := "/BoardDetail BMC\n"
	if measured {
		tag = "/BoardOutline BMC\n"
	}
	f.RawWriteStr(tag)
	f.Rect(v.X(0), v.Y(b.h), v.s*b.w, v.s*b.h, "FD")
	f.RawWriteStr("EMC\n")
	corners := []ptMM{{v.X(0), v.Y(0)}, {v.X(b.w), v.Y(0)}, {v.X(b.w), v.Y(b.h)}, {v.X(0), v.Y(b.h)}}
	for i := range corners {
		a, c := corners[i], corners[(i+1)%4]
		k.pl.line(obsLine, 0, a.x, a.y, c.x, c.y)
	}
	// Copper.
	setFill(f, colCopper)
	setDraw(f, colCopperEdg)
	f.SetLineWidth(0.12)
	f.RawWriteStr("/Copper BMC\n")
	for i, poly := range b.copper {
		setFill(f, colCopper)
		if b.pour[i] {
			setFill(f, colPour)
		}
		copperPolygon(f, k, v, poly)
	}
	if n := len(b.pour); n > 0 && b.pour[n-1] {
		setFill(f, colCopper) // the pads in copper, as in layout.svg, not in the pour's fill
	}
	for _, p := range b.pads {
		if p.round {
			f.Circle(v.X(p.c.x), v.Y(p.c.y), v.s*p.w/2, "FD")
			k.pl.add(newObstacle(obsCopper, 0, true, square(v.X(p.c.x), v.Y(p.c.y), v.s*p.w/2)...))
			continue
		}
		if !p.ground {
			continue // a port pad lies on the line's copper
		}
		// A landing's ground pad is copper of its own.
		x0, y0 := v.X(p.c.x-p.w/2), v.Y(p.c.y+p.h/2)
		f.Rect(x0, y0, v.s*p.w, v.s*p.h, "F")
		k.pl.add(newObstacle(obsCopper, 0, true, rect{x0, y0, x0 + v.s*p.w, y0 + v.s*p.h}.corners()...))
	}
	for _, via := range b.vias {
		k.pl.add(newObstacle(obsCopper, 0, true, square(v.X(via.c.x), v.Y(via.c.y), v.s*via.pad/2)...))
	}
	f.RawWriteStr("EMC\n")
	for _, p := range b.pads {
		if p.round {
			continue
		}
		f.SetDashPattern([]float64{0.6, 0.4}, 0)
		f.Rect(v.X(p.c.x-p.w/2), v.Y(p.c.y+p.h/2), v.s*p.w, v.s*p.h, "D")
		f.SetDashPattern(nil, 0)
	}
	for _, via := range b.vias {
		setFill(f, colDrill)
		setDraw(f, colInk)
		f.Circle(v.X(via.c.x), v.Y(via.c.y), v.s*via.drill/2, "FD")
		f.Line(v.X(via.c.x)-0.8, v.Y(via.c.y), v.X(via.c.x)+0.8, v.Y(via.c.y))
		f.Line(v.X(via.c.x), v.Y(via.c.y)-0.8, v.X(via.c.x), v.Y(via.c.y)+0.8)
	}
	d.trimTicks(b, v)
	d.centreLines(k, b, v)
	d.portLabels(k, b, v)
	d.boardDims(k, b, v)
	return k.flush()
}

// copperPolygon draws poly (board mm) in view v, filled with the current
// fill and outlined, and makes it copper that k's labels keep clear of.
func copperPolygon(f *gofpdf.Fpdf, k *ink, v view, poly []ptMM) {
	pts := make([]gofpdf.PointType, len(poly))
	area := make([]ptMM, len(poly))
	for j, q := range poly {
		pts[j] = gofpdf.PointType{X: v.X(q.x), Y: v.Y(q.y)}
		area[j] = ptMM{v.X(q.x), v.Y(q.y)}
	}
	f.Polygon(pts, "FD")
	k.pl.add(newObstacle(obsCopper, 0, true, area...))
}

// square is the square of half side r about (x, y), as a polygon.
func square(x, y, r float64) []ptMM {
	return []ptMM{{x - r, y - r}, {x + r, y - r}, {x + r, y + r}, {x - r, y + r}}
}

// centreLines draws the through line's and the stubs' centre lines
// (long dash, short dash) and the reference-plane marks at each tee.
func (d *doc) centreLines(k *ink, b boardModel, v view) {
	f := d.pdf
	setDraw(f, colRefPlane)
	f.SetLineWidth(0.12)
	f.SetDashPattern([]float64{3, 0.8, 0.6, 0.8}, 0)
	centre := func(x1, y1, x2, y2 float64) {
		f.Line(x1, y1, x2, y2)
		k.pl.line(obsCentre, 0, x1, y1, x2, y2)
	}
	centre(v.X(0)-3, v.Y(b.centreY), v.X(b.w)+3, v.Y(b.centreY))
	for _, s := range b.stubs {
		if s.bend != nil {
			d.bentCentreLine(s, v, b.centreY)
			continue
		}
		far := s.tip
		if s.via != nil {
			far = s.via.c.y + s.side*s.via.pad/2
		}
		centre(v.X(s.cx), v.Y(b.centreY), v.X(s.cx), v.Y(far)-s.side*2.5)
	}
	f.SetDashPattern(nil, 0)
	for _, s := range b.stubs {
		// Reference plane: a plum bar across the stub at its root with
		// triangles pointing at the plane, and the tee centre cross.
		k.group()
		y := v.Y(s.ref)
		xl, xr := v.X(s.x0)-3.5, v.X(s.x1)+3.5
		f.SetLineWidth(0.3)
		f.SetDashPattern([]float64{1.2, 0.6}, 0)
		f.Line(xl, y, xr, y)
		k.pl.line(obsCentre, k.owner, xl, y, xr, y)
		f.SetDashPattern(nil, 0)
		setFill(f, colRefPlane)
		for _, x := range []float64{xl, xr} {
			arrow(f, x, y, 0, s.side*-1)
		}
		f.SetLineWidth(0.2)
		tx, ty := v.X(s.teeX), v.Y(s.teeY)
		f.Line(tx-1.4, ty, tx+1.4, ty)
		f.Line(tx, ty-1.4, tx, ty+1.4)
		k.text(labelReq{lines: []string{"ref. plane"}, pt: noteFontPt, col: colRefPlane, anchor: ptMM{xl, y}, priority: 2,
			spots: []spot{{x: xl - 1.2, y: y - s.side*1.9, align: 'R'}, {x: xl - 1.2, y: y + s.side*1.9, align: 'R'},
				{x: xr + 1.2, y: y - s.side*1.9, align: 'L'}, {x: xr + 1.2, y: y + s.side*1.9, align: 'L'},
				{x: xl - 1.2, y: y - s.side*4.5, align: 'R', leader: true}, {x: xr + 1.2, y: y - s.side*4.5, align: 'L', leader: true}}})
	}
}

// portLabels names the load and source ports beside the board edges.
func (d *doc) portLabels(k *ink, b boardModel, v view) {
	f := d.pdf
	for i, name := range []string{"load port", "source port"} {
		k.group()
		p := b.ports[i]
		x, y := v.X(p.x), v.Y(p.y)
		setDraw(f, colAccent)
		setFill(f, colAccent)
		f.SetLineWidth(0.2)
		dir := -1.0
		align := byte('R')
		if i == 1 {
			dir, align = 1, 'L'
		}
		f.Line(x+dir*12, y+0.8, x+dir*2.5, y+0.8)
		k.pl.line(obsLine, k.owner, x+dir*12, y+0.8, x+dir*2.5, y+0.8)
		arrow(f, x+dir*0.5, y+0.8, -dir, 0)
		c := 6.5 * 25.4 / 72 * capEm / 2
		k.text(labelReq{lines: []string{name}, pt: 6.5, bold: true, col: colAccent, anchor: ptMM{x + dir*12, y + 0.8},
			spots: []spot{{x: x + dir*2, y: y - 1.2 - c, align: align}, {x: x + dir*2, y: y + 2.2 + c, align: align},
				{x: x + dir*12.6, y: y + 0.8, align: align}, {x: x + dir*2, y: y - 3.8 - c, align: align},
				{x: x + dir*2, y: y + 4.8 + c, align: align}}})
	}
}

// boardDims draws every dimension of the board.
func (d *doc) boardDims(k *ink, b boardModel, v view) {
	// Segment widths, across each segment away from its stubs, the value
	// on the side the stubs leave free, at alternating distances.
	up := true
	for _, s := range b.stubs {
		if s.side > 0 {
			up = false
		}
	}
	for i, g := range b.segs {
		x := v.X(widthDimX(b, g))
		k.dimAcross(x, v.Y(g.hi), v.Y(g.lo), mm3(g.hi-g.lo), up, float64(i%2)*3.2)
	}
	// Stubs: width beyond the end, drawn length beside, via callout.
	low := v.Y(0)
	for _, s := range b.stubs {
		if s.bend != nil {
			low = math.Max(low, d.bentStubDims(k, s, v))
			continue
		}
		far := s.tip
		if s.via != nil {
			far = s.via.c.y + s.side*s.via.pad/2
		}
		yd := v.Y(far) - s.side*dimStubGap
		k.dimH(v.X(s.x0), v.Y(s.tip), v.X(s.x1), v.Y(s.tip), yd, mm3(s.x1-s.x0), false)
		right := math.Max(v.X(s.x1), v.X(s.cx)+v.s*padOf(s)/2)
		xd := right + dimStubGap
		endX := v.X(s.x1)
		if s.via != nil {
			endX = v.X(s.cx) + v.s*s.via.pad/2
		}
		k.dimV(v.X(s.x1), v.Y(s.ref), endX, v.Y(s.end), xd, mm3(math.Abs(s.end-s.ref)), true)
		if s.via != nil {
			my := (v.Y(s.ref) + v.Y(s.end)) / 2
			k.note("to via centre", ptMM{xd, my}, spot{x: xd + 1.2, y: my + 2.8, align: 'L'}, spot{x: xd + 1.2, y: my - 2.8, align: 'L'},
				spot{x: xd - 1.2, y: my + 2.8, align: 'R'}, spot{x: xd + 1.2, y: my + 5.4, align: 'L'})
			vx, vy := v.X(s.via.c.x), v.Y(s.via.c.y)
			// The callout points left, clear of the length dimension on
			// the right, unless another stub on this side stands close on
			// the left: then it goes out beyond the length dimension.
			tx := v.X(s.x0) - 4
			for _, o := range b.stubs {
				if o.id != s.id && o.side == s.side && o.cx < s.cx && v.X(s.x0)-v.X(o.x1) < 30 {
					tx = xd + 14
				}
			}
			k.leader(vx, vy, tx, vy+s.side*3, fmt.Sprintf("via: drill Ø%s", mm3(s.via.drill)), fmt.Sprintf("pad Ø%s", mm3(s.via.pad)))
		} else {
			tip := ptMM{v.X(s.cx), v.Y(s.tip)}
			k.note("open end", tip, spot{x: v.X(s.x0) - 1.2, y: v.Y(s.tip) + s.side*1.4, align: 'R'},
				spot{x: v.X(s.x1) + 1.2, y: v.Y(s.tip) + s.side*1.4, align: 'L'},
				spot{x: v.X(s.x0) - 1.2, y: v.Y(s.tip) + s.side*4, align: 'R'},
				spot{x: v.X(s.x0) - 1.2, y: v.Y(s.tip) - s.side*1.4, align: 'R'})
		}
		low = math.Max(low, yd)
	}
	// A coplanar board: the gap over the first segment and the pitch of
	// the stitching vias.
	if x, lo, hi, ok := b.pourGap(); ok {
		k.dimV(v.X(x), v.Y(lo), v.X(x), v.Y(hi), v.X(x), "gap "+mm3(hi-lo), false)
	}
	if p, q, vertical, ok := b.stitchPitch(); ok {
		pad := 0.0
		for _, via := range b.vias {
			pad = math.Max(pad, via.pad)
		}
		off := v.s*pad/2 + 2.5
		if vertical {
			k.dimV(v.X(p.x), v.Y(p.y), v.X(q.x), v.Y(q.y), v.X(p.x)-off, "via pitch "+mm3(q.y-p.y), false)
		} else {
			k.dimH(v.X(p.x), v.Y(p.y), v.X(q.x), v.Y(q.y), v.Y(p.y)-off, "via pitch "+mm3(q.x-p.x), false)
		}
	}
	// Rows under the board: segment lengths, stub positions, board length.
	row := low + dimFirstRow
	caption := func(s string, y float64) {
		k.text(labelReq{lines: []string{s}, pt: noteFontPt, col: colMuted, anchor: ptMM{v.X(0) - 3, y},
			spots: []spot{{x: v.X(0) - 3, y: y, align: 'R'}}})
	}
	k.group()
	caption("drawn lengths", row)
	for i, g := range b.segs {
		k.dimH(v.X(g.x0), v.Y(g.lo), v.X(g.x1), v.Y(g.lo), row, mm3(g.x1-g.x0), i%2 == 1)
	}
	for _, s := range b.stubs {
		row += dimRowGap
		k.group()
		k.text(labelReq{lines: []string{s.id + " centre"}, pt: noteFontPt, col: colMuted, anchor: ptMM{v.X(0) - 3, row},
			spots: []spot{{x: v.X(0) - 3, y: row - 1.3, align: 'R'}}})
		k.text(labelReq{lines: []string{"from each board edge"}, pt: noteFontPt - 0.7, col: colMuted, anchor: ptMM{v.X(0) - 3, row},
			spots: []spot{{x: v.X(0) - 3, y: row + 1.3, align: 'R'}}})
		k.dimH(v.X(0), v.Y(0), v.X(s.cx), v.Y(b.centreY), row, mm3(s.cx), false)
		k.dimH(v.X(s.cx), v.Y(b.centreY), v.X(b.w), v.Y(0), row, mm3(b.w-s.cx), false)
	}
	row += dimRowGap
	k.group()
	caption("board", row)
	k.dimH(v.X(0), v.Y(0), v.X(b.w), v.Y(0), row, mm3(b.w), false)
	k.dimV(v.X(b.w), v.Y(0), v.X(b.w), v.Y(b.h), v.X(b.w)+heightDimOff, mm3(b.h), true)
}

// widthDimX is the x at which a segment's width is dimensioned: its
// middle, or the middle of its longest part clear of stubs.
func widthDimX(b boardModel, g segMM) float64 {
	lo, hi := g.x0, g.x1
	for _, s := range b.stubs {
		l, r := s.x0-0.5, s.x1+0.5
		if r <= lo || l >= hi {
			continue
		}
		if l-lo >= hi-r {
			hi = l
		} else {
			lo = r
		}
	}
	if hi <= lo {
		return (g.x0 + g.x1) / 2
	}
	return (lo + hi) / 2
}

// padOf is a stub's via pad diameter, or 0.
func padOf(s stubMM) float64 {
	if s.via == nil {
		return 0
	}
	return s.via.pad
}

// trimTicks draws the trim ticks of the stubs drawn with a trim allowance:
// a line across the stub at every tick, tick 0 (the design length) longer
// and heavier, so that the bench can cut back to a tick.
func (d *doc) trimTicks(b boardModel, v view) {
	f := d.pdf
	setDraw(f, colInk)
	for _, t := range b.trims {
		for k, p := range t.at {
			half := 0.5*t.across + 0.6
			f.SetLineWidth(0.12)
			if k == 0 {
				half += 0.8
				f.SetLineWidth(0.3)
			}
			// across the stub: perpendicular to its direction
			ax, ay := -t.dir.y*half, t.dir.x*half
			f.Line(v.X(p.x-ax), v.Y(p.y-ay), v.X(p.x+ax), v.Y(p.y+ay))
		}
	}
	f.SetLineWidth(0.12)
}
