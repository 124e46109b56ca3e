package main

import (
	"bytes"
	"fmt"
	"image"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gocv.io/x/gocv"

	"spallscope/dic/region"
	"spallscope/dic/synth"
)

// run executes the command line with args and returns stdout and the error.
func run(t *testing.T, args ...string) (string, error) {
	t.Helper()
	root := newRoot()
	var out, errOut bytes.Buffer
	root.SetOut(&out)
	root.SetErr(&errOut)
	root.SetArgs(args)
	err := root.Execute()
	return out.String(), err
}

// synth from a scenario file, then inspect the frames it wrote: the command
// line works end to end on the fixture (our own small Kirsch scenario).
func TestSynthSpecThenInspect(t *testing.T) {
	dir := t.TempDir()
	out, err := run(t, "synth", "--spec", filepath.Join("..", "..", "testdata", "kirsch_small.json"), "--out", dir)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "wrote 3 frames of 96x80 px") || !strings.Contains(out, "25 MPa") {
		t.Errorf("synth summary: %q", out)
	}
	out, err = run(t, "inspect", filepath.Join(dir, "frames"), "--fps", "2")
	if err != nil {
		t.Fatal(err)
	}
	if lines := strings.Count(out, "\n"); lines != 4 || !strings.Contains(out, "kirsch_0002  96x80") || !strings.Contains(out, "1.000") {
		t.Errorf("inspect table:\n%s", out)
	}
	// A corrupt frame is reported with its name; the others still listed.
	os.WriteFile(filepath.Join(dir, "frames", "kirsch_0001.png"), []byte("not a png"), 0o644)
	out, err = run(t, "inspect", filepath.Join(dir, "frames"))
	if err == nil || !strings.Contains(err.Error(), "1 of 3 frames failed") || !strings.Contains(err.Error(), "kirsch_0001.png") {
		t.Errorf("corrupt frame: error %v", err)
	}
	if !strings.Contains(out, "kirsch_0002") {
		t.Errorf("frames after the corrupt one must still be listed:\n%s", out)
	}
}

func TestSynthBadInput(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"synth", "--size", "512", "--out", dir}, "WIDTHxHEIGHT"},
		{[]string{"synth", "--field", "wobble", "--out", dir}, `field "wobble", expected one of translation`},
		{[]string{"synth", "--field", "crack", "--out", dir}, "distinct mouth and tip"},
		{[]string{"synth", "--depth", "12", "--out", dir}, "bit depth 12"},
		{[]string{"synth", "--field", "translation"}, "--out DIR is required"},
		// A typed 0 that the scenario builder would take as its default.
		{[]string{"synth", "--frames", "0", "--out", dir}, "--frames 0: 0 is not a setting here"},
		{[]string{"synth", "--E", "0.0", "--out", dir}, "--E 0: 0 is not a setting here"},
	}
	for _, c := range cases {
		if _, err := run(t, c.args...); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want it to say %q", c.args, err, c.want)
		}
	}
	// ν = 0 is a material's value (cork, to within a few hundredths:
	// common practice, no source), kept rather than replaced by the default.
	if out, err := run(t, "synth", "--nu", "0", "--print-spec"); err != nil || !strings.Contains(out, `"nu": 0`+"\n") {
		t.Errorf("--nu 0: %v, scenario %s, want nu 0 in it", err, out)
	}
	spec := filepath.Join(dir, "bad.json")
	os.WriteFile(spec, []byte(`{"name":"x","widht_px":64}`), 0o644)
	if _, err := run(t, "synth", "--spec", spec, "--out", dir); err == nil || !strings.Contains(err.Error(), "widht_px") {
		t.Errorf("unknown key: error %v should name it", err)
	}
}

// inspect tells of NaN and infinite pixels of a float frame, per frame,
// and that tracking treats them as unmeasured.
func TestInspectNonFinitePixels(t *testing.T) {
	dir := t.TempDir()
	m := gocv.NewMatWithSize(8, 8, gocv.MatTypeCV32F)
	defer m.Close()
	for i := 0; i < 64; i++ {
		m.SetFloatAt(i/8, i%8, float32(i))
	}
	m.SetFloatAt(2, 3, float32(math.NaN()))
	m.SetFloatAt(5, 5, float32(math.Inf(-1)))
	if !gocv.IMWrite(filepath.Join(dir, "f_1.tif"), m) {
		t.Skip("OpenCV here cannot write a float TIFF")
	}
	out, err := run(t, "inspect", dir)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "note: frame 0 (f_1): 2 pixels are NaN or infinite; tracking treats them as unmeasured") {
		t.Errorf("inspect output lacks the note of 2 non-finite pixels:\n%s", out)
	}
}

// inspect tells of a jump of the mean gray level between frames (here
// +40 %, from 100 to 140), and not of the steady frames before it.
func TestInspectBrightnessJump(t *testing.T) {
	dir := t.TempDir()
	for k, level := range []uint8{100, 101, 140} {
		img := image.NewGray(image.Rect(0, 0, 16, 16))
		for i := range img.Pix {
			img.Pix[i] = level + uint8(i%7)
		}
		f, err := os.Create(filepath.Join(dir, fmt.Sprintf("f_%d.png", k)))
		if err != nil {
			t.Fatal(err)
		}
		png.Encode(f, img)
		f.Close()
	}
	out, err := run(t, "inspect", dir)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "note: frame 2 (f_2): the mean gray level jumps by +38 %") || strings.Contains(out, "frame 1 (f_1): the mean") {
		t.Errorf("inspect output does not tell of the one jump:\n%s", out)
	}
}

// inspect --flash finds the frame an LED in view lights (synthetic frames
// whose LED region is 1.6 times brighter in frame 5 only, under a
// flickering lamp) and prints its camera time as a sync pair: frame 5 at
// 2 fps is 2.5 s. Over the whole frame the flicker hides it. A region
// that does not parse is refused, naming the option.
func TestInspectFlashSyncPair(t *testing.T) {
	dir := t.TempDir()
	box := &region.Rect{X0: 0, Y0: 0, X1: 15, Y1: 15}
	sc := &synth.Scenario{Name: "flash", Width: 64, Height: 48, Frames: 8, FPS: 2,
		Pattern:  synth.Pattern{Radius: 2, Coverage: 0.4, Seed: 2},
		Camera:   synth.Camera{Oversample: 1},
		Lighting: &synth.Lighting{Exposure: 0.5, Flicker: 3, Flash: &synth.Flash{Frame: 5, Gain: 1.6, Region: box}},
	}
	if _, err := synth.Write(sc, dir, nil); err != nil {
		t.Fatal(err)
	}
	frames := filepath.Join(dir, synth.FramesDir)
	out, err := run(t, "inspect", frames, "--fps", "2", "--flash", "--flash-region", "rect:0,0,15,15")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out, "flash: frame 5 (flash_0005) is +4") || !strings.Contains(out, "sync pair [2.500, LOG_S]") || strings.Contains(out, "flash: also") {
		t.Errorf("inspect --flash output:\n%s", out)
	}
	if out, err = run(t, "inspect", frames, "--fps", "2", "--flash"); err != nil || !strings.Contains(out, "flash: no frame is brighter") {
		t.Errorf("inspect --flash over the whole flickering frame: %v\n%s", err, out)
	}
	if _, err = run(t, "inspect", frames, "--flash", "--flash-region", "rect:0,0"); err == nil || !strings.Contains(err.Error(), "--flash-region") {
		t.Errorf("a malformed flash region: %v", err)
	}
}
