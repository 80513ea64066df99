package export

import "github.com/jung-kurt/gofpdf"

// rgb is a colour 0xRRGGBB of the drawing's own palette.
type rgb uint32

// The palette: slate ink, a deep teal accent, bronze copper on a pale sage
// board, blue-ink dimensions and plum reference planes.
const (
	colInk       rgb = 0x222831
	colMuted     rgb = 0x5f6670
	colAccent    rgb = 0x00696e
	colRule      rgb = 0x9aa3a8
	colPaperTint rgb = 0xeef3f1
	colBoard     rgb = 0xe6ecdc
	colBoardEdge rgb = 0x46583c
	colCopper    rgb = 0xc98a3e
	colCopperEdg rgb = 0x7e4e1c
	colPour      rgb = 0xe2bf8e
	colDrill     rgb = 0xffffff
	colDim       rgb = 0x1c4078
	colRefPlane  rgb = 0xa82a62
	colGrid      rgb = 0xd6ccb6
	colCurveA    rgb = 0x00696e
	colCurveB    rgb = 0x963c8c
	colLimit     rgb = 0xc85a1e
	colDielec    rgb = 0xd9e3c4
	colMask      rgb = 0x7f9a6a
	colWarn      rgb = 0xb0341c
)

func (c rgb) parts() (r, g, b int) { return int(c >> 16 & 0xff), int(c >> 8 & 0xff), int(c & 0xff) }

func setDraw(f *gofpdf.Fpdf, c rgb) { f.SetDrawColor(c.parts()) }
func setFill(f *gofpdf.Fpdf, c rgb) { f.SetFillColor(c.parts()) }
func setText(f *gofpdf.Fpdf, c rgb) { f.SetTextColor(c.parts()) }
