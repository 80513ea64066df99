package synth_test

import (
	"fmt"

	"stubcraft/physical"
	"stubcraft/synth"
)

// The width of a 50 ohm microstrip on 1.6 mm FR-4 class laminate at
// 2.45 GHz, copper thickness and dispersion included.
func ExampleWidth() {
	sub := physical.Substrate{Er: 4.4, Height: 1.6e-3, CopperThickness: 35e-6}
	w, err := synth.Width(sub, 50, 2.45e9)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("width %.2f mm, Z0 %.2f ohm\n", w.Width*1e3, w.Params.Z0)
	// Output:
	// width 3.02 mm, Z0 50.00 ohm
}

// The two short-circuited shunt-stub matches of 60 − j80 ohm to 50 ohm
// (Pozar, Microwave Engineering 4th ed., Example 5.2, from memory, read off
// the Smith chart there: d = 0.110 λ with a stub of 0.095 λ, and
// d = 0.260 λ with one of 0.405 λ).
func ExampleSolveShuntStub() {
	sols, err := synth.SolveShuntStub(complex(60, -80), 50, synth.Short)
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, s := range sols {
		fmt.Printf("solution %d: line %.3f λ, %s stub %.3f λ\n", i+1, s.LineWL(), s.End, s.StubWL())
	}
	// Output:
	// solution 1: line 0.110 λ, short stub 0.095 λ
	// solution 2: line 0.259 λ, short stub 0.405 λ
}
