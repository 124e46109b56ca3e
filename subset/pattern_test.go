package subset

import (
	"math"
	"math/rand/v2"
)

// wavePattern is an analytic, band-limited gray pattern: a mean level plus
// a sum of plane waves with random directions, periods and phases. Being
// analytic, it can be sampled exactly at any warped position, so deformed
// test images carry no interpolation error of their own.
type wavePattern struct {
	mean               float64
	amp, kx, ky, phase []float64
}

// newWavePattern returns a pattern of n waves with periods in
// [minPeriod, maxPeriod] pixels and a gray-level standard deviation of
// about std around a mean of 128 (a 0–255 scale).
func newWavePattern(rng *rand.Rand, n int, minPeriod, maxPeriod, std float64) *wavePattern {
	w := &wavePattern{mean: 128}
	a := std * math.Sqrt(2/float64(n))
	for range n {
		period := minPeriod + (maxPeriod-minPeriod)*rng.Float64()
		theta := 2 * math.Pi * rng.Float64()
		k := 2 * math.Pi / period
		w.amp = append(w.amp, a)
		w.kx = append(w.kx, k*math.Cos(theta))
		w.ky = append(w.ky, k*math.Sin(theta))
		w.phase = append(w.phase, 2*math.Pi*rng.Float64())
	}
	return w
}

func (w *wavePattern) at(x, y float64) float64 {
	v := w.mean
	for i, a := range w.amp {
		v += a * math.Cos(w.kx[i]*x+w.ky[i]*y+w.phase[i])
	}
	return v
}

// render returns a width×height image whose pixel (x, y) holds the pattern
// at inverse(x, y), the reference position that moved to (x, y); a nil
// inverse renders the pattern itself.
func (w *wavePattern) render(width, height int, inverse func(x, y float64) (float64, float64)) *Image {
	img := NewImage(width, height, 8)
	for y := 0; y < height; y++ {
		for x := 0; x < width; x++ {
			X, Y := float64(x), float64(y)
			if inverse != nil {
				X, Y = inverse(X, Y)
			}
			img.Set(x, y, float32(w.at(X, Y)))
		}
	}
	return img
}

// globalWarp is a displacement field over a whole image: a point X of the
// reference moves to c + W(X - c; p), with p the shape parameters at the
// centre c.
type globalWarp struct {
	cx, cy float64
	p      Params
}

// forward returns where reference point (X, Y) moves.
func (g globalWarp) forward(X, Y float64) (float64, float64) {
	x, y := g.p.Warp(X-g.cx, Y-g.cy)
	return g.cx + x, g.cy + y
}

// inverse returns the reference point that moves to (x, y), by Newton's
// method on the forward map to 1e-12 px.
func (g globalWarp) inverse(x, y float64) (float64, float64) {
	X, Y := x-g.p[PU], y-g.p[PV]
	for range 50 {
		fx, fy := g.forward(X, Y)
		rx, ry := fx-x, fy-y
		if math.Hypot(rx, ry) < 1e-12 {
			break
		}
		l := g.at(X, Y)
		// Jacobian of the forward map at (X, Y).
		a, b := 1+l[PUx], l[PUy]
		c, d := l[PVx], 1+l[PVy]
		det := a*d - b*c
		X -= (d*rx - b*ry) / det
		Y -= (-c*rx + a*ry) / det
	}
	return X, Y
}

// at returns the shape parameters of the field at reference point (X, Y):
// the second-order Taylor re-expansion of the quadratic field about that
// point, exact because the field is quadratic.
func (g globalWarp) at(X, Y float64) Params {
	ex, ey := X-g.cx, Y-g.cy
	p := g.p
	var l Params
	l[PU] = p[PU] + p[PUx]*ex + p[PUy]*ey + 0.5*p[PUxx]*ex*ex + p[PUxy]*ex*ey + 0.5*p[PUyy]*ey*ey
	l[PV] = p[PV] + p[PVx]*ex + p[PVy]*ey + 0.5*p[PVxx]*ex*ex + p[PVxy]*ex*ey + 0.5*p[PVyy]*ey*ey
	l[PUx] = p[PUx] + p[PUxx]*ex + p[PUxy]*ey
	l[PUy] = p[PUy] + p[PUxy]*ex + p[PUyy]*ey
	l[PVx] = p[PVx] + p[PVxx]*ex + p[PVxy]*ey
	l[PVy] = p[PVy] + p[PVxy]*ex + p[PVyy]*ey
	copy(l[PUxx:], p[PUxx:])
	return l
}

// addNoise returns a copy of img with independent Gaussian noise of
// standard deviation sigma added to every pixel (no quantisation).
func addNoise(img *Image, rng *rand.Rand, sigma float64) *Image {
	out := NewImage(img.Width, img.Height, img.Depth)
	for i, v := range img.Pix {
		out.Pix[i] = v + float32(sigma*rng.NormFloat64())
	}
	return out
}
