package dic_test

import (
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// speckle4 is a pattern whose speckles are about 4 px across: an ink spot
// of radius R is more than half inked within 1.21 R of its centre (for
// κ = 3: κ·e^(−r²/R²) > ln 2), so R = 1.7 px gives 4.1 px speckles.
var speckle4 = synth.Pattern{Radius: 1.7, Coverage: 0.5, Seed: 42}

// pair renders the reference and one deformed frame of a field.
func pair(t testing.TB, w, h int, f synth.Field, cam synth.Camera, openings ...synth.Opening) (ref, def *subset.Image) {
	t.Helper()
	sp, err := synth.NewSpeckles(speckle4, w, h)
	if err != nil {
		t.Fatal(err)
	}
	if ref, err = synth.Render(synth.Scene{Speckles: sp, Openings: openings}, cam, w, h, 0); err != nil {
		t.Fatal(err)
	}
	if def, err = synth.Render(synth.Scene{Speckles: sp, Field: f, Openings: openings}, cam, w, h, 1); err != nil {
		t.Fatal(err)
	}
	return ref, def
}

func track(t testing.TB, ref, def *subset.Image, mask *region.Mask, s dic.Settings) *dic.Field {
	t.Helper()
	tr, err := dic.NewTracker(ref, 0, mask, s)
	if err != nil {
		t.Fatal(err)
	}
	f, err := tr.Track(def, 1, "def")
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// errorsAgainst returns the displacement errors of the valid points
// against the truth (the synthetic field is exact by construction).
func errorsAgainst(f *dic.Field, truth synth.Field) (eu, ev []float64) {
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() {
			continue
		}
		m := truth.At(float64(p.X), float64(p.Y))
		u, v := p.U()
		eu, ev = append(eu, u-m.U), append(ev, v-m.V)
	}
	return
}

func meanStd(xs []float64) (mean, std float64) {
	for _, x := range xs {
		mean += x
	}
	mean /= float64(len(xs))
	for _, x := range xs {
		std += (x - mean) * (x - mean)
	}
	return mean, math.Sqrt(std / float64(len(xs)-1))
}

// Uniform strain of 0.5 % is exact by construction (continuum kinematics).
// The field's mean dudx must match within 1e-4 (no bias) and u within
// 0.01 px everywhere; the scatter of dudx between points is the 8-bit
// quantisation noise (σ = 1/√12 level), about 1e-4 for 21 px subsets.
func TestTrackUniformStrain(t *testing.T) {
	f := synth.UniformStrain{Cx: 100, Cy: 100, Exx: 0.005, Eyy: -0.002, Exy: 0.001}
	ref, def := pair(t, 200, 200, f, synth.Camera{Depth: 8})
	field := track(t, ref, def, nil, dic.Settings{Subset: 21, Step: 10})
	if n := field.Valid(); n < 250 {
		t.Fatalf("%d valid points of %d", n, field.Grid.Len())
	}
	var dudx, dvdy []float64
	worstU := 0.0
	for i := range field.Points {
		p := &field.Points[i]
		if !p.Valid() {
			continue
		}
		dudx = append(dudx, p.P[subset.PUx])
		dvdy = append(dvdy, p.P[subset.PVy])
		u, _ := p.U()
		worstU = math.Max(worstU, math.Abs(u-f.At(float64(p.X), float64(p.Y)).U))
	}
	mx, sx := meanStd(dudx)
	my, sy := meanStd(dvdy)
	if math.Abs(mx-0.005) > 1e-4 || math.Abs(my+0.002) > 1e-4 || worstU > 0.01 {
		t.Errorf("uniform strain: mean dudx %.6f (want 0.005 ± 1e-4), mean dvdy %.6f (want −0.002 ± 1e-4), worst |u error| %.4f px (limit 0.01)", mx, my, worstU)
	}
	if sx > 3e-4 || sy > 3e-4 {
		t.Errorf("dudx scatter %.2e, dvdy %.2e: above 3e-4, three times the quantisation estimate", sx, sy)
	}
	t.Logf("uniform 0.5 %%: dudx %.6f ± %.1e, dvdy %.6f ± %.1e, worst u error %.4f px, %d points", mx, sx, my, sy, worstU, field.Valid())
}

// A rigid jump of 40 px between frames is found from the seeds by the
// integer search and carried over the grid by propagation.
func TestTrackRigidJump(t *testing.T) {
	f := synth.Translation{U: 40.3, V: -12.6}
	ref, def := pair(t, 240, 200, f, synth.Camera{Depth: 8, Noise: 1})
	field := track(t, ref, def, nil, dic.Settings{Subset: 21, Step: 10})
	eu, ev := errorsAgainst(field, f)
	// Points whose subset left the frame are flagged out of image; the rest,
	// the overlap of the two views, must be found.
	overlap := 0
	for i := range field.Points {
		x, y := field.Grid.Pos(i)
		if x >= 10 && y >= 10 && float64(x)+40.3+10 <= 239 && float64(y)-12.6-10 >= 0 {
			overlap++
		}
	}
	if len(eu) < overlap*9/10 {
		t.Fatalf("%d of about %d overlapping points tracked", len(eu), overlap)
	}
	for k := range eu {
		if math.Hypot(eu[k], ev[k]) > 0.02 {
			t.Fatalf("point %d: error (%.3f, %.3f) px after a 40 px jump", k, eu[k], ev[k])
		}
	}
}

// Results do not depend on the worker count (the batches are fixed, the
// order of expansion fully determined).
func TestTrackDeterministic(t *testing.T) {
	f := synth.Sum{synth.UniformStrain{Cx: 60, Cy: 60, Exx: 0.01, Eyy: -0.004}, synth.Translation{U: 2.3, V: 0.4}}
	ref, def := pair(t, 160, 140, f, synth.Camera{Depth: 8, Noise: 2})
	a := track(t, ref, def, nil, dic.Settings{Subset: 17, Step: 6, Workers: 1})
	b := track(t, ref, def, nil, dic.Settings{Subset: 17, Step: 6, Workers: 3})
	for i := range a.Points {
		if a.Points[i] != b.Points[i] {
			t.Fatalf("point %d differs with 1 and 3 workers: %+v vs %+v", i, a.Points[i], b.Points[i])
		}
	}
}

// A tracker keeps the reference side of every subset from the first frame
// it tracks (subset.Prepared). A later frame must come out exactly as it
// does from a tracker that prepares from scratch, here one resumed after
// the first frame; with an opening, so masked subsets are kept too.
func TestTrackPreparedReuse(t *testing.T) {
	sp, err := synth.NewSpeckles(speckle4, 160, 140)
	if err != nil {
		t.Fatal(err)
	}
	hole := synth.Opening{Cx: 80, Cy: 70, Rx: 18, Ry: 18}
	cam := synth.Camera{Depth: 8, Noise: 1}
	render := func(f synth.Field, seed int) *subset.Image {
		img, err := synth.Render(synth.Scene{Speckles: sp, Field: f, Openings: []synth.Opening{hole}}, cam, 160, 140, seed)
		if err != nil {
			t.Fatal(err)
		}
		return img
	}
	ref := render(nil, 0)
	f1 := render(synth.Translation{U: 0.4, V: -0.3}, 1)
	f2 := render(synth.Sum{synth.UniformStrain{Cx: 80, Cy: 70, Exx: 0.003, Eyy: -0.001}, synth.Translation{U: 0.7, V: -0.5}}, 2)
	mask, err := region.Layout{Exclude: []region.Shape{region.Ellipse{Cx: 80, Cy: 70, Rx: 18, Ry: 18}}}.Rasterise(160, 140)
	if err != nil {
		t.Fatal(err)
	}
	s := dic.Settings{Subset: 17, Step: 6}
	warm, err := dic.NewTracker(ref, 0, mask, s)
	if err != nil {
		t.Fatal(err)
	}
	first, err := warm.Track(f1, 1, "f1")
	if err != nil {
		t.Fatal(err)
	}
	a, err := warm.Track(f2, 2, "f2")
	if err != nil {
		t.Fatal(err)
	}
	cold, err := dic.NewTracker(ref, 0, mask, s)
	if err != nil {
		t.Fatal(err)
	}
	if err := cold.Resume(first); err != nil {
		t.Fatal(err)
	}
	b, err := cold.Track(f2, 2, "f2")
	if err != nil {
		t.Fatal(err)
	}
	masked := 0
	for i := range a.Points {
		if a.Points[i] != b.Points[i] {
			t.Fatalf("point %d: %+v with kept reference sides, %+v prepared afresh", i, a.Points[i], b.Points[i])
		}
		if a.Points[i].Status == subset.Masked {
			masked++
		}
	}
	if a.Valid() < len(a.Points)/2 || masked == 0 {
		t.Errorf("%d of %d points valid, %d masked: the case does not exercise both kinds", a.Valid(), len(a.Points), masked)
	}
}
