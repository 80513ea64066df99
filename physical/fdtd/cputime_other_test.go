//go:build !unix

package fdtd

// cpuSeconds is not measured here; the CPU-time metric is then left out.
func cpuSeconds() float64 { return 0 }
