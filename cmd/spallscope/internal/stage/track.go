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
// and writes each field to dir/fields/<frame>.csv, then the "track"
// section of dir/run.json (rec, completed with frames and time). The next
// frame is decoded while a frame is tracked, and a frame's field is
// written while the next one is tracked, one write at a time and in frame
// order. progress, if not nil, is called in frame order, on the caller's
// goroutine, once a frame's field is on disk, with the frame count and the
// field (as written to dir/fields): after the next frame is tracked.
// rec.Times, when set, must hold one time per frame. With a lens
// correction corr (nil: none) the tracker's own field goes to
// dir/photo_fields/<frame>.csv first and the corrected field, in
// undistorted pixels, to dir/fields/<frame>.csv. With a compensation
// plate comp (nil: none) the plate's magnification is taken out of each
// field (after the lens correction), the plate's points are masked in
// dir/fields, the tracker's own field goes to dir/photo_fields as with a
// lens, and the plate's motions to run.json's "motion" section. A
// frame that cannot be read stops the stage with an error naming it; the
// fields of the frames before it are written whole. A field that cannot
// be written stops the stage with an error naming its file; no later
// field is written. When ctx is done the stage stops with a *Stopped
// error once the field being written is on disk, done with the frames
// reported (a frame tracked but not yet reported is dropped); the fields
// written stay, so that the run can resume after them. No goroutine of
// the stage outlives it.
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
	// Frame i+1 is decoded while frame i is tracked, and frame i's field
	// is written while frame i+1 is tracked (readAhead, writeBehind).
	// Every frame is widened into the storage of the one before: the
	// tracker keeps no frame of the caller's (dic.Tracker.Track).
	reads := &readAhead{seq: seq}
	defer reads.stop()
	var writes writeBehind
	defer writes.wait()
	// written waits for the field write in flight, if any, and records
	// its frame: frames are recorded and reported in order, each once
	// its fields are on disk.
	written := func() error {
		w, ok := writes.wait()
		if !ok {
			return nil
		}
		if w.err != nil {
			return w.err
		}
		rec.Frames = append(rec.Frames, seq.Name(w.index))
		if w.field.Valid() == 0 {
			rec.Unmeasured = append(rec.Unmeasured, seq.Name(w.index))
		}
		if progress != nil {
			progress(w.index+1, w.field)
		}
		return nil
	}
	var img *subset.Image
	for i := from; i < seq.Len(); i++ {
		if ctx.Err() != nil {
			if err := written(); err != nil {
				return rec, err
			}
			return rec, &Stopped{Stage: "track", Done: i, Total: seq.Len(), Cause: context.Cause(ctx)}
		}
		var err error
		img, err = reads.read(i, img)
		if err != nil {
			if err := written(); err != nil {
				return rec, err
			}
			return rec, fmt.Errorf("track stopped; the fields of frames before %d are in %s: %w", i, filepath.Join(dir, runfolder.FieldsDir), err)
		}
		reads.start(i + 1)
		field, err := tracker.Track(img, i, seq.Name(i))
		if err != nil {
			if err := written(); err != nil {
				return rec, err
			}
			return rec, err
		}
		if err := written(); err != nil {
			return rec, err
		}
		if ctx.Err() != nil {
			// Done while the frame before was reported, as a run that
			// writes each field before tracking the next stops: with the
			// frames reported done, not with the one tracked since.
			return rec, &Stopped{Stage: "track", Done: i, Total: seq.Len(), Cause: context.Cause(ctx)}
		}
		name, scale := seq.Name(i), rec.MMPerPx
		writes.start(i, func() (*dic.Field, error) { return writeFrame(dir, name, field, corr, comp, scale) })
	}
	if err := written(); err != nil {
		return rec, err
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

// writeFrame writes the field of frame name to run folder dir and returns
// the field as written to dir/fields: with a lens correction corr or a
// compensation plate comp (nil: none), the tracker's own field goes to
// dir/photo_fields first, then is corrected and compensated (Track).
func writeFrame(dir, name string, field *dic.Field, corr *lens.Correction, comp *Compensation, scale dic.Scale) (*dic.Field, error) {
	if corr != nil || comp != nil {
		if err := runfolder.WriteField(runfolder.PhotoFieldPath(dir, name), field, 0); err != nil {
			return nil, err
		}
	}
	if corr != nil {
		field = corr.Field(field)
	}
	if comp != nil {
		var err error
		if field, err = comp.apply(dir, field); err != nil {
			return nil, err
		}
	}
	if err := runfolder.WriteField(runfolder.FieldPath(dir, name), field, scale); err != nil {
		return nil, err
	}
	return field, nil
}
