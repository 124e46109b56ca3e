package runfolder

import (
	"bufio"
	"encoding/json"
)

// WriteJSON writes v as indented JSON to path through WriteAtomic, so a
// JSON file that exists is complete.
func WriteJSON(path string, v any) error {
	return WriteAtomic(path, func(w *bufio.Writer) error {
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		return enc.Encode(v)
	})
}
