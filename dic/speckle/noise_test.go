package speckle

import (
	"math"
	"testing"

	"spallscope/dic/synth"
)

// TestStaticPairNoise renders the same still pattern twice with camera
// noise σ = 3 levels (8-bit) and independent noise per frame. Each frame is
// also rounded to whole levels, which adds 1/12 level² (Widrow's
// quantisation theorem, valid for noise of a level or more), so the noise
// the pair shows is √(9 + 1/12) = 3.014 levels. With 65 536 pixels the
// sampling error of a standard deviation is 1/√(2N) ≈ 0.3 %; tolerance
// 2 % (and within the 10 % a lab would accept of σ = 3).
func TestStaticPairNoise(t *testing.T) {
	p := synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 3}
	a := render(t, p, 256, nil, 3, 0)
	b := render(t, p, 256, nil, 3, 1)
	r, err := Assess(a, Options{Static: b})
	if err != nil {
		t.Fatal(err)
	}
	want := math.Sqrt(9 + 1.0/12)
	t.Logf("static pair: σ = %.4f levels from %d px, want %.4f", r.Noise, r.NoisePixels, want)
	if r.NoiseSource != NoiseStaticPair || relErr(r.Noise, want) > 0.02 || relErr(r.Noise, 3) > 0.10 {
		t.Errorf("noise %g (%s), want %.4f ± 2 %% from the static pair", r.Noise, r.NoiseSource, want)
	}
	// A uniform change of exposure between the shots is not noise.
	brighter := *b
	brighter.Pix = make([]float32, len(b.Pix))
	for i, v := range b.Pix {
		brighter.Pix[i] = min(v+7, 255)
	}
	r2, err := Assess(a, Options{Static: &brighter})
	if err != nil {
		t.Fatal(err)
	}
	if relErr(r2.Noise, r.Noise) > 0.01 {
		t.Errorf("exposure offset of 7 levels changed the noise from %g to %g", r.Noise, r2.Noise)
	}
}
