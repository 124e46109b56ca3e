package dic_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// nanBlock sets the pixels of [x0,x1]×[y0,y1] of a copy of img to v.
func nanBlock(img *subset.Image, x0, y0, x1, y1 int, v float32) *subset.Image {
	out := &subset.Image{Width: img.Width, Height: img.Height, Depth: img.Depth, Pix: append([]float32(nil), img.Pix...)}
	for y := y0; y <= y1; y++ {
		for x := x0; x <= x1; x++ {
			out.Set(x, y, v)
		}
	}
	return out
}

// Float frames with NaN (and infinite) pixels: those pixels are not
// measured. A subset of the reference that holds one is masked or uses the
// other pixels; a deformed subset that lands on one is lost; every other
// point is measured as without them, against the exact field. Before, one
// NaN reached the B-spline prefilter and spread along its whole row and
// column, so points far from it failed or came out NaN.
func TestTrackNaNPixelsAreUnmeasured(t *testing.T) {
	f := synth.UniformStrain{Cx: 100, Cy: 100, Exx: 0.004, Eyy: -0.002, Exy: 0.001}
	ref, def := pair(t, 200, 200, f, synth.Camera{Depth: 8})
	nan, inf := float32(math.NaN()), float32(math.Inf(1))
	refBad := nanBlock(ref, 40, 40, 47, 47, nan)       // an 8×8 NaN patch in the reference
	defBad := nanBlock(def, 140, 130, 141, 131, inf)   // a 2×2 +Inf patch in the deformed frame
	defBad = nanBlock(defBad, 100, 160, 100, 160, nan) // one NaN pixel
	s := dic.Settings{Subset: 21, Step: 10}
	clean := track(t, ref, def, nil, s)
	dirty := track(t, refBad, defBad, nil, s)

	r := s.Subset / 2
	near := func(x, y, x0, y0, x1, y1, margin int) bool {
		return x+r+margin >= x0 && x-r-margin <= x1 && y+r+margin >= y0 && y-r-margin <= y1
	}
	far, farValid, lostOnInf := 0, 0, 0
	worst := 0.0
	for i := range dirty.Points {
		p, c := &dirty.Points[i], &clean.Points[i]
		x, y := dirty.Grid.Pos(i)
		switch {
		case near(x, y, 140, 130, 141, 131, 0) && c.Valid():
			// The deformed subset covers the +Inf patch (the motion here is
			// under 0.5 px): it must not be reported as measured.
			if p.Valid() {
				t.Errorf("point (%d,%d): its deformed subset covers the +Inf pixels but it is %s", x, y, p.Status)
			}
			lostOnInf++
		case near(x, y, 40, 40, 47, 47, 4), near(x, y, 100, 160, 100, 160, 4), near(x, y, 140, 130, 141, 131, 4), !c.Valid():
			// Beside a patch (within the 3 px the interpolant reaches):
			// masked, lost, or measured from the other pixels.
		default:
			far++
			if !p.Valid() {
				t.Errorf("point (%d,%d) away from every NaN pixel: %s, want converged", x, y, p.Status)
				continue
			}
			farValid++
			u, v := p.U()
			m := f.At(float64(x), float64(y))
			worst = math.Max(worst, math.Hypot(u-m.U, v-m.V))
			cu, cv := c.U()
			if d := math.Hypot(u-cu, v-cv); d > 1e-3 {
				t.Errorf("point (%d,%d): %.5f px from the NaN-free result", x, y, d)
			}
		}
		if p.Valid() && (math.IsNaN(p.ZNCC) || !p.P.IsFinite()) {
			t.Errorf("point (%d,%d): converged with non-finite results %+v", x, y, p)
		}
	}
	// Uniform strain is exact by construction; 0.01 px as in
	// TestTrackUniformStrain.
	if far < 200 || farValid != far || worst > 0.01 || lostOnInf == 0 {
		t.Errorf("%d of %d points away from the NaN pixels measured, worst error %.4f px (limit 0.01); %d lost on the +Inf patch", farValid, far, worst, lostOnInf)
	}
	// The reference's NaN patch is out of the mask: a point centred in it
	// is masked.
	for i := range dirty.Points {
		if x, y := dirty.Grid.Pos(i); x >= 40 && x <= 47 && y >= 40 && y <= 47 && dirty.Points[i].Status != subset.Masked {
			t.Errorf("point (%d,%d) centred on NaN pixels: %s, want masked", x, y, dirty.Points[i].Status)
		}
	}
}

// A reference without a single finite pixel is refused, saying so.
func TestTrackAllNaNReference(t *testing.T) {
	img := subset.NewImage(64, 64, 0)
	for i := range img.Pix {
		img.Pix[i] = float32(math.NaN())
	}
	_, err := dic.NewTracker(img, 3, nil, dic.Settings{Subset: 21, Step: 10})
	if want := "reference frame 3: none of its measured pixels is a number (4096 of 4096 pixels are NaN or infinite)"; err == nil || err.Error() != want {
		t.Errorf("error %v, want %q", err, want)
	}
}

// With an incremental reference, a frame holding NaN pixels becomes the
// reference: the points lost on them stay lost (their subsets would read
// filled pixels), the others follow the exact field to the last frame.
func TestTrackNaNPixelsIncremental(t *testing.T) {
	const w, h, n = 160, 140, 5
	sp, err := synth.NewSpeckles(speckle4, w, h)
	if err != nil {
		t.Fatal(err)
	}
	cam := synth.Camera{Depth: 8}
	field := func(k int) synth.Field {
		return synth.UniformStrain{Cx: 80, Cy: 70, Exx: 0.002 * float64(k), Eyy: -0.001 * float64(k)}
	}
	ref, _ := synth.Render(synth.Scene{Speckles: sp}, cam, w, h, 0)
	tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 10, Reference: dic.IncrementalReference, UpdateBelow: 0.99999999})
	if err != nil {
		t.Fatal(err)
	}
	var f *dic.Field
	for k := 1; k < n; k++ {
		img, _ := synth.Render(synth.Scene{Speckles: sp, Field: field(k)}, cam, w, h, k)
		if k == 2 {
			img = nanBlock(img, 60, 60, 65, 65, float32(math.NaN()))
		}
		if f, err = tr.Track(img, k, "f"); err != nil {
			t.Fatal(err)
		}
	}
	if f.Reference != n-2 {
		t.Fatalf("last field against frame %d, want %d (an update every frame)", f.Reference, n-2)
	}
	truth := field(n - 1)
	valid, far := 0, 0
	for i := range f.Points {
		p := &f.Points[i]
		x, y := f.Grid.Pos(i)
		if p.Valid() && (math.IsNaN(p.ZNCC) || !p.P.IsFinite()) {
			t.Fatalf("point (%d,%d): converged with non-finite results", x, y)
		}
		if x+10 >= 60 && x-10 <= 65 && y+10 >= 60 && y-10 <= 65 && p.Valid() {
			t.Errorf("point (%d,%d): its subset covered the NaN patch of frame 2, yet it is measured at the end", x, y)
		}
		if x < 10 || y < 10 || x > w-11 || y > h-11 || (x > 60-20 && x < 65+20 && y > 60-20 && y < 65+20) {
			continue // at the border or within reach of the NaN patch
		}
		far++
		if !p.Valid() {
			t.Errorf("point (%d,%d): %s, want converged", x, y, p.Status)
			continue
		}
		valid++
		m := truth.At(float64(x), float64(y))
		if u, v := p.U(); math.Hypot(u-m.U, v-m.V) > 0.02 {
			t.Errorf("point (%d,%d): error (%.4f, %.4f) px, limit 0.02 after four updates", x, y, u-m.U, v-m.V)
		}
	}
	if far < 80 || valid != far {
		t.Errorf("%d of %d points away from the NaN patch measured", valid, far)
	}
}
