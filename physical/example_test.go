package physical_test

import (
	"fmt"

	"stubcraft/physical"
)

// A 3 mm strip on 1.6 mm FR-4 class laminate with 35 µm copper: the
// Hammerstad-Jensen static impedance and the Kirschning-Jansen dispersive
// values at 2.45 GHz.
func ExampleNewMicrostrip() {
	sub := physical.Substrate{Er: 4.4, Height: 1.6e-3, CopperThickness: 35e-6, LossTangent: 0.02}
	m, err := physical.NewMicrostrip(3e-3, sub)
	if err != nil {
		fmt.Println(err)
		return
	}
	z0, eps := m.Static()
	fmt.Printf("static: Z0 %.1f ohm, εeff %.2f\n", z0, eps)
	p := m.At(2.45e9)
	fmt.Printf("2.45 GHz: Z0 %.1f ohm, εeff %.2f, λg %.1f mm\n", p.Z0, p.EpsEff, 1e3*p.GuidedWavelength())
	// Output:
	// static: Z0 50.2 ohm, εeff 3.30
	// 2.45 GHz: Z0 50.2 ohm, εeff 3.35, λg 66.8 mm
}
