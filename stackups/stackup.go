package stackups

import (
	"strings"

	"stubcraft/physical"
)

// LineKind is the kind of line a stackup carries.
type LineKind string

// Line kinds a stackup can carry.
const (
	Microstrip LineKind = "microstrip" // strip over a ground plane
	GCPW       LineKind = "gcpw"       // grounded coplanar waveguide: side grounds at Gap, ground plane below
)

// String returns the name a stackup file uses.
func (k LineKind) String() string { return string(k) }

// ParseLineKind reads "microstrip" or "gcpw" (case and surrounding space
// ignored).
func ParseLineKind(s string) (LineKind, error) {
	k := LineKind(strings.ToLower(strings.TrimSpace(s)))
	if err := checkLine(k); err != nil {
		return "", err
	}
	return k, nil
}

// Stackup is one signal layer's cross-section as read from a stackup file.
// Lengths are in metres, frequencies in hertz, conductivity in S/m.
type Stackup struct {
	Name        string // short identifier, the preset name for a preset
	Description string // free text, may be empty
	Line        LineKind
	Gap         float64 // GCPW only: strip-to-side-ground gap, m; 0 for microstrip
	Dielectric  Dielectric
	Copper      Copper
	Mask        *Mask // solder mask over the line; nil when there is none
	Spread      Spread
	// Board, when not nil, says that this cross-section is one layer
	// pair (the outer signal layer over the first plane) of a multilayer
	// board, and gives that board's layer count and total thickness.
	Board *Board
}

// Board is the multilayer board an outer layer pair belongs to.
type Board struct {
	Layers    int     // copper layers of the whole board: 2, 4, 6, …
	Thickness float64 // finished board thickness, m
}

// LayerPair reports whether the stackup describes one layer pair of a
// multilayer board rather than a whole two-layer board.
func (s Stackup) LayerPair() bool { return s.Board != nil && s.Board.Layers > 2 }

// BoardThickness returns the finished board thickness: [board] thickness
// when given, else the dielectric and the two coppers.
func (s Stackup) BoardThickness() float64 {
	if s.Board != nil {
		return s.Board.Thickness
	}
	return s.Dielectric.Thickness + 2*s.Copper.Thickness
}

// Dielectric is the laminate between the strip and its ground plane.
type Dielectric struct {
	Er          float64 // relative permittivity at ErFrequency
	ErFrequency float64 // frequency at which Er is given, Hz; 0 when not given
	LossTangent float64 // dielectric loss tangent at ErFrequency
	Thickness   float64 // strip-to-ground distance, m
}

// Copper is the conductor of the strip.
type Copper struct {
	Thickness    float64 // m; 0 for an ideal thin strip
	Roughness    float64 // RMS surface roughness, m
	Conductivity float64 // S/m
}

// Mask is a solder mask layer over the strip.
type Mask struct {
	Thickness   float64 // m
	Er          float64 // relative permittivity
	LossTangent float64 // loss tangent
}

// Spread holds the laminate's usual tolerances as fractions of the nominal
// values (0.05 for ±5 %), the defaults of a Monte Carlo run. A zero means
// that no spread was given.
type Spread struct {
	ErRel        float64 // relative spread of Dielectric.Er
	ThicknessRel float64 // relative spread of Dielectric.Thickness
}

// Substrate returns the cross-section data that the line models take. The
// line kind, the gap, ErFrequency and the spreads are not part of it.
func (s Stackup) Substrate() physical.Substrate {
	sub := physical.Substrate{
		Er:              s.Dielectric.Er,
		Height:          s.Dielectric.Thickness,
		LossTangent:     s.Dielectric.LossTangent,
		CopperThickness: s.Copper.Thickness,
		Conductivity:    s.Copper.Conductivity,
		Roughness:       s.Copper.Roughness,
	}
	if s.Mask != nil {
		sub.MaskThickness = s.Mask.Thickness
		sub.MaskEr = s.Mask.Er
		sub.MaskLossTangent = s.Mask.LossTangent
	}
	return sub
}
