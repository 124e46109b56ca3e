package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"gocv.io/x/gocv"
)

// The small Kirsch fixture, tracked and differentiated on the command line,
// renders one overlay per frame and a video that OpenCV reads back with one
// frame per overlay; the summary states the symmetric sequence limits.
func TestRenderRunFolder(t *testing.T) {
	dir := synthFixture(t)
	out := filepath.Join(t.TempDir(), "run")
	if _, err := run(t, "track", "--images", filepath.Join(dir, "frames"), "--exclude", "circle:47.5,39.5,12",
		"--subset", "15", "--step", "5", "--scale", "0.1", "--out", out); err != nil {
		t.Fatal(err)
	}
	if _, err := run(t, "strain", "--fields", out, "--window", "5"); err != nil {
		t.Fatal(err)
	}
	text, err := run(t, "render", out, "--field", "e1", "--video", "--fps", "3", "--format", "avi")
	if err != nil {
		t.Fatal(err)
	}
	t.Log(text)
	if !strings.Contains(text, "rendered 3 overlays of e1") || !strings.Contains(text, "µε (1–99 % of all frames)") || !strings.Contains(text, "video: ") {
		t.Errorf("summary:\n%s", text)
	}
	if m := regexp.MustCompile(`limits -([0-9.]+) to ([0-9.]+) µε`).FindStringSubmatch(text); m == nil || m[1] != m[2] {
		t.Errorf("limits in %q: expected symmetric ones, −L to L", text)
	}
	pngs, _ := filepath.Glob(filepath.Join(out, "overlays", "*.png"))
	if len(pngs) != 3 {
		t.Errorf("%d overlay PNGs, expected 3", len(pngs))
	}
	vc, err := gocv.VideoCaptureFile(filepath.Join(out, "video.avi"))
	if err != nil {
		t.Fatal(err)
	}
	defer vc.Close()
	if n := int(vc.Get(gocv.VideoCaptureFrameCount)); n != 3 {
		t.Errorf("OpenCV reads %d frames in the video, expected 3", n)
	}
	if _, err := os.Stat(filepath.Join(out, "video.mp4")); err == nil {
		t.Error("an MP4 was written although AVI was asked for")
	}
}

// Bad requests are refused before anything is drawn, saying what was
// expected; --help documents fields, units and conventions.
func TestRenderHelpAndErrors(t *testing.T) {
	text, err := run(t, "render", "--help")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"gamma_max", "µε", "tension positive", "y down", "--limits", "viridis", "--side-by-side"} {
		if !strings.Contains(text, want) {
			t.Errorf("help does not mention %q", want)
		}
	}
	dir := t.TempDir()
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{dir, "--field", "stress"}, "expected one of exx"},
		{[]string{dir, "--on", "sideways"}, "expected reference or current"},
		{[]string{dir, "--alpha", "0"}, "opacity in (0, 1]"},
		{[]string{dir, "--percentiles", "1"}, "LOW,HIGH"},
		{[]string{filepath.Join(dir, "none")}, "none"},
	} {
		if _, err := run(t, append([]string{"render"}, c.args...)...); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("render %v: error %v, expected one saying %q", c.args, err, c.want)
		}
	}
}
