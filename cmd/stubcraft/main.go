// Command stubcraft turns an impedance-matching solution, or a load to be
// matched, into a corrected printed-circuit layout and the files to make it.
package main

import (
	"context"
	"fmt"
	"os"
)

func main() {
	if err := newRootCmd().ExecuteContext(context.Background()); err != nil {
		fmt.Fprintln(os.Stderr, "stubcraft:", err)
		os.Exit(1)
	}
}
