//go:build !unix

package fullwave

// peakRSSMiB is not measured here.
func peakRSSMiB() float64 { return 0 }
