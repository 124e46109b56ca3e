package subset

import "math"

// SSSIG returns the sum of squared subset intensity gradients of the
// (2·radius+1)² subset centred on pixel (x, y), the smaller of its x and y
// directional sums (see SSSIGXY). Taking the smaller value makes it a
// conservative texture measure: it bounds the worse of the two
// displacement components (Pan et al. 2008, "Study on subset size
// selection in digital image correlation for speckle patterns", Optics
// Express 16(10):7037–7048).
func SSSIG(sp *Spline, x, y, radius int) float64 {
	sx, sy := SSSIGXY(sp, x, y, radius)
	return math.Min(sx, sy)
}

// SSSIGXY returns the directional sums Σ fx² and Σ fy² over the
// (2·radius+1)² subset centred on pixel (x, y) (Pan et al. 2008). The
// gradient is that of the B-spline interpolant sp at the pixel centres,
// the same gradient the solver uses for its steepest-descent images.
// Pixels of the subset outside the image are left out.
func SSSIGXY(sp *Spline, x, y, radius int) (sx, sy float64) {
	side := 2*radius + 1
	if x-radius >= 0 && y-radius >= 0 && x+radius < sp.width && y+radius < sp.height {
		// Inside the image: the gradients at the pixel centres in bulk.
		buf := make([]float64, 3*side*side+2*centreScratch(side))
		n := side * side
		v, gx, gy := buf[:n], buf[n:2*n], buf[2*n:3*n]
		sp.centres(x-radius, y-radius, side, 0, v, gx, gy, buf[3*n:3*n+centreScratch(side)], buf[3*n+centreScratch(side):])
		for k := range gx {
			sx += gx[k] * gx[k]
			sy += gy[k] * gy[k]
		}
		return sx, sy
	}
	for j := max(y-radius, 0); j <= min(y+radius, sp.height-1); j++ {
		for i := max(x-radius, 0); i <= min(x+radius, sp.width-1); i++ {
			_, gx, gy := sp.ValueGrad(float64(i), float64(j))
			sx += gx * gx
			sy += gy * gy
		}
	}
	return sx, sy
}

// PredictedNoise returns the standard deviation of a displacement
// component, in pixels, that image noise of standard deviation sigma (gray
// levels, present in both the reference and the deformed image) causes in
// a subset whose directional SSSIG for that component is sssig:
// √2·σ/√SSSIG (Pan et al. 2008; Wang et al. 2009, "Quantitative error
// assessment in pattern matching", Strain 45(2)). It is a first-order
// result for motions close to whole pixels; at subpixel positions the
// interpolation smooths the noise of the deformed image and the actual
// scatter is somewhat lower.
func PredictedNoise(sigma, sssig float64) float64 {
	return math.Sqrt2 * sigma / math.Sqrt(sssig)
}
