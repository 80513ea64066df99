package geom

import (
	"errors"
	"testing"
)

// refSpec is a network whose copper area and board size are worked out by
// hand below (exact arithmetic on the given sizes).
func refSpec() Spec {
	return Spec{
		Name: "ref",
		Segments: []Segment{
			{"feed-load", 1.8e-3, 5e-3},
			{"line1", 1.8e-3, 3.2e-3},
			{"line2", 1.0e-3, 4e-3},
			{"feed-source", 1.8e-3, 5e-3},
		},
		Stubs: []Stub{
			{ID: "s1", At: 1, Width: 1.2e-3, Length: 6e-3, Side: 1, Via: &ViaSpec{Drill: 0.4e-3, Pad: 0.8e-3}},
			{ID: "s2", At: 0, Width: 1.0e-3, Length: 4e-3, Side: -1},
		},
		PortPad:       PadSpec{Width: 2e-3, Length: 1e-3},
		Margin:        1e-3,
		Height:        0.8e-3,
		Mask:          "open",
		MaskExpansion: 0.05e-3,
	}
}

func TestBuildReference(t *testing.T) {
	l, err := Build(refSpec())
	if err != nil {
		t.Fatal(err)
	}
	// Exact, by hand: segments 5·1.8 + 3.2·1.8 + 4·1.0 + 5·1.8 = 27.76 mm²;
	// s1 (x 7.6..8.8, y 0..6.9) adds 8.28 − 0.6·0.9 − 0.6·0.5 = 7.44 mm²;
	// s2 (x 4.5..5.5, y −4.9..0) adds 4.9 − 0.9 = 4.0 mm²: total 39.2 mm².
	if len(l.Copper) != 1 {
		t.Fatalf("%d nets, want 1", len(l.Copper))
	}
	if a := l.Copper[0].Outline.Area(); a != 39.2e12 {
		t.Errorf("copper area %v nm², want 39.2e12", a)
	}
	// Exact: board 17.2 mm long; y = 6.9 + 4.9 + 2·1 = 13.8 mm.
	if _, max := l.Board.Bounds(); max != (Point{17.2e6, 13.8e6}) {
		t.Errorf("board corner %v, want 17.2×13.8 mm", max)
	}
	// The centre line sits at margin + 4.9 mm = 5.9 mm.
	if l.Marks.CentreY != 5.9e6 {
		t.Errorf("centre line y %d, want 5.9e6", l.Marks.CentreY)
	}
	wantTees := []Tee{
		{StubID: "s1", Center: Point{8.2e6, 5.9e6}, RefY: 6.8e6, EndY: 12.8e6},
		{StubID: "s2", Center: Point{5e6, 5.9e6}, RefY: 5e6, EndY: 1e6},
	}
	for i, w := range wantTees {
		if l.Marks.Tees[i] != w {
			t.Errorf("tee %d = %+v, want %+v", i, l.Marks.Tees[i], w)
		}
	}
	// Via: far pad edge on the stub end, 12.8 − 0.4 = 12.4 mm.
	if len(l.Vias) != 1 || l.Vias[0].Center != (Point{8.2e6, 12.4e6}) || l.Vias[0].Drill != 0.4e6 {
		t.Errorf("vias %+v, want one 0.4 mm drill at (8.2, 12.4) mm", l.Vias)
	}
	wantEl := []Element{
		{"feed-load", KindSegment, r(0, 5e6, 5e6, 6.8e6)},
		{"line1", KindSegment, r(5e6, 5e6, 8.2e6, 6.8e6)},
		{"line2", KindSegment, r(8.2e6, 5.4e6, 12.2e6, 6.4e6)},
		{"feed-source", KindSegment, r(12.2e6, 5e6, 17.2e6, 6.8e6)},
		{"s1", KindStub, r(7.6e6, 6.8e6, 8.8e6, 12.8e6)},
		{"s2", KindStub, r(4.5e6, 1e6, 5.5e6, 5e6)},
	}
	for i, w := range wantEl {
		if l.Marks.Elements[i] != w {
			t.Errorf("element %d = %+v, want %+v", i, l.Marks.Elements[i], w)
		}
	}
	// Port pads: two 1×2 mm ComponentPads centred on the ports' ends, and
	// one ViaPad.
	var comp int
	for _, p := range l.Pads {
		if p.Function == SMDPad {
			comp++
			if p.W != 1e6 || p.H != 2e6 || p.Center.Y != 5.9e6 {
				t.Errorf("port pad %+v, want 1×2 mm at y 5.9 mm", p)
			}
		}
	}
	if comp != 2 {
		t.Errorf("%d port pads, want 2", comp)
	}
}

func TestBuildRefuses(t *testing.T) {
	tests := []struct {
		name  string
		edit  func(*Spec)
		field string
		err   error
	}{
		{"no segments", func(s *Spec) { s.Segments = nil }, "Segments", ErrRange},
		{"zero width", func(s *Spec) { s.Segments[2].Width = 0 }, "Segments[2].Width", ErrSize},
		{"negative length", func(s *Spec) { s.Segments[0].Length = -1e-3 }, "Segments[0].Length", ErrSize},
		{"sub-nanometre width", func(s *Spec) { s.Segments[1].Width = 1e-10 }, "Segments[1].Width", ErrSize},
		{"At below range", func(s *Spec) { s.Stubs[0].At = -1 }, "Stubs[0].At", ErrRange},
		{"At at the source port", func(s *Spec) { s.Stubs[0].At = 3 }, "Stubs[0].At", ErrRange},
		{"Side zero", func(s *Spec) { s.Stubs[1].Side = 0 }, "Stubs[1].Side", ErrRange},
		{"stub width zero", func(s *Spec) { s.Stubs[1].Width = 0 }, "Stubs[1].Width", ErrSize},
		{"stub length zero", func(s *Spec) { s.Stubs[1].Length = 0 }, "Stubs[1].Length", ErrSize},
		{"stub beyond its segments", func(s *Spec) { s.Stubs[0].Width = 7e-3 }, "Stubs[0]", ErrOverlap},
		{"stub over the port pad", func(s *Spec) {
			s.Segments[0].Length = 1.2e-3
			s.Stubs[1].Width = 1e-3 // x 0.7..1.7 mm, pad 0..1 mm
		}, "Stubs[1]", ErrOverlap},
		{"stubs overlap on one side", func(s *Spec) {
			s.Stubs = append(s.Stubs, Stub{ID: "s3", At: 0, Width: 1e-3, Length: 2e-3, Side: -1})
		}, "Stubs[2]", ErrOverlap},
		{"via pad beyond 3 widths", func(s *Spec) {
			s.Stubs[0].Width = 0.25e-3
			s.Stubs[0].Via = &ViaSpec{Drill: 0.3e-3, Pad: 0.8e-3}
		}, "Stubs[0].Via.Pad", ErrVia},
		{"via pad not wider than drill", func(s *Spec) { s.Stubs[0].Via = &ViaSpec{Drill: 0.8e-3, Pad: 0.8e-3} }, "Stubs[0].Via.Pad", ErrVia},
		{"via pad longer than stub", func(s *Spec) { s.Stubs[0].Length = 0.5e-3 }, "Stubs[0].Via.Pad", ErrVia},
		{"via drill zero", func(s *Spec) { s.Stubs[0].Via = &ViaSpec{Pad: 0.8e-3} }, "Stubs[0].Via.Drill", ErrSize},
		{"board too short", func(s *Spec) { s.MaxBoard = [2]float64{17e-3, 0} }, "MaxBoard[0]", ErrNoFit},
		// 9 mm leaves 3.5 mm each side of the centre line: too little for
		// straight stubs, and a bent s1 or s2 would run its second leg
		// closer to the through line than 3 heights (see bend_test.go for
		// the 13 mm board, where s1 bends).
		{"board too narrow for the stubs", func(s *Spec) { s.MaxBoard = [2]float64{0, 9e-3} }, "MaxBoard[1]", ErrNoFit},
		{"negative margin", func(s *Spec) { s.Margin = -1e-3 }, "Margin", ErrSize},
		{"unknown mask", func(s *Spec) { s.Mask = "half" }, "Mask", ErrRange},
		{"pad without length", func(s *Spec) { s.PortPad.Length = 0 }, "PortPad.Length", ErrSize},
		{"port pads longer than the line", func(s *Spec) { s.PortPad.Length = 9e-3 }, "PortPad.Length", ErrOverlap},
		{"negative source pad width", func(s *Spec) { s.PortPad.SourceWidth = -1e-3 }, "PortPad.SourceWidth", ErrSize},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := refSpec()
			tt.edit(&s)
			l, err := Build(s)
			if err == nil {
				t.Fatalf("no error; layout %+v", l.Marks)
			}
			var se *SpecError
			if !errors.As(err, &se) || se.Field != tt.field || !errors.Is(err, tt.err) {
				t.Errorf("error %v, want field %s reason %v", err, tt.field, tt.err)
			}
		})
	}
}

func TestBuildAccepts(t *testing.T) {
	tests := []struct {
		name string
		edit func(*Spec)
		area float64 // exact by hand, nm²
	}{
		// A cross tee: s2 (x 7.7..8.7, y −4.9..0) moved under s1 adds
		// 1.0·4.9 − 0.5·0.9 − 0.5·0.5 = 4.2 mm² instead of 4.0.
		{"stubs on both sides of one tee", func(s *Spec) { s.Stubs[1].At = 1 }, 39.4e12},
		// MaxBoard exactly the board: 17.2 × 13.8 mm fits.
		{"board at the limit", func(s *Spec) { s.MaxBoard = [2]float64{17.2e-3, 13.8e-3} }, 39.2e12},
		// No port pads, no vias, mask over the copper.
		{"plain", func(s *Spec) { s.PortPad = PadSpec{}; s.Stubs[0].Via = nil; s.Mask = "cover" }, 39.2e12},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := refSpec()
			tt.edit(&s)
			l, err := Build(s)
			if err != nil {
				t.Fatal(err)
			}
			if a := l.Copper[0].Outline.Area(); a != tt.area {
				t.Errorf("area %v, want %v", a, tt.area)
			}
		})
	}
}

func TestBuildMask(t *testing.T) {
	s := refSpec()
	s.Mask = "cover"
	l, err := Build(s)
	if err != nil {
		t.Fatal(err)
	}
	// Exact: two port pads 1×2 mm grown by 0.05 mm and clipped at the board
	// edge in x: 1.05 × 2.1 mm each.
	if len(l.MaskOpenings) != 2 {
		t.Fatalf("%d openings, want 2", len(l.MaskOpenings))
	}
	for _, p := range l.MaskOpenings {
		if a := p.Area(); a != 1.05e6*2.1e6 {
			t.Errorf("opening area %v, want %v", a, 1.05e6*2.1e6)
		}
	}
}

func BenchmarkBuild(b *testing.B) {
	s := refSpec()
	for b.Loop() {
		if _, err := Build(s); err != nil {
			b.Fatal(err)
		}
	}
}

// TestPortPadsPerEnd checks that each port pad is drawn at its own width
// (PadSpec.SourceWidth) and that the board's extent follows the wider: a
// transformer's load and source port lines differ (a 16.7 mm pad at the
// source of a 3 mm line is a large shunt capacitance the circuit model
// does not have).
func TestPortPadsPerEnd(t *testing.T) {
	for _, tt := range []struct {
		name         string
		load, source float64  // PadSpec.Width, SourceWidth, m
		want         [2]int64 // pad heights at the load and source, nm
	}{
		{"one width", 2e-3, 0, [2]int64{2000000, 2000000}},
		{"wider source", 2e-3, 3e-3, [2]int64{2000000, 3000000}},
		{"narrower source", 3e-3, 1.5e-3, [2]int64{3000000, 1500000}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s := refSpec()
			s.PortPad.Width, s.PortPad.SourceWidth = tt.load, tt.source
			l, err := Build(s)
			if err != nil {
				t.Fatal(err)
			}
			got := map[string]int64{}
			for _, p := range l.Pads {
				if p.Function == SMDPad && p.Net == NetRF {
					got[p.Pin] = p.H
				}
			}
			if got[PinLoad] != tt.want[0] || got[PinSource] != tt.want[1] {
				t.Errorf("pad heights load %d nm, source %d nm; want %d, %d", got[PinLoad], got[PinSource], tt.want[0], tt.want[1])
			}
		})
	}
}
