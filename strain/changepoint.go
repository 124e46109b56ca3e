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
	// CurveChange is a growth that speeds up: z_k = γ·(k − onset + 1)²
	// for k ≥ onset — a crack or slab that lengthens as it opens.
	CurveChange ChangeModel = "curve"
)

// changeModels are the shapes EstimateChange tries.
var changeModels = []ChangeModel{StepChange, SlopeChange, CurveChange}

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
// change that begins at a position in [from, to] and rises, taking the
// best of the step, slope and curve models. Each model is a known shape
// g(j), j = k − onset + 1, times an unknown amplitude a > 0; the onset m
// maximises the log likelihood ratio against no change,
// (Σ_{k≥m} g·z_k)² / (2·Σ_{k≥m} g²). For the step (g = 1) this is the
// estimate of Hinkley (1970, Biometrika 57, 1–17) for a change in the mean
// with the pre-change mean and the variance known; for the slope (g = j)
// that of two-phase regression with a hinge (Hinkley 1969, Biometrika 56,
// 495–504); the curve (g = j²) is the same likelihood for a growth that
// speeds up. Every scan takes O(n) through suffix sums of z, k·z and
// k²·z. It reports false when no onset in the range gives a rise.
func EstimateChange(z []float64, from, to int) (ChangePoint, bool) {
	var best ChangePoint
	found := false
	for _, model := range changeModels {
		if c, ok := scanChange(z, from, to, model); ok && (!found || c.LogLik > best.LogLik) {
			best, found = c, true
		}
	}
	return best, found
}

// scanChange finds the maximum-likelihood onset of model in [from, to].
func scanChange(z []float64, from, to int, model ChangeModel) (ChangePoint, bool) {
	n := len(z)
	from, to = max(from, 0), min(to, n-1)
	best := ChangePoint{Model: model, Onset: -1}
	// Suffix sums from the end: s0 = Σ z_k, s1 = Σ k·z_k, s2 = Σ k²·z_k
	// over k ≥ m; with j = k − m + 1 = k − a (a = m − 1), Σ j·z = s1 − a·s0
	// and Σ j²·z = s2 − 2a·s1 + a²·s0.
	var s0, s1, s2 float64
	for m := n - 1; m >= from; m-- {
		k := float64(m)
		s0 += z[m]
		s1 += k * z[m]
		s2 += k * k * z[m]
		if m > to {
			continue
		}
		r := float64(n - m) // frames from the onset on
		a := float64(m - 1)
		var num, den float64
		switch model {
		case StepChange:
			num, den = s0, r
		case SlopeChange:
			num, den = s1-a*s0, r*(r+1)*(2*r+1)/6
		case CurveChange:
			num, den = s2-2*a*s1+a*a*s0, r*(r+1)*(2*r+1)*(3*r*r+3*r-1)/30
		}
		size, stat := num/den, num*num/(2*den)
		if size > 0 && (best.Onset < 0 || stat > best.LogLik) {
			best = ChangePoint{Model: model, Onset: m, Size: size, LogLik: stat}
		}
	}
	return best, best.Onset >= 0
}

// shape is the model's g(j) at j = k − onset + 1 ≥ 1.
func (m ChangeModel) shape(j float64) float64 {
	switch m {
	case SlopeChange:
		return j
	case CurveChange:
		return j * j
	}
	return 1
}

// fitted returns the model's mean signal of length n.
func (c ChangePoint) fitted(n int) []float64 {
	f := make([]float64, n)
	for k := c.Onset; k < n; k++ {
		f[k] = c.Size * c.Model.shape(float64(k-c.Onset+1))
	}
	return f
}

// Interval returns a confidence interval [lo, hi] for the onset with
// confidence conf (such as 0.95), by the parametric bootstrap (Efron and
// Tibshirani 1993, An Introduction to the Bootstrap, ch. 6): reps signals
// are drawn from the fitted change plus Gaussian noise of standard
// deviation sigma (1 for a signal whose normalisation holds; more when the
// fit's residuals say so), each is re-estimated as the signal was (the
// choice of model included) over [from, to], and the interval is their
// central conf share, widened to hold the estimate itself. seed makes it
// repeatable.
func (c ChangePoint) Interval(n, from, to int, sigma, conf float64, reps int, seed uint64) (lo, hi int) {
	rng := rand.New(rand.NewPCG(seed, 0x5e11))
	mean := c.fitted(n)
	z := make([]float64, n)
	onsets := make([]int, 0, reps)
	for range reps {
		for k := range z {
			z[k] = mean[k] + sigma*rng.NormFloat64()
		}
		if e, ok := EstimateChange(z, from, to); ok {
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

// ResidualSigma is the standard deviation of z about the fitted change,
// RSS/(n − 2) under the square root (two fitted parameters, the onset and
// the amplitude).
func (c ChangePoint) ResidualSigma(z []float64) float64 {
	f := c.fitted(len(z))
	var rss float64
	for k := range z {
		rss += (z[k] - f[k]) * (z[k] - f[k])
	}
	return math.Sqrt(rss / float64(max(len(z)-2, 1)))
}
