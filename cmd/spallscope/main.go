// Command spallscope measures displacement and strain fields on speckled
// faces of rock specimens under compression and times the onset of
// fracturing around openings. See README.md for the job it does.
//
// This package only parses flags and prints; the work is done by the
// packages dic, subset, strain and render.
package main

import (
	"fmt"
	"os"
)

// version is the tool version recorded in every output.
const version = "0.1.0-dev"

func main() {
	if err := newRoot().Execute(); err != nil {
		fmt.Fprintln(os.Stderr, "spallscope:", err)
		os.Exit(1)
	}
}
