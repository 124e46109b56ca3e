package speckle

import (
	"bufio"
	"encoding/json"

	"spallscope/dic/runfolder"
)

// WriteJSON writes r as indented JSON to path, under a temporary name that
// is renamed into place when complete.
func WriteJSON(path string, r *Report) error {
	return runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(r)
	})
}
