package export

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"

	"stubcraft/synth/geom"
)

// Layer is one Gerber file of a board.
type Layer int

// The layers WriteGerber writes.
const (
	CopperTop     Layer = iota + 1 // top copper: the network, port and via pads
	CopperBottom                   // bottom copper: the ground plane
	Profile                        // the board outline
	SoldermaskTop                  // the top solder-mask openings
	DrillPTH                       // the plated through holes, as a Gerber drill layer
	LegendTop                      // the top legend (silkscreen)
)

// Layers lists every Layer in the order a job file lists them.
func Layers() []Layer {
	return []Layer{CopperTop, CopperBottom, SoldermaskTop, LegendTop, Profile, DrillPTH}
}

// Has reports whether the layout puts anything on the layer: a file is
// written only for a layer with content (an empty drill or mask Gerber
// reads as a different, older format to some readers and tells a fab
// nothing).
func (ly Layer) Has(l geom.Layout) bool {
	switch ly {
	case CopperTop:
		return len(l.Copper) > 0 || len(l.Pads) > 0
	case CopperBottom:
		return len(l.Ground) >= 3
	case Profile:
		return len(l.Board) >= 3
	case SoldermaskTop:
		return len(l.MaskOpenings) > 0
	case DrillPTH:
		return len(l.Vias) > 0
	case LegendTop:
		return len(l.Legend) > 0
	}
	return false
}

// LayersOf lists the layers of l that have content, in the order of
// Layers.
func LayersOf(l geom.Layout) []Layer {
	var out []Layer
	for _, ly := range Layers() {
		if ly.Has(l) {
			out = append(out, ly)
		}
	}
	return out
}

// String returns the layer's name as used in file names.
func (ly Layer) String() string {
	switch ly {
	case CopperTop:
		return "copper-top"
	case CopperBottom:
		return "copper-bottom"
	case Profile:
		return "outline"
	case SoldermaskTop:
		return "mask-top"
	case DrillPTH:
		return "drill-plated"
	case LegendTop:
		return "legend-top"
	}
	return "Layer(" + strconv.Itoa(int(ly)) + ")"
}

// FileFunction returns the value of the layer's .FileFunction attribute
// on a two-layer board.
func (ly Layer) FileFunction() string { return ly.FileFunctionOf(2) }

// FileFunctionOf returns the value of the layer's .FileFunction attribute
// on a board of that many copper layers (Gerber Layer Format
// Specification 2023.08, 5.6.3, from memory): on a multilayer board the
// plane under the top layer is the inner layer L2, and the vias are
// plated through all layers.
func (ly Layer) FileFunctionOf(layers int) string {
	if layers < 2 {
		layers = 2
	}
	switch ly {
	case CopperTop:
		return "Copper,L1,Top"
	case CopperBottom:
		if layers > 2 {
			return "Copper,L2,Inr"
		}
		return "Copper,L2,Bot"
	case Profile:
		return "Profile,NP"
	case SoldermaskTop:
		return "Soldermask,Top"
	case DrillPTH:
		return "Plated,1," + strconv.Itoa(layers) + ",PTH"
	case LegendTop:
		return "Legend,Top"
	}
	return ""
}

// FilePolarity returns the value of the layer's .FilePolarity attribute.
// The solder-mask file draws the openings, where there is no mask:
// Negative.
func (ly Layer) FilePolarity() string {
	if ly == SoldermaskTop {
		return "Negative"
	}
	return "Positive"
}

// FileName returns the name of the layer's Gerber file for a board called
// base: "<base>-<layer>.gbr".
func (ly Layer) FileName(base string) string { return baseName(base) + "-" + ly.String() + ".gbr" }

// ExcellonFileName returns the name of the Excellon drill file for a board
// called base.
func ExcellonFileName(base string) string { return baseName(base) + "-drill.drl" }

// JobFileName returns the name of the Gerber job file for a board called
// base.
func JobFileName(base string) string { return baseName(base) + ".gbrjob" }

// WriteGerber writes one layer of the layout as a Gerber X2 file, to the
// Gerber Layer Format Specification (revision 2023.08): millimetres,
// format 4.6 (so a coordinate is the integer nanometre value itself),
// standard apertures, regions for copper shapes, file, aperture and object
// attributes. The output depends only on its arguments.
func WriteGerber(w io.Writer, l geom.Layout, layer Layer, meta Meta) error {
	if layer.FileFunction() == "" {
		return fmt.Errorf("export: unknown Gerber layer %d", int(layer))
	}
	if !layer.Has(l) {
		return fmt.Errorf("export: %s Gerber: %w", layer, ErrEmptyLayer)
	}
	guid, err := meta.ProjectGUID()
	if err != nil {
		return err
	}
	g := &gerber{w: bufio.NewWriter(w)}
	g.header(layer, meta, guid, l.Name)
	switch layer {
	case CopperTop:
		g.apertures(l.Pads)
		if len(g.codes) == 0 {
			g.regionAperture("Conductor")
		}
		for _, n := range l.Copper {
			g.region(n.Outline, "Conductor", l.DCNet(n.Name))
		}
		g.flashes(l, l.Pads)
	case CopperBottom:
		g.regionAperture("Conductor")
		g.region(l.Ground, "Conductor", l.DCNet(geom.NetGround))
	case Profile:
		g.line("%TA.AperFunction,Profile*%")
		g.line("%ADD10C," + geom.FormatMM(ProfileLineWidth) + "*%")
		g.line("%TD*%")
		g.line("D10*")
		g.contour(l.Board)
	case SoldermaskTop:
		g.regionAperture("")
		for _, p := range l.MaskOpenings {
			g.region(p, "", "")
		}
	case DrillPTH:
		g.drills(l.Vias)
	case LegendTop:
		g.line("%ADD10C," + geom.FormatMM(geom.LegendLine) + "*%")
		g.line("D10*")
		for _, s := range l.Legend {
			if len(s) < 2 {
				continue
			}
			g.line(xy(s[0]) + "D02*")
			for _, p := range s[1:] {
				g.line(xy(p) + "D01*")
			}
		}
	}
	g.line("M02*")
	if g.err != nil {
		return fmt.Errorf("export: writing %s Gerber: %w", layer, g.err)
	}
	if err := g.w.Flush(); err != nil {
		return fmt.Errorf("export: writing %s Gerber: %w", layer, err)
	}
	return nil
}

// ErrEmptyLayer is returned for a file that would have no content: a
// layer the layout leaves empty, a drill file without holes.
var ErrEmptyLayer = errors.New("the layout puts nothing on this layer")

// ProfileLineWidth is the width of the board outline's draw, nm. The
// specification leaves it free; a thin line keeps the rendered outline
// close to the board edge.
const ProfileLineWidth = 50000

// gerber accumulates the first write error, in the manner of bufio.Writer.
type gerber struct {
	w     *bufio.Writer
	err   error
	codes []padKey // aperture D-codes 10, 11, ... in order of first use
	obj   objAttrs // the object attributes in force
}

// objAttrs are the object attributes a writer attaches to a graphical
// object: the net (.N) and the pin (.P, "J1,1").
type objAttrs struct{ net, pin string }

type padKey struct {
	function string
	w, h     int64
	round    bool
}

func (g *gerber) line(s string) {
	if g.err != nil {
		return
	}
	_, g.err = g.w.WriteString(s + "\n")
}

func (g *gerber) header(layer Layer, meta Meta, guid, board string) {
	g.line("%TF.GenerationSoftware," + attrField(Vendor) + "," + attrField(Application) + "," + attrField(meta.version()) + "*%")
	g.line("%TF.CreationDate," + meta.creationDate() + "*%")
	g.line("%TF.ProjectId," + attrField(meta.name()) + "," + guid + "," + attrField(meta.revision()) + "*%")
	g.line("%TF.SameCoordinates," + guid + "*%")
	g.line("%TF.FileFunction," + layer.FileFunctionOf(meta.Layers) + "*%")
	g.line("%TF.FilePolarity," + layer.FilePolarity() + "*%")
	g.line("%FSLAX46Y46*%")
	g.line("%MOMM*%")
	g.line("G04 " + commentText(board) + " " + layer.String() + "*")
	g.line("%LPD*%")
	g.line("G01*")
}

// apertures defines one standard aperture per distinct pad, each after
// its aperture-function attribute.
func (g *gerber) apertures(pads []geom.Pad) {
	for _, p := range pads {
		k := padKey{p.Function, p.W, p.H, p.Round}
		if g.code(k) >= 0 {
			continue
		}
		g.codes = append(g.codes, k)
		g.line("%TA.AperFunction," + p.Function + "*%")
		if p.Round {
			g.line(fmt.Sprintf("%%ADD%dC,%s*%%", 9+len(g.codes), geom.FormatMM(p.W)))
		} else {
			g.line(fmt.Sprintf("%%ADD%dR,%sX%s*%%", 9+len(g.codes), geom.FormatMM(p.W), geom.FormatMM(p.H)))
		}
	}
	if len(g.codes) > 0 {
		g.line("%TD*%")
	}
}

// regionAperture defines and selects a small round aperture, D10, in a
// file that has only regions. Regions do not use the current aperture, but
// readers that predate RS-274X extended apertures take a file with no
// aperture definition for RS-274D and warn.
func (g *gerber) regionAperture(function string) {
	if function != "" {
		g.line("%TA.AperFunction," + function + "*%")
	}
	g.line("%ADD10C," + geom.FormatMM(ProfileLineWidth) + "*%")
	if function != "" {
		g.line("%TD*%")
	}
	g.line("D10*")
}

func (g *gerber) code(k padKey) int {
	for i, c := range g.codes {
		if c == k {
			return 10 + i
		}
	}
	return -1
}

func (g *gerber) flashes(l geom.Layout, pads []geom.Pad) {
	cur := -1
	for _, p := range pads {
		g.object(objAttrs{l.DCNet(p.Net), p.Pin})
		if d := g.code(padKey{p.Function, p.W, p.H, p.Round}); d != cur {
			cur = d
			g.line("D" + strconv.Itoa(d) + "*")
		}
		g.line(xy(p.Center) + "D03*")
	}
	g.object(objAttrs{})
}

// object sets the object attributes (.N net, .P pin; Gerber Layer Format
// Specification 2023.08, the standard object attributes), clearing the
// ones in force first; the zero value clears them.
func (g *gerber) object(a objAttrs) {
	if a == g.obj {
		return
	}
	if g.obj != (objAttrs{}) {
		g.line("%TD*%")
	}
	if a.net != "" {
		g.line("%TO.N," + attrField(a.net) + "*%")
	}
	if a.pin != "" {
		ref, pin, _ := strings.Cut(a.pin, ",")
		g.line("%TO.P," + attrField(ref) + "," + attrField(pin) + "*%")
	}
	g.obj = a
}

// region fills a polygon; function and net may be empty.
func (g *gerber) region(p geom.Polygon, function, net string) {
	if len(p) < 3 {
		return
	}
	if function != "" {
		g.line("%TA.AperFunction," + function + "*%")
	}
	g.object(objAttrs{net: net})
	g.line("G36*")
	g.contour(p)
	g.line("G37*")
	if function != "" || g.obj != (objAttrs{}) {
		g.line("%TD*%") // clears both the aperture and the object attributes
		g.obj = objAttrs{}
	}
}

// contour draws a closed contour with the current aperture (or, inside
// G36/G37, a region boundary).
func (g *gerber) contour(p geom.Polygon) {
	g.line(xy(p[0]) + "D02*")
	for _, q := range p[1:] {
		g.line(xy(q) + "D01*")
	}
	g.line(xy(p[0]) + "D01*")
}

func (g *gerber) drills(vias []geom.Via) {
	var sizes []int64
	for _, v := range vias {
		sizes = addSize(sizes, v.Drill)
	}
	for i, d := range sizes {
		g.line("%TA.AperFunction,ViaDrill*%")
		g.line(fmt.Sprintf("%%ADD%dC,%s*%%", 10+i, geom.FormatMM(d)))
	}
	if len(sizes) > 0 {
		g.line("%TD*%")
	}
	for i, d := range sizes {
		g.line("D" + strconv.Itoa(10+i) + "*")
		for _, v := range vias {
			if v.Drill == d {
				g.line(xy(v.Center) + "D03*")
			}
		}
	}
}

// addSize inserts d into the ascending list s if it is not there yet.
func addSize(s []int64, d int64) []int64 {
	i := 0
	for i < len(s) && s[i] < d {
		i++
	}
	if i < len(s) && s[i] == d {
		return s
	}
	return append(s[:i], append([]int64{d}, s[i:]...)...)
}

// xy prints a point in format 4.6 mm: the digits are the nanometres.
func xy(p geom.Point) string {
	return "X" + strconv.FormatInt(p.X, 10) + "Y" + strconv.FormatInt(p.Y, 10)
}

func baseName(s string) string {
	b := []rune{}
	for _, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_', r == '.':
			b = append(b, r)
		default:
			b = append(b, '_')
		}
	}
	if len(b) == 0 {
		return "board"
	}
	return string(b)
}
