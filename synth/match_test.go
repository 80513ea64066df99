package synth

import (
	"errors"
	"math"
	"math/cmplx"
	"testing"
)

// Pozar, Microwave Engineering, 4th ed., Example 5.2 (from memory): ZL =
// 15 + j10 Ω on a 50 Ω line, open shunt stubs. The book reads its answers
// off the formulas to three decimals of a wavelength.
func TestSolveShuntStubPozarExample(t *testing.T) {
	sols, err := SolveShuntStub(complex(15, 10), 50, Open)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ lineWL, stubWL float64 }{
		{0.044, 0.147}, // Pozar 4th ed. Example 5.2, solution 1 (from memory)
		{0.387, 0.353}, // Pozar 4th ed. Example 5.2, solution 2 (from memory)
	}
	if len(sols) != len(want) {
		t.Fatalf("got %d solutions, want %d: %+v", len(sols), len(want), sols)
	}
	for i, w := range want {
		if math.Abs(sols[i].LineWL()-w.lineWL) > 0.001 || math.Abs(sols[i].StubWL()-w.stubWL) > 0.001 {
			t.Errorf("solution %d: d = %.4f λ, l = %.4f λ; want %.3f λ, %.3f λ",
				i+1, sols[i].LineWL(), sols[i].StubWL(), w.lineWL, w.stubWL)
		}
		if sols[i].End != Open || sols[i].LineZ0 != 50 || sols[i].StubZ0 != 50 {
			t.Errorf("solution %d carries %+v", i+1, sols[i])
		}
	}
}

// A second worked example recalled from the same chapter (from memory,
// by another reader; the edition's numbering is not certain): ZL = 60 − j80 Ω
// on 50 Ω with shorted shunt stubs, d = 0.110 λ with l = 0.095 λ and
// d = 0.260 λ with l = 0.405 λ.
func TestSolveShuntStubShortedExample(t *testing.T) {
	sols, err := SolveShuntStub(complex(60, -80), 50, Short)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ lineWL, stubWL float64 }{{0.110, 0.095}, {0.260, 0.405}}
	if len(sols) != len(want) {
		t.Fatalf("got %d solutions: %+v", len(sols), sols)
	}
	for i, w := range want {
		if math.Abs(sols[i].LineWL()-w.lineWL) > 0.001 || math.Abs(sols[i].StubWL()-w.stubWL) > 0.001 {
			t.Errorf("solution %d: d = %.4f λ, l = %.4f λ; want %.3f λ, %.3f λ",
				i+1, sols[i].LineWL(), sols[i].StubWL(), w.lineWL, w.stubWL)
		}
	}
}

// matchABCD is the test's own 2×2 complex chain matrix, written apart from the
// production code so that the closure check below is independent of it.
type matchABCD [2][2]complex128

func (m matchABCD) mul(n matchABCD) matchABCD {
	var p matchABCD
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			p[i][j] = m[i][0]*n[0][j] + m[i][1]*n[1][j]
		}
	}
	return p
}

// matchTLine is a lossless line of impedance z and electrical length deg
// (the textbook chain matrix: cos θ, jZ sin θ; j sin θ / Z, cos θ; exact).
func matchTLine(z, deg float64) matchABCD {
	th := deg * math.Pi / 180
	zc := complex(z, 0)
	return matchABCD{
		{complex(math.Cos(th), 0), complex(0, math.Sin(th)) * zc},
		{complex(0, math.Sin(th)) / zc, complex(math.Cos(th), 0)},
	}
}

// matchShuntY is a shunt admittance (exact).
func matchShuntY(y complex128) matchABCD { return matchABCD{{1, 0}, {y, 1}} }

// matchStubY returns a stub's input admittance from its own chain matrix: an
// open end gives Zin = A/C, a short Zin = B/D.
func matchStubY(z, deg float64, end StubEnd) complex128 {
	m := matchTLine(z, deg)
	if end == Open {
		return m[1][0] / m[0][0]
	}
	return m[1][1] / m[0][1]
}

func matchInputGamma(m matchABCD, zLoad complex128, z0 float64) float64 {
	zin := (m[0][0]*zLoad + m[0][1]) / (m[1][0]*zLoad + m[1][1])
	return cmplx.Abs((zin - complex(z0, 0)) / (zin + complex(z0, 0)))
}

// Closure: every solution, cascaded by the test's own chain matrices
// (exact transmission-line theory), must present z0 at its input.
func TestSolveShuntStubClosure(t *testing.T) {
	cases := []struct {
		name                 string
		zl                   complex128
		z0, lineZ0, stubZ0   float64
		wantSolutionsAtLeast int
	}{
		{"RL < z0, inductive", complex(15, 10), 50, 50, 50, 2},
		{"RL > z0, capacitive", complex(120, -45), 50, 50, 50, 2},
		{"RL > z0, inductive", complex(200, 80), 50, 50, 50, 2},
		{"RL < z0, capacitive (sensor antenna)", complex(22, -31), 50, 50, 50, 2},
		{"RL = z0, inductive (t has a root at infinity)", complex(50, 40), 50, 50, 50, 2},
		{"RL = z0, capacitive", complex(50, -15), 50, 50, 50, 2},
		{"real load below z0 (x = 0)", complex(10, 0), 50, 50, 50, 2},
		{"real load above z0 (x = 0)", complex(300, 0), 50, 50, 50, 2},
		{"75 ohm system", complex(30, 60), 75, 75, 75, 2},
		{"stub of another impedance", complex(25, -20), 50, 50, 100, 2},
		{"line of another impedance", complex(25, -20), 50, 70, 50, 2},
		{"line and stub differ", complex(140, 60), 50, 35, 80, 2},
		{"line impedance = load resistance (r = g0)", complex(70, 30), 50, 70, 50, 2},
		{"small resistance", complex(0.5, 12), 50, 50, 50, 2},
	}
	for _, c := range cases {
		for _, end := range []StubEnd{Open, Short} {
			sols, err := SolveShuntStubZ(c.zl, c.z0, c.lineZ0, c.stubZ0, end)
			if err != nil {
				t.Errorf("%s, %v: %v", c.name, end, err)
				continue
			}
			if len(sols) < c.wantSolutionsAtLeast {
				t.Errorf("%s, %v: %d solutions, want %d", c.name, end, len(sols), c.wantSolutionsAtLeast)
			}
			for i, s := range sols {
				if !(s.LineDeg > 0 && s.LineDeg <= 180 && s.StubDeg > 0 && s.StubDeg <= 180) {
					t.Errorf("%s, %v, solution %d: lengths %g°, %g° outside (0, 180]", c.name, end, i+1, s.LineDeg, s.StubDeg)
				}
				m := matchShuntY(matchStubY(c.stubZ0, s.StubDeg, end)).mul(matchTLine(c.lineZ0, s.LineDeg))
				if g := matchInputGamma(m, c.zl, c.z0); !(g < 1e-9) {
					t.Errorf("%s, %v, solution %d (%+v): |Γin| = %.3g, want < 1e-9", c.name, end, i+1, s, g)
				}
			}
			if len(sols) == 2 && sols[0].LineDeg > sols[1].LineDeg {
				t.Errorf("%s, %v: solutions not sorted by line length: %+v", c.name, end, sols)
			}
		}
	}
}

// The two solutions of a shorted stub sit at the same points on the line as
// the open ones, with stubs a quarter wave apart (exact: an open stub and a
// shorted stub a quarter wave longer or shorter have the same input).
func TestSolveShuntStubShortVersusOpen(t *testing.T) {
	open, err := SolveShuntStub(complex(15, 10), 50, Open)
	if err != nil {
		t.Fatal(err)
	}
	short, err := SolveShuntStub(complex(15, 10), 50, Short)
	if err != nil {
		t.Fatal(err)
	}
	for i := range open {
		if math.Abs(open[i].LineDeg-short[i].LineDeg) > 1e-9 {
			t.Errorf("solution %d: line %g° (open) vs %g° (short)", i+1, open[i].LineDeg, short[i].LineDeg)
		}
		diff := math.Mod(open[i].StubDeg-short[i].StubDeg+360, 180)
		if math.Abs(diff-90) > 1e-9 {
			t.Errorf("solution %d: open %g°, short %g°: not 90° apart", i+1, open[i].StubDeg, short[i].StubDeg)
		}
	}
}

func TestSolveShuntStubErrors(t *testing.T) {
	cases := []struct {
		name               string
		zl                 complex128
		z0, lineZ0, stubZ0 float64
		end                StubEnd
		want               error // nil: any error
	}{
		{"negative resistance", complex(-10, 5), 50, 50, 50, Open, ErrBadLoad},
		{"infinite load", cmplx.Inf(), 50, 50, 50, Open, ErrBadLoad},
		{"NaN load", cmplx.NaN(), 50, 50, 50, Short, ErrBadLoad},
		{"purely reactive, inductive", complex(0, 30), 50, 50, 50, Open, ErrUnmatchable},
		{"purely reactive, capacitive", complex(0, -80), 50, 50, 50, Short, ErrUnmatchable},
		{"short circuit", 0, 50, 50, 50, Open, ErrUnmatchable},
		{"already matched", complex(50, 0), 50, 50, 50, Open, ErrMatched},
		{"already matched on another line", complex(50, 0), 50, 90, 50, Open, ErrMatched},
		// On a 100 Ω line a 55 Ω load swings between 55 and 181.8 Ω
		// (|Γ| = 0.29 against 100 Ω): Re(Y) never reaches 1/50 S (exact).
		{"out of reach of the line", complex(55, 0), 50, 100, 50, Open, ErrUnmatchable},
		{"zero z0", complex(20, 5), 0, 50, 50, Open, nil},
		{"negative line z0", complex(20, 5), 50, -50, 50, Open, nil},
		{"NaN stub z0", complex(20, 5), 50, 50, math.NaN(), Open, nil},
		{"no stub end", complex(20, 5), 50, 50, 50, 0, nil},
	}
	for _, c := range cases {
		sols, err := SolveShuntStubZ(c.zl, c.z0, c.lineZ0, c.stubZ0, c.end)
		if err == nil {
			t.Errorf("%s: no error, got %+v", c.name, sols)
			continue
		}
		if c.want != nil && !errors.Is(err, c.want) {
			t.Errorf("%s: error %q does not wrap %q", c.name, err, c.want)
		}
	}
}

func TestLoadReport(t *testing.T) {
	cases := []struct {
		zl              complex128
		z0              float64
		gamma, vswr, rl float64
	}{
		// exact: Γ = (ZL−Z0)/(ZL+Z0), VSWR = (1+|Γ|)/(1−|Γ|), RL = −20 log10|Γ|
		{complex(100, 0), 50, 1.0 / 3, 2, 20 * math.Log10(3)},
		{complex(25, 0), 50, 1.0 / 3, 2, 20 * math.Log10(3)},
		// |Γ| = |(−35+j10)/(65+j10)| = sqrt(1325/4325) (exact)
		{complex(15, 10), 50, math.Sqrt(1325.0 / 4325), (1 + math.Sqrt(1325.0/4325)) / (1 - math.Sqrt(1325.0/4325)), -10 * math.Log10(1325.0/4325)},
		{complex(0, 40), 50, 1, math.Inf(1), 0},
		{complex(50, 0), 50, 0, 1, math.Inf(1)},
	}
	for _, c := range cases {
		g, v, rl := LoadReport(c.zl, c.z0)
		if math.Abs(g-c.gamma) > 1e-12 || !matchNearly(v, c.vswr) || !matchNearly(rl, c.rl) {
			t.Errorf("LoadReport(%v, %g) = %g, %g, %g; want %g, %g, %g", c.zl, c.z0, g, v, rl, c.gamma, c.vswr, c.rl)
		}
	}
}

func matchNearly(a, b float64) bool {
	if math.IsInf(b, 0) {
		return a == b
	}
	return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b))
}

func TestPick(t *testing.T) {
	sols := []StubSolution{
		{LineDeg: 15.8, StubDeg: 52.9},
		{LineDeg: 139.3, StubDeg: 127.1},
	}
	longFirst := []StubSolution{sols[1], sols[0]}
	cases := []struct {
		sols    []StubSolution
		pick    string
		wantDeg float64 // LineDeg of the chosen one; 0: an error
	}{
		{sols, "shortest", 15.8},
		{longFirst, "shortest", 15.8},
		{sols, " Shortest ", 15.8},
		{sols, "1", 15.8},
		{sols, "2", 139.3},
		{sols, "3", 0},
		{sols, "0", 0},
		{sols, "longest", 0},
		{sols, "", 0},
		{nil, "shortest", 0},
		{sols[:1], "2", 0},
	}
	for _, c := range cases {
		p, err := ParsePick(c.pick)
		var s StubSolution
		if err == nil {
			s, err = PickSolution(c.sols, p)
		}
		if c.wantDeg == 0 {
			if err == nil {
				t.Errorf("Pick(%q) = %+v, want an error", c.pick, s)
			}
			continue
		}
		if err != nil || s.LineDeg != c.wantDeg {
			t.Errorf("Pick(%q) = %+v, %v; want line %g°", c.pick, s, err, c.wantDeg)
		}
	}
}

func TestParseStubEnd(t *testing.T) {
	cases := []struct {
		in   string
		want StubEnd // 0: an error
	}{
		{"open", Open}, {"short", Short}, {" Short ", Short}, {"OPEN", Open},
		{"shorted", 0}, {"", 0}, {"via", 0},
	}
	for _, c := range cases {
		got, err := ParseStubEnd(c.in)
		if (c.want == 0) != (err != nil) || got != c.want {
			t.Errorf("ParseStubEnd(%q) = %v, %v; want %v", c.in, got, err, c.want)
		}
		if err == nil && got.String() != map[StubEnd]string{Open: "open", Short: "short"}[c.want] {
			t.Errorf("%v.String() = %q", got, got.String())
		}
	}
}

func BenchmarkSolveShuntStubZ(b *testing.B) {
	for i := 0; i < b.N; i++ {
		if _, err := SolveShuntStubZ(complex(22, -31), 50, 60, 45, Short); err != nil {
			b.Fatal(err)
		}
	}
}
