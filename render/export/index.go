package export

import (
	"bufio"
	"encoding/json"

	"spallscope/dic"
)

// IndexFile lists the NPY arrays of an export, in the npy folder.
const IndexFile = "index.json"

// Index is the content of index.json: what each array holds, so the
// arrays can be loaded without this program.
type Index struct {
	// Format states the file format of the arrays.
	Format string `json:"format"`
	// Frames are the frame names, in the order of the arrays' first axis.
	Frames []string `json:"frames"`
	// TimeSource is "camera" when times.npy holds the camera times (s) and
	// "frame index" when no times were recorded.
	TimeSource string `json:"time_source"`
	// LengthUnit is the unit of x, y, u and v: "mm" with a known scale,
	// else "px".
	LengthUnit string    `json:"length_unit"`
	MMPerPx    dic.Scale `json:"mm_per_px,omitempty"`
	// Grid is the grid of reference positions, in px.
	Grid   dic.Grid     `json:"grid"`
	Arrays []IndexArray `json:"arrays"`
	// StatusCodes names the values of the status array.
	StatusCodes map[int]string `json:"status_codes,omitempty"`
	// Missing tells what an invalid point holds.
	Missing string `json:"missing"`
}

// IndexArray describes one NPY file.
type IndexArray struct {
	File  string `json:"file"`
	Name  string `json:"name"`
	Shape []int  `json:"shape"`
	// Axes names the axes of Shape, such as ["frame", "row", "col"].
	Axes  []string `json:"axes"`
	DType string   `json:"dtype"`
	Unit  string   `json:"unit"`
}

// writeIndex writes ix as indented JSON, with dtypes such as "<f8" kept
// readable (no HTML escaping).
func writeIndex(w *bufio.Writer, ix *Index) error {
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(ix)
}
