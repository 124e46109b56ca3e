package runfolder

import (
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"

	"spallscope/dic"
	"spallscope/dic/frames"
)

// TrackRecord is the run.json section written by the track stage.
type TrackRecord struct {
	Tool      string       `json:"tool"`
	Images    string       `json:"images"`
	Reference string       `json:"reference"`
	Settings  dic.Settings `json:"settings"`
	Grid      dic.Grid     `json:"grid"`
	Frames    []string     `json:"frames"`
	Seconds   float64      `json:"seconds"`
	// MMPerPx is the image scale when known (0: results in px only).
	MMPerPx dic.Scale `json:"mm_per_px,omitempty"`
	// Times are the frames' camera times in s (nil when not known).
	Times []float64 `json:"times_s,omitempty"`
	// Exclude lists the excluded shapes as given (openings and the like).
	Exclude []string `json:"exclude,omitempty"`
	// Unmeasured lists the frames in which no point was measured
	// (untextured, blank or lost photos).
	Unmeasured []string `json:"unmeasured_frames,omitempty"`
	// Lens is the lens whose distortion was taken out of the fields (nil:
	// none; the fields are in photo pixels).
	Lens *LensRecord `json:"lens,omitempty"`
	// Notes are what the user should know of the inputs (the frame times'
	// warnings).
	Notes []string `json:"notes,omitempty"`
}

// Frames lists the frames of a run folder whose displacement fields exist,
// in the order the track stage recorded (or natural order of the files).
func Frames(dir string) ([]string, error) {
	var rec TrackRecord
	err := Section(dir, "track", &rec)
	switch {
	case err == nil && len(rec.Frames) > 0:
		return rec.Frames, nil
	case err != nil && !errors.Is(err, fs.ErrNotExist):
		return nil, err
	}
	matches, _ := filepath.Glob(filepath.Join(dir, FieldsDir, "*.csv"))
	if len(matches) == 0 {
		return nil, fmt.Errorf("run folder %s: no displacement fields in %s (run track first)", dir, filepath.Join(dir, FieldsDir))
	}
	var names []string
	for _, m := range matches {
		names = append(names, strings.TrimSuffix(filepath.Base(m), ".csv"))
	}
	frames.SortNatural(names)
	return names, nil
}
