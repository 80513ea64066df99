package physical

import (
	"math"
	"testing"

	"stubcraft/physical/fdtd/records"
)

// teeRecord is the full-wave T-junction sweep of testdata/tee/sweep.sh:
// per geometry and frequency, the parameters physical/fdtd extracted.
const teeRecord = "../testdata/tee/tee.tsv"

// fullWaveTee is one row of the record.
type fullWaveTee struct {
	er, h, wt, ws, f float64 // substrate, widths (m), frequency (Hz)
	d1, d2, k, b     float64 // m, m, 1, S
	resid            float64 // S: how well four stub lengths fit the equivalent circuit
}

func readTeeRecord(t *testing.T) []fullWaveTee {
	t.Helper()
	return readTeeFile(t, teeRecord)
}

func readTeeFile(t *testing.T, teeRecord string) []fullWaveTee {
	t.Helper()
	var rows []fullWaveTee
	for _, r := range records.Read(t, teeRecord, "testdata/tee/sweep.sh").Rows {
		get := func(name string) float64 { return r.Num(t, name) }
		rows = append(rows, fullWaveTee{er: get("er"), h: get("h_mm") * 1e-3, wt: get("wt_mm") * 1e-3, ws: get("ws_mm") * 1e-3,
			f: get("f_hz"), d1: get("d1_mm") * 1e-3, d2: get("d2_mm") * 1e-3, k: get("k"), b: get("b_ms") * 1e-3, resid: get("resid_ms") * 1e-3})
	}
	if len(rows) == 0 {
		t.Fatalf("%s has no rows", teeRecord)
	}
	return rows
}

// teeErrors compares the model with one full-wave row and returns the
// errors that move a build: the through arm's reference plane (degrees of
// the through line, per arm) and the stub's drawn length (degrees of the
// stub line) when the stub is sized, as synth does, to present a given
// ideal susceptance at the node; the worst of a 45° and a 135° stub.
func teeErrors(t *testing.T, r fullWaveTee) (armDeg, stubDeg float64, p TeeParams, k float64) {
	t.Helper()
	sub := Substrate{Er: r.er, Height: r.h}
	mt, err := NewMicrostrip(r.wt, sub)
	if err != nil {
		t.Fatal(err)
	}
	ms, err := NewMicrostrip(r.ws, sub)
	if err != nil {
		t.Fatal(err)
	}
	pt, ps := mt.At(r.f), ms.At(r.f)
	p = Tee{ThroughZ0: pt.Z0, ThroughEpsEff: pt.EpsEff, StubZ0: ps.Z0, StubEpsEff: ps.EpsEff, H: r.h, Er: r.er}.At(r.f)
	// The node's shunt admittance is C of the junction's ABCD: jB + k·y,
	// read off without assuming how the model writes its transformer.
	b := imag(p.ThroughWithStub(0)[1][0])
	k = imag(p.ThroughWithStub(1i)[1][0]) - b
	armDeg = (p.ThroughShift - r.d1) * pt.Beta() * 180 / math.Pi
	for _, ideal := range []float64{45, 135} {
		d := (stubAngle(ps, ideal, b, k, p.StubShift) - stubAngle(ps, ideal, r.b, r.k, r.d2)) * 180 / math.Pi
		if math.Abs(d) > math.Abs(stubDeg) {
			stubDeg = d
		}
	}
	return armDeg, stubDeg, p, k
}

// TestTeeAgainstFullWave holds the T-junction model to the full-wave sweep
// (physical/fdtd, testdata/tee/tee.tsv). Tolerances, derived here: issue
// 11's acceptance asks for the best match within 1 % of f0, and a matching
// network holds about 100° of line, so 1 % of f0 is about 1° of it. A tee
// must therefore place its stub within 1° and each through arm's plane
// within 0.5° (two arms per tee). The full-wave figures carry their own
// error: the coarse mesh's open end sits about 0.06 mm (0.3° at 2.45 GHz
// on 0.8 mm) beyond Kirschning-Jansen-Koster's (testdata/fdtd, (d)), which
// the record's d2 absorbs. Rows above f·h = 5 GHz·mm (the range,
// and the fit's) are logged, not held: the sweep's bands reach 5.5 GHz·mm,
// where the widest tee's full-wave d1 jumps from 0.12 to 0.60 mm.
func TestTeeAgainstFullWave(t *testing.T) {
	held := 0
	for _, r := range readTeeRecord(t) {
		if fh := r.f * r.h * 1e-6; fh > 5.0001 {
			arm, stub, _, _ := teeErrors(t, r)
			t.Logf("not held (f·h %.2f GHz·mm above 5): εr %.2f Wt %.2f Ws %.2f mm: arm %+.2f°, stub %+.2f°", fh, r.er, r.wt*1e3, r.ws*1e3, arm, stub)
			continue
		}
		held++
		arm, stub, p, k := teeErrors(t, r)
		t.Logf("εr %.2f h %.2f mm Wt %.2f Ws %.2f mm %.3f GHz (f·h %.2f GHz·mm): d1 %.3f/%.3f mm, d2 %.3f/%.3f mm, k %.3f/%.3f, B %.3f/%.3f mS (model/full-wave): arm %+.2f°, stub %+.2f°",
			r.er, r.h*1e3, r.wt*1e3, r.ws*1e3, r.f/1e9, r.f*r.h*1e-6, p.ThroughShift*1e3, r.d1*1e3, p.StubShift*1e3, r.d2*1e3, k, r.k, p.B*1e3, r.b*1e3, arm, stub)
		if math.Abs(arm) > 0.5 {
			t.Errorf("εr %.2f h %.2f mm Wt %.2f Ws %.2f mm at %.3f GHz: through-arm plane off by %.2f° (model %.3f mm, full-wave %.3f mm), want ≤ 0.5°",
				r.er, r.h*1e3, r.wt*1e3, r.ws*1e3, r.f/1e9, arm, p.ThroughShift*1e3, r.d1*1e3)
		}
		if math.Abs(stub) > 1 {
			t.Errorf("εr %.2f h %.2f mm Wt %.2f Ws %.2f mm at %.3f GHz: stub drawn %.2f° off the full-wave junction's (d2 %.3f/%.3f mm, k %.3f/%.3f, B %.3f/%.3f mS model/full-wave), want ≤ 1°",
				r.er, r.h*1e3, r.wt*1e3, r.ws*1e3, r.f/1e9, stub, p.StubShift*1e3, r.d2*1e3, k, r.k, p.B*1e3, r.b*1e3)
		}
	}
	if held < 20 {
		t.Errorf("only %d rows held to the model, want the sweep's ≥ 20", held)
	}
}

// stubAngle is the drawn angle (radians of the stub line, from its
// reference plane's shift on) that makes a junction with susceptance b,
// stub factor k and stub shift d2 present the ideal susceptance of a stub
// of angle ideal (degrees) at the node; ps is the stub line.
func stubAngle(ps LineParams, ideal, b, k, d2 float64) float64 {
	want := math.Tan(ideal*math.Pi/180) / ps.Z0
	th := math.Atan((want - b) / k * ps.Z0)
	th += math.Pi * math.Round((ideal*math.Pi/180-th)/math.Pi)
	return th + ps.Beta()*d2
}

// TestTeeFullWaveMesh checks that the sweep's coarse mesh is fine enough
// for the fit: geometries re-run on the normal mesh (tee-normal.tsv, the
// same script with MESH=normal ONLY=…) must give the same junction within
// half the model's budget, 0.5° on the stub and 0.25° per through arm,
// through the same figures TestTeeAgainstFullWave uses.
func TestTeeFullWaveMesh(t *testing.T) {
	coarse := readTeeRecord(t)
	normal := readTeeFile(t, "../testdata/tee/tee-normal.tsv")
	matched := 0
	for _, n := range normal {
		for _, c := range coarse {
			if c.er != n.er || c.h != n.h || c.wt != n.wt || c.ws != n.ws || math.Abs(c.f/n.f-1) > 1e-9 {
				continue
			}
			matched++
			sub := Substrate{Er: n.er, Height: n.h}
			mt, err := NewMicrostrip(n.wt, sub)
			if err != nil {
				t.Fatal(err)
			}
			ms, err := NewMicrostrip(n.ws, sub)
			if err != nil {
				t.Fatal(err)
			}
			pt, ps := mt.At(n.f), ms.At(n.f)
			arm := (n.d1 - c.d1) * pt.Beta() * 180 / math.Pi
			var stub float64
			for _, ideal := range []float64{45, 135} {
				d := (stubAngle(ps, ideal, n.b, n.k, n.d2) - stubAngle(ps, ideal, c.b, c.k, c.d2)) * 180 / math.Pi
				if math.Abs(d) > math.Abs(stub) {
					stub = d
				}
			}
			t.Logf("εr %.2f h %.2f mm Wt %.2f Ws %.2f mm %.3f GHz: normal − coarse: d1 %+.3f mm, d2 %+.3f mm, k %+.4f, B %+.3f mS: arm %+.2f°, stub %+.2f°",
				n.er, n.h*1e3, n.wt*1e3, n.ws*1e3, n.f/1e9, (n.d1-c.d1)*1e3, (n.d2-c.d2)*1e3, n.k-c.k, (n.b-c.b)*1e3, arm, stub)
			if math.Abs(arm) > 0.25 || math.Abs(stub) > 0.5 {
				t.Errorf("εr %.2f Wt %.2f Ws %.2f mm at %.3f GHz: the normal mesh moves the junction by %.2f° (arm) and %.2f° (stub), want ≤ 0.25° and 0.5°",
					n.er, n.wt*1e3, n.ws*1e3, n.f/1e9, arm, stub)
			}
		}
	}
	if matched < len(normal) || matched == 0 {
		t.Errorf("%d of %d normal-mesh rows matched a coarse row", matched, len(normal))
	}
}
