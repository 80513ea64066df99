// Command stubcraft turns an impedance-matching solution, or a load to be
// matched, into a corrected printed-circuit layout and the files to make it.
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"
)

func main() {
	os.Exit(run())
}

// buildMemoryLimit is the soft memory limit of a build without a
// full-wave solve (runtime/debug.SetMemoryLimit): the collector works
// harder only when the heap nears it, which a long sweep does (a
// 100,001-point build peaked at 63-69 MiB RSS without it, 50-53 MiB with
// it, at the same CPU time), and a usual build never does. A global
// GOGC=50 did the same for the long sweep but cost the field-solver
// commands 20-30 % more CPU. GOMEMLIMIT set by the user wins.
const buildMemoryLimit = 40 << 20

// limitBuildMemory sets buildMemoryLimit unless GOMEMLIMIT is set.
func limitBuildMemory() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(buildMemoryLimit)
	}
}

// run executes the command line and returns the exit status: 0, 1 for an
// error, 130 after SIGINT and 143 after SIGTERM (128 + the signal number,
// as shells report a process the signal ended). The first signal cancels
// the command's context, so the build stops, removes its temporary files
// and writes nothing; a second one ends the process at once.
func run() int {
	term, stopTerm := signal.NotifyContext(context.Background(), syscall.SIGTERM)
	defer stopTerm()
	ctx, stopInt := signal.NotifyContext(term, os.Interrupt)
	defer stopInt()
	go func() {
		<-ctx.Done()
		stopInt()
		stopTerm()
	}()
	err := newRootCmd().ExecuteContext(ctx)
	switch {
	case err == nil:
		return 0
	case signalled(term):
		fmt.Fprintln(os.Stderr, "stubcraft: stopped by SIGTERM; no output written")
		return 143
	case signalled(ctx):
		fmt.Fprintln(os.Stderr, "stubcraft: interrupted (SIGINT); no output written")
		return 130
	}
	fmt.Fprintln(os.Stderr, "stubcraft:", err)
	return 1
}

// signalled reports whether a signal, rather than its stop function,
// cancelled a context from signal.NotifyContext: the signal leaves its own
// cause, stop leaves context.Canceled itself.
func signalled(ctx context.Context) bool {
	cause := context.Cause(ctx)
	return cause != nil && cause != context.Canceled
}
