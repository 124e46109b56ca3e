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
	defer func() {
		// A bug must end in a message, not a stack dump; the deferred
		// releases of the run folder (its lock) have run by now, and every
		// file is written whole or not at all. 70 is EX_SOFTWARE of
		// sysexits(3), common practice.
		if r := recover(); r != nil {
			fmt.Fprintf(os.Stderr, "spallscope: internal error: %v\nThis is a bug in spallscope: please report it with the command line and its inputs. No file was left half-written; running the same command again resumes.\n", r)
			os.Exit(70)
		}
	}()
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
