package speckle

import (
	"spallscope/dic/runfolder"
)

// WriteJSON writes r as indented JSON to path, under a temporary name that
// is renamed into place when complete.
func WriteJSON(path string, r *Report) error {
	return runfolder.WriteJSON(path, r)
}
