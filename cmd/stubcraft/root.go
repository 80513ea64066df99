package main

import (
	"github.com/spf13/cobra"
)

// version is the tool version, printed by --version and written into
// every artefact.
const version = "0.1.0"

func newRootCmd() *cobra.Command {
	root := &cobra.Command{
		Use:           "stubcraft",
		Short:         "From a matching solution to fab-ready microstrip artwork",
		Version:       version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.AddCommand(newTraceCmd(), newStackupsCmd(), newSolveCmd(), newBuildCmd(), newCompareCmd(), newXsectCmd(), newTuneCmd(), newVerifyCmd())
	return root
}
