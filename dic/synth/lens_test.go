package synth

import (
	"math"
	"strings"
	"testing"

	"spallscope/dic/lens"
)

// Through a lens, the photo's pixel p shows the scene at the lens's ideal
// pixel Undistort(p): with one sample per pixel (the pixel centre) each
// exposed level is the pattern's level there, to float32 rounding (the
// definition of rendering through the lens: a sample is mapped, no bitmap
// resampled); a distortion-free lens renders the frame without a lens
// exactly.
func TestExposeThroughLens(t *testing.T) {
	p := Pattern{Radius: 2, Coverage: 0.5, Seed: 5}
	sp, err := NewSpeckles(p, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	m := lens.Model{Width: 96, Height: 80, Fx: 90, Fy: 90, Cx: 47.5, Cy: 39.5, K1: -0.3, P1: 0.002}
	cam := Camera{Oversample: 1}
	img, err := Expose(Scene{Speckles: sp, Lens: &m}, cam, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for y := 0; y < 80; y++ {
		for x := 0; x < 96; x++ {
			X, Y, _ := m.Undistort(float64(x), float64(y))
			worst = math.Max(worst, math.Abs(float64(img.At(x, y))-255*sp.Level(X, Y)))
		}
	}
	if worst > 1e-4 {
		t.Errorf("exposed levels differ from the pattern at the undistorted position by %.3g levels", worst)
	}
	ideal := m
	ideal.K1, ideal.P1 = 0, 0
	a, _ := Expose(Scene{Speckles: sp, Lens: &ideal}, Camera{}, 96, 80)
	b, _ := Expose(Scene{Speckles: sp}, Camera{}, 96, 80)
	for i := range a.Pix {
		if a.Pix[i] != b.Pix[i] {
			t.Fatalf("a distortion-free lens changes pixel %d: %g vs %g", i, a.Pix[i], b.Pix[i])
		}
	}
}

// A scenario's lens is checked: its size must be the scenario's (or left
// out), it cannot go with Fourier rendering, and targets need a lens.
func TestScenarioLensValidation(t *testing.T) {
	base := func() *Scenario {
		sc, err := Simple{Field: "translation", U: 1, Width: 64, Height: 48, Frames: 2}.Scenario()
		if err != nil {
			t.Fatal(err)
		}
		return sc
	}
	sc := base()
	sc.Lens = &lens.Model{Fx: 60, Fy: 60, Cx: 31.5, Cy: 23.5, K1: -0.1}
	if err := sc.Validate(); err != nil {
		t.Errorf("a lens without its size: %v", err)
	}
	for _, tc := range []struct {
		edit func(*Scenario)
		want string
	}{
		{func(s *Scenario) { s.Lens.Width, s.Lens.Height = 32, 24 }, "image size 32x24, expected the scenario's 64x48"},
		{func(s *Scenario) { s.FourierTranslation = true }, "fourier_translation cannot render through a lens"},
		{func(s *Scenario) {
			s.Lens = nil
			s.Targets = &Targets{Board: lens.Board{Cols: 5, Rows: 4, SquareMM: 5}, Poses: 3}
		}, "targets: need a lens"},
		{func(s *Scenario) { s.Targets = &Targets{Board: lens.Board{Cols: 5, Rows: 4, SquareMM: 5}} }, "0 target poses"},
	} {
		s := base()
		s.Lens = &lens.Model{Fx: 60, Fy: 60, Cx: 31.5, Cy: 23.5, K1: -0.1}
		tc.edit(s)
		if err := s.Validate(); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("error %v, want it to say %q", err, tc.want)
		}
	}
}
