package stage

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spallscope/dic"
	"spallscope/dic/frames"
	"spallscope/dic/runfolder"
	"spallscope/dic/synth"
)

// The frames of the track stage's tests: a speckle pattern (spots about
// 4 px across) translated by k·(shiftU, shiftV) px in frame k, rendered
// at 8 bits and written as PNG, so that the stage reads them as a run
// does, through frames.Decode.
const (
	testW, testH, testFrames = 120, 100, 6
	shiftU, shiftV           = 0.3, -0.2
)

// writeTestFrames writes the test frames to a new folder and returns it.
func writeTestFrames(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	sp, err := synth.NewSpeckles(synth.Pattern{Radius: 1.7, Coverage: 0.5, Seed: 42}, testW, testH)
	if err != nil {
		t.Fatal(err)
	}
	for k := range testFrames {
		img, err := synth.Render(synth.Scene{Speckles: sp, Field: synth.Translation{U: shiftU * float64(k), V: shiftV * float64(k)}},
			synth.Camera{Depth: 8}, testW, testH, k)
		if err != nil {
			t.Fatal(err)
		}
		if err := frames.WriteImage(filepath.Join(dir, fmt.Sprintf("f%d.png", k)), img, 8); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// openTracker opens the frames in dir and a tracker on the first, with
// the given worker count.
func openTracker(t *testing.T, dir string, workers int) (frames.Sequence, *dic.Tracker) {
	t.Helper()
	seq, err := frames.Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	ref, err := seq.Read(0)
	if err != nil {
		t.Fatal(err)
	}
	tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 10, Workers: workers})
	if err != nil {
		t.Fatal(err)
	}
	return seq, tr
}

// serialFields tracks the frames in dir one after the other, as the
// stage did before it read ahead and wrote behind (read, track, write),
// and returns each frame's field file, the reference the stage's must
// equal byte for byte.
func serialFields(t *testing.T, dir string) [][]byte {
	t.Helper()
	seq, tr := openTracker(t, dir, 1)
	out := t.TempDir()
	var files [][]byte
	for i := range seq.Len() {
		img, err := seq.Read(i)
		if err != nil {
			t.Fatal(err)
		}
		f, err := tr.Track(img, i, seq.Name(i))
		if err != nil {
			t.Fatal(err)
		}
		path := runfolder.FieldPath(out, seq.Name(i))
		if err := runfolder.WriteField(path, f, 0); err != nil {
			t.Fatal(err)
		}
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, data)
	}
	return files
}

// checkProgress returns a progress function that checks each call: in
// frame order, after the frame's field is on disk whole (it reads back
// with the field's valid points) and before the next frame's field is
// written. It counts the calls in *calls and calls then (nil: nothing)
// after its checks.
func checkProgress(t *testing.T, out string, seq frames.Sequence, from int, calls *int, then func(done int)) func(int, *dic.Field) {
	return func(done int, f *dic.Field) {
		if want := from + *calls + 1; done != want {
			t.Errorf("progress(%d) after %d calls from frame %d, want progress(%d)", done, *calls, from, want)
		}
		*calls++
		name := seq.Name(done - 1)
		back, err := runfolder.ReadField(runfolder.FieldPath(out, name))
		if err != nil || f.Name != name || back.Valid() != f.Valid() {
			t.Errorf("progress(%d): field %s, file read back %v, %d valid points of %d; want field %s on disk whole",
				done, f.Name, err, validOf(back), f.Valid(), name)
		}
		if done < seq.Len() {
			if _, err := os.Stat(runfolder.FieldPath(out, seq.Name(done))); err == nil {
				t.Errorf("progress(%d): the field of frame %d is on disk already", done, done)
			}
		}
		if then != nil {
			then(done)
		}
	}
}

func validOf(f *dic.Field) int {
	if f == nil {
		return -1
	}
	return f.Valid()
}

// checkFields checks that out's fields folder holds exactly the fields of
// the frames before n, each equal byte for byte to want's, and no partly
// written file.
func checkFields(t *testing.T, fieldsDir string, seq frames.Sequence, want [][]byte, n int) {
	t.Helper()
	entries, err := os.ReadDir(fieldsDir)
	if err != nil {
		t.Fatal(err)
	}
	var names, wantNames []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	for i := range n {
		wantNames = append(wantNames, seq.Name(i)+".csv")
		data, err := os.ReadFile(filepath.Join(fieldsDir, seq.Name(i)+".csv"))
		if err != nil || !bytes.Equal(data, want[i]) {
			t.Errorf("field of frame %d: %v, same bytes as tracked serially %v, want the same", i, err, bytes.Equal(data, want[i]))
		}
	}
	if !slices.Equal(names, wantNames) {
		t.Errorf("fields folder holds %v, want %v", names, wantNames)
	}
}

// The stage reads each frame ahead and writes each field behind, and its
// fields are those of tracking, reading and writing one frame after the
// other, byte for byte, with one worker or three; each field is reported
// in order once it is on disk. Against the known translation the
// measured displacement is within 0.02 px (noise-free 8-bit speckles and
// a 21 px subset: common practice, no source).
func TestTrackPipelineMatchesSerial(t *testing.T) {
	dir := writeTestFrames(t)
	want := serialFields(t, dir)
	for _, workers := range []int{1, 3} {
		seq, tr := openTracker(t, dir, workers)
		out := t.TempDir()
		calls := 0
		rec, err := Track(context.Background(), out, seq, tr, nil, nil, runfolder.TrackRecord{}, 0, checkProgress(t, out, seq, 0, &calls, nil))
		if err != nil {
			t.Fatal(err)
		}
		checkFields(t, filepath.Join(out, runfolder.FieldsDir), seq, want, testFrames)
		if calls != testFrames || len(rec.Frames) != testFrames || rec.Frames[testFrames-1] != seq.Name(testFrames-1) || rec.Unmeasured != nil {
			t.Errorf("workers %d: %d progress calls, frames %v, unmeasured %v; want %d calls and frames, none unmeasured",
				workers, calls, rec.Frames, rec.Unmeasured, testFrames)
		}
		last, err := runfolder.ReadField(runfolder.FieldPath(out, seq.Name(testFrames-1)))
		if err != nil {
			t.Fatal(err)
		}
		for i := range last.Points {
			p := &last.Points[i]
			u, v := p.U()
			if p.Valid() && math.Hypot(u-shiftU*(testFrames-1), v-shiftV*(testFrames-1)) > 0.02 {
				t.Fatalf("point (%d,%d): displacement (%.4f, %.4f), want (%.1f, %.1f) ± 0.02 px", p.X, p.Y, u, v, shiftU*(testFrames-1), shiftV*(testFrames-1))
			}
		}
		if last.Valid() < len(last.Points)/2 {
			t.Errorf("%d of %d points valid in the last frame, want most", last.Valid(), len(last.Points))
		}
	}
}

// readWhole is a sequence that is not a frames.Decoder: the stage reads
// its frames whole (frames.Decode).
type readWhole struct{ frames.Sequence }

// A frame that cannot be read (a PNG cut short after its header, the
// frame read ahead) stops the stage with an error naming the frame and
// its file; the fields before it are on disk whole and reported, the
// frame's and later ones are not. The same holds for a sequence read
// whole and for the first frame.
func TestTrackStopsAtUnreadableFrame(t *testing.T) {
	dir := writeTestFrames(t)
	want := serialFields(t, dir)
	for _, c := range []struct {
		bad   int
		whole bool
	}{{3, false}, {3, true}, {0, false}} {
		frameDir := t.TempDir()
		for k := range testFrames {
			data, err := os.ReadFile(filepath.Join(dir, fmt.Sprintf("f%d.png", k)))
			if err != nil {
				t.Fatal(err)
			}
			if k == c.bad {
				data = data[:100]
			}
			os.WriteFile(filepath.Join(frameDir, fmt.Sprintf("f%d.png", k)), data, 0o644)
		}
		_, tr := openTracker(t, dir, 0)
		seq, err := frames.Open(frameDir)
		if err != nil {
			t.Fatal(err)
		}
		if c.whole {
			seq = readWhole{seq}
		}
		out := t.TempDir()
		calls := 0
		rec, err := Track(context.Background(), out, seq, tr, nil, nil, runfolder.TrackRecord{}, 0, checkProgress(t, out, seq, 0, &calls, nil))
		file := filepath.Join(frameDir, fmt.Sprintf("f%d.png", c.bad))
		if err == nil || !strings.Contains(err.Error(), fmt.Sprintf("frame %d", c.bad)) || !strings.Contains(err.Error(), file) {
			t.Errorf("frame %d unreadable (whole %v): error %v, want one naming frame %d and %s", c.bad, c.whole, err, c.bad, file)
		}
		checkFields(t, filepath.Join(out, runfolder.FieldsDir), seq, want, c.bad)
		if calls != c.bad || len(rec.Frames) != c.bad {
			t.Errorf("frame %d unreadable (whole %v): %d progress calls, frames %v; want %d of each", c.bad, c.whole, calls, rec.Frames, c.bad)
		}
	}
}

// A field that cannot be written (its folder replaced by a file once
// frame 1's field is reported, so that the write of frame 2, which the
// stage starts next, fails) stops the stage with an error naming the
// field's file; the fields before it stay whole, and no later frame is
// reported.
func TestTrackStopsAtFailedWrite(t *testing.T) {
	dir := writeTestFrames(t)
	want := serialFields(t, dir)
	seq, tr := openTracker(t, dir, 0)
	out := t.TempDir()
	fieldsDir := filepath.Join(out, runfolder.FieldsDir)
	saved := filepath.Join(out, "saved")
	calls := 0
	breakFolder := func(done int) {
		if done != 2 {
			return
		}
		if err := os.Rename(fieldsDir, saved); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(fieldsDir, nil, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	rec, err := Track(context.Background(), out, seq, tr, nil, nil, runfolder.TrackRecord{}, 0, checkProgress(t, out, seq, 0, &calls, breakFolder))
	if file := runfolder.FieldPath(out, seq.Name(2)); err == nil || !strings.Contains(err.Error(), file) {
		t.Errorf("error %v, want one naming %s", err, file)
	}
	checkFields(t, saved, seq, want, 2)
	if calls != 2 || len(rec.Frames) != 2 {
		t.Errorf("%d progress calls, frames %v; want 2 of each", calls, rec.Frames)
	}
}

// A context cancelled while frame 2's field is reported (progress(3))
// stops the stage with a *Stopped error after the 3 frames reported, as
// the stage did when it wrote each field before tracking the next: frame
// 3, tracked by then, is dropped, not written. The run resumed
// from there (dic.Tracker.Resume with the last two fields read back)
// writes the fields an uninterrupted run writes, byte for byte. A
// context done before the stage starts stops it before its first frame.
func TestTrackStopsWhenCancelledAndResumes(t *testing.T) {
	dir := writeTestFrames(t)
	want := serialFields(t, dir)
	seq, tr := openTracker(t, dir, 0)
	out := t.TempDir()
	ctx, cancel := context.WithCancelCause(context.Background())
	defer cancel(nil)
	cause := errors.New("operator's interrupt")
	calls := 0
	_, err := Track(ctx, out, seq, tr, nil, nil, runfolder.TrackRecord{}, 0, checkProgress(t, out, seq, 0, &calls, func(done int) {
		if done == 3 {
			cancel(cause)
		}
	}))
	var stopped *Stopped
	if !errors.As(err, &stopped) || stopped.Done != 3 || stopped.Total != testFrames || !errors.Is(err, cause) {
		t.Fatalf("error %v, want *Stopped after 3 of %d frames, caused by %v", err, testFrames, cause)
	}
	checkFields(t, filepath.Join(out, runfolder.FieldsDir), seq, want, 3)
	if calls != 3 {
		t.Errorf("%d progress calls, want 3", calls)
	}

	seq, tr = openTracker(t, dir, 0)
	var last []*dic.Field
	for i := 1; i < 3; i++ {
		f, err := runfolder.ReadField(runfolder.FieldPath(out, seq.Name(i)))
		if err != nil {
			t.Fatal(err)
		}
		f.Index = i
		last = append(last, f)
	}
	if err := tr.Resume(last...); err != nil {
		t.Fatal(err)
	}
	calls = 0
	rec, err := Track(context.Background(), out, seq, tr, nil, nil, runfolder.TrackRecord{}, 3, checkProgress(t, out, seq, 3, &calls, nil))
	if err != nil {
		t.Fatal(err)
	}
	checkFields(t, filepath.Join(out, runfolder.FieldsDir), seq, want, testFrames)
	if calls != testFrames-3 || len(rec.Frames) != testFrames {
		t.Errorf("resumed: %d progress calls, frames %v; want %d calls, %d frames", calls, rec.Frames, testFrames-3, testFrames)
	}

	done, stop := context.WithCancel(context.Background())
	stop()
	_, tr = openTracker(t, dir, 0)
	out = t.TempDir()
	_, err = Track(done, out, seq, tr, nil, nil, runfolder.TrackRecord{}, 0, checkProgress(t, out, seq, 0, &calls, nil))
	if !errors.As(err, &stopped) || stopped.Done != 0 {
		t.Errorf("context done before the first frame: error %v, want *Stopped after 0 frames", err)
	}
	checkFields(t, filepath.Join(out, runfolder.FieldsDir), seq, want, 0)
}
