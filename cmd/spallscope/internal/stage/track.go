package stage

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/lens"
	"spallscope/dic/runfolder"
	"spallscope/subset"
)

// ErrNothingMeasured is wrapped by Track's error when no point was
// measured in any frame: a run of blank photos must not read as a quiet
// test.
var ErrNothingMeasured = errors.New("nothing measured")

// Track runs tracker over the frames of seq from index from on (the fields
// of earlier frames are already in dir and the tracker resumed after them)
// and writes each field to dir/fields/<frame>.csv as soon as it is done,
// then the "track" section of dir/run.json (rec, completed with frames and
// time). progress, if not nil, is called after each frame with the frame
// count and the field.
// rec.Times, when set, must hold one time per frame. With a lens
// correction corr (nil: none) the tracker's own field goes to
// dir/photo_fields/<frame>.csv first and the corrected field, in
// undistorted pixels, to dir/fields/<frame>.csv. With a compensation
// plate comp (nil: none) the plate's magnification is taken out of each
// field (after the lens correction), the plate's points are masked in
// dir/fields, the tracker's own field goes to dir/photo_fields as with a
// lens, and the plate's motions to run.json's "motion" section. A
// frame that cannot be read stops the stage with an error naming it; the
// fields already written stay. When ctx is done the stage stops before
// its next frame with a *Stopped error; the fields written stay, so that
// the run can resume after them.
func Track(ctx context.Context, dir string, seq frames.Sequence, tracker *dic.Tracker, corr *lens.Correction, comp *Compensation, rec runfolder.TrackRecord, from int, progress func(done int, f *dic.Field)) (runfolder.TrackRecord, error) {
	if err := os.MkdirAll(filepath.Join(dir, runfolder.FieldsDir), 0o755); err != nil {
		return rec, err
	}
	if corr != nil || comp != nil {
		if err := os.MkdirAll(filepath.Join(dir, runfolder.PhotoFieldsDir), 0o755); err != nil {
			return rec, err
		}
	}
	if rec.Times != nil && len(rec.Times) != seq.Len() {
		return rec, fmt.Errorf("track: %d frame times for %d frames", len(rec.Times), seq.Len())
	}
	collectOften(tracker)
	start := time.Now()
	rec.Settings, rec.Grid, rec.Frames, rec.Unmeasured = tracker.Settings(), tracker.Grid(), nil, nil
	for i := 0; i < from && i < seq.Len(); i++ {
		rec.Frames = append(rec.Frames, seq.Name(i))
	}
	// Every frame is decoded into the storage of the one before: the
	// tracker keeps no frame of the caller's (dic.Tracker.Track).
	var img *subset.Image
	for i := from; i < seq.Len(); i++ {
		if ctx.Err() != nil {
			return rec, &Stopped{Stage: "track", Done: i, Total: seq.Len(), Cause: context.Cause(ctx)}
		}
		var err error
		img, err = seq.ReadInto(i, img)
		if err != nil {
			return rec, fmt.Errorf("track stopped; the fields of frames before %d are in %s: %w", i, filepath.Join(dir, runfolder.FieldsDir), err)
		}
		field, err := tracker.Track(img, i, seq.Name(i))
		if err != nil {
			return rec, err
		}
		if corr != nil || comp != nil {
			if err := runfolder.WriteField(runfolder.PhotoFieldPath(dir, seq.Name(i)), field, 0); err != nil {
				return rec, err
			}
		}
		if corr != nil {
			field = corr.Field(field)
		}
		if comp != nil {
			if field, err = comp.apply(dir, field); err != nil {
				return rec, err
			}
		}
		if err := runfolder.WriteField(runfolder.FieldPath(dir, seq.Name(i)), field, rec.MMPerPx); err != nil {
			return rec, err
		}
		rec.Frames = append(rec.Frames, seq.Name(i))
		if field.Valid() == 0 {
			rec.Unmeasured = append(rec.Unmeasured, seq.Name(i))
		}
		if progress != nil {
			progress(i+1, field)
		}
	}
	rec.Seconds = time.Since(start).Seconds()
	if err := runfolder.SetSection(dir, "track", rec); err != nil {
		return rec, err
	}
	if from == 0 && len(rec.Unmeasured) == seq.Len() {
		return rec, fmt.Errorf("NOTHING WAS MEASURED: none of the grid's %d points was tracked in any of the %d frames (blank or untextured photos, or a region of interest and mask without speckle?); check the photos with 'spallscope inspect' and the pattern with 'spallscope pattern': %w",
			rec.Grid.Len(), seq.Len(), ErrNothingMeasured)
	}
	return rec, nil
}
