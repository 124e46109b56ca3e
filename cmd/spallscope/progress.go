package main

import (
	"fmt"

	"github.com/spf13/cobra"
)

// progressLine returns a progress callback that prints "what done/total"
// to stderr about every tenth of the work and at the end.
func progressLine(cmd *cobra.Command, what string) func(done, total int) {
	last := -1
	return func(done, total int) {
		step := done * 10 / total
		if step != last || done == total {
			last = step
			fmt.Fprintf(cmd.ErrOrStderr(), "%s %d/%d\n", what, done, total)
		}
	}
}
