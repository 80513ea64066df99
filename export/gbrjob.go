package export

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"stubcraft/synth/geom"
)

// JobStack is the material stack-up that the Gerber job file reports: one
// dielectric between the two copper layers, and optionally a solder mask on
// top. Thicknesses are metres.
type JobStack struct {
	DielectricName      string
	Er                  float64 // relative permittivity of the dielectric
	LossTangent         float64
	DielectricThickness float64
	CopperThickness     float64 // each of the two copper layers
	Mask                bool    // a top solder mask is applied
	MaskThickness       float64
	MaskEr              float64
	// Layers and BoardThickness describe the whole board when the stack
	// is the outer layer pair of a multilayer: its copper layer count and
	// finished thickness, m. Zero: a two-layer board, as thick as the
	// dielectric and the two coppers.
	Layers         int
	BoardThickness float64
	// Finish is the surface finish in the job format's words ("ENIG",
	// "None", …; see FinishJobName); empty leaves it out.
	Finish string
	// ImpedanceControlled marks a board whose line widths are sized for
	// an impedance, which the fab is to hold.
	ImpedanceControlled bool
}

// job mirrors the keys of the Gerber job format (Gerber Layer Format
// Specification, "Gerber Job File"): the struct field order fixes the order
// of the keys, so the output is deterministic.
type job struct {
	Header          jobHeader
	GeneralSpecs    jobGeneral
	FilesAttributes []jobFile
	MaterialStackup []jobMaterial
}

type jobHeader struct {
	GenerationSoftware jobSoftware
	CreationDate       string
}

type jobSoftware struct {
	Vendor, Application, Version string
}

type jobGeneral struct {
	ProjectId           jobProject // key name from the specification
	Size                jobSize
	LayerNumber         int
	BoardThickness      json.Number
	Finish              string `json:",omitempty"`
	ImpedanceControlled bool   `json:",omitempty"`
}

type jobProject struct {
	Name, GUID, Revision string
}

type jobSize struct {
	X, Y json.Number
}

type jobFile struct {
	Path, FileFunction, FilePolarity string
}

type jobMaterial struct {
	Type               string
	Thickness          json.Number `json:",omitempty"`
	Material           string      `json:",omitempty"`
	DielectricConstant json.Number `json:",omitempty"`
	LossTangent        json.Number `json:",omitempty"`
	Name               string
}

// WriteGerberJob writes the Gerber job file (.gbrjob, JSON) of the board:
// the header with GenerationSoftware and CreationDate, GeneralSpecs with
// ProjectId, the board Size (mm), LayerNumber and BoardThickness (2 and
// the dielectric plus both coppers, mm, unless stack gives the multilayer
// board's), Finish and ImpedanceControlled, FilesAttributes naming the Gerber
// files by Layer.FileName(l.Name), and MaterialStackup from top to bottom.
// FilesAttributes lists every file a build writes for the layout, each
// with its function: the Gerber layers that have content (LayersOf) and,
// when there are holes, the Excellon drill file. The solder-mask material
// is in the stack-up only when stack.Mask gives its thickness.
func WriteGerberJob(w io.Writer, l geom.Layout, meta Meta, stack JobStack) error {
	guid, err := meta.ProjectGUID()
	if err != nil {
		return err
	}
	for _, c := range []struct {
		name string
		v    float64
		need bool
	}{
		{"Er", stack.Er, true},
		{"DielectricThickness", stack.DielectricThickness, true},
		{"CopperThickness", stack.CopperThickness, true},
		{"MaskThickness", stack.MaskThickness, stack.Mask},
	} {
		if c.need && !(c.v > 0 && !math.IsInf(c.v, 0)) {
			return fmt.Errorf("export: job stack-up %s = %g, want a positive value", c.name, c.v)
		}
	}
	if !(stack.LossTangent >= 0) || (stack.Mask && !(stack.MaskEr >= 0)) {
		return fmt.Errorf("export: job stack-up loss tangent %g or mask permittivity %g is negative", stack.LossTangent, stack.MaskEr)
	}
	min, max := l.Board.Bounds()
	cu := geom.Nanometres(stack.CopperThickness)
	j := job{
		Header: jobHeader{
			GenerationSoftware: jobSoftware{Vendor, Application, meta.version()},
			CreationDate:       meta.creationDate(),
		},
		GeneralSpecs: jobGeneral{
			ProjectId:           jobProject{meta.name(), guid, meta.revision()},
			Size:                jobSize{mmNumber(max.X - min.X), mmNumber(max.Y - min.Y)},
			LayerNumber:         2,
			BoardThickness:      mmNumber(geom.Nanometres(stack.DielectricThickness) + 2*cu),
			Finish:              stack.Finish,
			ImpedanceControlled: stack.ImpedanceControlled,
		},
	}
	if stack.Layers > 2 {
		j.GeneralSpecs.LayerNumber = stack.Layers
	}
	if stack.BoardThickness > 0 {
		j.GeneralSpecs.BoardThickness = mmNumber(geom.Nanometres(stack.BoardThickness))
	}
	for _, ly := range LayersOf(l) {
		j.FilesAttributes = append(j.FilesAttributes, jobFile{ly.FileName(l.Name), ly.FileFunctionOf(stack.Layers), ly.FilePolarity()})
	}
	if len(l.Vias) > 0 {
		j.FilesAttributes = append(j.FilesAttributes, jobFile{ExcellonFileName(l.Name), DrillPTH.FileFunctionOf(stack.Layers), "Positive"})
	}
	if stack.Mask {
		m := jobMaterial{Type: "SolderMask", Thickness: mmNumber(geom.Nanometres(stack.MaskThickness)), Name: "Top solder mask"}
		if stack.MaskEr > 0 {
			m.DielectricConstant = floatNumber(stack.MaskEr)
		}
		j.MaterialStackup = append(j.MaterialStackup, m)
	}
	name := stack.DielectricName
	if name == "" {
		name = "dielectric"
	}
	j.MaterialStackup = append(j.MaterialStackup,
		jobMaterial{Type: "Copper", Thickness: mmNumber(cu), Name: "Top copper"},
		jobMaterial{
			Type: "Dielectric", Thickness: mmNumber(geom.Nanometres(stack.DielectricThickness)),
			Material: name, DielectricConstant: floatNumber(stack.Er), LossTangent: floatNumber(stack.LossTangent),
			Name: "Dielectric 1",
		},
		jobMaterial{Type: "Copper", Thickness: mmNumber(cu), Name: "Bottom copper"},
	)
	b, err := json.MarshalIndent(j, "", "  ")
	if err != nil {
		return fmt.Errorf("export: encoding Gerber job: %w", err)
	}
	if _, err := w.Write(append(b, '\n')); err != nil {
		return fmt.Errorf("export: writing Gerber job: %w", err)
	}
	return nil
}

// mmNumber is an exact JSON number of millimetres from nanometres, with
// trailing zeros dropped ("1.6", "0.035").
func mmNumber(nm int64) json.Number {
	s := geom.FormatMM(nm)
	for s[len(s)-1] == '0' {
		s = s[:len(s)-1]
	}
	if s[len(s)-1] == '.' {
		s = s[:len(s)-1]
	}
	return json.Number(s)
}

// floatNumber prints a float in the shortest form that reads back exactly.
func floatNumber(v float64) json.Number {
	return json.Number(strconv.FormatFloat(v, 'g', -1, 64))
}
