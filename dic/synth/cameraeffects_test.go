package synth

import (
	"math"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/frames"
	"spallscope/dic/region"
	"spallscope/subset"
)

// A pinhole camera shows a face that came w closer at Z/(Z − w) times its
// size about the principal point (Sutton et al. 2008, Optics and Lasers
// in Engineering 46, 746, eq. 1 in our words): the lab's magnification is
// w/(Z − w) exactly, and a frame rendered with it equals, sample for
// sample, the frame rendered under the same isotropic strain about the
// principal point with no out-of-plane motion (the two maps are one
// affine map), to float32 rounding. Inside the plate the photo shows the
// pattern at the demagnified position, whatever the field.
func TestOutOfPlaneMagnifiesAboutThePrincipalPoint(t *testing.T) {
	sc := &Scenario{Width: 96, Height: 80, Frames: 3, FPS: 1,
		OutOfPlane: &OutOfPlane{StandoffMM: 500, TowardMM: 0.6, Drive: DriveRamp, Plate: &region.Rect{X0: 70, Y0: 10, X1: 90, Y1: 30}}}
	w, m := sc.OutOfPlaneAt(2)
	if w != 0.6 || math.Abs(m-0.6/499.4) > 1e-15 {
		t.Fatalf("w %g mag %g, want 0.6 mm and %g", w, m, 0.6/499.4)
	}
	if _, m1 := sc.OutOfPlaneAt(1); math.Abs(m1-0.3/499.7) > 1e-15 {
		t.Errorf("half-way magnification %g, want %g", m1, 0.3/499.7)
	}
	sp, err := NewSpeckles(Pattern{Radius: 2, Coverage: 0.5, Seed: 3}, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	cx, cy := sc.PrincipalPoint()
	shear := UniformStrain{Cx: 30, Cy: 40, Exx: 2e-3, Eyy: -1e-3}
	cam := Camera{Oversample: 1}
	mag := 50 * m // a strong one, so that a wrong centre shows
	scene := Scene{Speckles: sp, Field: shear, Magnification: mag, MagCx: cx, MagCy: cy}
	got, err := Expose(scene, cam, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	// x = c + (1+m)(X + u(X) − c): u' = (1+m)(X + u − c) + c − X.
	iso := composed{shear, mag, cx, cy}
	want, err := Expose(Scene{Speckles: sp, Field: iso}, cam, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for i := range got.Pix {
		worst = math.Max(worst, math.Abs(float64(got.Pix[i]-want.Pix[i])))
	}
	if worst > 1e-3 {
		t.Errorf("magnified frame differs from the composed field's by %g levels", worst)
	}
	scene.Plate = &region.Rect{X0: 70, Y0: 10, X1: 90, Y1: 30}
	plated, _ := Expose(scene, cam, 96, 80)
	for _, p := range [][2]int{{75, 15}, {85, 25}} {
		X := cx + (float64(p[0])-cx)/(1+mag)
		Y := cy + (float64(p[1])-cy)/(1+mag)
		if d := math.Abs(float64(plated.Pix[p[1]*96+p[0]]) - 255*sp.Level(X, Y)); d > 1e-3 {
			t.Errorf("plate pixel %v differs from the pattern at its demagnified position by %g levels", p, d)
		}
	}
}

func uniformImage(w, h int, level float32) *subset.Image {
	img := subset.NewImage(w, h, 8)
	for i := range img.Pix {
		img.Pix[i] = level
	}
	return img
}

// composed is field f followed by a magnification about (cx, cy).
type composed struct {
	f         Field
	m, cx, cy float64
}

func (c composed) At(x, y float64) Motion {
	a := c.f.At(x, y)
	s := 1 + c.m
	return Motion{
		U: s*(x+a.U-c.cx) + c.cx - x, V: s*(y+a.V-c.cy) + c.cy - y,
		UX: s*(1+a.UX) - 1, UY: s * a.UY, VX: s * a.VX, VY: s*(1+a.VY) - 1,
	}
}

// Lighting multiplies the exposure by its gain and adds its flicker: at
// the last of 5 frames a 30 % dimming with a 20 % fall-off gives, at
// x = 0 of a 100 px frame, 0.7·0.9·level − 4 (odd frame); the flash frame
// multiplies only its region.
func TestLightingGainAndFlash(t *testing.T) {
	l := &Lighting{Drift: -0.3, Gradient: 0.2, Flicker: 4, Flash: &Flash{Frame: 2, Gain: 1.5, Region: &region.Rect{X0: 0, Y0: 0, X1: 9, Y1: 9}}}
	if err := l.Validate(5); err != nil {
		t.Fatal(err)
	}
	img := uniformImage(100, 20, 100)
	l.Light(img, 3, 4)
	if got, want := float64(img.Pix[0]), 0.7*0.9*100-4; math.Abs(got-want) > 1e-4 {
		t.Errorf("level %g, want %g", got, want)
	}
	img = uniformImage(100, 20, 100)
	l.Light(img, 2, 5)
	in, out := float64(img.Pix[5*100+5]), float64(img.Pix[15*100+5])
	if math.Abs((in-4)/(out-4)-1.5) > 1e-4 {
		t.Errorf("flash region %g against %g outside, want 1.5 times (before the flicker)", in, out)
	}
	if err := (&Lighting{Flash: &Flash{Frame: 9, Gain: 2}}).Validate(5); err == nil || !strings.Contains(err.Error(), "flash") {
		t.Errorf("a flash after the last frame: %v", err)
	}
}

// JPEG frames carry the camera clock: read back by the frames package's
// EXIF reader (go-exif), the capture times are the scenario's frame times
// to the millisecond of SubSecTimeOriginal (EXIF 2.32 §4.6.5: the tags'
// resolution is their digits).
func TestExifFramesReadBack(t *testing.T) {
	dir := t.TempDir()
	sc := &Scenario{Name: "clock", Width: 32, Height: 24, Frames: 4, FPS: 3, Format: "jpg",
		Pattern: Pattern{Radius: 2, Coverage: 0.5}, Camera: Camera{Oversample: 1},
		Exif: &ExifClock{Start: "2026:03:01 10:59:59", Offset: "+01:00"}}
	if _, err := Write(sc, dir, nil); err != nil {
		t.Fatal(err)
	}
	seq, err := frames.Open(filepath.Join(dir, FramesDir))
	if err != nil {
		t.Fatal(err)
	}
	defer seq.Close()
	times, notes, err := frames.ExifTimes(seq)
	if err != nil {
		t.Fatal(err)
	}
	for i, got := range times {
		if math.Abs(got-sc.Time(i)) > 0.0005 {
			t.Errorf("frame %d at %g s, want %g", i, got, sc.Time(i))
		}
	}
	// A regular clock with subseconds and offsets gives one note: when
	// the first photo was taken, as stamped.
	if len(notes) != 1 || !strings.Contains(notes[0], "first frame was taken 2026-03-01 10:59:59 +01:00") {
		t.Errorf("notes %q, want only the first frame's time", notes)
	}
	sc.Format = "png"
	if err := sc.Validate(); err == nil || !strings.Contains(err.Error(), "exif: needs format jpg") {
		t.Errorf("exif with png frames: %v", err)
	}
}
