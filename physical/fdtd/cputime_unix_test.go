//go:build unix

package fdtd

import "syscall"

// cpuSeconds returns the process's user and system CPU time so far, s: on
// a shared machine, cell updates per CPU second say what the kernel does
// whatever the load, where updates per wall second say what the load lets
// it do.
func cpuSeconds() float64 {
	var u syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &u); err != nil {
		return 0
	}
	return float64(u.Utime.Sec+u.Stime.Sec) + float64(u.Utime.Usec+u.Stime.Usec)*1e-6
}
