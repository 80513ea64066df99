package synth

// TEMPORARY shim written by the lead so that synth compiles while the
// width synthesis is being written. Whoever adds synth/width.go deletes
// this file (same names: WidthResult, WidthWith, Width, PhysicalLength,
// ElectricalDegrees).

import (
	"fmt"
	"math"

	"stubcraft/physical"
)

type WidthResult struct {
	Width                  float64
	Model                  physical.LineModel
	Params                 physical.LineParams
	Z0Static, EpsEffStatic float64
	Warnings               []string
}

func WidthWith(mk physical.LineMaker, sub physical.Substrate, z0, freq float64) (WidthResult, error) {
	lo, hi := 1e-6, 100*sub.Height
	f := func(w float64) (float64, physical.LineModel, error) {
		m, err := mk(w, sub)
		if err != nil {
			return 0, nil, err
		}
		return m.At(freq).Z0 - z0, m, nil
	}
	flo, _, err := f(lo)
	if err != nil {
		return WidthResult{}, err
	}
	fhi, _, err := f(hi)
	if err != nil {
		return WidthResult{}, err
	}
	if flo < 0 || fhi > 0 {
		return WidthResult{}, fmt.Errorf("%g ohm is outside the widths 1 µm to 100 h", z0)
	}
	var m physical.LineModel
	for i := 0; i < 80; i++ {
		mid := math.Sqrt(lo * hi)
		v, mm, err := f(mid)
		if err != nil {
			return WidthResult{}, err
		}
		m = mm
		if v > 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	w, _ := m.Strip()
	zs, es := m.Static()
	return WidthResult{Width: w, Model: m, Params: m.At(freq), Z0Static: zs, EpsEffStatic: es, Warnings: m.Warnings(freq)}, nil
}

func PhysicalLength(p physical.LineParams, degrees float64) float64 {
	return degrees / 360 * p.GuidedWavelength()
}

func ElectricalDegrees(p physical.LineParams, length float64) float64 {
	return 360 * length / p.GuidedWavelength()
}
