package strain

import (
	"math"
	"math/rand/v2"
	"testing"
)

// bruteLogLik is the log likelihood ratio of a rising change beginning at
// m, written out from the models' definitions: Gaussian noise of unit
// variance, zero mean before m, and after it a constant mean μ (step) or
// β·(k−m+1) (slope) at its least-squares value; the ratio against no
// change is ½·Σ z² − ½·Σ (z − fit)² (Hinkley 1970, eq. 2.2 with the
// pre-change mean and the variance known, and its two-phase regression
// analogue, Hinkley 1969).
func bruteLogLik(z []float64, m int, model ChangeModel) (float64, float64) {
	var num, den float64
	for k := m; k < len(z); k++ {
		x := model.shape(float64(k - m + 1))
		num += x * z[k]
		den += x * x
	}
	size := num / den
	var rss0, rss1 float64
	for k := range z {
		fit := 0.0
		if k >= m {
			fit = size * model.shape(float64(k-m+1))
		}
		rss0 += z[k] * z[k]
		rss1 += (z[k] - fit) * (z[k] - fit)
	}
	return (rss0 - rss1) / 2, size
}

// The O(n) scans give the published statistic at every onset, to rounding.
func TestChangeScanMatchesDefinition(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	z := make([]float64, 60)
	for k := range z {
		z[k] = rng.NormFloat64()
		if k >= 35 {
			z[k] += 0.3 * float64(k-34)
		}
	}
	for _, model := range changeModels {
		best, bestM := math.Inf(-1), -1
		for m := 5; m <= 55; m++ {
			ll, size := bruteLogLik(z, m, model)
			if size > 0 && ll > best {
				best, bestM = ll, m
			}
		}
		got, ok := scanChange(z, 5, 55, model)
		if !ok || got.Onset != bestM || math.Abs(got.LogLik-best) > 1e-9*best {
			t.Errorf("%s: scan onset %d, log LR %.12g; definition %d, %.12g", model, got.Onset, got.LogLik, bestM, best)
		}
	}
}

// A step in the mean of Gaussian noise, the textbook case (Hinkley 1970):
// the estimation error of the maximum-likelihood onset stays bounded in
// probability, with a distribution that depends on the step δ alone and
// peaks at zero error. With a step of two standard deviations at position
// 50 of 100 the onset is within 2 positions of the truth in at least 90 %
// of 400 draws (about 95 % here), and exactly right more often than at any
// other error.
func TestStepChangeTextbook(t *testing.T) {
	const n, at, reps = 100, 50, 400
	rng := rand.New(rand.NewPCG(3, 4))
	within, exact := 0, 0
	errors := map[int]int{}
	z := make([]float64, n)
	for range reps {
		for k := range z {
			z[k] = rng.NormFloat64()
			if k >= at {
				z[k] += 2
			}
		}
		c, ok := scanChange(z, 1, n-1, StepChange)
		if !ok {
			continue
		}
		d := c.Onset - at
		errors[d]++
		if d >= -2 && d <= 2 {
			within++
		}
		if d == 0 {
			exact++
		}
	}
	t.Logf("within ±2: %d of %d; exact: %d", within, reps, exact)
	if float64(within) < 0.9*reps {
		t.Errorf("onset within ±2 in %d of %d draws, want ≥ 90 %%", within, reps)
	}
	for d, k := range errors {
		if d != 0 && k > exact {
			t.Errorf("error %+d in %d draws, more than the %d exact ones", d, k, exact)
		}
	}
}

// The bootstrap interval holds the true onset in about its confidence
// share of draws (at least 90 % for a 95 % interval over 200 draws, for a
// slope of 0.25 per frame from position 40 of 70), and it narrows when the
// change is larger against the noise.
func TestChangeIntervalCoverage(t *testing.T) {
	const n, at, reps = 70, 40, 200
	rng := rand.New(rand.NewPCG(5, 6))
	width := map[float64]float64{}
	for _, beta := range []float64{0.25, 1} {
		hit := 0
		z := make([]float64, n)
		for r := range reps {
			for k := range z {
				z[k] = rng.NormFloat64()
				if k >= at {
					z[k] += beta * float64(k-at+1)
				}
			}
			c, ok := EstimateChange(z, 5, n-1)
			if !ok {
				continue
			}
			lo, hi := c.Interval(n, 5, n-1, 1, 0.95, 300, uint64(r))
			if lo <= at && at <= hi {
				hit++
			}
			width[beta] += float64(hi-lo) / reps
		}
		t.Logf("β %g: coverage %d of %d, mean width %.2f", beta, hit, reps, width[beta])
		if beta == 0.25 && float64(hit) < 0.9*reps {
			t.Errorf("β %g: the 95 %% interval holds the onset in %d of %d draws, want ≥ 90 %%", beta, hit, reps)
		}
	}
	if !(width[1] < width[0.25]) {
		t.Errorf("mean interval width %.2f at β = 1, %.2f at β = 0.25: a larger change must narrow it", width[1], width[0.25])
	}
}

// Noise alone gives no change worth the name: the log likelihood ratio of
// the best onset, a maximum over the onsets of χ²₁/2 variables, stays below
// 8 (a tail probability under 1e-4 for each onset) in at least 95 % of 200
// draws.
func TestChangeOnNoise(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	big := 0
	z := make([]float64, 80)
	for range 200 {
		for k := range z {
			z[k] = rng.NormFloat64()
		}
		if c, ok := EstimateChange(z, 5, 75); ok && c.LogLik > 8 {
			big++
		}
	}
	t.Logf("noise: %d of 200 above 8", big)
	if big > 10 {
		t.Errorf("%d of 200 noise signals gave a log LR above 8", big)
	}
}

// On pure noise (unit Gaussian, 40 frames, the first 8 calibrating a
// baseline at stresses 0 to 7 MPa, then a ramp to 40 MPa) the best
// drift-change log likelihood ratio stays below MinLogLik in at least 99 %
// of 300 draws: a maximum over about 90 onsets and models of ratios that
// are each χ²₁/2 at most (tail beyond 10 under 1e-5 each; Hinkley 1970
// for the step), so a noise trigger gives no onset.
func TestDriftChangeOnNoise(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	const n = 40
	stress := make([]float64, n)
	calib := make([]bool, n)
	for k := range stress {
		stress[k] = float64(k)
		calib[k] = k < 8
	}
	prior := CalibrationPrior(stress, calib)
	big := 0
	z := make([]float64, n)
	for range 300 {
		for k := range z {
			z[k] = rng.NormFloat64()
		}
		if c, ok := EstimateDriftChange(z, stress, prior, 8, n-1); ok && c.LogLik >= MinLogLik {
			big++
		}
	}
	t.Logf("noise: %d of 300 at or above %d", big, MinLogLik)
	if big > 3 {
		t.Errorf("%d of 300 noise signals gave a log LR of at least %d", big, MinLogLik)
	}
}

// A kink in a drifting signal: z = 0.05·σ (a drift of the baseline's size)
// plus a slope of 0.8 per frame from frame 25, unit noise: the drift
// change point is within 2 frames of 25 in at least 80 % of 100 draws,
// where the change point without the drift line is pulled early in more
// than half of them (common
// practice, no source: the drift line is the first phase of a two-phase
// regression, Hinkley 1969).
func TestDriftChangeAbsorbsDrift(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	const n, onset = 40, 25
	stress := make([]float64, n)
	calib := make([]bool, n)
	for k := range stress {
		stress[k] = float64(k)
		calib[k] = k < 8
	}
	prior := CalibrationPrior(stress, calib)
	near, early := 0, 0
	z := make([]float64, n)
	for range 100 {
		for k := range z {
			z[k] = 0.05*stress[k] + rng.NormFloat64()
			if k >= onset {
				z[k] += 0.8 * float64(k-onset+1)
			}
		}
		if c, ok := EstimateDriftChange(z, stress, prior, 8, n-1); ok && c.Onset >= onset-2 && c.Onset <= onset+2 {
			near++
		}
		if c, ok := EstimateChange(z, 8, n-1); ok && c.Onset < onset-2 {
			early++
		}
	}
	t.Logf("drift change within 2 frames: %d of 100; plain change early: %d of 100", near, early)
	if near < 80 || early < 50 {
		t.Errorf("drift change point within 2 frames of %d in %d of 100 draws, want at least 80; plain change point early in %d, want at least 50", onset, near, early)
	}
}

// The likelihood-ratio set of a step's onset, worked by hand: a noise-free
// step of 3 at position 20 of 40 (unit noise, no drift) has the log
// likelihood ratio (Σ_{k≥m} z_k)²/(2(40 − m)) (Hinkley 1970), 3600/40 = 90
// at m = 20, 3600/42 = 85.71 at 19 and 3600/44 = 81.82 at 18; the slope
// and curve shapes fit it less well from any earlier onset. A drop of
// 1.92 (95 %) keeps only 20; a drop of 5 takes 19, not 18.
func TestEarliestPlausibleOnsetWorkedStep(t *testing.T) {
	z := make([]float64, 40)
	for k := 20; k < 40; k++ {
		z[k] = 3
	}
	best, ok := EstimateDriftChange(z, nil, Prior{}, 1, 39)
	if !ok || best.Onset != 20 || best.Model != StepChange || math.Abs(best.LogLik-90) > 1e-9 {
		t.Fatalf("estimate %+v, want a step at 20 with log LR 90", best)
	}
	for _, c := range []struct {
		drop float64
		want int
	}{{1.92, 20}, {5, 19}} {
		if got := EarliestPlausibleOnset(z, nil, Prior{}, 1, 39, best, c.drop); got != c.want {
			t.Errorf("drop %g: earliest plausible onset %d, want %d (worked by hand)", c.drop, got, c.want)
		}
	}
}
