package speckle

import (
	"math"

	"spallscope/dic/synth"
)

// patternCovariance returns the autocovariance, at distance s px, of the
// transmittance T = exp(−κ·Σ g(x − x_k)) of the synthetic lab's pattern
// (Poisson spot centres of density λ, spots g(u) = exp(−|u|²/R²)). For a
// Poisson process the Laplace functional gives
//
//	E[T(x)·T(x+s)] = exp(−λ ∫ (1 − exp(−κ(g(u) + g(u − s)))) du),
//
// (Kingman 1993, Poisson Processes, §3.2, Campbell's theorem), and
// E[T] = exp(−λπR²·Ein(κ)). The integral is taken by the midpoint rule on
// a grid of R/16, which for this smooth, Gaussian-decaying integrand is
// accurate far beyond the test's needs (checked at s = 0 against the
// closed form πR²·Ein(2κ)). The gray level is an affine function of T, so
// its normalised autocorrelation is that of T.
func patternCovariance(p synth.Pattern, s float64) float64 {
	const kappa = 3 // synth's default ink density
	R := p.Radius
	lambda := p.SpotDensity()
	h := R / 16
	var sum float64
	for y := -6 * R; y <= 6*R; y += h {
		for x := -6 * R; x <= s+6*R; x += h {
			g1 := math.Exp(-(x*x + y*y) / (R * R))
			g2 := math.Exp(-((x-s)*(x-s) + y*y) / (R * R))
			sum += 1 - math.Exp(-kappa*(g1+g2))
		}
	}
	mean := math.Exp(-lambda * math.Pi * R * R * synth.Ein(kappa))
	return math.Exp(-lambda*sum*h*h) - mean*mean
}

// predictedCorrelationRadius returns the correlation radius (lag of the
// half-height of the normalised autocorrelation, by linear interpolation
// between whole lags, as correlationRadius measures it) that the synthetic
// lab's pattern has once recorded by its camera: each pixel integrates the
// light at the 2×2 Gauss–Legendre points ±1/(2√3) (synth.Camera's default
// oversampling), so the pixel covariance at lag d is the mean of the
// pattern covariance over the 16 pairs of points, and 8-bit rounding adds
// 1/12 level² at lag 0 only (white).
func predictedCorrelationRadius(p synth.Pattern, levelsPerT float64) float64 {
	a := 0.5 / math.Sqrt(3)
	nodes := []float64{-a, a}
	cache := map[float64]float64{}
	cov := func(s float64) float64 {
		s = math.Round(s*1e9) / 1e9
		if c, ok := cache[s]; ok {
			return c
		}
		c := patternCovariance(p, s)
		cache[s] = c
		return c
	}
	pixel := func(d float64) float64 {
		var c float64
		for _, xi := range nodes {
			for _, xk := range nodes {
				for _, yj := range nodes {
					for _, yl := range nodes {
						c += cov(math.Hypot(d+xi-xk, yj-yl)) / 16
					}
				}
			}
		}
		return c
	}
	c0 := pixel(0) + 1.0/12/(levelsPerT*levelsPerT)
	prev := 1.0
	for k := 1; ; k++ {
		rho := pixel(float64(k)) / c0
		if rho <= 0.5 {
			return float64(k-1) + (prev-0.5)/(prev-rho)
		}
		prev = rho
	}
}
