package stage

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"sync"
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

// trackGCPercent is the garbage collector's heap growth between
// collections while a tracker is live, in per cent of the live heap (Go's
// default, GOGC, is 100). The track stage's live heap is the tracker's
// frames and splines, held from frame to frame (587 MB at 20 MP and a
// 10 px step, measured: the reference, the frame read into one image,
// their two spline planes, the points' prepared sums and sample
// buffers); what a frame leaves behind is little more than its field,
// 33 MB. With the default the heap grows to twice the live size, 1.2 GB
// at 20 MP, to hold dead fields between collections. A collection's work
// is the pointers it scans, a few MB here whatever the frame size, as
// frames, planes and fields hold none: measured at 20 MP, 10–15 ms of
// wall time and 5–8 ms of CPU a collection, about one a frame at 5 %,
// against 5–6 s a frame.
const trackGCPercent = 5

// lowGC counts the trackers for which the collector's growth is lowered,
// and holds the growth to restore when none is left.
var lowGC struct {
	sync.Mutex
	trackers int
	restore  int
}

// collectOften sets the collector's growth to trackGCPercent until
// tracker has been collected, unless GOGC is set in the environment
// (GOGC=100 keeps Go's default). The growth is restored when the
// collector frees the tracker, not when the stage returns: restored while
// the caller still holds the tracker, the next collection's goal would be
// twice the tracker's live heap, which the next stage would fill on top
// of the dead tracker (measured: 1.27 GB at 20 MP, against 0.8 GB).
func collectOften(tracker *dic.Tracker) {
	if _, set := os.LookupEnv("GOGC"); set {
		return
	}
	lowGC.Lock()
	if lowGC.trackers == 0 {
		lowGC.restore = debug.SetGCPercent(trackGCPercent)
	}
	lowGC.trackers++
	lowGC.Unlock()
	runtime.AddCleanup(tracker, func(struct{}) {
		lowGC.Lock()
		defer lowGC.Unlock()
		if lowGC.trackers--; lowGC.trackers == 0 {
			debug.SetGCPercent(lowGC.restore)
		}
	}, struct{}{})
}

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
