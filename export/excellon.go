package export

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"stubcraft/synth/geom"
)

// WriteExcellon writes the plated through holes of the layout as an
// Excellon drill file, in the IPC-NC-349 conventions that board fabs read:
// an M48 header with "METRIC,TZ" and a tool table ("T01C0.400"), "%" to end
// the header, G90 (absolute) and G05 (drill mode), the hits, M30.
//
// Every coordinate and tool size is written in millimetres with an explicit
// decimal point (at least three decimals, trailing zeros beyond them
// dropped, exact to the nanometre), so the zero-suppression mode stated in
// the header (TZ: trailing zeros kept) never has to be applied by a reader.
// Tools are numbered by ascending diameter.
//
// The header carries the Gerber X2 attributes in the form X2-aware CAM
// reads from Excellon comments ("; #@! TF.FileFunction,Plated,1,2,PTH",
// "; #@! TA.AperFunction,Plated,PTH,ViaDrill" before each tool; the
// attribute values of the Gerber Layer Format Specification 2023.08,
// .FileFunction and .AperFunction for drill layers; the comment form is
// common practice, no source), and says in plain words that the holes are
// plated. All of stubcraft's holes are plated vias, so no non-plated file
// is ever written. A layout without holes gets no file: ErrEmptyLayer.
// The output depends only on the arguments.
func WriteExcellon(w io.Writer, l geom.Layout, meta Meta) error {
	if len(l.Vias) == 0 {
		return fmt.Errorf("export: Excellon drill file: %w", ErrEmptyLayer)
	}
	guid, err := meta.ProjectGUID()
	if err != nil {
		return err
	}
	var sizes []int64
	for _, v := range l.Vias {
		if v.Drill <= 0 {
			return fmt.Errorf("export: via at %v has drill %d nm", v.Center, v.Drill)
		}
		sizes = addSize(sizes, v.Drill)
	}
	if len(sizes) > 99 {
		return fmt.Errorf("export: %d drill sizes, Excellon tools go to T99", len(sizes))
	}
	b := bufio.NewWriter(w)
	p := func(format string, a ...any) { fmt.Fprintf(b, format+"\n", a...) }
	p("M48")
	p("; %s %s %s, plated through holes", commentText(Application), commentText(meta.version()), commentText(l.Name))
	p("; created %s", meta.creationDate())
	p("; #@! TF.GenerationSoftware,%s,%s,%s", attrField(Vendor), attrField(Application), attrField(meta.version()))
	p("; #@! TF.CreationDate,%s", meta.creationDate())
	p("; #@! TF.ProjectId,%s,%s,%s", attrField(meta.name()), guid, attrField(meta.revision()))
	p("; #@! TF.SameCoordinates,%s", guid)
	p("; #@! TF.FileFunction,%s", DrillPTH.FileFunctionOf(meta.Layers))
	p("; #@! TF.FilePolarity,Positive")
	p("FMAT,2")
	p("METRIC,TZ")
	for i, d := range sizes {
		p("; #@! TA.AperFunction,Plated,PTH,ViaDrill")
		p("T%02dC%s", i+1, drillMM(d))
	}
	p("%%")
	p("G90")
	p("G05")
	for i, d := range sizes {
		p("T%02d", i+1)
		for _, v := range l.Vias {
			if v.Drill == d {
				p("X%sY%s", drillMM(v.Center.X), drillMM(v.Center.Y))
			}
		}
	}
	p("M30")
	if err := b.Flush(); err != nil {
		return fmt.Errorf("export: writing Excellon drill file: %w", err)
	}
	return nil
}

// drillMM prints nanometres as millimetres with at least three decimals.
func drillMM(nm int64) string {
	s := geom.FormatMM(nm) // six decimals
	for k := 0; k < 3 && strings.HasSuffix(s, "0"); k++ {
		s = s[:len(s)-1]
	}
	return s
}
