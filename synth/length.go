package synth

import (
	"math"

	"stubcraft/physical"
)

// PhysicalLength returns the length (m) of line p that is degrees long
// electrically at p.Freq: l = (degrees·π/180)/β.
func PhysicalLength(p physical.LineParams, degrees float64) float64 {
	return degrees * math.Pi / 180 / p.Beta()
}

// ElectricalDegrees returns the electrical length in degrees of length
// (m) of line p at p.Freq: β·l·180/π. It is the inverse of PhysicalLength.
func ElectricalDegrees(p physical.LineParams, length float64) float64 {
	return length * p.Beta() * 180 / math.Pi
}
