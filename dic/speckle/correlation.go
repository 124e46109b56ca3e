package speckle

import "spallscope/subset"

// The speckle size is read from the autocorrelation of the image: how far
// the image must be moved against itself before it matches only half as
// well. It needs no threshold between ink and paint, so it works on any
// gray pattern, and it is the length scale that subset matching sees.

// detrended returns the gray levels of img as float64 with their
// least-squares plane a + b·x + c·y removed. Removing the mean is what the
// autocorrelation needs; removing the tilt as well keeps a gradual change
// of lighting across the face (common in photos of lit specimens; common
// practice, no source) from passing for long-range correlation. On the full
// pixel grid the centred coordinates are orthogonal, so the three
// coefficients are independent sums.
func detrended(img *subset.Image) []float64 {
	w, h := img.Width, img.Height
	cx, cy := float64(w-1)/2, float64(h-1)/2
	var sum, sx, sy, xx, yy float64
	for y := 0; y < h; y++ {
		dy := float64(y) - cy
		for x, v := range img.Row(y) {
			dx := float64(x) - cx
			f := float64(v)
			sum += f
			sx += f * dx
			sy += f * dy
			xx += dx * dx
			yy += dy * dy
		}
	}
	n := float64(w * h)
	a := sum / n
	b, c := 0.0, 0.0
	if xx > 0 {
		b = sx / xx
	}
	if yy > 0 {
		c = sy / yy
	}
	f := make([]float64, w*h)
	for y := 0; y < h; y++ {
		dy := float64(y) - cy
		for x, v := range img.Row(y) {
			f[y*w+x] = float64(v) - a - b*(float64(x)-cx) - c*dy
		}
	}
	return f
}

// lagCovariance returns the mean of f(x, y)·f(x+dx, y+dy) over all pairs of
// pixels of the w×h image f that lie inside it (dx, dy ≥ 0): the
// autocovariance at that lag of a zero-mean image, each lag averaged over
// its own overlap so that larger lags are not biased towards 0.
func lagCovariance(f []float64, w, h, dx, dy int) float64 {
	if dx >= w || dy >= h {
		return 0
	}
	var sum float64
	for y := 0; y+dy < h; y++ {
		a := f[y*w : y*w+w-dx]
		b := f[(y+dy)*w+dx : (y+dy)*w+w]
		for i, v := range a {
			sum += v * b[i]
		}
	}
	return sum / float64((w-dx)*(h-dy))
}

// correlationRadius returns the lag in px along the direction (dx, dy) —
// (1, 0) for x, (0, 1) for y — at which the normalised autocorrelation
// ρ(k) = C(k)/C(0) of the zero-mean image f first falls to 1/2, by linear
// interpolation between the last whole lag above 1/2 and the first at or
// below it. It reports false when ρ stays above 1/2 up to maxLag or f has
// no variance.
//
// Image noise is white and adds only to C(0), lowering ρ at every other
// lag by the factor s²/(s² + σ²) for pattern variance s²: under 1 % for a
// contrast ten times the noise, so it is not corrected.
func correlationRadius(f []float64, w, h, dx, dy, maxLag int) (float64, bool) {
	c0 := lagCovariance(f, w, h, 0, 0)
	if !(c0 > 0) {
		return 0, false
	}
	prev := 1.0
	for k := 1; k <= maxLag; k++ {
		rho := lagCovariance(f, w, h, k*dx, k*dy) / c0
		if rho <= 0.5 {
			return float64(k-1) + (prev-0.5)/(prev-rho), true
		}
		prev = rho
	}
	return 0, false
}
