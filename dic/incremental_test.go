package dic_test

import (
	"math"
	"slices"
	"testing"

	"spallscope/dic"
	"spallscope/dic/synth"
	"spallscope/subset"
)

// The surface slowly changes (a second speckle pattern fades in, as when a
// face dusts, sheds paint or weathers under the lights), while the rock
// strains and moves. Against a fixed reference the late frames decorrelate
// and points are lost; the incremental strategy moves its reference forward
// and still reports Lagrangian displacements that match the exact field
// (continuum kinematics: increments compose as x = X + u_k(X) + Δu(x_k)).
func TestIncrementalReferenceFollowsChangingSurface(t *testing.T) {
	const w, h, n = 180, 160, 9
	a, _ := synth.NewSpeckles(speckle4, w, h)
	p2 := speckle4
	p2.Seed = 4242
	b, _ := synth.NewSpeckles(p2, w, h)
	cam := synth.Camera{Depth: 16, Noise: 60}
	field := func(k int) synth.Field {
		s := float64(k) / (n - 1)
		return synth.Sum{
			synth.UniformStrain{Cx: 90, Cy: 80, Exx: 0.03 * s, Eyy: -0.012 * s, Exy: 0.004 * s},
			synth.Translation{U: 3.2 * s, V: -1.7 * s},
		}
	}
	frame := func(k int) *subset.Image {
		s := float64(k) / (n - 1)
		ia, _ := synth.Render(synth.Scene{Speckles: a, Field: field(k)}, cam, w, h, k)
		ib, _ := synth.Render(synth.Scene{Speckles: b, Field: field(k)}, cam, w, h, k+100)
		for i := range ia.Pix {
			ia.Pix[i] = float32((1-0.85*s)*float64(ia.Pix[i]) + 0.85*s*float64(ib.Pix[i]))
		}
		return ia
	}
	run := func(mode dic.ReferenceMode) (*dic.Field, int) {
		ref := frame(0)
		tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 12, Reference: mode, UpdateBelow: 0.97})
		if err != nil {
			t.Fatal(err)
		}
		var f *dic.Field
		updates, last := 0, 0
		for k := 0; k < n; k++ {
			if f, err = tr.Track(frame(k), k, "f"); err != nil {
				t.Fatal(err)
			}
			if f.Reference != last {
				updates, last = updates+1, f.Reference
			}
		}
		return f, updates
	}
	fixed, _ := run(dic.FixedReference)
	inc, updates := run(dic.IncrementalReference)
	if updates < 2 {
		t.Errorf("incremental run updated its reference %d times, expected several", updates)
	}
	if inc.Valid() < fixed.Valid() || inc.Valid() < 150 { // 156 points have subsets inside the frame
		t.Errorf("valid points at the last frame: incremental %d, fixed %d, of %d", inc.Valid(), fixed.Valid(), inc.Grid.Len())
	}
	// Accuracy after surface change is limited: the texture that changed
	// between two frames errs every increment the same way at a point, so
	// errors add up; the composition itself is checked below.
	truth := field(n - 1)
	var errs []float64
	for i := range inc.Points {
		p := &inc.Points[i]
		if p.Valid() {
			m := truth.At(float64(p.X), float64(p.Y))
			u, v := p.U()
			errs = append(errs, math.Hypot(u-m.U, v-m.V))
		}
	}
	slices.Sort(errs)
	med := errs[len(errs)/2]
	if med > 0.5 {
		t.Errorf("median displacement error %.3f px after the surface changed by 85 %%", med)
	}
	t.Logf("last frame: fixed %d valid, incremental %d valid (%d updates), median error %.3f px", fixed.Valid(), inc.Valid(), updates, med)
}

// Composition of increments (continuum kinematics): forcing a reference
// update at every frame of a clean strain-and-shift sequence, the
// accumulated Lagrangian displacement and gradient must match the exact
// field. What remains is the interpolation bias of each increment (about
// 0.002 px for bicubic splines at these subpixel shifts), which adds up
// over the 7 updates.
func TestIncrementalComposition(t *testing.T) {
	const w, h, n = 180, 160, 9
	sp, _ := synth.NewSpeckles(speckle4, w, h)
	cam := synth.Camera{Depth: 16, Noise: 60}
	field := func(k int) synth.Field {
		s := float64(k) / (n - 1)
		return synth.Sum{
			synth.UniformStrain{Cx: 90, Cy: 80, Exx: 0.03 * s, Eyy: -0.012 * s, Exy: 0.004 * s},
			synth.Rotation{Cx: 90, Cy: 80, AngleDeg: 2 * s},
		}
	}
	ref, _ := synth.Render(synth.Scene{Speckles: sp}, cam, w, h, 0)
	tr, err := dic.NewTracker(ref, 0, nil, dic.Settings{Subset: 21, Step: 12, Reference: dic.IncrementalReference, UpdateBelow: 0.99999999})
	if err != nil {
		t.Fatal(err)
	}
	var f *dic.Field
	for k := 0; k < n; k++ {
		img, _ := synth.Render(synth.Scene{Speckles: sp, Field: field(k)}, cam, w, h, k)
		if f, err = tr.Track(img, k, "f"); err != nil {
			t.Fatal(err)
		}
	}
	if f.Reference != n-2 {
		t.Fatalf("last field correlated against frame %d, want %d (an update every frame)", f.Reference, n-2)
	}
	truth := field(n - 1)
	worstU, sumG, nG := 0.0, 0.0, 0
	var bias [4]float64
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() {
			continue
		}
		m := truth.At(float64(p.X), float64(p.Y))
		u, v := p.U()
		worstU = math.Max(worstU, math.Hypot(u-m.U, v-m.V))
		for k, d := range []float64{p.P[subset.PUx] - m.UX, p.P[subset.PUy] - m.UY, p.P[subset.PVx] - m.VX, p.P[subset.PVy] - m.VY} {
			sumG += d * d
			bias[k] += d
			nG++
		}
	}
	rmsG := math.Sqrt(sumG / float64(nG))
	for k := range bias {
		bias[k] /= float64(nG / 4)
	}
	// Gradient: no bias beyond 2e-4 in any component, and an RMS scatter
	// within 1.5e-3 (seven increments of per-frame noise ~1.5e-4 each, from
	// new noise in every new reference).
	if f.Valid() < 150 || worstU > 0.05 || rmsG > 1.5e-3 || math.Abs(bias[0]) > 2e-4 || math.Abs(bias[1]) > 2e-4 || math.Abs(bias[2]) > 2e-4 || math.Abs(bias[3]) > 2e-4 {
		t.Errorf("%d valid; worst displacement error %.4f px (limit 0.05), gradient RMS %.2e (limit 1.5e-3), bias %.1e", f.Valid(), worstU, rmsG, bias)
	}
	t.Logf("7 updates: worst displacement error %.4f px, gradient RMS error %.2e, bias %.1e, %d points", worstU, rmsG, bias, f.Valid())
}
