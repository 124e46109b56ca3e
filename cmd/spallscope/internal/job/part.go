package job

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
)

// Part is one frame range of a test's tracking, run as its own cluster
// task so that a long sequence is tracked by several nodes at once: frames
// From … To−1 of the sequence, part Index of Count.
//
// Only the fixed reference can be split this way: every frame is then
// correlated against the same reference, so a part needs nothing from the
// frames before it. A part's first frame has no previous solution to start
// from; it starts like the first frame of a whole run, from the integer
// ZNCC search at the seed points and reliability-guided propagation. IC-GN
// then converges to the same optimum as in a whole run to within its
// stopping tolerance (parameter updates that move the subset corners by
// less than 1e-3 px), so a split run equals a whole one to about that
// tolerance, not to the last digit. The incremental reference carries its
// current reference image from frame to frame and is refused.
type Part struct {
	Index int `json:"index"`
	Count int `json:"count"`
	From  int `json:"from"`
	To    int `json:"to"`
}

// partsDir is the folder of a test's run folder that holds its parts.
const partsDir = "parts"

// partRecordFile is the file in a part's folder that says how the part's
// last task ended: written at the end, so a task that died leaves none.
const partRecordFile = "part.json"

// SplitFrames divides n frames into parts of at most perTask frames, as
// even as possible. perTask ≤ 0 or ≥ n gives one part.
func SplitFrames(n, perTask int) []Part {
	count := 1
	if perTask > 0 && n > perTask {
		count = (n + perTask - 1) / perTask
	}
	parts := make([]Part, count)
	for k := range parts {
		parts[k] = Part{Index: k, Count: count, From: k * n / count, To: (k + 1) * n / count}
	}
	return parts
}

// Dir is the part's folder under the test's run folder testDir.
func (p Part) Dir(testDir string) string {
	return filepath.Join(testDir, partsDir, fmt.Sprintf("%d-of-%d", p.Index+1, p.Count))
}

// String names the part for messages: "part 2/3 (frames 10–19)".
func (p Part) String() string {
	return fmt.Sprintf("part %d/%d (frames %d–%d)", p.Index+1, p.Count, p.From, p.To-1)
}

// PartRecord is how a part's task ended.
type PartRecord struct {
	Config      string                 `json:"config"`
	Part        Part                   `json:"part"`
	OK          bool                   `json:"ok"`
	Error       string                 `json:"error,omitempty"`
	Fingerprint string                 `json:"track_fingerprint,omitempty"`
	Track       *runfolder.TrackRecord `json:"track,omitempty"`
}

// ReadPartRecord reads part p's record under testDir; fs.ErrNotExist when
// the part has not finished (waiting, running, or its task died).
func ReadPartRecord(testDir string, p Part) (PartRecord, error) {
	var r PartRecord
	err := readJSON(filepath.Join(p.Dir(testDir), partRecordFile), &r)
	return r, err
}

// FrameCount returns the number of frames in test t's photo sequence.
func FrameCount(t *config.Test) (int, error) {
	if t.Images == "" {
		return 0, fmt.Errorf("test %s: no images given", t.Name)
	}
	seq, err := frames.Open(t.Resolve(t.Images))
	if err != nil {
		return 0, fmt.Errorf("test %s: %w", t.Name, err)
	}
	defer seq.Close()
	return seq.Len(), nil
}

// CanSplit reports why test t cannot be tracked in frame parts, or nil.
func CanSplit(t *config.Test) error {
	if len(t.Faces) > 0 {
		return fmt.Errorf("test %s has several faces; it runs as one task", t.Name)
	}
	settings, err := t.Correlation.Settings()
	if err != nil {
		return fmt.Errorf("test %s: correlation: %w", t.Name, err)
	}
	if t.CompensationPlate != "" {
		return fmt.Errorf("test %s has a compensation plate, whose per-frame magnifications are recorded by one tracking run; it runs as one task (leave --frames-per-task out)", t.Name)
	}
	if settings.Reference == dic.IncrementalReference {
		return fmt.Errorf("test %s uses the %s reference, which carries its current reference image from frame to frame; frames can be split over tasks only with the fixed reference (set correlation.reference: fixed, or leave --frames-per-task out)", t.Name, settings.Reference)
	}
	return nil
}

// TrackPart tracks frames p.From … p.To−1 of the test configured in configPath
// into p's folder under testDir (the test's run folder) and records the
// outcome there, failures included. A part that was interrupted resumes
// after its last complete field when its inputs and settings are
// unchanged.
func TrackPart(ctx context.Context, configPath, testDir, tool string, p Part, progress Progress) (err error) {
	dir := p.Dir(testDir)
	if err := runfolder.Claim(testDir, tool); err != nil {
		return err
	}
	unlock, err := claimAndLock(dir, tool)
	if err != nil {
		return err
	}
	defer unlock()
	recPath := filepath.Join(dir, partRecordFile)
	if err := os.Remove(recPath); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	rec := PartRecord{Config: configPath, Part: p}
	defer func() {
		if r := recover(); r != nil { // a bug must still leave a record
			err = fmt.Errorf("internal error: %v", r)
		}
		if err != nil {
			rec.OK, rec.Error = false, err.Error()
		} else {
			rec.OK = true
		}
		if werr := runfolder.WriteJSON(recPath, rec); werr != nil && err == nil {
			err = werr
		}
	}()
	t, err := config.Read(configPath)
	if err != nil {
		return err
	}
	if err := CanSplit(t); err != nil {
		return err
	}
	tp, err := prepareTrack(t, tool)
	if err != nil {
		return err
	}
	defer tp.in.Seq.Close()
	n := tp.in.Seq.Len()
	if p.From < 0 || p.To > n || p.From >= p.To {
		return fmt.Errorf("test %s: %s outside the sequence's %d frames (the photos changed since the campaign was planned: submit again)", t.Name, p, n)
	}
	rec.Fingerprint = tp.fingerprint
	if tp.times != nil {
		tp.times = tp.times[:p.To]
	}
	if progress == nil {
		progress = func(string, int, int) {}
	}

	var stages map[string]stageRecord
	if err := runfolder.Section(dir, "stages", &stages); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	tracker, err := dic.NewTracker(tp.in.Ref, max(tp.in.RefIndex, 0), tp.in.Mask, tp.settings)
	if err != nil {
		return fmt.Errorf("test %s: %w", t.Name, err)
	}
	from := p.From
	if st := stages["track"]; st.Fingerprint == tp.fingerprint {
		from = tp.resume(dir, tracker, p.From, p.To)
	}
	if from == p.From {
		os.RemoveAll(filepath.Join(dir, runfolder.FieldsDir))
		os.RemoveAll(filepath.Join(dir, runfolder.PhotoFieldsDir))
	}
	if err := runfolder.SetSection(dir, "stages", map[string]stageRecord{"track": {Fingerprint: tp.fingerprint}}); err != nil {
		return err
	}
	start := time.Now()
	tr, err := stage.Track(ctx, dir, headSequence{tp.in.Seq, p.To}, tracker, tp.lens, nil, tp.record(t, tool), from,
		func(done int, _ *dic.Field) { progress("track", done-p.From, p.To-p.From) })
	if err != nil {
		return fmt.Errorf("test %s, %s: %w", t.Name, p, err)
	}
	tr.Frames = tr.Frames[p.From:]
	rec.Track = &tr
	return runfolder.SetSection(dir, "stages", map[string]stageRecord{"track": {Fingerprint: tp.fingerprint, Complete: true, Seconds: time.Since(start).Seconds()}})
}

// AssembleParts makes test t's run folder testDir whole from its finished
// parts: it links (or copies) every part's fields into testDir/fields and
// writes the track stage's records, so that Run then skips tracking and
// goes on with strain, zones and outputs. Every part must have finished
// with the inputs and settings the test has now; otherwise it says which
// parts are missing, failed or stale and changes nothing.
func AssembleParts(t *config.Test, testDir, tool string, parts []Part) error {
	tp, err := prepareTrack(t, tool)
	if err != nil {
		return err
	}
	defer tp.in.Seq.Close()
	var records []PartRecord
	var problems []error
	for _, p := range parts {
		r, err := ReadPartRecord(testDir, p)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			problems = append(problems, fmt.Errorf("%s has not finished", p))
		case err != nil:
			problems = append(problems, fmt.Errorf("%s: %w", p, err))
		case !r.OK:
			problems = append(problems, fmt.Errorf("%s failed: %s", p, r.Error))
		case r.Fingerprint != tp.fingerprint || r.Part != p || r.Track == nil:
			problems = append(problems, fmt.Errorf("%s was tracked with other inputs or settings: submit again", p))
		}
		records = append(records, r)
	}
	if len(problems) > 0 {
		return fmt.Errorf("test %s: %w", t.Name, errors.Join(problems...))
	}
	var stages map[string]stageRecord
	if err := runfolder.Section(testDir, "stages", &stages); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	if st := stages["track"]; st.Fingerprint == tp.fingerprint && st.Complete {
		return nil // already assembled
	}
	for _, s := range pipeline {
		removeOutputs(testDir, s.outputs)
	}
	if err := os.MkdirAll(filepath.Join(testDir, runfolder.FieldsDir), 0o755); err != nil {
		return err
	}
	if tp.lens != nil {
		if err := os.MkdirAll(filepath.Join(testDir, runfolder.PhotoFieldsDir), 0o755); err != nil {
			return err
		}
	}
	rec := tp.record(t, tool)
	var seconds float64
	for k, p := range parts {
		for i := p.From; i < p.To; i++ {
			name := tp.in.Seq.Name(i)
			if err := linkOrCopy(runfolder.FieldPath(p.Dir(testDir), name), runfolder.FieldPath(testDir, name)); err != nil {
				return fmt.Errorf("test %s, %s: %w", t.Name, p, err)
			}
			if tp.lens != nil {
				if err := linkOrCopy(runfolder.PhotoFieldPath(p.Dir(testDir), name), runfolder.PhotoFieldPath(testDir, name)); err != nil {
					return fmt.Errorf("test %s, %s: %w", t.Name, p, err)
				}
			}
			rec.Frames = append(rec.Frames, name)
		}
		seconds += records[k].Track.Seconds
		rec.Settings, rec.Grid = records[k].Track.Settings, records[k].Track.Grid
	}
	rec.Seconds = seconds
	if err := runfolder.SetSection(testDir, "track", rec); err != nil {
		return err
	}
	return runfolder.SetSection(testDir, "stages", map[string]stageRecord{"track": {Fingerprint: tp.fingerprint, Complete: true, Seconds: seconds}})
}

// headSequence is the first n frames of a sequence.
type headSequence struct {
	frames.Sequence
	n int
}

func (h headSequence) Len() int { return h.n }

// Decode decodes frame i as the whole sequence does (frames.Decoder), so
// that a part's frames read ahead take the memory a whole run's take.
func (h headSequence) Decode(i int) (*frames.Decoded, error) { return frames.Decode(h.Sequence, i) }

// linkOrCopy makes dst a hard link of src, or a copy where the file system
// cannot link; the copy is renamed into place whole.
func linkOrCopy(src, dst string) error {
	os.Remove(dst)
	if err := os.Link(src, dst); err == nil {
		return nil
	}
	in, err := os.Open(src)
	if err != nil {
		return err
	}
	defer in.Close()
	return runfolder.WriteAtomic(dst, func(w *bufio.Writer) error {
		_, err := io.Copy(w, in)
		return err
	})
}

// TrackFingerprint is the fingerprint of test t's track stage as run by
// tool: it changes when the photos, reference, region, mask, correlation
// settings, scale, lens file or tool change.
func TrackFingerprint(t *config.Test, tool string) (string, error) {
	tp, err := prepareTrack(t, tool)
	if err != nil {
		return "", err
	}
	tp.in.Seq.Close()
	return tp.fingerprint, nil
}
