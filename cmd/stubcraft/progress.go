package main

import (
	"fmt"
	"os"
	"sync"
	"time"

	"stubcraft/synth"
)

// isTerminal reports whether f is a character device (a terminal).
func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// solverProgress shows, on stderr and only when stderr is a terminal, how
// many cross-sections the field solver has solved, once the run has taken
// longer than a second. The returned function stops it.
func solverProgress(cache *synth.SolverCache) (stop func()) {
	if !isTerminal(os.Stderr) {
		return func() {}
	}
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		start := time.Now()
		tick := time.NewTicker(250 * time.Millisecond)
		defer tick.Stop()
		shown := false
		for {
			select {
			case <-done:
				if shown {
					fmt.Fprintln(os.Stderr)
				}
				return
			case <-tick.C:
				if time.Since(start) > time.Second {
					fmt.Fprintf(os.Stderr, "\rfield solver: %d cross-sections solved, %.1f s ", cache.Len(), time.Since(start).Seconds())
					shown = true
				}
			}
		}
	}()
	return func() { close(done); wg.Wait() }
}
