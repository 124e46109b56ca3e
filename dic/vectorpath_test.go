package dic_test

import (
	"fmt"
	"math"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// Whole-field tracking gives the same answer on the vector kernels as on
// the pure-Go loops they replace (the reference, see subset's
// vector_amd64.go): a short noisy sequence (a strain ramp with a small
// rotation and a shift, sensor noise) tracked both ways in one process,
// every point with the same status and iteration count and its
// displacement within 1e-9 px (the kernels differ by rounding only: FMA,
// and sums in another order). Shared samples (Affine, steps smaller than
// the subset) and the Quadratic order's own sums are both exercised. The
// sequence is also held to its exact field, 0.05 px, so that the two
// paths agree on a real measurement and not on a common failure (the
// product's accuracy target is finer; this is only a guard).
func TestTrackingVectorEqualsGo(t *testing.T) {
	restore, ok := subset.SetVectorForTesting(true)
	restore()
	if !ok {
		t.Skip("no vector kernels in this build (purego or not amd64), on this processor (AVX2 and FMA) or under GODEBUG=cpu.avx2=off")
	}
	const w, h, n = 200, 180, 4
	sp, err := synth.NewSpeckles(speckle4, w, h)
	if err != nil {
		t.Fatal(err)
	}
	cam := synth.Camera{Depth: 16, Noise: 150}
	field := func(k int) synth.Field {
		s := float64(k) / (n - 1)
		return synth.Sum{
			synth.UniformStrain{Cx: 100, Cy: 90, Exx: 0.01 * s, Eyy: -0.005 * s, Exy: 0.002 * s},
			synth.Rotation{Cx: 100, Cy: 90, AngleDeg: 0.5 * s},
			synth.Translation{U: 1.3 * s, V: -0.7 * s},
		}
	}
	frames := make([]*subset.Image, n)
	for k := range frames {
		if frames[k], err = synth.Render(synth.Scene{Speckles: sp, Field: field(k)}, cam, w, h, k); err != nil {
			t.Fatal(err)
		}
	}
	track := func(vector bool, s dic.Settings) []*dic.Field {
		restore, _ := subset.SetVectorForTesting(vector)
		defer restore()
		tr, err := dic.NewTracker(frames[0], 0, nil, s)
		if err != nil {
			t.Fatal(err)
		}
		out := make([]*dic.Field, n)
		for k, img := range frames {
			if out[k], err = tr.Track(img, k, fmt.Sprint(k)); err != nil {
				t.Fatal(err)
			}
		}
		return out
	}
	for _, s := range []dic.Settings{
		{Subset: 21, Step: 5},
		{Subset: 31, Step: 10},
		{Subset: 21, Step: 7, Order: subset.Quadratic},
	} {
		name := fmt.Sprintf("subset %d step %d %v", s.Subset, s.Step, s.Order)
		vec, ref := track(true, s), track(false, s)
		// Points whose subset stays 5 px inside the frame (the motion is
		// under 4 px) must all be measured.
		inner := func(x, y int) bool {
			r := s.Subset/2 + 5
			return x >= r && y >= r && x < w-r && y < h-r
		}
		worstUV, valid, total := 0.0, 0, 0
		for k := 1; k < n; k++ {
			truth := field(k)
			for i := range ref[k].Points {
				a, b := &vec[k].Points[i], &ref[k].Points[i]
				if a.Status != b.Status || a.Iterations != b.Iterations {
					t.Fatalf("%s frame %d point (%d, %d): vector %v in %d iterations, Go %v in %d", name, k, b.X, b.Y, a.Status, a.Iterations, b.Status, b.Iterations)
				}
				if inner(b.X, b.Y) {
					total++
				}
				if !b.Valid() {
					continue
				}
				if inner(b.X, b.Y) {
					valid++
				}
				au, av := a.U()
				bu, bv := b.U()
				worstUV = math.Max(worstUV, math.Max(math.Abs(au-bu), math.Abs(av-bv)))
				m := truth.At(float64(b.X), float64(b.Y))
				if e := math.Hypot(bu-m.U, bv-m.V); e > 0.05 {
					t.Errorf("%s frame %d point (%d, %d): error %.3g px against the exact field", name, k, b.X, b.Y, e)
				}
			}
		}
		t.Logf("%s: %d of the %d inner point-frames valid, vector and Go paths within %.2g px", name, valid, total, worstUV)
		if worstUV > 1e-9 {
			t.Errorf("%s: the vector and Go paths differ by %.3g px (want ≤ 1e-9)", name, worstUV)
		}
		if worstUV == 0 {
			t.Errorf("%s: the vector and Go paths agree bit for bit everywhere: the switch did not switch", name)
		}
		if total == 0 || valid < total {
			t.Errorf("%s: %d of the %d inner point-frames valid, want all", name, valid, total)
		}
	}
}
