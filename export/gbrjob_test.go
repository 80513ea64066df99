package export

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"
)

func refStack() JobStack {
	return JobStack{DielectricName: "glass epoxy", Er: 4.4, LossTangent: 0.02, DielectricThickness: 0.8e-3,
		CopperThickness: 35e-6, Mask: true, MaskThickness: 20e-6, MaskEr: 3.5}
}

// TestGerberJob decodes the job file and checks its keys and values against
// the Gerber Job format of the Gerber Layer Format Specification (key
// names from memory of the specification) and the sizes worked by hand.
func TestGerberJob(t *testing.T) {
	l := build(t, refSpec())
	var b bytes.Buffer
	if err := WriteGerberJob(&b, l, refMeta(), refStack()); err != nil {
		t.Fatal(err)
	}
	var j struct {
		Header struct {
			GenerationSoftware struct{ Vendor, Application, Version string }
			CreationDate       string
		}
		GeneralSpecs struct {
			ProjectId      struct{ Name, GUID, Revision string }
			Size           struct{ X, Y float64 }
			LayerNumber    int
			BoardThickness float64
		}
		FilesAttributes []struct{ Path, FileFunction, FilePolarity string }
		MaterialStackup []struct {
			Type                                       string
			Thickness, DielectricConstant, LossTangent float64
			Material, Name                             string
		}
	}
	dec := json.NewDecoder(&b)
	dec.DisallowUnknownFields()
	if err := dec.Decode(&j); err != nil {
		t.Fatal(err)
	}
	h, g := j.Header, j.GeneralSpecs
	if h.GenerationSoftware.Application != "stubcraft" || h.GenerationSoftware.Version != "0.1" || h.CreationDate != "2024-01-02T03:04:05+01:00" {
		t.Errorf("header %+v", h)
	}
	// By hand: board 17.2 × 13.8 mm; thickness 0.8 + 2 × 0.035 = 0.87 mm.
	if g.Size.X != 17.2 || g.Size.Y != 13.8 || g.LayerNumber != 2 || g.BoardThickness != 0.87 ||
		g.ProjectId.GUID != "f205030f-a43b-5ed3-9ef1-747cc36142ae" {
		t.Errorf("general specs %+v", g)
	}
	// Every file a build writes, each with its function: the five Gerbers
	// and the Excellon file.
	wantFiles := []string{"Copper,L1,Top", "Copper,L2,Bot", "Soldermask,Top", "Profile,NP", "Plated,1,2,PTH", "Plated,1,2,PTH"}
	if len(j.FilesAttributes) != len(wantFiles) {
		t.Fatalf("files %+v", j.FilesAttributes)
	}
	for i, f := range j.FilesAttributes {
		if f.FileFunction != wantFiles[i] || f.Path == "" {
			t.Errorf("file %d = %+v, want function %s", i, f, wantFiles[i])
		}
	}
	wantStack := []struct {
		typ       string
		thick, er float64
		lossTan   float64
	}{
		{"SolderMask", 0.02, 3.5, 0},
		{"Copper", 0.035, 0, 0},
		{"Dielectric", 0.8, 4.4, 0.02},
		{"Copper", 0.035, 0, 0},
	}
	if len(j.MaterialStackup) != len(wantStack) {
		t.Fatalf("stack-up %+v", j.MaterialStackup)
	}
	for i, w := range wantStack {
		m := j.MaterialStackup[i]
		if m.Type != w.typ || m.Thickness != w.thick || m.DielectricConstant != w.er || m.LossTangent != w.lossTan {
			t.Errorf("layer %d = %+v, want %+v", i, m, w)
		}
	}
}

func TestGerberJobRefuses(t *testing.T) {
	l := build(t, refSpec())
	for _, edit := range []func(*JobStack){
		func(s *JobStack) { s.Er = 0 },
		func(s *JobStack) { s.DielectricThickness = -1 },
		func(s *JobStack) { s.CopperThickness = 0 },
		func(s *JobStack) { s.MaskThickness = 0 },
		func(s *JobStack) { s.LossTangent = -0.1 },
	} {
		s := refStack()
		edit(&s)
		if err := WriteGerberJob(&bytes.Buffer{}, l, refMeta(), s); err == nil {
			t.Errorf("stack %+v: no error", s)
		}
	}
}

// TestGerberJobListsWrittenFiles: a board without holes lists no drill
// file, and the mask is listed whenever its file is written, whether or
// not the stack-up gives the mask's material (Gerber Job Format,
// FilesAttributes: every file of the fabrication data set, from memory).
func TestGerberJobListsWrittenFiles(t *testing.T) {
	l := build(t, openSpec())
	st := refStack()
	st.Mask = false
	var b bytes.Buffer
	if err := WriteGerberJob(&b, l, refMeta(), st); err != nil {
		t.Fatal(err)
	}
	var j struct {
		FilesAttributes []struct{ Path, FileFunction string }
	}
	if err := json.Unmarshal(b.Bytes(), &j); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, f := range j.FilesAttributes {
		got = append(got, f.Path)
	}
	want := []string{"open-copper-top.gbr", "open-copper-bottom.gbr", "open-mask-top.gbr", "open-outline.gbr"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("files %v, want %v", got, want)
	}
}

// TestGerberJobMultilayerFinish: the outer layer pair of a 4-layer board
// reports the whole board's layer count and thickness, the plane as the
// inner layer L2 and the vias plated through all four layers (Gerber Layer
// Format Specification 2023.08, 5.6.3 .FileFunction, from memory); the
// finish and impedance control go into GeneralSpecs (Gerber Job Format,
// from memory).
func TestGerberJobMultilayerFinish(t *testing.T) {
	l := build(t, refSpec())
	st := refStack()
	st.Layers, st.BoardThickness, st.Finish, st.ImpedanceControlled = 4, 1.6e-3, "ENIG", true
	var b bytes.Buffer
	if err := WriteGerberJob(&b, l, refMeta(), st); err != nil {
		t.Fatal(err)
	}
	var j struct {
		GeneralSpecs struct {
			LayerNumber         int
			BoardThickness      float64
			Finish              string
			ImpedanceControlled bool
		}
		FilesAttributes []struct{ Path, FileFunction string }
	}
	if err := json.Unmarshal(b.Bytes(), &j); err != nil {
		t.Fatal(err)
	}
	g := j.GeneralSpecs
	if g.LayerNumber != 4 || g.BoardThickness != 1.6 || g.Finish != "ENIG" || !g.ImpedanceControlled {
		t.Errorf("general specs %+v", g)
	}
	want := map[string]string{"ref-copper-bottom.gbr": "Copper,L2,Inr", "ref-drill-plated.gbr": "Plated,1,4,PTH", "ref-drill.drl": "Plated,1,4,PTH"}
	for _, f := range j.FilesAttributes {
		if w, ok := want[f.Path]; ok && f.FileFunction != w {
			t.Errorf("%s: %s, want %s", f.Path, f.FileFunction, w)
		}
	}
	m := refMeta()
	m.Layers = 4
	var g2 bytes.Buffer
	if err := WriteGerber(&g2, l, CopperBottom, m); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(g2.String(), "%TF.FileFunction,Copper,L2,Inr*%") {
		t.Error("the plane Gerber of a 4-layer board is not Copper,L2,Inr")
	}
}
