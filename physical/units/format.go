package units

import (
	"fmt"
	"math"
)

// FrequencyUnit is the unit a frequency of hz prints in: GHz from 1 GHz,
// MHz from 1 MHz, kHz from 1 kHz, else Hz; per is hertz per unit.
func FrequencyUnit(hz float64) (per float64, name string) {
	switch a := math.Abs(hz); {
	case a >= 1e9:
		return 1e9, "GHz"
	case a >= 1e6:
		return 1e6, "MHz"
	case a >= 1e3:
		return 1e3, "kHz"
	}
	return 1, "Hz"
}

// FormatFrequency prints hz with at most sig significant digits in its
// unit (FrequencyUnit), without trailing zeros: "2.45 GHz", "433.92 MHz",
// "915 MHz".
func FormatFrequency(hz float64, sig int) string {
	per, name := FrequencyUnit(hz)
	return fmt.Sprintf("%.*g %s", sig, hz/per, name)
}

// FormatFrequencyRange prints lo–hi in the unit of the larger end, so both
// ends read on one scale: "2.244–2.633 GHz", "360.2–487.2 MHz".
func FormatFrequencyRange(lo, hi float64, sig int) string {
	per, name := FrequencyUnit(math.Max(math.Abs(lo), math.Abs(hi)))
	return fmt.Sprintf("%.*g–%.*g %s", sig, lo/per, sig, hi/per, name)
}
