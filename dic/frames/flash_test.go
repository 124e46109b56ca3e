package frames_test

import (
	"math"
	"path/filepath"
	"testing"

	"spallscope/dic/frames"
	"spallscope/dic/region"
	"spallscope/dic/synth"
)

// flashFrames writes 8 frames of a speckled face lit by a lamp that dims
// by drift over the test, flickers by ±flicker gray levels, and an LED in
// the top-left corner (x, y ≤ 15) that makes the exposure there 1.6 times
// brighter in frame 5; it returns each frame's mean inside the LED's
// region and over the whole frame.
func flashFrames(t *testing.T, drift, flicker float64) (led, whole []float64) {
	t.Helper()
	dir := t.TempDir()
	box := &region.Rect{X0: 0, Y0: 0, X1: 15, Y1: 15}
	sc := &synth.Scenario{Name: "flash", Width: 64, Height: 48, Frames: 8, FPS: 2,
		Pattern:  synth.Pattern{Radius: 2, Coverage: 0.4, Seed: 2},
		Camera:   synth.Camera{Oversample: 1},
		Fields:   []synth.FieldSpec{{Translation: &synth.Translation{U: 0.5}, Drive: synth.DriveRamp}},
		Lighting: &synth.Lighting{Exposure: 0.5, Drift: drift, Flicker: flicker, Flash: &synth.Flash{Frame: 5, Gain: 1.6, Region: box}},
	}
	if _, err := synth.Write(sc, dir, nil); err != nil {
		t.Fatal(err)
	}
	seq, err := frames.Open(filepath.Join(dir, synth.FramesDir))
	if err != nil {
		t.Fatal(err)
	}
	defer seq.Close()
	for i := 0; i < seq.Len(); i++ {
		img, err := seq.Read(i)
		if err != nil {
			t.Fatal(err)
		}
		m, n := frames.RegionMean(img, box.Contains)
		if n != 256 {
			t.Fatalf("%d pixels in the LED's 16×16 box", n)
		}
		all, _ := frames.RegionMean(img, nil)
		led, whole = append(led, m), append(whole, all)
	}
	return led, whole
}

// A light that multiplies the exposure by 1.6 in one frame, under a lamp
// dimming linearly by 5 % over 8 frames: inside the LED's region the
// flash is found at its frame, with the jump the gains give,
// 1.6·(1 − 0.05·5/7) − 1 = 0.5429 over the brightest of the five frames
// before (frame 0), to the 8-bit rounding (0.005); the
// dimming frames are no flash. Over the whole frame, of which the LED
// lights a twelfth, the mean rises by under the 5 % a flash must reach.
func TestFindFlashAtItsFrame(t *testing.T) {
	led, whole := flashFrames(t, -0.05, 0)
	fl := frames.FindFlashes(led, 0.05)
	if len(fl) != 1 || fl[0].Frame != 5 {
		t.Fatalf("flashes %+v, want one at frame 5", fl)
	}
	want := 1.6*(1-0.05*5.0/7) - 1
	if math.Abs(fl[0].Jump-want) > 0.005 {
		t.Errorf("jump %.4f, want %.4f ± 0.005", fl[0].Jump, want)
	}
	if fl := frames.FindFlashes(whole, 0.05); len(fl) != 0 {
		t.Errorf("whole frame: flashes %+v, want none", fl)
	}
}

// Under a flicker of ±3 gray levels (±5 % of the mean) the LED's twelfth
// of the frame moves the whole frame's mean by less than the flicker
// does: over the whole frame no frame rises above the brightest of those
// before it; inside the LED's region frame 5 does, by the jump the gains
// and offsets give (to 0.01, the 8-bit rounding).
func TestFindFlashInItsRegion(t *testing.T) {
	led, whole := flashFrames(t, 0, 3)
	if fl := frames.FindFlashes(whole, 0.05); len(fl) != 0 {
		t.Errorf("whole frame under flicker: flashes %+v, want none", fl)
	}
	if fl := frames.FindFlashes(led, 0.05); len(fl) != 1 || fl[0].Frame != 5 {
		t.Errorf("LED region: flashes %+v, want one at frame 5", fl)

	}
}
