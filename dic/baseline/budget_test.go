package baseline

import (
	"testing"

	"spallscope/dic"
)

// On the noisy strain ramp (σ = 1.5 gray levels, 21 px subsets) the
// tracker's random error is the one theory predicts for the pattern, and
// its systematic error is the interpolation bias it has without noise:
//   - the random part is within 15 % of the least-squares covariance
//     2σ²·H⁻¹ of its affine model (textbook least squares) and at least
//     Pan's √2·σ/√SSSIG less 10 % (Pan et al. 2008, Optics Express
//     16(10):7037–7048: the bound of a translation-only subset, which the
//     affine model's extra unknowns can only raise; the cubic spline's
//     smoothing of the deformed image's noise at subpixel positions lowers
//     it by a few per cent);
//   - the systematic part is within 0.0005 px of the noise-free error, so
//     neither noise-induced bias nor the noise-aware stopping rule adds to
//     it measurably;
//   - Lucas–Kanade's error is mostly systematic (bilinear interpolation
//     bias, Schreier, Braasch & Sutton 2000, Optical Engineering
//     39(11):2915–2921, from memory): its systematic part is over twice its
//     random part.
func TestSequenceErrorBudget(t *testing.T) {
	seq, err := NewSequence(SequenceSpec{Width: 256, Height: 256, Frames: 4, Noise: 1.5})
	if err != nil {
		t.Fatal(err)
	}
	b, err := SequenceErrorBudget(seq, dic.Settings{Subset: 21, Step: 10}, 8)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%+v", b)
	if b.PointFrames < 600 {
		t.Fatalf("%d point-frames scored, want at least 600", b.PointFrames)
	}
	if b.Random > 1.15*b.TheoryAffine || b.Random < 0.9*b.TheoryPan {
		t.Errorf("random part %.5f px, want between 0.9 × Pan's %.5f and 1.15 × the affine covariance's %.5f", b.Random, b.TheoryPan, b.TheoryAffine)
	}
	if d := b.Systematic - b.NoiseFree; d > 5e-4 || d < -5e-4 {
		t.Errorf("systematic part %.5f px, noise-free error %.5f px: differ by more than 0.0005 px", b.Systematic, b.NoiseFree)
	}
	if b.LKSystematic < 2*b.LKRandom {
		t.Errorf("Lucas–Kanade: systematic %.5f px, random %.5f px: want the systematic part over twice the random", b.LKSystematic, b.LKRandom)
	}
	if _, err := SequenceErrorBudget(seq, dic.Settings{Subset: 21, Step: 10}, 1); err == nil {
		t.Errorf("one realisation accepted")
	}
}
