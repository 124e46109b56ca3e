package main

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/frames/exiftest"
	"spallscope/dic/lens"
	"spallscope/dic/runfolder"
)

// synth renders the lens fixture (our own scenario: a 0.1 % strain and a
// 7x5 chessboard at twelve poses, shot through a barrel lens), calibrate
// measures the lens from the chessboard photos, and track --lens corrects
// the frames with it: end to end on the command line. The calibrated
// focal length is the rendering lens's to 1 % and k1 to 0.02 (what the
// synthetic lab shot through; measured in the log).
func TestSynthCalibrateTrack(t *testing.T) {
	dir := t.TempDir()
	if _, err := run(t, "synth", "--spec", filepath.Join("..", "..", "testdata", "lens_small.json"), "--out", dir); err != nil {
		t.Fatal(err)
	}
	targets, _ := filepath.Glob(filepath.Join(dir, "targets", "*.png"))
	if len(targets) != 12 {
		t.Fatalf("%d target photos, want 12", len(targets))
	}
	lensFile := filepath.Join(dir, "lens.json")
	out, err := run(t, append([]string{"calibrate", "--board", "7x5", "--square", "10", "--out", lensFile}, targets...)...)
	if err != nil {
		t.Fatal(err)
	}
	t.Log(out)
	if !strings.Contains(out, "calibrated from 12 photos of the 7x5 board") || strings.Contains(out, "WARNING") {
		t.Errorf("calibrate printed:\n%s", out)
	}
	got, err := lens.Read(lensFile)
	if err != nil {
		t.Fatal(err)
	}
	truth, err := lens.Read(filepath.Join(dir, "lens_truth.json"))
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(got.Fx/truth.Fx-1) > 0.01 || math.Abs(got.K1-truth.K1) > 0.02 {
		t.Errorf("calibrated fx %.2f k1 %.4f, rendered with fx %.2f k1 %.4f", got.Fx, got.K1, truth.Fx, truth.K1)
	}
	// A second run does not overwrite the lens file without --force.
	if _, err := run(t, append([]string{"calibrate", "--board", "7x5", "--square", "10", "--out", lensFile}, targets...)...); err == nil || !strings.Contains(err.Error(), "--force") {
		t.Errorf("existing lens file: error %v, want a refusal pointing at --force", err)
	}
	runDir := filepath.Join(dir, "run")
	if out, err = run(t, "track", "--images", filepath.Join(dir, "frames"), "--lens", lensFile, "--subset", "21", "--step", "10", "--out", runDir); err != nil {
		t.Fatal(err)
	}
	var rec runfolder.TrackRecord
	if err := runfolder.Section(runDir, "track", &rec); err != nil || rec.Lens == nil || rec.Lens.File != lensFile {
		t.Errorf("track record's lens %+v (%v), want %s", rec.Lens, err, lensFile)
	}
}

// calibrate refuses a photo of another size than the first, naming it,
// and a board size that is not COLSxROWS.
func TestCalibrateBadInput(t *testing.T) {
	dir := t.TempDir()
	if _, err := run(t, "synth", "--field", "translation", "--u", "1", "--frames", "1", "--size", "64x48", "--out", filepath.Join(dir, "a")); err != nil {
		t.Fatal(err)
	}
	if _, err := run(t, "synth", "--field", "translation", "--u", "1", "--frames", "1", "--size", "64x64", "--out", filepath.Join(dir, "b")); err != nil {
		t.Fatal(err)
	}
	a := filepath.Join(dir, "a", "frames", "translation_0000.png")
	b := filepath.Join(dir, "b", "frames", "translation_0000.png")
	_, err := run(t, "calibrate", "--board", "9x6", "--square", "20", "--out", filepath.Join(dir, "l.json"), a, b)
	if err == nil || !strings.Contains(err.Error(), b+" is 64x64 px, the first ("+a+") 64x48 px") {
		t.Errorf("photos of two sizes: error %v", err)
	}
	for _, board := range []string{"9", "9x", "2x6", "nine by six"} {
		if _, err := run(t, "calibrate", "--board", board, "--square", "20", "--out", filepath.Join(dir, "l.json"), a); err == nil || !strings.Contains(err.Error(), "--board") {
			t.Errorf("--board %q: error %v", board, err)
		}
	}
	if _, err := os.Stat(filepath.Join(dir, "l.json")); err == nil {
		t.Error("a refused calibration wrote a lens file")
	}
}

// inspect --exif prints each photo's EXIF time and the interval since the
// one before (JPEGs written with known tags: 0.5 s apart, then 1.5 s), and
// notes the irregular interval.
func TestInspectExif(t *testing.T) {
	dir := t.TempDir()
	for i, tg := range []exiftest.Tags{
		{DateTimeOriginal: "2024:03:05 14:00:00", SubSecTimeOriginal: "00", OffsetTimeOriginal: "+01:00"},
		{DateTimeOriginal: "2024:03:05 14:00:00", SubSecTimeOriginal: "50", OffsetTimeOriginal: "+01:00"},
		{DateTimeOriginal: "2024:03:05 14:00:01", SubSecTimeOriginal: "00", OffsetTimeOriginal: "+01:00"},
		{DateTimeOriginal: "2024:03:05 14:00:02", SubSecTimeOriginal: "50", OffsetTimeOriginal: "+01:00"},
	} {
		if err := exiftest.WriteJPEG(filepath.Join(dir, "p"+string(rune('0'+i))+".jpg"), tg); err != nil {
			t.Fatal(err)
		}
	}
	out, err := run(t, "inspect", "--exif", dir)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"interval_s", "interval is irregular", "first frame was taken 2024-03-05 14:00:00 +01:00"} {
		if !strings.Contains(out, want) {
			t.Errorf("inspect --exif printed\n%s\nwithout %q", out, want)
		}
	}
	var got []string
	for _, line := range strings.Split(out, "\n") {
		if f := strings.Fields(line); len(f) > 2 && strings.HasPrefix(f[1], "p") {
			got = append(got, f[len(f)-2]+" "+f[len(f)-1])
		}
	}
	if want := "0.000 -|0.500 0.500|1.000 0.500|2.500 1.500"; strings.Join(got, "|") != want {
		t.Errorf("times and intervals %q, want %q", strings.Join(got, "|"), want)
	}
}
