package subset

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestCentres checks the fixed-stencil evaluation at pixel centres against
// ValueGrad, the general evaluation of the same interpolant, on every
// pixel of windows that touch the image border. They differ only by
// rounding: 1e-12 of the 0–255 range.
func TestCentres(t *testing.T) {
	rng := rand.New(rand.NewPCG(50, 50))
	img := randomImage(rng, 40, 30)
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		for _, win := range [][3]int{{0, 0, 11}, {29, 19, 11}, {7, 5, 21}, {0, 0, 1}} {
			x0, y0, side := win[0], win[1], win[2]
			v, gx, gy := make([]float64, side*side), make([]float64, side*side), make([]float64, side*side)
			colV, colD := make([]float64, centreScratch(side)), make([]float64, centreScratch(side))
			sp.centres(x0, y0, side, 0, v, gx, gy, colV, colD)
			var worst float64
			for j := range side {
				for i := range side {
					wv, wx, wy := sp.ValueGrad(float64(x0+i), float64(y0+j))
					k := j*side + i
					worst = math.Max(worst, math.Max(math.Abs(v[k]-wv), math.Max(math.Abs(gx[k]-wx), math.Abs(gy[k]-wy))))
				}
			}
			if worst > 1e-12*255 {
				t.Errorf("%v window %v: max difference from ValueGrad %g, want < %g", kind, win, worst, 1e-12*255)
			}
		}
	}
}

// TestValues checks the bulk evaluation inside the image against Value at
// random positions and at the four corners, where the kernel reaches into
// the mirrored border. They differ only by rounding: 1e-12 of the 0–255
// range.
func TestValues(t *testing.T) {
	rng := rand.New(rand.NewPCG(51, 51))
	const w, h = 37, 23
	img := randomImage(rng, w, h)
	xs := []float64{0, w - 1, 0, w - 1, math.Nextafter(w-1, 0), 0.5}
	ys := []float64{0, 0, h - 1, h - 1, math.Nextafter(h-1, 0), h - 1}
	for range 500 {
		xs = append(xs, (w-1)*rng.Float64())
		ys = append(ys, (h-1)*rng.Float64())
	}
	out := make([]float64, len(xs))
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		sp.values(xs, ys, out)
		var worst float64
		for k := range out {
			worst = math.Max(worst, math.Abs(out[k]-sp.Value(xs[k], ys[k])))
		}
		if worst > 1e-12*255 {
			t.Errorf("%v: max difference from Value %g, want < %g", kind, worst, 1e-12*255)
		}
	}
}

// lineValues forms the positions of a warped row on the fly and must give
// the values of values at those positions to the last bit, from the
// row's start and from an offset into it (i0), for both kernels: the
// affine solver relies on it (its samples equal the general path's).
// Known answer: values itself, checked against Value in TestValues.
func TestLineValues(t *testing.T) {
	img := testPattern(54).render(60, 50, nil)
	const x0, y0, ax, ay, n = 7.3, 11.6, 1.013, 0.021, 30
	for _, kind := range []Interpolation{Bicubic, Biquintic} {
		sp := NewSpline(img, kind)
		xs, ys := make([]float64, n), make([]float64, n)
		for i := range xs {
			xs[i], ys[i] = x0+float64(float64(i)*ax), y0+float64(float64(i)*ay)
		}
		want := make([]float64, n)
		sp.values(xs, ys, want)
		got := make([]float64, n)
		sp.lineValues(x0, y0, ax, ay, 0, got[:12])
		sp.lineValues(x0, y0, ax, ay, 12, got[12:])
		if !slices.Equal(got, want) {
			t.Errorf("%v: lineValues %v, values %v", kind, got[:3], want[:3])
		}
	}
}
