package job

import (
	"fmt"
	"os"
	"strconv"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/lens"
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
	lens        *lens.Correction // nil without a lens file
	lensRecord  *runfolder.LensRecord
	plate       *plate            // nil without a compensation plate
	notes       []string          // what the user should know of the frame times
	hashes      map[string]string // "mask", "images" and "lens", for run.json
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
	if tp.plate, err = openPlate(t, tp.in, tp.settings.Subset, tp.settings.Step); err != nil {
		return fail(inTest(t, err))
	}
	if err := tp.openLens(t); err != nil {
		return fail(inTest(t, err))
	}
	if tp.scale, err = scaleOf(t.Scale, tp.lens); err != nil {
		return fail(inTest(t, err))
	}
	if tp.times, tp.notes, err = Times(tp.in.Seq, t.Times, t.Resolve); err != nil {
		return fail(inTest(t, err))
	}
	if tp.maskHash, err = fileHash(t.Resolve(t.Mask)); err != nil {
		return fail(err)
	}
	tp.hashes["mask"] = tp.maskHash
	tp.hashes["images"] = sequenceDigest(tp.in.Seq)
	tp.inputs = []any{tool, tp.hashes["images"], resolveRef(t), t.ROI, tp.exclude, tp.maskHash, tp.settings, tp.scale}
	if tp.lens != nil {
		tp.inputs = append(tp.inputs, "lens", tp.hashes["lens"])
	}
	if tp.plate != nil {
		tp.inputs = append(tp.inputs, "compensation_plate", tp.plate.given, t.StandoffMM)
	}
	tp.fingerprint = stageFingerprint("track", "", tp.inputs)
	return tp, nil
}

// record is the start of the track stage's run.json section.
func (tp *trackInputs) record(t *config.Test, tool string) runfolder.TrackRecord {
	return runfolder.TrackRecord{Tool: tool, Images: t.Resolve(t.Images), Reference: resolveRef(t), MMPerPx: tp.scale, Times: tp.times, Exclude: tp.exclude, Lens: tp.lensRecord, Notes: tp.notes}
}

// openLens reads test t's lens file, if it names one, and checks it
// against the photos: the correction of the track stage's output.
func (tp *trackInputs) openLens(t *config.Test) error {
	if t.Lens == "" {
		return nil
	}
	path := t.Resolve(t.Lens)
	m, err := lens.Read(path)
	if err != nil {
		return err
	}
	if tp.lens, err = lens.NewCorrection(m, tp.in.Ref.Width, tp.in.Ref.Height, tp.in.Mask); err != nil {
		return fmt.Errorf("lens file %s: %w", path, err)
	}
	if tp.hashes["lens"], err = fileHash(path); err != nil {
		return err
	}
	tp.lensRecord = &runfolder.LensRecord{File: path, SHA256: tp.hashes["lens"]}
	return nil
}

// scaleOf is the image scale of section s. With a lens, a scale line's
// end points (photo pixels) are undistorted first, so that the scale is
// in mm per undistorted pixel, like the corrected fields; a scale given
// as mm_per_px is taken as it is (at the principal point an undistorted
// pixel is a photo pixel).
func scaleOf(s config.Scale, corr *lens.Correction) (dic.Scale, error) {
	if corr == nil || len(s.Line) != 5 || s.MMPerPx != 0 {
		return s.Value()
	}
	l := s.Line
	d, err := corr.Model.Length(l[0], l[1], l[2], l[3])
	if err != nil {
		return 0, fmt.Errorf("scale.line: %w", err)
	}
	if !(d > 0) || !(l[4] > 0) {
		return s.Value() // its own error
	}
	return dic.Scale(l[4] / d), nil
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
	if tp.plate != nil { // the frames whose plate motions are recorded
		next = min(next, max(from, recordedMotions(dir)))
	}
	if next == from {
		return from
	}
	// The last field and, when there is one, the field before it: the
	// tracker extrapolates each point's motion from the two.
	var fs []*dic.Field
	for k := max(from, next-2); k < next; k++ {
		src := runfolder.FieldPath(dir, tp.in.Seq.Name(k))
		if tp.lens != nil || tp.plate != nil { // the tracker resumes from its own, photo-pixel fields
			src = runfolder.PhotoFieldPath(dir, tp.in.Seq.Name(k))
		}
		f, err := runfolder.ReadField(src)
		if err != nil {
			if k == next-1 {
				return from
			}
			continue // without the one before: the last alone
		}
		f.Index = k // a field file does not hold its frame's index
		fs = append(fs, f)
	}
	if err := tracker.Resume(fs...); err != nil { // leaves the tracker as it was on error
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

// compensation is the track stage's plate compensation for a run that
// starts at frame from in dir, or nil without a plate.
func (tp *trackInputs) compensation(dir string, from int) *stage.Compensation {
	if tp.plate == nil {
		return nil
	}
	return tp.plate.compensation(dir, tp.in.Width, tp.in.Height, tp.lens, from)
}
