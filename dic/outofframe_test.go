package dic_test

import (
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// Material that moves out of the frame is reported out of image, not lost:
// a face translated right by 3 px a frame for 6 frames, so the grid's
// right columns leave the photo one after another. A point whose subset
// (the centre ± half the subset, common practice, no source) lies wholly
// inside the frame at its true position is tracked; one whose subset
// reaches past the right edge there is out of image; none is lost. (Those
// whose subset ends within 3 px of the edge are not held either way: the
// spline's support decides.)
func TestMaterialLeavingTheFrameIsOutOfImage(t *testing.T) {
	const w, h, frames, step = 200, 120, 7, 3.0
	sp, err := synth.NewSpeckles(speckle4, w, h)
	if err != nil {
		t.Fatal(err)
	}
	cam := synth.Camera{Depth: 8, Noise: 0.5}
	render := func(k int) *subset.Image {
		img, err := synth.Render(synth.Scene{Speckles: sp, Field: synth.Translation{U: step * float64(k)}}, cam, w, h, k)
		if err != nil {
			t.Fatal(err)
		}
		return img
	}
	s := dic.Settings{Subset: 21, Step: 10}
	tr, err := dic.NewTracker(render(0), 0, nil, s)
	if err != nil {
		t.Fatal(err)
	}
	half := s.Subset / 2
	outside := 0
	for k := 1; k < frames; k++ {
		f, err := tr.Track(render(k), k, "f")
		if err != nil {
			t.Fatal(err)
		}
		for i := range f.Points {
			p := &f.Points[i]
			x, y := f.Grid.Pos(i)
			if x-half < 0 || y-half < 0 || y+half >= h {
				continue // outside the reference's frame: not the case here
			}
			right := float64(x) + step*float64(k) + float64(half) // the subset's last column
			if right > w-4 && right <= w-1 {
				continue // at the edge: the spline's own support decides
			}
			inside := right <= w-4
			switch {
			case inside && p.Status != subset.Converged:
				t.Errorf("frame %d: point (%d, %d) with its subset inside the frame is %s, expected converged", k, x, y, p.Status)
			case !inside && p.Status == subset.Lost:
				t.Errorf("frame %d: point (%d, %d), whose material left the frame, is lost, expected out of image", k, x, y)
			case !inside && p.Status == subset.Converged:
				t.Errorf("frame %d: point (%d, %d), whose material left the frame, converged", k, x, y)
			}
			if !inside {
				outside++
			}
		}
	}
	if outside < 20 {
		t.Fatalf("%d point-frames with the material out of the frame; the case needs more", outside)
	}
}
