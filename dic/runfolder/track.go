package runfolder

import (
	"fmt"
	"os"
	"path/filepath"
	"time"

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
}

// Track runs tracker over the frames of seq from index from on (the fields
// of earlier frames are already in dir and the tracker resumed after them)
// and writes each field to dir/fields/<frame>.csv as soon as it is done,
// then the "track" section of dir/run.json (rec, completed with frames and
// time). progress, if not nil, is called after each frame with the frame
// count and the field.
// rec.Times, when set, must hold one time per frame. A
// frame that cannot be read stops the stage with an error naming it; the
// fields already written stay.
func Track(dir string, seq frames.Sequence, tracker *dic.Tracker, rec TrackRecord, from int, progress func(done int, f *dic.Field)) (TrackRecord, error) {
	if err := os.MkdirAll(filepath.Join(dir, FieldsDir), 0o755); err != nil {
		return rec, err
	}
	if rec.Times != nil && len(rec.Times) != seq.Len() {
		return rec, fmt.Errorf("track: %d frame times for %d frames", len(rec.Times), seq.Len())
	}
	start := time.Now()
	rec.Settings, rec.Grid, rec.Frames = tracker.Settings(), tracker.Grid(), nil
	for i := 0; i < from && i < seq.Len(); i++ {
		rec.Frames = append(rec.Frames, seq.Name(i))
	}
	for i := from; i < seq.Len(); i++ {
		img, err := seq.Read(i)
		if err != nil {
			return rec, fmt.Errorf("track stopped; the fields of frames before %d are in %s: %w", i, filepath.Join(dir, FieldsDir), err)
		}
		field, err := tracker.Track(img, i, seq.Name(i))
		if err != nil {
			return rec, err
		}
		if err := WriteField(FieldPath(dir, seq.Name(i)), field, rec.MMPerPx); err != nil {
			return rec, err
		}
		rec.Frames = append(rec.Frames, seq.Name(i))
		if progress != nil {
			progress(i+1, field)
		}
	}
	rec.Seconds = time.Since(start).Seconds()
	return rec, SetSection(dir, "track", rec)
}
