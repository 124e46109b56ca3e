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

// CubicChange is a growth that starts slower still: z_k = c·(k − onset + 1)³ — a
// feature whose length and slip both grow from zero. It widens the
// plausible onsets of EarliestPlausibleOnset only; the estimate keeps the
// three shapes above.
const CubicChange ChangeModel = "cubic"

// changeModels are the shapes EstimateChange tries.
var changeModels = []ChangeModel{StepChange, SlopeChange, CurveChange}

// plausibleModels are the shapes EarliestPlausibleOnset takes.
var plausibleModels = []ChangeModel{StepChange, SlopeChange, CurveChange, CubicChange}

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
// estimate of Hinkley (1970, Biometrika 57, 1–17; from memory) for a change in the mean
// with the pre-change mean and the variance known; for the slope (g = j)
// that of two-phase regression with a hinge (Hinkley 1969, Biometrika 56,
// 495–504; from memory); the curve (g = j²) is the same likelihood for a growth that
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
	case CubicChange:
		return j * j * j
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

// shapeColumn returns the change's shape over n frames at unit amplitude
// (0 before the onset): the column a fit of the change's amplitude uses.
func (c ChangePoint) shapeColumn(n int) []float64 {
	c.Size = 1
	return c.fitted(n)
}

// Interval returns a confidence interval [lo, hi] for the onset with
// confidence conf (such as 0.95), by the parametric bootstrap (Efron and
// Tibshirani 1993, An Introduction to the Bootstrap, ch. 6; from memory): reps signals
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

// DriftChange is a change point estimated over an elastic drift: the
// signal is a line in the nominal stress, α + β·σ_k, in every frame, and
// from the onset on the change's shape on top (see EstimateDriftChange).
type DriftChange struct {
	ChangePoint
	// Level and Slope are the drift line's α and β (per MPa).
	Level, Slope float64
	stress       []float64
	prior        Prior
}

// Prior is the precision (inverse covariance, in units of the signal's
// noise) of the drift line's α and β before the signal is seen: the
// baseline's own error is that of a line fitted over the calibration
// frames, so its precision is the information matrix of that fit, Σ over
// the calibration frames of (1, σ_k)ᵀ(1, σ_k) (for unit noise; Bayesian
// linear regression with a Gaussian prior, e.g. Gelman et al. 2013,
// Bayesian Data Analysis, 3rd ed., §14.8). It keeps the drift from
// absorbing a real change that grows with the load; zero is no prior.
type Prior [2][2]float64

// CalibrationPrior is the Prior of a baseline fitted over the frames k
// with calibration[k], at stress[k].
func CalibrationPrior(stress []float64, calibration []bool) Prior {
	var p Prior
	for k, c := range calibration {
		if c && k < len(stress) {
			s := stress[k]
			p[0][0]++
			p[0][1] += s
			p[1][0] += s
			p[1][1] += s * s
		}
	}
	return p
}

// penalty is θᵀPθ for the line (α, β).
func (p Prior) penalty(a, b float64) float64 {
	return a*(p[0][0]*a+p[0][1]*b) + b*(p[1][0]*a+p[1][1]*b)
}

// EstimateDriftChange is EstimateChange for a signal whose pre-change
// part is not known to be zero but a line in the nominal stress: z_k = α +
// β·σ_k + a·g(k − m + 1)·[k ≥ m] + noise, with α, β and a > 0 fitted by
// least squares for every onset m in [from, to] and the three shapes of
// EstimateChange; the estimate maximises the log likelihood ratio against
// the line alone, (RSS_line − RSS_change)/2 for unit noise. This is the
// two-phase regression of Hinkley (1969, Biometrika 56, 495–504; from
// memory) with the first phase a line in the stress instead of a constant.
//
// Why: a point's residual from its elastic baseline carries the baseline's
// own error, δa + δb·σ, which grows with the stress beyond the calibration
// frames (the baseline's slope is extrapolated from the first fifth of the
// load) — at an opening's wall, where the strain noise is largest, by
// several hundred µε at the peak (measured on the demo's elastic field).
// A change-point model whose first phase is zero reads that growth as an
// onset right after calibration; one whose first phase is a line in the
// stress absorbs it. Without a spread of stresses (stress nil, or no two
// frames at different stresses) it is EstimateChange.
func EstimateDriftChange(z, stress []float64, prior Prior, from, to int) (DriftChange, bool) {
	if !spreadOut(stress, len(z)) {
		c, ok := EstimateChange(z, from, to)
		return DriftChange{ChangePoint: c}, ok
	}
	n := len(z)
	from, to = max(from, 1), min(to, n-1)
	_, rss0 := fitLine(z, stress, prior, n)
	var best DriftChange
	found := false
	g := make([]float64, n)
	for _, model := range changeModels {
		for m := from; m <= to; m++ {
			for k := range g {
				g[k] = 0
				if k >= m {
					g[k] = model.shape(float64(k - m + 1))
				}
			}
			coef, rss, ok := fitThree(z, stress, g, prior)
			if !ok || coef[2] <= 0 {
				continue
			}
			stat := (rss0 - rss) / 2
			if !found || stat > best.LogLik {
				best = DriftChange{ChangePoint: ChangePoint{Model: model, Onset: m, Size: coef[2], LogLik: stat},
					Level: coef[0], Slope: coef[1], stress: stress, prior: prior}
				found = true
			}
		}
	}
	return best, found
}

// EarliestPlausibleOnset is the lower end of the likelihood-ratio
// confidence set of the onset of EstimateDriftChange: the earliest onset m
// in [from, to], of any of the change shapes, whose log likelihood ratio
// is within drop of the best's (drop = χ²₁ quantile / 2, 1.92 for 95 %),
// with a cubic growth (CubicChange) among the shapes.
// Inverting the likelihood-ratio test gives a confidence set for a change
// point (Siegmund 1988, "Confidence sets in change-point problems", Int.
// Stat. Rev. 56, 31–48; from memory); taken over the shapes it also holds
// the shapes' disagreement, which a bootstrap at one fitted shape does
// not. best is the estimate; without a spread of stresses the drift line
// is left out, as there.
func EarliestPlausibleOnset(z, stress []float64, prior Prior, from, to int, best DriftChange, drop float64) int {
	n := len(z)
	out := best.Onset
	drift := spreadOut(stress, n)
	from, to = max(from, 1), min(to, n-1)
	var rss0 float64
	if drift {
		_, rss0 = fitLine(z, stress, prior, n)
	}
	g := make([]float64, n)
	for _, model := range plausibleModels {
		for m := from; m < out && m <= to; m++ {
			if !drift {
				if model == CubicChange {
					break // scanChange has the three shapes
				}
				if c, ok := scanChange(z, m, m, model); ok && c.LogLik >= best.LogLik-drop {
					out = m
					break
				}
				continue
			}
			for k := range g {
				g[k] = 0
				if k >= m {
					g[k] = model.shape(float64(k - m + 1))
				}
			}
			coef, rss, ok := fitThree(z, stress, g, prior)
			if ok && coef[2] > 0 && (rss0-rss)/2 >= best.LogLik-drop {
				out = m
				break
			}
		}
	}
	return out
}

// spreadOut reports whether the first n stresses hold two that differ.
func spreadOut(stress []float64, n int) bool {
	if len(stress) < n || n < 2 {
		return false
	}
	for _, s := range stress[:n] {
		if math.Abs(s-stress[0]) > 1e-9*math.Max(1, math.Abs(stress[0])) {
			return true
		}
	}
	return false
}

// fitLine fits z_k = α + β·s_k over the first n frames by least squares
// with the prior's penalty and returns the coefficients and the penalised
// residual sum of squares.
func fitLine(z, s []float64, prior Prior, n int) ([2]float64, float64) {
	var sz, ssz float64
	a := prior
	for k := range n {
		a[0][0]++
		a[0][1] += s[k]
		a[1][0] += s[k]
		a[1][1] += s[k] * s[k]
		sz += z[k]
		ssz += s[k] * z[k]
	}
	det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	var c [2]float64
	if det > 0 {
		c[0] = (a[1][1]*sz - a[0][1]*ssz) / det
		c[1] = (a[0][0]*ssz - a[1][0]*sz) / det
	}
	rss := prior.penalty(c[0], c[1])
	for k := range n {
		r := z[k] - c[0] - c[1]*s[k]
		rss += r * r
	}
	return c, rss
}

// fitThree fits z_k = c0 + c1·s_k + c2·g_k by least squares with the
// prior's penalty on (c0, c1) (normal equations, solved by Cramer's rule)
// and returns the coefficients and the penalised residual sum of squares;
// false when the design is singular.
func fitThree(z, s, g []float64, prior Prior) ([3]float64, float64, bool) {
	var a [3][3]float64
	for i := range 2 {
		for j := range 2 {
			a[i][j] = prior[i][j]
		}
	}
	var b [3]float64
	for k := range z {
		x := [3]float64{1, s[k], g[k]}
		for i := range 3 {
			for j := range 3 {
				a[i][j] += x[i] * x[j]
			}
			b[i] += x[i] * z[k]
		}
	}
	det := det3(a)
	scale := a[0][0] * a[1][1] * a[2][2]
	if !(math.Abs(det) > 1e-12*math.Abs(scale)) {
		return [3]float64{}, 0, false
	}
	var c [3]float64
	for col := range 3 {
		m := a
		for i := range 3 {
			m[i][col] = b[i]
		}
		c[col] = det3(m) / det
	}
	rss := prior.penalty(c[0], c[1])
	for k := range z {
		r := z[k] - c[0] - c[1]*s[k] - c[2]*g[k]
		rss += r * r
	}
	return c, rss, true
}

func det3(a [3][3]float64) float64 {
	return a[0][0]*(a[1][1]*a[2][2]-a[1][2]*a[2][1]) - a[0][1]*(a[1][0]*a[2][2]-a[1][2]*a[2][0]) + a[0][2]*(a[1][0]*a[2][1]-a[1][1]*a[2][0])
}

// fitted returns the drift line plus the change, over n frames.
func (c DriftChange) fitted(n int) []float64 {
	f := c.ChangePoint.fitted(n)
	if c.stress != nil {
		for k := range f {
			f[k] += c.Level + c.Slope*c.stress[k]
		}
	}
	return f
}

// ResidualSigma is the standard deviation of z about the fitted drift and
// change, RSS/(n − p) under the square root with p the fitted parameters
// (onset, amplitude, and the line's two when there is a drift).
func (c DriftChange) ResidualSigma(z []float64) float64 {
	f := c.fitted(len(z))
	var rss float64
	for k := range z {
		rss += (z[k] - f[k]) * (z[k] - f[k])
	}
	p := 2
	if c.stress != nil {
		p = 4
	}
	return math.Sqrt(rss / float64(max(len(z)-p, 1)))
}

// Without returns z less the fitted drift line.
func (c DriftChange) Without(z []float64) []float64 {
	out := slices.Clone(z)
	if c.stress != nil {
		for k := range out {
			out[k] -= c.Level + c.Slope*c.stress[k]
		}
	}
	return out
}
