// Command spallscope measures displacement and strain fields on speckled
// faces of rock specimens under compression and times the onset of
// fracturing around openings. See README.md for the job it does.
//
// This package only parses flags, calls one function of the job's
// packages (internal/...) and prints.
package main

import (
	"fmt"
	"os"
)

// version is the tool version recorded in every output.
const version = "0.1.0-dev"

func main() {
	ctx, release := stopOnSignal(os.Stderr)
	err := newRoot().ExecuteContext(ctx)
	code := 0
	if err != nil {
		fmt.Fprintln(os.Stderr, "spallscope:", err)
		code = exitCode(ctx, err)
	}
	release()
	os.Exit(code)
}
