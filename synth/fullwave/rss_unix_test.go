//go:build unix

package fullwave

import (
	"runtime"
	"syscall"
)

// peakRSSMiB returns the process's peak resident memory, MiB (getrusage's
// ru_maxrss: KiB on Linux, bytes on Darwin).
func peakRSSMiB() float64 {
	var u syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &u); err != nil {
		return 0
	}
	if runtime.GOOS == "darwin" {
		return float64(u.Maxrss) / (1 << 20)
	}
	return float64(u.Maxrss) / (1 << 10)
}
