package export

import (
	"fmt"
)

// structuresSheet draws the calibration and test structures of the panel,
// each at 1:1 with its outline, copper, length and width dimensioned and
// its purpose, one below the other. A structure wider than the sheet is
// drawn at the largest of the reduction scales that fits, and says so.
func (d *doc) structuresSheet() {
	ss := d.rep.Structures
	if len(ss) == 0 {
		return
	}
	f := d.pdf
	x, y, w, h := d.contentBox()
	bottom := y + h
	if yj, ok := d.joinSheet("Calibration and test structures", d.structuresHeight(w)); ok {
		y = yj
	} else {
		d.newSheet("Calibration and test structures", d.rep.Name+": made on the same panel, each on its own outline")
	}
	y += 4
	for _, s := range ss {
		scale := structureScale(s, w)
		bw, bh := s.BoardMM[0], s.BoardMM[1]
		need := bh*scale + 22
		if y+need > bottom {
			d.newSheet("Calibration and test structures (continued)", d.rep.Name)
			d.tailPage = f.PageNo()
			_, y, _, _ = d.contentBox()
			y += 4
		}
		// Title line.
		f.SetFont(fontSans, "B", 7.5)
		setText(f, colAccent)
		title := fmt.Sprintf("%s (%s)", s.Name, s.Kind)
		if scale != 1 {
			title += fmt.Sprintf(", drawn at 1:%g", 1/scale)
		}
		f.Text(x, y+3, title)
		y += 6
		ox, oy := x+2, y
		// Outline.
		setFill(f, colBoard)
		setDraw(f, colBoardEdge)
		f.SetLineWidth(0.3)
		f.Rect(ox, oy, bw*scale, bh*scale, "FD")
		// Copper: the line across the board at mid-height; the reflect
		// is two launches with a gap between them.
		setFill(f, colCopper)
		setDraw(f, colCopperEdg)
		f.SetLineWidth(0.12)
		cy := oy + bh*scale/2 - s.WidthMM*scale/2
		if s.Kind == "reflect" {
			f.Rect(ox, cy, s.LengthMM*scale, s.WidthMM*scale, "FD")
			f.Rect(ox+(bw-s.LengthMM)*scale, cy, s.LengthMM*scale, s.WidthMM*scale, "FD")
		} else {
			f.Rect(ox, cy, bw*scale, s.WidthMM*scale, "FD")
		}
		// Dimensions: the copper length below, the width at the right.
		setDraw(f, colDim)
		setFill(f, colDim)
		f.SetLineWidth(0.12)
		dimY := oy + bh*scale + 3
		run := s.LengthMM
		f.Line(ox, dimY, ox+run*scale, dimY)
		arrow(f, ox, dimY, -1, 0)
		arrow(f, ox+run*scale, dimY, 1, 0)
		label(f, mm3(run), ox+run*scale/2, dimY+3.2, "C", 6.5, colDim)
		wx := ox + bw*scale + 3
		label(f, "width "+mm3(s.WidthMM), wx, oy+bh*scale/2+1, "L", 6.5, colDim)
		label(f, fmt.Sprintf("board %s × %s", mm3(bw), mm3(bh)), wx, oy+bh*scale/2+4.5, "L", 6.5, colDim)
		y = dimY + 6
		// Purpose.
		f.SetFont(fontSans, "", 6.5)
		setText(f, colInk)
		for _, line := range f.SplitText(Minus(s.Note), w-4) {
			f.Text(x+2, y+2.2, line)
			y += 2.9
		}
		y += 4
	}
	d.tailPage, d.tailY = f.PageNo(), y
}

// structureScale is the scale a structure is drawn at on a sheet w wide:
// 1:1, or the largest reduction by halves that fits.
func structureScale(s ReportStructure, w float64) float64 {
	scale := 1.0
	for s.BoardMM[0]*scale > w-30 {
		scale /= 2
	}
	return scale
}

// structuresHeight is the height structuresSheet takes for the
// structures on a sheet w wide, mm, as it lays them out.
func (d *doc) structuresHeight(w float64) float64 {
	f := d.pdf
	f.SetFont(fontSans, "", 6.5)
	h := 4.0
	for _, s := range d.rep.Structures {
		h += 6 + s.BoardMM[1]*structureScale(s, w) + 9 + 4
		h += 2.9 * float64(len(f.SplitText(Minus(s.Note), w-4)))
	}
	return h
}
