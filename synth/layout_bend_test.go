package synth_test

import (
	"context"
	"math"
	"strings"
	"testing"

	"stubcraft/export"
	"stubcraft/stackups"
	"stubcraft/synth"
	"stubcraft/synth/geom"
)

// bentStubDesign is an invented design whose open stub (about 9.8 mm) bends
// on a board limited to 16 mm in y; it ends in its [layout] table, so a
// test may append layout keys.
const bentStubDesign = `
name = "bent"
frequency = "2.45GHz"
z0 = 50
stackup = "hydrocarbon-ceramic-0.51mm"
[load]
impedance = "27-j35"
[match]
topology = "shunt-stub"
stub = "open"
pick = "shortest"
[layout]
stub_side = "up"
`

// A long open stub on a board limited to 16 mm in y builds: synth.Build,
// GeomSpec and geom.Build lay the stub out as a mitred L whose centre-line
// length is the report's drawn_length_mm, and LayoutNotes says so. The
// design is invented; its stub is about 9.8 mm, which with the default
// 5 mm margin would need a board about 21 mm tall.
func TestBentStubEndToEnd(t *testing.T) {
	text := bentStubDesign + `max_board = ["40mm", "16mm"]
`
	d, err := synth.DecodeDesign(strings.NewReader(text), "bent.toml", "")
	if err != nil {
		t.Fatal(err)
	}
	st, ok := stackups.Preset("hydrocarbon-ceramic-0.51mm")
	if !ok {
		t.Fatal("no preset hydrocarbon-ceramic-0.51mm")
	}
	res, err := synth.Simulate(context.Background(), synth.BuildInput{Design: d, Stackup: st, Load: synth.ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	lay, err := geom.Build(res.GeomSpec())
	if err != nil {
		t.Fatal(err)
	}
	if len(lay.Marks.Bends) != 1 {
		t.Fatalf("%d bent stubs, want 1", len(lay.Marks.Bends))
	}
	b := lay.Marks.Bends[0]
	if _, hi := lay.Board.Bounds(); hi.Y > 16e6 {
		t.Errorf("board %d nm tall, above the 16 mm limit", hi.Y)
	}
	rep := export.NewReport(res, "test")
	var drawn float64
	for _, e := range rep.Elements {
		if e.ID == b.StubID {
			drawn = e.DrawnLengthMM
		}
	}
	if got := float64(b.Leg1+b.Leg2) * 1e-6; drawn == 0 || math.Abs(got-drawn) > 1e-3 {
		t.Errorf("centre-line length %.6f mm, report's drawn_length_mm %.6f", got, drawn)
	}
	// Douville and James at this stub's W/h.
	var w float64
	for _, e := range res.Physical.Elements {
		if e.ID == b.StubID {
			w = e.Width
		}
	}
	h := st.Dielectric.Thickness
	if m := 0.52 + 0.65*math.Exp(-1.35*w/h); math.Abs(b.Miter-m) > 1e-12 {
		t.Errorf("miter %.6f, want 0.52 + 0.65·exp(−1.35·%.4f) = %.6f", b.Miter, w/h, m)
	}
	notes := res.LayoutNotes(lay)
	if len(notes) != 1 || !strings.Contains(notes[0], b.StubID+" bends 90° toward the") ||
		!strings.Contains(notes[0], "Douville and James 1978") || !strings.Contains(notes[0], "centre-line length") {
		t.Errorf("notes %q", notes)
	}
	// The same design with room keeps the stub straight and has no note.
	d.Layout.MaxBoard = [2]float64{}
	res2, err := synth.Simulate(context.Background(), synth.BuildInput{Design: d, Stackup: st, Load: synth.ConstantLoad(d.Load.Impedance), SkipTolerance: true})
	if err != nil {
		t.Fatal(err)
	}
	lay2, err := geom.Build(res2.GeomSpec())
	if err != nil {
		t.Fatal(err)
	}
	if len(lay2.Marks.Bends) != 0 || len(res2.LayoutNotes(lay2)) != 0 {
		t.Errorf("unlimited board: bends %+v", lay2.Marks.Bends)
	}
}

// Build lengthens a stub it bends by the bend's shortening, so that the
// bent stub keeps the straight stub's electrical length: the invented
// design of TestBentStubEndToEnd built twice, on the 16 mm board limit
// (bent) and without one (straight). The bent stub's centre line less one
// bend's shortening δ = W·(0.50 + 0.34·exp(−3·(W/h − 0.5))) (the fit to
// the project's full-wave record testdata/discontinuities/bend.tsv,
// restated here) is the straight stub's drawn length within 1 µm; the
// report gives the copper (drawn_length_mm = the centre line, bend_mm =
// δ) and the note says the bend is compensated. Without the compensation
// the centre line is the straight length and the check misses by δ
// (about 0.5 mm).
func TestBentStubCompensated(t *testing.T) {
	text := bentStubDesign
	st, ok := stackups.Preset("hydrocarbon-ceramic-0.51mm")
	if !ok {
		t.Fatal("no preset hydrocarbon-ceramic-0.51mm")
	}
	build := func(maxY string) *synth.Result {
		t.Helper()
		src := text
		if maxY != "" {
			src += `max_board = ["40mm", "` + maxY + `"]` + "\n"
		}
		d, err := synth.DecodeDesign(strings.NewReader(src), "bent.toml", "")
		if err != nil {
			t.Fatal(err)
		}
		res, err := synth.Build(context.Background(), synth.BuildInput{Design: d, Stackup: st, Load: synth.ConstantLoad(d.Load.Impedance), SkipTolerance: true})
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	bent, straight := build("16mm"), build("")
	if len(straight.Layout.Marks.Bends) != 0 {
		t.Fatalf("unlimited board: bends %+v", straight.Layout.Marks.Bends)
	}
	if len(bent.Layout.Marks.Bends) != 1 {
		t.Fatalf("%d bent stubs, want 1", len(bent.Layout.Marks.Bends))
	}
	b := bent.Layout.Marks.Bends[0]
	var straightLen, w float64
	for _, e := range straight.Physical.Elements {
		if e.ID == b.StubID {
			straightLen, w = e.Drawn(), e.Width
		}
	}
	if straightLen == 0 {
		t.Fatalf("no stub %s in the straight build", b.StubID)
	}
	h := st.Dielectric.Thickness
	delta := w * (0.50 + 0.34*math.Exp(-3*(w/h-0.5)))
	centre := float64(b.Leg1+b.Leg2) * 1e-9
	if got := centre - delta; math.Abs(got-straightLen) > 1e-6 {
		t.Errorf("bent centre line %.6f mm − δ %.6f mm = %.6f mm, straight stub %.6f mm", centre*1e3, delta*1e3, got*1e3, straightLen*1e3)
	}
	rep := export.NewReport(bent, "test")
	for _, e := range rep.Elements {
		if e.ID != b.StubID {
			continue
		}
		if math.Abs(e.DrawnLengthMM-centre*1e3) > 1e-3 || math.Abs(e.BendMM-delta*1e3) > 1e-3 {
			t.Errorf("report drawn_length_mm %.6f, bend_mm %.6f; want the centre line %.6f and δ %.6f", e.DrawnLengthMM, e.BendMM, centre*1e3, delta*1e3)
		}
	}
	found := false
	for _, n := range bent.Notes {
		if strings.Contains(n, b.StubID+" bends 90°") {
			found = true
			if !strings.Contains(n, "compensated") || strings.Contains(n, "not compensated") || !strings.Contains(n, "testdata/discontinuities/bend.tsv") {
				t.Errorf("note %q", n)
			}
		}
	}
	if !found {
		t.Errorf("no bend note in %q", bent.Notes)
	}
	// The circuit model is the straight one: same S11 at f0.
	if g, s := bent.Physical.Board, straight.Physical.Board; len(g.Stubs) != 1 || len(s.Stubs) != 1 || math.Abs(g.Stubs[0].Length-s.Stubs[0].Length) > 1e-12 {
		t.Errorf("model stub lengths %+v and %+v differ", g.Stubs, s.Stubs)
	}
}
