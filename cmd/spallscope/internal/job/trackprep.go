package job

import (
	"fmt"
	"os"
	"strconv"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic"
	"spallscope/dic/runfolder"
)

// trackInputs is what the track stage of a test needs, opened and checked,
// with the stage's fingerprint. A whole run and a frame part of a run on a
// cluster build it the same way, so both agree on when tracking is stale.
type trackInputs struct {
	in          *photos
	settings    dic.Settings
	scale       dic.Scale
	times       []float64
	exclude     []string
	maskHash    string
	hashes      map[string]string // "mask" and "images", for run.json
	inputs      []any             // what decides the track stage's output
	fingerprint string
}

// prepareTrack opens test t's photos, reference and mask and reads its
// correlation, scale and frame-time settings. The caller closes in.Seq.
func prepareTrack(t *config.Test, tool string) (*trackInputs, error) {
	tp := &trackInputs{hashes: map[string]string{}}
	for _, o := range t.Openings {
		tp.exclude = append(tp.exclude, o.Shape)
	}
	tp.exclude = append(tp.exclude, t.Exclude...)
	var err error
	tp.in, err = openPhotos(t.Resolve(t.Images), resolveRef(t), t.ROI, tp.exclude, t.Resolve(t.Mask))
	if err != nil {
		return nil, inTest(t, err)
	}
	fail := func(err error) (*trackInputs, error) {
		tp.in.Seq.Close()
		return nil, err
	}
	if tp.settings, err = t.Correlation.Settings(); err != nil {
		return fail(inTest(t, fmt.Errorf("correlation: %w", err)))
	}
	if tp.scale, err = t.Scale.Value(); err != nil {
		return fail(inTest(t, err))
	}
	if tp.times, err = Times(tp.in.Seq, t.Resolve(t.Times.CSV), t.Times.FPS, t.Times.MTime); err != nil {
		return fail(inTest(t, err))
	}
	if tp.maskHash, err = fileHash(t.Resolve(t.Mask)); err != nil {
		return fail(err)
	}
	tp.hashes["mask"] = tp.maskHash
	tp.hashes["images"] = sequenceDigest(tp.in.Seq)
	tp.inputs = []any{tool, tp.hashes["images"], resolveRef(t), t.ROI, tp.exclude, tp.maskHash, tp.settings, tp.scale}
	tp.fingerprint = stageFingerprint("track", "", tp.inputs)
	return tp, nil
}

// record is the start of the track stage's run.json section.
func (tp *trackInputs) record(t *config.Test, tool string) runfolder.TrackRecord {
	return runfolder.TrackRecord{Tool: tool, Images: t.Resolve(t.Images), Reference: resolveRef(t), MMPerPx: tp.scale, Times: tp.times, Exclude: tp.exclude}
}

// resume finds the first of frames from … to−1 without a complete field
// in dir (fields are renamed into place, so one that exists is whole) and,
// when it is past from, resumes tracker (fresh, fixed reference) after the
// field before it, returning that first frame. If that field cannot be
// used, the run starts again at from.
func (tp *trackInputs) resume(dir string, tracker *dic.Tracker, from, to int) int {
	next := from
	for next < to {
		if _, err := os.Stat(runfolder.FieldPath(dir, tp.in.Seq.Name(next))); err != nil {
			break
		}
		next++
	}
	if next == from {
		return from
	}
	f, err := runfolder.ReadField(runfolder.FieldPath(dir, tp.in.Seq.Name(next-1)))
	if err == nil {
		err = tracker.Resume(f) // leaves the tracker as it was on error
	}
	if err != nil {
		return from
	}
	return next
}

// inTest prefixes err with the test's name, when the test has one (a
// stage run alone from the command line has none).
func inTest(t *config.Test, err error) error {
	if t.Name == "" {
		return err
	}
	return fmt.Errorf("test %s: %w", t.Name, err)
}

// resolveRef is the test's reference: a frame index (default 0) or the
// path of an image file.
func resolveRef(t *config.Test) string {
	if t.Reference == "" {
		return "0"
	}
	if _, err := strconv.Atoi(t.Reference); err == nil {
		return t.Reference
	}
	return t.Resolve(t.Reference)
}
