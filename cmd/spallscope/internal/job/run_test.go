package job

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"image"
	"image/png"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"
	"time"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/loadlog"
	"spallscope/dic/runfolder"
	"spallscope/strain/strainfile"
)

const tool = "spallscope test"

// A run with nothing changed skips every stage; a new strain window reruns
// strain and the stages after it, not tracking (the fingerprint rule of
// the stage table, common practice for build tools, no source).
func TestRunSkipsWhatIsUpToDate(t *testing.T) {
	tc := bandTest(t, "band", bandConfig)
	out := filepath.Join(t.TempDir(), "run")
	first, err := Run(context.Background(), tc, out, tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(first.Skipped) != 0 || first.Frames != 14 {
		t.Fatalf("first run skipped %v, %d frames; want none skipped, 14 frames", first.Skipped, first.Frames)
	}
	// The zones stage joins one event's onsets within the VSG: the strain
	// files do not carry the strain window, so it must come from the
	// strain record, (window − 1) × step + subset (5 points here).
	var sr0 strainfile.StrainRecord
	var rep strainfile.OnsetReport
	if err := runfolder.Section(out, "strain", &sr0); err != nil {
		t.Fatal(err)
	}
	if data, err := os.ReadFile(filepath.Join(out, strainfile.OnsetJSON)); err != nil {
		t.Fatal(err)
	} else if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	if rep.Settings.EventJoinPx != sr0.VSG || sr0.VSG <= 0 {
		t.Errorf("onset.json's event_join_px %d, want the strain record's VSG %d (> 0)", rep.Settings.EventJoinPx, sr0.VSG)
	}
	again, err := Run(context.Background(), tc, out, tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(again.Skipped, Stages) {
		t.Errorf("unchanged run skipped %v, want %v", again.Skipped, Stages)
	}
	field := runfolder.FieldPath(out, "band_0005")
	before, _ := os.Stat(field)
	wider := bandTest(t, "band-wider", strings.Replace(bandConfig, "strain: {window: 5}", "strain: {window: 7}", 1))
	s, err := Run(context.Background(), wider, out, tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(s.Skipped, []string{"track"}) {
		t.Errorf("after a strain-window change skipped %v, want [track]", s.Skipped)
	}
	if after, _ := os.Stat(field); !after.ModTime().Equal(before.ModTime()) {
		t.Error("tracking was redone for a strain-window change")
	}
	var sr strainfile.StrainRecord
	if runfolder.Section(out, "strain", &sr); sr.Window != 7 {
		t.Errorf("strain record window %d, want 7", sr.Window)
	}
	// A zone setting reruns zones and outputs only.
	zones := bandTest(t, "band-zones", strings.Replace(bandConfig, "strain: {window: 5}", "strain: {window: 7}", 1)+"outputs: {report: false}\n")
	if s, err = Run(context.Background(), zones, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(s.Skipped, []string{"track", "strain", "zones"}) {
		t.Errorf("after an outputs change skipped %v, want [track strain zones]", s.Skipped)
	}
}

// A run whose context ends mid-tracking stops at a frame boundary with a
// Stopped error that says how to resume, keeps the finished fields and
// leaves no temporary file and no lock; running again resumes after the
// kept frames and gives the same bytes as an uninterrupted run.
func TestStoppedRunResumes(t *testing.T) {
	tc := bandTest(t, "band", bandConfig)
	whole := filepath.Join(t.TempDir(), "whole")
	if _, err := Run(context.Background(), tc, whole, tool, nil); err != nil {
		t.Fatal(err)
	}
	cut := filepath.Join(t.TempDir(), "cut")
	ctx, cancel := context.WithCancelCause(context.Background())
	stopAfter := 5
	_, err := Run(ctx, tc, cut, tool, func(stage string, done, total int) {
		if stage == "track" && done == stopAfter {
			cancel(errors.New("test interrupt"))
		}
	})
	if !IsStopped(err) {
		t.Fatalf("got %v, want a Stopped error", err)
	}
	for _, want := range []string{"test interrupt", "track", fmt.Sprintf("%d of 14 frames", stopAfter), "run the same command again to resume"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("stop message %q lacks %q", err, want)
		}
	}
	fields, _ := filepath.Glob(filepath.Join(cut, runfolder.FieldsDir, "*.csv"))
	if len(fields) != stopAfter {
		t.Errorf("%d fields kept, want %d", len(fields), stopAfter)
	}
	if n, _ := runfolder.RemovePartials(cut); n != 0 {
		t.Errorf("%d temporary files left by the stop", n)
	}
	if _, err := os.Stat(filepath.Join(cut, runfolder.LockFile)); !os.IsNotExist(err) {
		t.Errorf("lock left after the stop: %v", err)
	}
	s, err := Run(context.Background(), tc, cut, tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Resumed != stopAfter {
		t.Errorf("resumed after %d frames, want %d", s.Resumed, stopAfter)
	}
	sameResults(t, whole, cut)
}

// A temporary file left by a process killed mid-write is removed when the
// next run takes the folder.
func TestRunRemovesPartialsOfAKilledWrite(t *testing.T) {
	tc := bandTest(t, "band", bandConfig)
	out := filepath.Join(t.TempDir(), "run")
	if _, err := Run(context.Background(), tc, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	partial := filepath.Join(out, runfolder.FieldsDir, ".band_0003.csv.partial-77")
	os.WriteFile(partial, []byte("x,y\n1,"), 0o644)
	if _, err := Run(context.Background(), tc, out, tool, nil); err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(partial); !os.IsNotExist(err) {
		t.Errorf("partial file left: %v", err)
	}
}

// --out into a folder of the user's that is not a run folder is refused
// before any work, and nothing in it changes; a folder another live
// process is writing is refused naming its PID.
func TestRunRefusesForeignAndLockedFolders(t *testing.T) {
	tc := bandTest(t, "band", bandConfig)
	foreign := t.TempDir()
	for _, sub := range []string{runfolder.FieldsDir, strainfile.StrainDir} {
		os.Mkdir(filepath.Join(foreign, sub), 0o755)
		os.WriteFile(filepath.Join(foreign, sub, "mine.csv"), []byte("only copy"), 0o644)
	}
	_, err := Run(context.Background(), tc, foreign, tool, nil)
	if !errors.Is(err, runfolder.ErrForeignFolder) {
		t.Fatalf("foreign folder: got %v", err)
	}
	for _, sub := range []string{runfolder.FieldsDir, strainfile.StrainDir} {
		if b, err := os.ReadFile(filepath.Join(foreign, sub, "mine.csv")); err != nil || string(b) != "only copy" {
			t.Errorf("user's file in %s changed: %q %v", sub, b, err)
		}
	}

	locked := filepath.Join(t.TempDir(), "run")
	os.MkdirAll(locked, 0o755)
	unlock, err := runfolder.Lock(locked)
	if err != nil {
		t.Fatal(err)
	}
	defer unlock()
	_, err = Run(context.Background(), tc, locked, tool, nil)
	if !errors.Is(err, runfolder.ErrLocked) || !strings.Contains(err.Error(), fmt.Sprint(os.Getpid())) {
		t.Errorf("locked folder: got %v, want ErrLocked naming PID %d", err, os.Getpid())
	}
}

// What the late stages need is read before tracking starts: a load log
// with a broken cell fails in well under the time of tracking, naming the
// file and line, with no field written.
func TestRunChecksLateInputsBeforeTracking(t *testing.T) {
	dir := bandPhotos(t)
	bad := filepath.Join(dir, "broken-load.csv")
	data, err := os.ReadFile(filepath.Join(dir, "synth", "loadlog.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(string(data), "\n")
	lines[5] = "12.5,not-a-number"
	os.WriteFile(bad, []byte(strings.Join(lines, "\n")), 0o644)
	for name, cfg := range map[string]string{
		"load log": strings.Replace(bandConfig, "file: synth/loadlog.csv", "file: broken-load.csv", 1),
		"AE log":   bandConfig + "ae: {file: missing-hits.csv}\n",
		"model":    bandConfig + "model: {file: missing-model.csv, load_mpa: 5}\n",
	} {
		tc := bandTest(t, "band-"+strings.ReplaceAll(name, " ", "-"), cfg)
		out := filepath.Join(t.TempDir(), "run")
		start := time.Now()
		_, err := Run(context.Background(), tc, out, tool, nil)
		if err == nil {
			t.Errorf("%s: run succeeded", name)
			continue
		}
		fields, _ := filepath.Glob(filepath.Join(out, runfolder.FieldsDir, "*.csv"))
		if len(fields) != 0 {
			t.Errorf("%s: %d fields tracked before the error %v", name, len(fields), err)
		}
		if name == "load log" && !strings.Contains(err.Error(), "broken-load.csv") {
			t.Errorf("%s: error %q does not name the file", name, err)
		}
		t.Logf("%s: %v (%.2f s)", name, err, time.Since(start).Seconds())
	}
}

// The stage table lists the stages in the order of the pipeline, and
// every stage's outputs are its own.
func TestStageTable(t *testing.T) {
	if want := []string{"track", "strain", "zones", "outputs"}; !slices.Equal(Stages, want) {
		t.Fatalf("stages %v, want %v", Stages, want)
	}
	owner := map[string]string{}
	for _, s := range pipeline {
		for _, o := range s.outputs {
			if prev, ok := owner[o]; ok {
				t.Errorf("%s is an output of both %s and %s", o, prev, s.name)
			}
			owner[o] = s.name
		}
	}
}

// A load log on another clock is caught before tracking: one that covers
// no frame is an error naming the clocks; one that ends before the last
// frames is a note that names them (the log spans log time 1 to 16 s; at
// an offset of 6 s, camera frames 11 to 13 fall after it).
func TestRunLoadLogCoverage(t *testing.T) {
	none := bandTest(t, "band-no-overlap", strings.Replace(bandConfig, "clock_offset_s: 2", "clock_offset_s: 1000", 1))
	out := filepath.Join(t.TempDir(), "run")
	_, err := Run(context.Background(), none, out, tool, nil)
	if !errors.Is(err, loadlog.ErrNoOverlap) {
		t.Fatalf("no overlap: got %v, want ErrNoOverlap", err)
	}
	if fields, _ := filepath.Glob(filepath.Join(out, runfolder.FieldsDir, "*.csv")); len(fields) != 0 {
		t.Errorf("no overlap: %d fields tracked before the error", len(fields))
	}
	late := bandTest(t, "band-late", strings.Replace(bandConfig, "clock_offset_s: 2", "clock_offset_s: 6", 1))
	s, err := Run(context.Background(), late, filepath.Join(t.TempDir(), "run"), tool, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(s.Notes, func(n string) bool { return strings.Contains(n, "3 of 14 frames are outside the load log") }) {
		t.Errorf("notes %q do not tell of the 3 frames after the log", s.Notes)
	}
}

// Blank photos are not a quiet test: a run in which no point is measured
// fails, in capitals, with ErrNothingMeasured.
func TestRunOfBlankPhotosFails(t *testing.T) {
	dir := t.TempDir()
	os.Mkdir(filepath.Join(dir, "blank"), 0o755)
	for i := range 4 {
		img := image.NewGray(image.Rect(0, 0, 96, 80))
		for k := range img.Pix {
			img.Pix[k] = 128
		}
		f, err := os.Create(filepath.Join(dir, "blank", fmt.Sprintf("b_%02d.png", i)))
		if err != nil {
			t.Fatal(err)
		}
		png.Encode(f, img)
		f.Close()
	}
	path := filepath.Join(dir, "blank.yaml")
	os.WriteFile(path, []byte("name: blank\nimages: blank\ntimes: {fps: 1}\ncorrelation: {subset: 21, step: 10}\n"), 0o644)
	tc, err := config.Read(path)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), tc, filepath.Join(dir, "run"), tool, nil)
	if !errors.Is(err, stage.ErrNothingMeasured) || !strings.Contains(err.Error(), "NOTHING WAS MEASURED") {
		t.Fatalf("blank photos: got %v, want ErrNothingMeasured in capitals", err)
	}
}
