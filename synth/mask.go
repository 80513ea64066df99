package synth

import (
	"errors"

	"stubcraft/stackups"
)

// MaskMode is what the solder mask does over the RF copper ([layout] mask).
type MaskMode string

// Layout mask choices ([layout] mask).
const (
	// MaskAuto follows the stackup: a stackup with [mask] covers the line
	// (the cross-section it is sized in), one without leaves it open.
	MaskAuto MaskMode = "auto"
	// MaskOpen draws a solder-mask window over the RF copper.
	MaskOpen MaskMode = "open"
	// MaskCover covers the RF copper with mask; only the port pads are
	// open.
	MaskCover MaskMode = "cover"
)

// String returns the word a design file uses.
func (m MaskMode) String() string { return string(m) }

// ParseMaskMode reads "auto", "open" or "cover".
func ParseMaskMode(s string) (MaskMode, error) {
	switch m := MaskMode(s); m {
	case MaskAuto, MaskOpen, MaskCover:
		return m, nil
	}
	return "", errors.New("use auto (follow the stackup's [mask]), open (a window over the RF copper) or cover")
}

// StubSide is the side of the through line the stubs go ([layout]
// stub_side).
type StubSide string

// Stub sides.
const (
	StubUp   StubSide = "up"
	StubDown StubSide = "down"
)

// String returns the word a design file uses.
func (s StubSide) String() string { return string(s) }

// ParseStubSide reads "up" or "down".
func ParseStubSide(s string) (StubSide, error) {
	switch v := StubSide(s); v {
	case StubUp, StubDown:
		return v, nil
	}
	return "", errors.New("use up or down")
}

// MaskRule settles the design's mask against the stackup so that the
// line is sized for the cross-section that is drawn. It resolves
// MaskAuto in d.Layout.Mask (cover with a stackup [mask], open without)
// and returns the stackup to size the lines on:
//
//   - open on a stackup with [mask]: the drawn line is bare, so it is
//     sized on the stackup without its mask (a note says so); the mask
//     stays in the stackup the fab is told about, over the rest of the
//     board.
//   - cover on a stackup without [mask]: the mask's thickness and
//     permittivity are unknown, so the line stays sized bare and a
//     warning says that the drawn line's Z0 will run low under the mask.
func MaskRule(d *Design, st stackups.Stackup) (sizing stackups.Stackup, notes, warnings []string) {
	sizing = st
	switch d.Layout.Mask {
	case "", MaskAuto:
		d.Layout.Mask = MaskOpen
		if st.Mask != nil {
			d.Layout.Mask = MaskCover
		}
	case MaskOpen:
		if st.Mask != nil {
			sizing.Mask = nil
			notes = append(notes, "layout.mask = open leaves the RF copper bare: its widths are sized without the stackup's [mask], which covers only the rest of the board")
		}
	case MaskCover:
		if st.Mask == nil {
			warnings = append(warnings, "layout.mask = cover puts solder mask over lines sized as bare microstrip (the stackup has no [mask]): the drawn lines' Z0 runs a few per cent low; give the stackup a [mask] to size them under it, or use mask = \"open\"")
		}
	}
	return sizing, notes, warnings
}
