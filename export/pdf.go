package export

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"github.com/jung-kurt/gofpdf"

	"stubcraft/physical/units"
	"stubcraft/synth/geom"
)

// PageSize is the paper of the drawing, portrait.
type PageSize string

// Page sizes.
const (
	A4     PageSize = "a4"
	Letter PageSize = "letter"
)

// String returns the name ParsePageSize reads.
func (p PageSize) String() string { return string(p) }

// ParsePageSize reads "a4" or "letter" (case ignored).
func ParsePageSize(s string) (PageSize, error) {
	switch p := PageSize(strings.ToLower(s)); p {
	case A4, Letter:
		return p, nil
	}
	return "", fmt.Errorf("page %q: use a4 or letter", s)
}

// Fit says what happens to a board that does not fit the page at 1:1.
type Fit string

// Fits.
const (
	// FitScale draws the board at a stated smaller scale, marked NOT TO
	// SCALE 1:1.
	FitScale Fit = "scale"
	// FitTile draws it at 1:1 across several pages with overlap and glue
	// marks.
	FitTile Fit = "tile"
)

// String returns the name ParseFit reads.
func (f Fit) String() string { return string(f) }

// ParseFit reads "scale" or "tile" (case ignored).
func ParseFit(s string) (Fit, error) {
	switch f := Fit(strings.ToLower(s)); f {
	case FitScale, FitTile:
		return f, nil
	}
	return "", fmt.Errorf("fit %q: use scale or tile", s)
}

// DrawingOptions are the choices of the PDF drawing.
type DrawingOptions struct {
	// Page is the paper; "" is A4.
	Page PageSize
	// Fit says what happens to a board that does not fit the page at 1:1;
	// "" is FitScale.
	Fit Fit
	// Created dates the drawing: the title block and the PDF's creation
	// and modification dates. The caller takes it from SOURCE_DATE_EPOCH
	// for reproducible output; the zero time is written as 1970-01-01.
	Created time.Time
	// FabNotes, when not nil, adds a fab-notes sheet after the data
	// sheets.
	FabNotes *FabNotes
	// Version is the tool version printed in the title block.
	Version string
}

// paper is a page size in millimetres.
type paper struct {
	name string // gofpdf's size name
	w, h float64
}

// paperOf returns the paper of p.
func paperOf(p PageSize) (paper, error) {
	switch p {
	case "", A4:
		return paper{"A4", 210, 297}, nil
	case Letter:
		return paper{"Letter", 215.9, 279.4}, nil
	}
	return paper{}, fmt.Errorf("drawing: page %q: want a4 or letter", p)
}

// WritePDF writes the dimensioned drawing of lay: sheet 1 (or sheets 1 to
// n when tiled) shows the board with every width, drawn length, stub
// position, the board size and the vias dimensioned in millimetres, at
// 1:1 when it fits the page; the next sheet shows the stackup, the table
// of elements, |S11| against frequency, a Smith chart, the tolerance
// histogram, the RF safety cautions and the build's notes and warnings.
// The same input gives the same bytes.
func WritePDF(w io.Writer, rep Report, lay geom.Layout, opt DrawingOptions) error {
	pg, err := paperOf(opt.Page)
	if err != nil {
		return err
	}
	fit := opt.Fit
	if fit == "" {
		fit = FitScale
	}
	if fit != FitScale && fit != FitTile {
		return fmt.Errorf("drawing: fit %q: want scale or tile", opt.Fit)
	}
	b, err := newBoardModel(lay)
	if err != nil {
		return fmt.Errorf("drawing: %w", err)
	}
	plan := planBoard(b, pg, fit, headlineHeight(rep))
	// The first pass counts the sheets for "sheet n of m"; the second
	// writes them.
	// It also finds the sheets two parts share, so the second pass can
	// title them.
	d, err := renderPDF(rep, b, plan, pg, opt, 0, nil)
	if err != nil {
		return err
	}
	d, err = renderPDF(rep, b, plan, pg, opt, d.pdf.PageNo(), d.shared)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if err := d.pdf.Output(&buf); err != nil {
		return fmt.Errorf("drawing: %w", err)
	}
	_, err = w.Write(buf.Bytes())
	return err
}

// doc is a drawing being written.
type doc struct {
	pdf   *gofpdf.Fpdf
	pg    paper
	rep   Report
	opt   DrawingOptions
	total int // sheets in the drawing, 0 while counting
	// titles are the titles of the sheets two parts share, by sheet
	// number, as the first pass found them (nil on that pass).
	titles map[int]string
	// title is the title of the current sheet; tailPage is the sheet a
	// flowing part (notes, structures) ended on with free space below,
	// from tailY down (0: none).
	title    string
	tailPage int
	tailY    float64
	// shared collects the titles of the shared sheets for the second
	// pass.
	shared map[int]string
}

// renderPDF draws every sheet; total is the sheet count for the title
// blocks (0 on the counting pass) and titles the titles of the sheets two
// parts share (nil on the counting pass).
func renderPDF(rep Report, b boardModel, plan boardPlan, pg paper, opt DrawingOptions, total int, titles map[int]string) (*doc, error) {
	f := gofpdf.New("P", "mm", pg.name, "")
	f.SetCatalogSort(true)
	f.SetCompression(true)
	created := opt.Created.UTC()
	if opt.Created.IsZero() {
		created = time.Unix(0, 0).UTC()
	}
	f.SetCreationDate(created)
	f.SetModificationDate(created)
	f.SetCreator("stubcraft "+version(rep, opt), true)
	f.SetProducer("stubcraft", true)
	f.SetTitle(rep.Name+" — bench drawing", true)
	f.SetAutoPageBreak(false, 0)
	f.SetMargins(0, 0, 0)
	for _, ff := range fontFiles() {
		// A copy: gofpdf writes into the bytes it is given while it
		// subsets, which would change the next drawing of the process.
		f.AddUTF8FontFromBytes(ff.family, ff.style, bytes.Clone(ff.ttf))
	}
	d := &doc{pdf: f, pg: pg, rep: rep, opt: opt, total: total, titles: titles, shared: map[int]string{}}
	d.boardSheets(b, plan)
	d.dataSheets(b)
	d.landingSheet(b)
	d.structuresSheet()
	if opt.FabNotes != nil {
		d.fabNotesSheet(*opt.FabNotes)
	}
	if err := f.Error(); err != nil {
		return nil, fmt.Errorf("drawing: %w", err)
	}
	return d, nil
}

// version is the tool version for the title block.
func version(rep Report, opt DrawingOptions) string {
	if opt.Version != "" {
		return opt.Version
	}
	return rep.Version
}

// Page furniture, mm.
const (
	pageMargin  = 10.0 // paper edge to frame
	headerH     = 11.0 // sheet title band under the frame's top
	titleBlockH = 22.0 // title block above the frame's bottom
)

// newSheet starts a page with its frame, header line and title block.
func (d *doc) newSheet(title, subtitle string) {
	f := d.pdf
	d.title = title
	f.AddPage()
	n := f.PageNo()
	if t, ok := d.titles[n]; ok {
		title = t
	}
	m := pageMargin
	setDraw(f, colInk)
	f.SetLineWidth(0.35)
	f.Rect(m, m, d.pg.w-2*m, d.pg.h-2*m, "D")
	f.SetFont(fontSans, "B", 11)
	setText(f, colInk)
	f.Text(m+3, m+7, title)
	if subtitle != "" {
		f.SetFont(fontSans, "", 8)
		setText(f, colAccent)
		f.Text(d.pg.w-m-3-f.GetStringWidth(subtitle), m+7, subtitle)
	}
	setDraw(f, colAccent)
	f.SetLineWidth(0.5)
	f.Line(m, m+headerH, d.pg.w-m, m+headerH)
	d.titleBlock(n)
}

// joinSheet puts a part of the given height below the flowing part that
// ended on the current sheet, under a rule and the part's heading, when it
// fits there; it returns the y the part starts at and whether it joined.
func (d *doc) joinSheet(heading string, need float64) (float64, bool) {
	const gap = 8.0
	x, cy, w, ch := d.contentBox()
	if d.tailPage == 0 || d.tailPage != d.pdf.PageNo() || d.tailY+gap+need > cy+ch {
		return 0, false
	}
	f := d.pdf
	y := d.tailY + gap - 3
	setDraw(f, colAccent)
	f.SetLineWidth(0.3)
	f.Line(x, y, x+w, y)
	f.SetFont(fontSans, "B", 10)
	setText(f, colInk)
	f.Text(x, y+5, heading)
	d.title += " and " + strings.ToLower(heading[:1]) + heading[1:]
	d.shared[d.pdf.PageNo()] = d.title
	return y + 6, true
}

// contentBox returns the drawable area of a sheet between the header and
// the title block: left, top, width, height in mm.
func (d *doc) contentBox() (x, y, w, h float64) {
	m := pageMargin
	x, y = m+3, m+headerH+3
	return x, y, d.pg.w - 2*x, d.pg.h - m - titleBlockH - 3 - y
}

// titleBlock draws the title block of sheet n: a band across the foot of
// the frame, the design name large on the left, the facts in labelled
// cells and the sheet count on the right.
func (d *doc) titleBlock(n int) {
	f := d.pdf
	m := pageMargin
	x0, y0 := m, d.pg.h-m-titleBlockH
	w := d.pg.w - 2*m
	setFill(f, colPaperTint)
	f.Rect(x0, y0, w, titleBlockH, "F")
	setFill(f, colAccent)
	f.Rect(x0, y0, 2.5, titleBlockH, "F")
	setDraw(f, colAccent)
	f.SetLineWidth(0.5)
	f.Line(x0, y0, x0+w, y0)

	sheet := fmt.Sprintf("sheet %d of %d", n, d.total)
	if d.total == 0 {
		sheet = fmt.Sprintf("sheet %d of %d", n, n)
	}
	created := d.opt.Created.UTC()
	if d.opt.Created.IsZero() {
		created = time.Unix(0, 0).UTC()
	}
	name := d.rep.Name
	if name == "" {
		name = "unnamed design"
	}
	// The name shrinks to fit, then wraps (two lines at most); the lines
	// under it move down with it.
	pt, lines := fitText(f, name, "B", 13, 8, 0.40*w-8, 2)
	setText(f, colInk)
	f.SetFont(fontSans, "B", pt)
	base := y0 + 8.5
	if len(lines) > 1 {
		base = y0 + 5.5
	}
	lh := pt * 25.4 / 72 * pitchEm
	for i, l := range lines {
		f.Text(x0+6, base+float64(i)*lh, l)
	}
	sub := base + float64(len(lines)-1)*lh + 4.5
	f.SetFont(fontSans, "", 7)
	setText(f, colMuted)
	f.Text(x0+6, sub, "matching network, top copper over a solid ground plane")
	f.Text(x0+6, math.Min(sub+4, y0+titleBlockH-1.5), "all dimensions in mm unless stated")

	// Frequency, reference, date and tool take two narrow columns; the
	// stackup the rest of the width up to the sheet number.
	cx := x0 + 0.40*w
	colX := []float64{cx, cx + 24, cx + 48}
	colW := []float64{23, 23, x0 + w - 30 - colX[2] - 2}
	cells := []struct {
		label, value string
		col, row     int
		lines        int // the most lines the value may wrap to
	}{
		{"frequency", formatFreq(d.rep.FrequencyHz), 0, 0, 1},
		{"reference", fmt.Sprintf("%.4g Ω", d.rep.Z0Ohm), 1, 0, 1},
		{"stackup", d.rep.Stackup.Name, 2, 0, 3},
		{"date", created.Format("2006-01-02"), 0, 1, 1},
		{"tool", "stubcraft " + version(d.rep, d.opt), 1, 1, 1},
	}
	for _, c := range cells {
		x := colX[c.col]
		y := y0 + 2 + float64(c.row)*10
		f.SetFont(fontSans, "", 6)
		setText(f, colAccent)
		f.Text(x, y+3, c.label)
		pt, lines := fitText(f, c.value, "B", 8, 6, colW[c.col], c.lines)
		f.SetFont(fontSans, "B", pt)
		setText(f, colInk)
		for i, l := range lines {
			f.Text(x, y+7.5+float64(i)*pt*25.4/72*pitchEm, l)
		}
	}
	setDraw(f, colRule)
	f.SetLineWidth(0.2)
	f.Line(x0+w-30, y0+2, x0+w-30, y0+titleBlockH-2)
	f.SetFont(fontSans, "", 6)
	setText(f, colAccent)
	f.Text(x0+w-27, y0+5, "sheet")
	f.SetFont(fontSans, "B", 10)
	setText(f, colInk)
	f.Text(x0+w-27, y0+11, strings.TrimPrefix(sheet, "sheet "))
	f.SetFont(fontSans, "", 6)
	setText(f, colMuted)
	f.Text(x0+w-27, y0+17, "stubcraft drawing")
}

// fitText sets s in the largest size from maxPt down to minPt (in half
// points) at which it fits width w on one line; when even minPt is too
// wide it wraps s into at most n lines, breaking after spaces, hyphens and
// underscores (or anywhere in a run with none), at minPt or, if n lines
// cannot hold it there, smaller down to 4.5 pt. It returns the size and
// the lines; the text is never cut.
func fitText(f *gofpdf.Fpdf, s, style string, maxPt, minPt, w float64, n int) (float64, []string) {
	for pt := maxPt; pt >= minPt; pt -= 0.5 {
		f.SetFont(fontSans, style, pt)
		if f.GetStringWidth(s) <= w {
			return pt, []string{s}
		}
	}
	var lines []string
	pt := minPt
	for ; pt >= 4.5; pt -= 0.5 {
		f.SetFont(fontSans, style, pt)
		lines = wrapText(f, s, w, n)
		if f.GetStringWidth(lines[len(lines)-1]) <= w {
			break
		}
	}
	return math.Max(pt, 4.5), lines
}

// wrapText breaks s into at most n lines of width w in the current font,
// after spaces, hyphens and underscores where it can; the last line takes
// the rest.
func wrapText(f *gofpdf.Fpdf, s string, w float64, n int) []string {
	var lines []string
	rest := []rune(s)
	for len(rest) > 0 && len(lines) < n-1 {
		k := len(rest)
		for k > 1 && f.GetStringWidth(string(rest[:k])) > w {
			k--
		}
		if k == len(rest) {
			break
		}
		for j := k; j > 0; j-- {
			if c := rest[j-1]; c == ' ' || c == '-' || c == '_' {
				k = j
				break
			}
		}
		lines = append(lines, strings.TrimRight(string(rest[:k]), " "))
		rest = rest[k:]
	}
	if len(rest) > 0 {
		lines = append(lines, string(rest))
	}
	return lines
}

// formatFreq formats a frequency in its unit (MHz below 1 GHz) with up to
// six significant digits: "2.45 GHz", "433.92 MHz".
func formatFreq(hz float64) string { return units.FormatFrequency(hz, 6) }

// mm3 formats a length in mm with three decimals and a true minus sign.
func mm3(v float64) string { return Minus(fmt.Sprintf("%.3f", v)) }

// signed3 formats a correction in mm with three decimals and its sign.
func signed3(v float64) string { return Minus(fmt.Sprintf("%+.3f", v)) }
