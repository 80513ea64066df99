package physical

import (
	"fmt"
	"math"
)

// Tee is a symmetric microstrip T-junction: through arms 1 and 2 are the
// same line, arm 3 is the stub. Its model is Hammerstad, "Computer-aided
// design of microstrip couplers with accurate discontinuity models", IEEE
// MTT-S International Microwave Symposium Digest, 1981. The equations are
// written here as recalled from memory (see At); the susceptance term is
// the one least sure.
//
// The inputs are the quasi-TEM properties of the two lines at the working
// frequency (their impedance and effective permittivity, from any line
// model), the substrate height and its relative permittivity.
type Tee struct {
	ThroughZ0     float64 // characteristic impedance of the through line, ohm
	ThroughEpsEff float64 // effective permittivity of the through line
	StubZ0        float64 // characteristic impedance of the stub line, ohm
	StubEpsEff    float64 // effective permittivity of the stub line
	H             float64 // substrate height, m
	Er            float64 // substrate relative permittivity
}

// TeeParams is the equivalent circuit of a Tee at one frequency.
//
// Reference planes: the ideal junction of the model has the through arms
// meeting at a node and the stub hung on it through an n:1 transformer,
// with a shunt susceptance B at the node. The through arms' reference
// planes lie ThroughShift from the stub's centre line, the stub's reference
// plane lies StubShift from the through line's centre line. A through line
// drawn to length L from the stub's centre line therefore enters the
// network as L − ThroughShift of line, and a stub drawn to length Ls from
// the through line's centre line as Ls − StubShift.
type TeeParams struct {
	ThroughShift float64 // d1, m, from the stub centre line to each through arm's reference plane
	StubShift    float64 // d2, m, from the through centre line to the stub's reference plane
	B            float64 // junction susceptance at the node, siemens (not normalised)
	N            float64 // transformer turns ratio n (junction side : stub side), 1 at zero frequency
	D1, D2       float64 // equivalent parallel-plate widths of the through and stub lines, m
	Fp1          float64 // first higher-order mode cut-off of the through line, Hz
	Warnings     []string
}

// At returns the junction's equivalent circuit at freq (Hz). With
// r = Z1/Z2 (through over stub impedance) and φ = f/fp1:
//
//	D = η0·h/(Z·√εeff)                               equivalent parallel-plate width
//	fp1 = 0.4·Z1/h  (GHz with h in mm)               published form; equals c0/(2·D1·√εeff1) within 0.6 %
//	d1 = 0.055·D2·r·(1 − 2·r·φ²)
//	d2 = D1·(0.5 − r·(0.05 + 0.7·exp(−1.6·r) + 0.25·r·φ² − 0.17·ln r))
//	n² = 1 − π·φ²·(r²/12 + (0.5 − d2/D1)²)
//	B  = 5.5·((εr + 2)/εr)·(D1/λ1)·(d1/D2)/(n²·Z2)   λ1 = guided wavelength of the through line
//
// (all from memory). At zero frequency n is 1 and B is 0, while d1 and d2
// keep their static values: the shifts do not vanish with frequency. As h
// goes to zero (or both impedances grow at a fixed ratio) D1 and D2 go to
// zero, fp1 to infinity, and the junction becomes an ideal tee: no shifts,
// B = 0, n = 1.
//
// Warnings: the model was fitted, from memory, for frequencies well below
// the first higher-order mode (f < fp1/2 is checked here) and for impedance
// ratios near one (0.25 ≤ r ≤ 4 is checked, common practice, no source);
// when n² ≤ 0 the model has failed and N is 0.
func (t Tee) At(freq float64) TeeParams {
	z1, z2 := t.ThroughZ0, t.StubZ0
	d1w := Eta0 * t.H / (z1 * math.Sqrt(t.ThroughEpsEff))
	d2w := Eta0 * t.H / (z2 * math.Sqrt(t.StubEpsEff))
	fp1 := 0.4e6 * z1 / t.H // 0.4·Z/h GHz·mm = 0.4e6·Z/h Hz·m
	r := z1 / z2
	phi2 := (freq / fp1) * (freq / fp1)

	p := TeeParams{D1: d1w, D2: d2w, Fp1: fp1}
	p.ThroughShift = 0.055 * d2w * r * (1 - 2*r*phi2)
	p.StubShift = d1w * (0.5 - r*(0.05+0.7*math.Exp(-1.6*r)+0.25*r*phi2-0.17*math.Log(r)))
	q := 0.5 - p.StubShift/d1w
	n2 := 1 - math.Pi*phi2*(r*r/12+q*q)

	if freq > fp1/2 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("tee: f = %.4g GHz above half the first higher-order mode cut-off (%.4g GHz)", freq/1e9, fp1/1e9))
	}
	if r < 0.25 || r > 4 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("tee: impedance ratio Z1/Z2 = %.3g outside 0.25 to 4", r))
	}
	if n2 <= 0 {
		p.Warnings = append(p.Warnings, fmt.Sprintf("tee: turns ratio n² = %.3g ≤ 0 at %.4g GHz, the model has failed", n2, freq/1e9))
		return p
	}
	p.N = math.Sqrt(n2)
	lambda1 := C0 / (freq * math.Sqrt(t.ThroughEpsEff))
	if freq > 0 {
		p.B = 5.5 * (t.Er + 2) / t.Er * (d1w / lambda1) * (p.ThroughShift / d2w) / (n2 * z2)
	}
	return p
}

// ThroughWithStub returns the two-port ABCD matrix of the through path,
// between the through arms' reference planes, with the stub hung on it:
// yStub is the stub's input admittance at its reference plane. Through the
// n:1 transformer the stub is seen at the node as yStub/n², in parallel
// with jB. Cascade it as
//
//	Line(through, L1 − ThroughShift) · ThroughWithStub(y) · Line(through, L2 − ThroughShift)
func (p TeeParams) ThroughWithStub(yStub complex128) ABCD {
	n2 := complex(p.N*p.N, 0)
	return ShuntAdmittance(complex(0, p.B) + yStub/n2)
}
