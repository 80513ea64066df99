package export

import (
	"bytes"
	"math"
	"sort"
	"strings"
	"testing"
	"time"

	"stubcraft/export/internal/gerberread"
	"stubcraft/synth/geom"
)

// refSpec is the network the writer tests lay out. Its sizes are the
// expected values the tests measure back from the files.
func refSpec() geom.Spec {
	return geom.Spec{
		Name: "ref",
		Segments: []geom.Segment{
			{ID: "feed-load", Width: 1.8e-3, Length: 5e-3},
			{ID: "line1", Width: 1.8e-3, Length: 3.2e-3},
			{ID: "line2", Width: 1.0e-3, Length: 4e-3},
			{ID: "feed-source", Width: 1.8e-3, Length: 5e-3},
		},
		Stubs: []geom.Stub{
			{ID: "s1", At: 1, Width: 1.2e-3, Length: 6e-3, Side: 1, Via: &geom.ViaSpec{Drill: 0.4e-3, Pad: 0.8e-3}},
			{ID: "s2", At: 0, Width: 1.0e-3, Length: 4e-3, Side: -1},
		},
		PortPad:       geom.PadSpec{Width: 2e-3, Length: 1e-3},
		Margin:        1e-3,
		Height:        0.8e-3,
		MaskExpansion: 0.05e-3,
	}
}

func refMeta() Meta {
	return Meta{ProjectName: "ref", Version: "0.1", Created: time.Date(2024, 1, 2, 3, 4, 5, 0, time.FixedZone("", 3600))}
}

func build(t testing.TB, s geom.Spec) geom.Layout {
	t.Helper()
	l, err := geom.Build(s)
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func gerberBytes(t testing.TB, l geom.Layout, ly Layer) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := WriteGerber(&b, l, ly, refMeta()); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func parse(t testing.TB, data []byte) *gerberread.File {
	t.Helper()
	f, err := gerberread.Read(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// TestGerberAttributes checks the X2 attributes against the values the
// Gerber Layer Format Specification 2023.08 defines for each file function
// (from memory of the specification).
func TestGerberAttributes(t *testing.T) {
	l := build(t, refSpec())
	// uuid.uuid5(uuid.NAMESPACE_DNS, "ref.stubcraft") in Python 3.11's uuid
	// module (RFC 4122 version 5): an outside reference for ProjectGUID.
	const guid = "f205030f-a43b-5ed3-9ef1-747cc36142ae"
	tests := []struct {
		layer              Layer
		function, polarity string
	}{
		{CopperTop, "Copper,L1,Top", "Positive"},
		{CopperBottom, "Copper,L2,Bot", "Positive"},
		{Profile, "Profile,NP", "Positive"},
		{SoldermaskTop, "Soldermask,Top", "Negative"}, // image = mask openings
		{DrillPTH, "Plated,1,2,PTH", "Positive"},
	}
	for _, tt := range tests {
		t.Run(tt.layer.String(), func(t *testing.T) {
			f := parse(t, gerberBytes(t, l, tt.layer))
			want := map[string]string{
				".FileFunction":       tt.function,
				".FilePolarity":       tt.polarity,
				".GenerationSoftware": "stubcraft,stubcraft,0.1",
				".CreationDate":       "2024-01-02T03:04:05+01:00",
				".ProjectId":          "ref," + guid + ",1",
				".SameCoordinates":    guid,
			}
			for k, v := range want {
				if f.FileAttrs[k] != v {
					t.Errorf("%s = %q, want %q", k, f.FileAttrs[k], v)
				}
			}
		})
	}
}

// TestGerberExact reads every layer back and compares the shapes with the
// layout exactly: coordinates are integer nanometres on both sides.
func TestGerberExact(t *testing.T) {
	l := build(t, refSpec())

	top := parse(t, gerberBytes(t, l, CopperTop))
	// The reference board's shorted stub joins the RF copper to the plane:
	// one DC net.
	if len(top.Regions) != 1 || top.Regions[0].Attrs[".AperFunction"] != "Conductor" || top.Regions[0].Attrs[".N"] != "RF_GND" {
		t.Fatalf("top regions %+v, want one Conductor region of net RF_GND", top.Regions)
	}
	samePolygon(t, "top copper", top.Regions[0].Outline, l.Copper[0].Outline)
	if len(top.Flashes) != len(l.Pads) {
		t.Fatalf("%d flashes, want %d", len(top.Flashes), len(l.Pads))
	}
	for i, fl := range top.Flashes {
		p, a := l.Pads[i], top.Apertures[fl.D]
		wantShape := "R"
		if p.Round {
			wantShape = "C"
		}
		if fl.At != p.Center || a.W != p.W || a.H != p.H || a.Shape != wantShape ||
			a.Attrs[".AperFunction"] != p.Function || fl.Attrs[".N"] != "RF_GND" {
			t.Errorf("flash %d: %+v with %+v, want pad %+v", i, fl, a, p)
		}
	}

	bot := parse(t, gerberBytes(t, l, CopperBottom))
	if len(bot.Regions) != 1 || bot.Regions[0].Attrs[".N"] != "RF_GND" {
		t.Fatalf("bottom regions %+v, want the plane on net RF_GND", bot.Regions)
	}
	samePolygon(t, "ground", bot.Regions[0].Outline, l.Ground)

	mask := parse(t, gerberBytes(t, l, SoldermaskTop))
	if len(mask.Regions) != len(l.MaskOpenings) {
		t.Fatalf("%d mask regions, want %d", len(mask.Regions), len(l.MaskOpenings))
	}
	for i, r := range mask.Regions {
		samePolygon(t, "mask opening", r.Outline, l.MaskOpenings[i])
	}

	prof := parse(t, gerberBytes(t, l, Profile))
	var loop geom.Polygon
	for i, d := range prof.Draws {
		if prof.Apertures[d.D].Attrs[".AperFunction"] != "Profile" {
			t.Errorf("draw %d has no Profile aperture function", i)
		}
		if i > 0 && d.From != prof.Draws[i-1].To {
			t.Errorf("profile not continuous at draw %d", i)
		}
		loop = append(loop, d.From)
	}
	samePolygon(t, "profile", loop, l.Board)

	drill := parse(t, gerberBytes(t, l, DrillPTH))
	if len(drill.Flashes) != 1 || drill.Flashes[0].At != l.Vias[0].Center ||
		drill.Apertures[drill.Flashes[0].D].W != l.Vias[0].Drill ||
		drill.Apertures[drill.Flashes[0].D].Attrs[".AperFunction"] != "ViaDrill" {
		t.Errorf("drill flashes %+v, want the via %+v", drill.Flashes, l.Vias[0])
	}
}

func samePolygon(t *testing.T, what string, got, want geom.Polygon) {
	t.Helper()
	gmin, gmax := got.Bounds()
	wmin, wmax := want.Bounds()
	if got.Area() != want.Area() || gmin != wmin || gmax != wmax {
		t.Errorf("%s: area %v bounds %v..%v, want %v %v..%v", what, got.Area(), gmin, gmax, want.Area(), wmin, wmax)
	}
}

// crossings returns the inside intervals of a rectilinear polygon along the
// line x = c (vertical, when vertical) or y = c, sorted.
func crossings(p geom.Polygon, c int64, vertical bool) [][2]int64 {
	var at []int64
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		if vertical && a.Y == b.Y && min(a.X, b.X) < c && c < max(a.X, b.X) {
			at = append(at, a.Y)
		}
		if !vertical && a.X == b.X && min(a.Y, b.Y) < c && c < max(a.Y, b.Y) {
			at = append(at, a.X)
		}
	}
	sort.Slice(at, func(i, j int) bool { return at[i] < at[j] })
	var iv [][2]int64
	for i := 0; i+1 < len(at); i += 2 {
		iv = append(iv, [2]int64{at[i], at[i+1]})
	}
	return iv
}

// TestGerberDimensions measures the widths, lengths and positions of the
// network from the parsed top-copper Gerber (not from the layout) and
// compares them with the Spec's sizes within 1 µm, and the via drill from
// the parsed Excellon file.
func TestGerberDimensions(t *testing.T) {
	s := refSpec()
	l := build(t, s)
	top := parse(t, gerberBytes(t, l, CopperTop))
	poly := top.Regions[0].Outline
	const tol = 1e-6 // m
	near := func(what string, gotNM int64, wantM float64) {
		t.Helper()
		if math.Abs(float64(gotNM)*1e-9-wantM) > tol {
			t.Errorf("%s = %.6f mm, want %.6f mm", what, float64(gotNM)*1e-6, wantM*1e3)
		}
	}
	// Segment boundaries from the Spec, in metres.
	bound := []float64{0}
	for _, g := range s.Segments {
		bound = append(bound, bound[len(bound)-1]+g.Length)
	}
	var centre int64
	widths := make([]int64, len(s.Segments))
	for i, g := range s.Segments {
		// Scan across the line at a quarter of the segment: clear of stubs.
		x := geom.Nanometres(bound[i] + g.Length/4)
		iv := crossings(poly, x, true)
		if len(iv) != 1 {
			t.Fatalf("segment %s: %d copper intervals across x = %d nm, want 1", g.ID, len(iv), x)
		}
		widths[i] = iv[0][1] - iv[0][0]
		near("width of "+g.ID, widths[i], g.Width)
		c := (iv[0][0] + iv[0][1]) / 2
		if i == 0 {
			centre = c
		} else {
			near("centre line of "+g.ID+" relative to the first", c-centre, 0)
		}
	}
	for _, st := range s.Stubs {
		wider := max(widths[st.At], widths[st.At+1])
		edge := centre + int64(st.Side)*wider/2
		// Across the stub halfway along it.
		y := edge + int64(st.Side)*geom.Nanometres(st.Length/2)
		iv := crossings(poly, y, false)
		if len(iv) != 1 {
			t.Fatalf("stub %s: %d copper intervals along y = %d nm, want 1", st.ID, len(iv), y)
		}
		near("width of "+st.ID, iv[0][1]-iv[0][0], st.Width)
		near("x of "+st.ID, (iv[0][0]+iv[0][1])/2, bound[st.At+1])
		// Along the stub, a quarter width off its centre line.
		x := (iv[0][0]+iv[0][1])/2 + geom.Nanometres(st.Width/4)
		along := crossings(poly, x, true)
		if len(along) != 1 {
			t.Fatalf("stub %s: %d intervals along x = %d nm, want 1", st.ID, len(along), x)
		}
		end := along[0][1]
		if st.Side < 0 {
			end = along[0][0]
		}
		near("drawn length of "+st.ID, int64(st.Side)*(end-edge), st.Length)
	}

	var b bytes.Buffer
	if err := WriteExcellon(&b, l, refMeta()); err != nil {
		t.Fatal(err)
	}
	d, err := gerberread.ReadExcellon(&b)
	if err != nil {
		t.Fatal(err)
	}
	if len(d.Hits) != 1 {
		t.Fatalf("%d drill hits, want 1", len(d.Hits))
	}
	v := s.Stubs[0]
	near("via drill", d.Hits[0].Drill, v.Via.Drill)
	near("via x", d.Hits[0].At.X, bound[v.At+1])
	// The pad's far edge is the stub end: centre = edge + length − pad/2.
	near("via y", d.Hits[0].At.Y-centre, 0.9e-3+v.Length-v.Via.Pad/2)
}

// TestDeterministic writes every file twice and wants the same bytes.
func TestDeterministic(t *testing.T) {
	writers := map[string]func(*bytes.Buffer, geom.Layout) error{
		"excellon": func(b *bytes.Buffer, l geom.Layout) error { return WriteExcellon(b, l, refMeta()) },
		"job":      func(b *bytes.Buffer, l geom.Layout) error { return WriteGerberJob(b, l, refMeta(), refStack()) },
	}
	for _, ly := range LayersOf(build(t, refSpec())) {
		writers[ly.String()] = func(b *bytes.Buffer, l geom.Layout) error { return WriteGerber(b, l, ly, refMeta()) }
	}
	for name, w := range writers {
		var a, b bytes.Buffer
		if err := w(&a, build(t, refSpec())); err != nil {
			t.Fatal(err)
		}
		if err := w(&b, build(t, refSpec())); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) || a.Len() == 0 {
			t.Errorf("%s: two writes differ (or are empty)", name)
		}
	}
}

func TestAttrField(t *testing.T) {
	tests := []struct{ in, want string }{
		// Gerber specification 2023.08, "String": reserved characters and
		// non-ASCII are written as \u escapes (from memory of the
		// specification).
		{"RF", "RF"},
		{"a,b", `a\u002Cb`},
		{"50%*", `50\u0025\u002A`},
		{"µ", `\u00B5`},
		{`a\b`, `a\u005Cb`},
	}
	for _, tt := range tests {
		if got := attrField(tt.in); got != tt.want {
			t.Errorf("attrField(%q) = %q, want %q", tt.in, got, tt.want)
		}
	}
}

func TestMetaErrors(t *testing.T) {
	l := build(t, refSpec())
	m := refMeta()
	m.ProjectID = "not-a-uuid"
	if err := WriteGerber(&bytes.Buffer{}, l, CopperTop, m); err == nil || !strings.Contains(err.Error(), "UUID") {
		t.Errorf("bad project id: err %v, want a UUID error", err)
	}
	if err := WriteGerber(&bytes.Buffer{}, l, Layer(99), refMeta()); err == nil {
		t.Error("unknown layer: no error")
	}
	m.ProjectID = "F81D4FAE-7DEC-11D0-A765-00A0C91E6BF6" // RFC 4122's own example UUID
	if g, err := m.ProjectGUID(); err != nil || g != "f81d4fae-7dec-11d0-a765-00a0c91e6bf6" {
		t.Errorf("ProjectGUID = %q, %v", g, err)
	}
}

func BenchmarkWriteGerberTop(b *testing.B) {
	l := build(b, refSpec())
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := WriteGerber(&buf, l, CopperTop, refMeta()); err != nil {
			b.Fatal(err)
		}
	}
}
