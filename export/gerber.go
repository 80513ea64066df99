package export

import (
	"bufio"
	"fmt"
	"io"
	"strconv"

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
)

// Layers lists every Layer in the order a job file lists them.
func Layers() []Layer { return []Layer{CopperTop, CopperBottom, SoldermaskTop, Profile, DrillPTH} }

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
	}
	return "Layer(" + strconv.Itoa(int(ly)) + ")"
}

// FileFunction returns the value of the layer's .FileFunction attribute.
func (ly Layer) FileFunction() string {
	switch ly {
	case CopperTop:
		return "Copper,L1,Top"
	case CopperBottom:
		return "Copper,L2,Bot"
	case Profile:
		return "Profile,NP"
	case SoldermaskTop:
		return "Soldermask,Top"
	case DrillPTH:
		return "Plated,1,2,PTH"
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
			g.region(n.Outline, "Conductor", n.Name)
		}
		g.flashes(l.Pads)
	case CopperBottom:
		g.regionAperture("Conductor")
		g.region(l.Ground, "Conductor", geom.NetGround)
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

// ProfileLineWidth is the width of the board outline's draw, nm. The
// specification leaves it free; a thin line keeps the rendered outline
// close to the board edge.
const ProfileLineWidth = 50000

// gerber accumulates the first write error, in the manner of bufio.Writer.
type gerber struct {
	w      *bufio.Writer
	err    error
	codes  []padKey // aperture D-codes 10, 11, ... in order of first use
	holes  []int64
	objNet string
}

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
	g.line("%TF.FileFunction," + layer.FileFunction() + "*%")
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

func (g *gerber) flashes(pads []geom.Pad) {
	cur := -1
	for _, p := range pads {
		g.net(p.Net)
		if d := g.code(padKey{p.Function, p.W, p.H, p.Round}); d != cur {
			cur = d
			g.line("D" + strconv.Itoa(d) + "*")
		}
		g.line(xy(p.Center) + "D03*")
	}
	g.net("")
}

// net sets or, for "", clears the .N object attribute.
func (g *gerber) net(n string) {
	if n == g.objNet {
		return
	}
	if g.objNet != "" {
		g.line("%TD*%")
	}
	if n != "" {
		g.line("%TO.N," + attrField(n) + "*%")
	}
	g.objNet = n
}

// region fills a polygon; function and net may be empty.
func (g *gerber) region(p geom.Polygon, function, net string) {
	if len(p) < 3 {
		return
	}
	if function != "" {
		g.line("%TA.AperFunction," + function + "*%")
	}
	g.net(net)
	g.line("G36*")
	g.contour(p)
	g.line("G37*")
	if function != "" || g.objNet != "" {
		g.line("%TD*%") // clears both the aperture and the object attributes
		g.objNet = ""
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
