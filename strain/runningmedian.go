package strain

// runningMedian3 is the running median of three of xs (Tukey 1977,
// Exploratory Data Analysis, ch. 7, smoothing sequences by running
// medians; from memory): each value but the two ends replaced by the
// median of itself and its two neighbours. A monotone stretch passes
// unchanged, while a value out of line with both of its neighbours — one
// noisy frame — is replaced by the nearer of them; for independent
// Gaussian noise the median of three has about 0.449 of one value's
// variance (the variance of the sample median of three standard normals,
// from memory; checked by TestRunningMedian3Variance). The end values are
// copied on as they are, the simplest of Tukey's end rules: an end has
// only one neighbour, and no frame beyond the series is invented.
func runningMedian3(xs []float64) []float64 {
	out := make([]float64, len(xs))
	copy(out, xs)
	for k := 1; k+1 < len(xs); k++ {
		out[k] = median3(xs[k-1], xs[k], xs[k+1])
	}
	return out
}

// median3 is the median of a, b and c.
func median3(a, b, c float64) float64 {
	if a > b {
		a, b = b, a
	}
	// a ≤ b: the median is b clipped to [a, c] when c is the largest, c
	// when it lies between them, a when it is the smallest.
	return max(a, min(b, c))
}
