package export

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"stubcraft/stackups"

	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// FabNotesFileName is the name of the fabrication notes in a build.
const FabNotesFileName = "fab-notes.txt"

// ImpedanceTolerance is the tolerance on Z0 the fab notes ask for:
// ±10 %, what board houses commonly offer as impedance control (common
// practice, no source).
const ImpedanceTolerance = 0.10

// FabNotes is what a board house needs beside the artwork: the board,
// the material, the controlled impedances, the holes and the rules the
// artwork follows. WriteFabNotes prints it as text, WritePDF as a sheet.
type FabNotes struct {
	Board string
	// Facts are label and value pairs: size, material, thickness, copper,
	// finish, mask, layers.
	Facts [][2]string
	// Impedance has one row per distinct line width.
	Impedance []ImpedanceRow
	// Drills has one row per drill size.
	Drills []DrillRow
	// Rules are the conventions of the artwork the fab must keep: the
	// edge clearance, the nets, the impedance control.
	Rules []string
	// Files lists the fabrication files with their functions.
	Files [][2]string
}

// ImpedanceRow is one controlled-impedance line width.
type ImpedanceRow struct {
	WidthMM   float64 // drawn width, mm, as report.json's width_mm
	Z0Ohm     float64 // target characteristic impedance, ohm
	Tolerance float64 // relative, 0.10 for ±10 %
	Layer     string
	Reference string // the reference plane(s)
	Elements  []string
}

// DrillRow is one drill size.
type DrillRow struct {
	Tool       int
	DiameterMM float64 // finished hole, mm
	Count      int
	Plated     bool
	Function   string
}

// NewFabNotes collects the fab notes of a build. The impedance table comes
// from the report's elements (width_mm and z0_ohm), so it matches
// report.json by construction of the same values; the drill table from the
// layout's vias, as the Excellon file numbers its tools.
func NewFabNotes(res *synth.Result, rep Report, lay geom.Layout) FabNotes {
	st := res.Stackup
	lo, hi := lay.Board.Bounds()
	n := FabNotes{Board: rep.Name}
	fact := func(k, v string) { n.Facts = append(n.Facts, [2]string{k, v}) }
	fact("board", rep.Name)
	fact("size", fmt.Sprintf("%.3f × %.3f mm, rectangular, routed on the outline of %s", float64(hi.X-lo.X)*1e-6, float64(hi.Y-lo.Y)*1e-6, Profile.FileName(lay.Name)))
	desc := st.Name
	if st.Description != "" {
		desc += " (" + st.Description + ")"
	}
	fact("material", desc)
	fact("dielectric", fmt.Sprintf("%s mm between L1 and its plane, εr %.3g (typical, as the stackup gives it), tanδ %.2g",
		mmText(geom.Nanometres(st.Dielectric.Thickness)), st.Dielectric.Er, st.Dielectric.LossTangent))
	layers := 2
	if st.Board != nil {
		layers = st.Board.Layers
	}
	if st.LayerPair() {
		fact("layers", fmt.Sprintf("these files describe the outer layer pair (L1 signal, L2 plane) of a %d-layer board; the other layers are not in them", layers))
	} else {
		fact("layers", "2 (L1 signal, L2 ground plane)")
	}
	fact("board thickness", mmText(geom.Nanometres(st.BoardThickness()))+" mm finished")
	cu := st.Copper.Thickness
	fact("copper", fmt.Sprintf("%.0f µm finished on L1 (about %.2g oz)", cu*1e6, cu/34.79e-6))
	fact("finish", synth.FinishJobName(res.Design.Fab.Finish))
	mask := "top, windows over the RF copper (the lines are sized bare)"
	if res.Design.Layout.Mask == synth.MaskCover {
		mask = "top, covering the lines, openings only at the port pads"
	}
	if st.Mask != nil {
		mask += fmt.Sprintf("; %.0f µm, εr %.3g over the lines", st.Mask.Thickness*1e6, st.Mask.Er)
	}
	fact("solder mask", mask)

	ref := "L2 ground plane"
	if st.LayerPair() {
		ref = "L2 inner ground plane"
	}
	if st.Line == stackups.GCPW {
		ref += fmt.Sprintf(" and the coplanar ground on L1 at %s mm gap", mmText(geom.Nanometres(st.Gap)))
	}
	for _, e := range rep.Elements {
		w := math.Round(e.WidthMM*1e3) / 1e3
		found := false
		for i := range n.Impedance {
			r := &n.Impedance[i]
			if r.WidthMM == w && math.Abs(r.Z0Ohm-e.Z0Ohm) < 1e-9 {
				r.Elements = append(r.Elements, e.ID)
				found = true
			}
		}
		if !found {
			n.Impedance = append(n.Impedance, ImpedanceRow{WidthMM: w, Z0Ohm: e.Z0Ohm, Tolerance: ImpedanceTolerance,
				Layer: "L1 (top)", Reference: ref, Elements: []string{e.ID}})
		}
	}
	sort.SliceStable(n.Impedance, func(i, j int) bool { return n.Impedance[i].WidthMM < n.Impedance[j].WidthMM })

	var sizes []int64
	for _, v := range lay.Vias {
		sizes = addSize(sizes, v.Drill)
	}
	for i, d := range sizes {
		row := DrillRow{Tool: i + 1, DiameterMM: float64(d) * 1e-6, Plated: true, Function: "via to the plane"}
		for _, v := range lay.Vias {
			if v.Drill == d {
				row.Count++
			}
		}
		n.Drills = append(n.Drills, row)
	}

	clr := geom.Nanometres(res.Design.Layout.EdgeClearance)
	launch := res.GeomSpec().Launch
	pads := "its port pads (J1, J2)"
	if launch != nil {
		pads = "its signal pads (J1 and J2 pin 1)"
	}
	n.Rules = append(n.Rules,
		fmt.Sprintf("Impedance control: hold each width of the table to its target Z0 ±%.0f %% on the material above; adjust the width only, and say so before changing it.", 100*ImpedanceTolerance),
		fmt.Sprintf("Edge clearance: all copper is pulled back %s mm from the routed outline, except the signal line and %s, which run to the board edge at the two ports for an edge-launch connector. Do not pull back further and do not trim the port copper.", mmText(clr), pads),
	)
	if launch != nil {
		n.Rules = append(n.Rules, fmt.Sprintf("Edge launch: each port (J1, J2) has a landing for an edge-launch connector (no part specified): the signal pad (pin 1, %s × %s mm) at the board edge, and %s mm from it on each side a ground pad (pins 2 and 3, %s × %s mm, net GND) with %d plated vias to the plane; all landing pads are open in the solder mask.",
			mmText(geom.Nanometres(launch.PadLength)), mmText(geom.Nanometres(launch.PadWidth)), mmText(geom.Nanometres(launch.Gap)),
			mmText(geom.Nanometres(launch.GroundLength)), mmText(geom.Nanometres(launch.GroundWidth)), geom.LaunchViaCount(*launch)))
	}
	if f := res.GeomSpec().Fence; f != nil {
		n.Rules = append(n.Rules, fmt.Sprintf("Via fence: %d plated vias (net GND, %s mm drill, %s mm pads) to the plane alongside the RF lines, centres %s mm from the copper's edge; keep them where drawn.",
			synth.FenceViaCount(lay), mmText(geom.Nanometres(f.Drill)), mmText(geom.Nanometres(f.Pad)), mmText(geom.Nanometres(f.Offset))))
	}
	switch {
	case lay.ShortedToGround():
		n.Rules = append(n.Rules, "Netlist: a shorted stub's via joins the signal copper to the ground plane, so RF and GND are one DC net, "+geom.NetRFGround+": an electrical test finds the signal pins J1 and J2 shorted to ground, by design.")
	case launch != nil:
		n.Rules = append(n.Rules, "Netlist: net RF (the signal copper, J1 and J2 pin 1) and net GND (the plane and the landings' ground pads, J1 and J2 pins 2 and 3) are not connected.")
	default:
		n.Rules = append(n.Rules, "Netlist: net RF (the signal copper, pins J1 and J2) and net GND (the plane) are not connected.")
	}
	if len(lay.Vias) == 0 {
		n.Rules = append(n.Rules, "No holes: the board is routed only; there is no drill file.")
	}
	for _, ly := range LayersOf(lay) {
		n.Files = append(n.Files, [2]string{ly.FileName(lay.Name), ly.FileFunctionOf(layers)})
	}
	if len(lay.Vias) > 0 {
		n.Files = append(n.Files, [2]string{ExcellonFileName(lay.Name), "Excellon, " + DrillPTH.FileFunctionOf(layers)})
	}
	n.Files = append(n.Files, [2]string{JobFileName(lay.Name), "Gerber job file"})
	if len(res.Structures) > 0 {
		var names []string
		for _, s := range res.Structures {
			names = append(names, s.Layout.Name)
			for _, ly := range LayersOf(s.Layout) {
				n.Files = append(n.Files, [2]string{ly.FileName(s.Layout.Name), ly.FileFunctionOf(layers)})
			}
			if len(s.Layout.Vias) > 0 {
				n.Files = append(n.Files, [2]string{ExcellonFileName(s.Layout.Name), "Excellon, " + DrillPTH.FileFunctionOf(layers)})
			}
			n.Files = append(n.Files, [2]string{JobFileName(s.Layout.Name), "Gerber job file of " + s.Layout.Name})
		}
		n.Rules = append(n.Rules, fmt.Sprintf("Test structures: make %s on the same panel and material as the board, each routed on its own outline, same widths, copper, finish and mask; they are for measuring this board and must come from the same lot.",
			strings.Join(names, ", ")))
	}
	return n
}

// ImpedanceTableHeader is the header line of the impedance table in
// fab-notes.txt; each row below it has the columns tab-separated.
const ImpedanceTableHeader = "width_mm\tz0_ohm\ttolerance\tlayer\treference\telements"

// WriteFabNotes writes the notes as plain UTF-8 text.
func WriteFabNotes(w io.Writer, n FabNotes) error {
	b := bufio.NewWriter(w)
	p := func(format string, a ...any) { fmt.Fprintf(b, format+"\n", a...) }
	p("Fabrication notes: %s", n.Board)
	p("")
	for _, f := range n.Facts {
		p("%-16s %s", f[0]+":", f[1])
	}
	p("")
	p("Controlled impedance (target Z0 ±%.0f %%):", 100*ImpedanceTolerance)
	p("%s", ImpedanceTableHeader)
	for _, r := range n.Impedance {
		p("%.3f\t%.2f\t±%.0f %%\t%s\t%s\t%s", r.WidthMM, r.Z0Ohm, 100*r.Tolerance, r.Layer, r.Reference, strings.Join(r.Elements, ", "))
	}
	p("")
	if len(n.Drills) > 0 {
		p("Drills:")
		p("tool\tdiameter_mm\tcount\tplated\tfunction")
		for _, d := range n.Drills {
			plated := "no"
			if d.Plated {
				plated = "yes"
			}
			p("T%02d\t%.3f\t%d\t%s\t%s", d.Tool, d.DiameterMM, d.Count, plated, d.Function)
		}
		p("")
	}
	p("Rules:")
	for _, r := range n.Rules {
		p("- %s", r)
	}
	p("")
	p("Files:")
	for _, f := range n.Files {
		p("%-40s %s", f[0], f[1])
	}
	if err := b.Flush(); err != nil {
		return fmt.Errorf("export: writing fab notes: %w", err)
	}
	return nil
}

// mmText prints nanometres as millimetres without trailing zeros.
func mmText(nm int64) string { return string(mmNumber(nm)) }
