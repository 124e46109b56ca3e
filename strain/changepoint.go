package strain

import (
	"math"
	"math/rand/v2"
	"slices"
)

// ChangeModel is the shape of the change a change-point estimate looks
// for in a normalised signal (unit noise, zero mean before the change).
type ChangeModel string

const (
	// StepChange is a jump in the mean: z_k = μ for k ≥ onset — a crack
	// that opens at once, material that decorrelates.
	StepChange ChangeModel = "step"
	// SlopeChange is a kink: z_k = β·(k − onset + 1) for k ≥ onset — a
	// zone whose strain grows steadily from the onset on.
	SlopeChange ChangeModel = "slope"
)

// ChangePoint is the maximum-likelihood estimate of when a signal began:
// the first frame of the change (Onset, a position in the signal), its
// model and size (μ for a step, β per frame for a slope), and the log
// likelihood ratio of the change against no change.
type ChangePoint struct {
	Model  ChangeModel
	Onset  int
	Size   float64
	LogLik float64
}

// EstimateChange returns the maximum-likelihood change point of z, a
// signal with unit Gaussian noise and zero mean before the change, for a
// change that begins at a position in [from, to] and rises (μ or β > 0),
// taking the better of the step and slope models. The estimate for a
// change in the mean with the pre-change mean and the variance known is
// that of Hinkley (1970, Biometrika 57, 1–17): the onset m maximises
// S(m)²/(2(n−m)) with S(m) the sum of z from m on; for a change in the
// slope (two-phase regression with a hinge, Hinkley 1969, Biometrika 56,
// 495–504) it maximises T(m)²/(2Q(m)) with T(m) = Σ_{k≥m}(k−m+1)·z_k and
// Q(m) = Σ_{j=1}^{n−m} j². Both scans take O(n) through suffix sums. It
// reports false when no onset in the range gives a rising change.
func EstimateChange(z []float64, from, to int) (ChangePoint, bool) {
	step, okS := scanChange(z, from, to, StepChange)
	slope, okL := scanChange(z, from, to, SlopeChange)
	switch {
	case okS && (!okL || step.LogLik >= slope.LogLik):
		return step, true
	case okL:
		return slope, true
	}
	return ChangePoint{}, false
}

// scanChange finds the maximum-likelihood onset of model in [from, to].
func scanChange(z []float64, from, to int, model ChangeModel) (ChangePoint, bool) {
	n := len(z)
	from, to = max(from, 0), min(to, n-1)
	best := ChangePoint{Model: model, Onset: -1}
	// Suffix sums from the end: s = Σ_{k≥m} z_k, w = Σ_{k≥m} k·z_k.
	var s, w float64
	for m := n - 1; m >= from; m-- {
		s += z[m]
		w += float64(m) * z[m]
		if m > to {
			continue
		}
		r := float64(n - m) // frames from the onset on
		var stat, size float64
		switch model {
		case StepChange:
			size = s / r
			stat = s * s / (2 * r)
		case SlopeChange:
			t := w - float64(m-1)*s // Σ (k−m+1)·z_k
			q := r * (r + 1) * (2*r + 1) / 6
			size = t / q
			stat = t * t / (2 * q)
		}
		if size > 0 && (best.Onset < 0 || stat > best.LogLik) {
			best = ChangePoint{Model: model, Onset: m, Size: size, LogLik: stat}
		}
	}
	return best, best.Onset >= 0
}

// fitted returns the model's mean signal of length n.
func (c ChangePoint) fitted(n int) []float64 {
	f := make([]float64, n)
	for k := c.Onset; k < n; k++ {
		switch c.Model {
		case StepChange:
			f[k] = c.Size
		case SlopeChange:
			f[k] = c.Size * float64(k-c.Onset+1)
		}
	}
	return f
}

// Interval returns a confidence interval [lo, hi] for the onset with
// confidence conf (such as 0.95), by the parametric bootstrap (Efron and
// Tibshirani 1993, An Introduction to the Bootstrap, ch. 6): reps signals
// are drawn from the fitted change plus unit Gaussian noise, each is
// re-estimated with the same model over [from, to], and the interval is
// their central conf share, widened to hold the estimate itself. seed
// makes it repeatable.
func (c ChangePoint) Interval(n, from, to int, conf float64, reps int, seed uint64) (lo, hi int) {
	rng := rand.New(rand.NewPCG(seed, 0x5e11))
	mean := c.fitted(n)
	z := make([]float64, n)
	onsets := make([]int, 0, reps)
	for range reps {
		for k := range z {
			z[k] = mean[k] + rng.NormFloat64()
		}
		if e, ok := scanChange(z, from, to, c.Model); ok {
			onsets = append(onsets, e.Onset)
		} else {
			onsets = append(onsets, to) // no rise found: the latest it could be
		}
	}
	slices.Sort(onsets)
	tail := (1 - conf) / 2
	lo = onsets[int(math.Floor(tail*float64(len(onsets))))]
	hi = onsets[min(len(onsets)-1, int(math.Ceil((1-tail)*float64(len(onsets))))-1)]
	return min(lo, c.Onset), max(hi, c.Onset)
}
