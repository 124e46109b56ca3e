package subset

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"
)

var kinds = []Interpolation{Bicubic, Biquintic}

// degree returns the polynomial degree of the B-spline kind.
func degree(k Interpolation) int {
	if k == Biquintic {
		return 5
	}
	return 3
}

func randomImage(rng *rand.Rand, w, h int) *Image {
	img := NewImage(w, h, 8)
	for i := range img.Pix {
		img.Pix[i] = float32(255 * rng.Float64())
	}
	return img
}

// TestSplinePoles checks the prefilter poles: they are roots of the
// z-transform of the sampled B-spline, (z + 4 + 1/z)/6 for the cubic and
// (z² + 26z + 66 + 26/z + 1/z²)/120 for the quintic (Unser 1999, Table 1),
// and match the tabulated values √3−2, −0.430575347099973 and
// −0.0430962882032647 (quintic values from memory of that table).
func TestSplinePoles(t *testing.T) {
	cases := []struct {
		kind Interpolation
		want []float64
		poly func(z float64) float64
	}{
		{Bicubic, []float64{math.Sqrt(3) - 2}, func(z float64) float64 { return z + 4 + 1/z }},
		{Biquintic, []float64{-0.430575347099973, -0.0430962882032647},
			func(z float64) float64 { return z*z + 26*z + 66 + 26/z + 1/(z*z) }},
	}
	for _, c := range cases {
		got := splinePoles(c.kind)
		for i, z := range got {
			if math.Abs(z-c.want[i]) > 1e-13 {
				t.Errorf("%v pole %d = %.16g, want %.16g", c.kind, i, z, c.want[i])
			}
			// Relative to the largest term, 1/z², for float64 rounding.
			if r := c.poly(z); math.Abs(r) > 1e-13/(z*z) {
				t.Errorf("%v pole %d: sampled B-spline transform = %g, want 0", c.kind, i, r)
			}
		}
	}
}

// TestSplineWeights checks the B-spline kernel: the weights form a
// partition of unity, their derivatives sum to zero, and the kernel is
// symmetric, w_k(t) = w_{n-1-k}(1-t) (B-spline theory, Unser 1999). The
// central weights at t = 0 are the sampled B-spline, 4/6 and 1/6 for the
// cubic and 66/120, 26/120, 1/120 for the quintic.
func TestSplineWeights(t *testing.T) {
	cubic := func(x float64) ([]float64, []float64) {
		w0, w1, w2, w3 := cubicWeights(x)
		d0, d1, d2, d3 := cubicDerivs(x)
		return []float64{w0, w1, w2, w3}, []float64{d0, d1, d2, d3}
	}
	quintic := func(x float64) ([]float64, []float64) {
		w0, w1, w2, w3, w4, w5 := quinticWeights(x)
		d0, d1, d2, d3, d4, d5 := quinticDerivs(x)
		return []float64{w0, w1, w2, w3, w4, w5}, []float64{d0, d1, d2, d3, d4, d5}
	}
	for _, kernel := range []struct {
		name    string
		weights func(float64) ([]float64, []float64)
		at0     []float64
	}{
		{"cubic", cubic, []float64{1.0 / 6, 4.0 / 6, 1.0 / 6, 0}},
		{"quintic", quintic, []float64{1.0 / 120, 26.0 / 120, 66.0 / 120, 26.0 / 120, 1.0 / 120, 0}},
	} {
		for i := 0; i <= 100; i++ {
			x := float64(i) / 100
			w, d := kernel.weights(x)
			mw, md := kernel.weights(1 - x)
			var sw, sd float64
			for k := range w {
				sw += w[k]
				sd += d[k]
				n := len(w) - 1 - k
				if math.Abs(w[k]-mw[n]) > 1e-14 || math.Abs(d[k]+md[n]) > 1e-14 {
					t.Errorf("%s t=%g: tap %d not symmetric: w %g vs %g, d %g vs %g", kernel.name, x, k, w[k], mw[n], d[k], -md[n])
				}
			}
			if math.Abs(sw-1) > 1e-14 || math.Abs(sd) > 1e-14 {
				t.Errorf("%s t=%g: Σw = %.16g (want 1), Σw' = %g (want 0)", kernel.name, x, sw, sd)
			}
		}
		w, _ := kernel.weights(0)
		for k := range w {
			if math.Abs(w[k]-kernel.at0[k]) > 1e-15 {
				t.Errorf("%s w%d(0) = %g, want %g", kernel.name, k, w[k], kernel.at0[k])
			}
		}
	}
}

// TestSplineInterpolatesSamples checks that the prefiltered spline passes
// through every pixel, boundaries included, which is what the exact
// mirror-boundary prefilter guarantees (Unser 1999). Sizes down to one
// pixel exercise the degenerate mirror extensions.
func TestSplineInterpolatesSamples(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	for _, kind := range kinds {
		for _, size := range [][2]int{{37, 23}, {2, 3}, {1, 7}, {5, 1}, {1, 1}} {
			img := randomImage(rng, size[0], size[1])
			sp := NewSpline(img, kind)
			var worst float64
			for y := 0; y < img.Height; y++ {
				for x := 0; x < img.Width; x++ {
					v, _, _ := sp.ValueGrad(float64(x), float64(y))
					worst = math.Max(worst, math.Abs(sp.Value(float64(x), float64(y))-float64(img.At(x, y))))
					worst = math.Max(worst, math.Abs(v-float64(img.At(x, y))))
				}
			}
			// Tolerance: the float32 rounding of the coefficients (see
			// float32Bound) on a 0–255 scale, 3e-4 (bicubic) and 2e-3
			// (biquintic) gray levels; measured 2e-5 and 6e-5. A wrong
			// prefilter or boundary is off by gray levels.
			if tol := float32Bound(kind, 255); worst > tol {
				t.Errorf("%v %dx%d: max |spline - pixel| = %g, want < %.2g", kind, size[0], size[1], worst, tol)
			}
		}
	}
}

// prefilterGain returns the ℓ1 norm of the impulse response of the
// direct B-spline filter along one axis, which is its gain at the Nyquist
// frequency, 1/B(−1) for the sampled kernel B: 3 for (1, 4, 1)/6 and 7.5
// for (1, 26, 66, 26, 1)/120 (the impulse response alternates in sign,
// Unser 1999). A coefficient is at most its square times the largest
// sample.
func prefilterGain(kind Interpolation) float64 {
	if kind == Biquintic {
		return 120.0 / (66 - 2*26 + 2)
	}
	return 6.0 / (4 - 2)
}

// float32Bound is the largest difference the float32 storage of the
// coefficients can make to the interpolant of samples of at most peak
// (rounding analysis, ours): each coefficient is rounded to float32
// twice, after the row filter (at most g·peak) and at the end (at most
// g²·peak), a relative error of 2⁻²⁴ each; the column filter amplifies
// the first by up to g, and an evaluation sums its weights' magnitudes,
// at most 2 for the value and for either derivative.
func float32Bound(kind Interpolation, peak float64) float64 {
	g := prefilterGain(kind)
	return 2 * 2 * g * g * peak / (1 << 24)
}

// TestSplineReproducesPolynomials checks that a B-spline of degree n
// reproduces every polynomial x^i y^j with i, j ≤ n exactly (B-spline
// theory: approximation order n+1, Unser 1999), away from the mirror
// boundary whose effect decays like |z|^d with the distance d from it
// (here d ≥ 35 px, so |z|^d < 2e-13). The samples are stored as float32,
// so the tolerance is the float32 rounding of the samples (2⁻²⁴ relative)
// times a Lebesgue constant below 4 for the 2-D cardinal spline: 1e-6 of
// the largest sample.
func TestSplineReproducesPolynomials(t *testing.T) {
	const size = 90
	rng := rand.New(rand.NewPCG(2, 2))
	for _, kind := range kinds {
		n := degree(kind)
		var coef [6][6]float64
		for i := 0; i <= n; i++ {
			for j := 0; j <= n; j++ {
				coef[i][j] = rng.Float64()*2 - 1
			}
		}
		poly := func(x, y float64) float64 {
			X, Y := (x-size/2)/(size/2), (y-size/2)/(size/2)
			var v float64
			for i := 0; i <= n; i++ {
				for j := 0; j <= n; j++ {
					v += coef[i][j] * math.Pow(X, float64(i)) * math.Pow(Y, float64(j))
				}
			}
			return v
		}
		img := NewImage(size, size, 0)
		var peak float64
		for y := 0; y < size; y++ {
			for x := 0; x < size; x++ {
				v := poly(float64(x), float64(y))
				img.Set(x, y, float32(v))
				peak = math.Max(peak, math.Abs(v))
			}
		}
		sp := NewSpline(img, kind)
		var worst float64
		for range 400 {
			x, y := 35+20*rng.Float64(), 35+20*rng.Float64()
			worst = math.Max(worst, math.Abs(sp.Value(x, y)-poly(x, y)))
		}
		t.Logf("%v: tensor degree %d, max error %.2g of peak", kind, n, worst/peak)
		if worst > 1e-6*peak {
			t.Errorf("%v: degree-%d polynomial reproduced with error %.3g of peak, want < 1e-6", kind, n, worst/peak)
		}
	}
}

// TestSplineGradient checks ValueGrad against a central finite difference
// of Value (the derivative of the interpolant, so they must agree to the
// finite-difference error O(h²) plus rounding), and checks that the
// gradient of a sampled linear ramp is exact in the interior (linear
// reproduction, Unser 1999).
func TestSplineGradient(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 3))
	img := newWavePattern(rng, 16, 4, 20, 40).render(40, 40, nil)
	ramp := NewImage(90, 90, 0)
	for y := 0; y < 90; y++ {
		for x := 0; x < 90; x++ {
			ramp.Set(x, y, float32(3*x-2*y+7))
		}
	}
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		const h = 1e-5
		var worst float64
		for range 500 {
			x, y := 1+38*rng.Float64(), 1+38*rng.Float64()
			v, gx, gy := sp.ValueGrad(x, y)
			fx := (sp.Value(x+h, y) - sp.Value(x-h, y)) / (2 * h)
			fy := (sp.Value(x, y+h) - sp.Value(x, y-h)) / (2 * h)
			worst = math.Max(worst, math.Max(math.Abs(gx-fx), math.Abs(gy-fy)))
			if math.Abs(v-sp.Value(x, y)) > 1e-12 {
				t.Fatalf("%v: ValueGrad value %g != Value %g", kind, v, sp.Value(x, y))
			}
		}
		// Gradients here are up to ~40 gray/px; rounding of a difference
		// over 2h = 2e-5 px contributes ~1e-13·255/2e-5 ≈ 1e-6.
		if worst > 1e-5 {
			t.Errorf("%v: |gradient - finite difference| = %g, want < 1e-5", kind, worst)
		}

		rs := NewSpline(ramp, kind)
		worst = 0
		for range 200 {
			// 35 px from the mirror boundary, whose effect decays like
			// |z|^d (0.43^35 ≈ 2e-13 for the quintic).
			x, y := 35+20*rng.Float64(), 35+20*rng.Float64()
			_, gx, gy := rs.ValueGrad(x, y)
			worst = math.Max(worst, math.Max(math.Abs(gx-3), math.Abs(gy+2)))
		}
		if worst > 1e-9 {
			t.Errorf("%v: ramp 3x-2y gradient error %g, want < 1e-9", kind, worst)
		}
	}
}

// fft2 transforms a row-major n×n array in place with gonum's FFT, forward
// or (unnormalised) backward.
func fft2(data []complex128, n int, forward bool) {
	f := fourier.NewCmplxFFT(n)
	line := make([]complex128, n)
	apply := func() {
		if forward {
			f.Coefficients(line, line)
		} else {
			f.Sequence(line, line)
		}
	}
	for y := 0; y < n; y++ {
		copy(line, data[y*n:(y+1)*n])
		apply()
		copy(data[y*n:(y+1)*n], line)
	}
	for x := 0; x < n; x++ {
		for y := 0; y < n; y++ {
			line[y] = data[y*n+x]
		}
		apply()
		for y := 0; y < n; y++ {
			data[y*n+x] = line[y]
		}
	}
}

// TestSplineFourierShift checks subpixel interpolation against the Fourier
// shift theorem: a periodic image band-limited below a cut-off frequency is
// shifted by (dx, dy) exactly by multiplying its spectrum by
// exp(-2πi(fx·dx + fy·dy)) (computed with gonum's FFT). Evaluating the
// spline of the unshifted image at (x-dx, y-dy) must give the shifted image,
// up to the interpolation error of the kernel, which grows with frequency
// (B-spline theory: error ~ (f)^(n+1)). Tolerances are on the peak error in
// the interior relative to the image's gray range; the measured values are
// logged.
func TestSplineFourierShift(t *testing.T) {
	const n = 64
	const dx, dy = 0.37, -0.81
	cases := []struct {
		cutoff float64 // cycles/px
		tol    map[Interpolation]float64
	}{
		// Measured with this seed: 1.3e-4 and 1.7e-6 (periods ≥ 8 px),
		// 2.2e-3 and 1.7e-4 (periods ≥ 4 px).
		{0.125, map[Interpolation]float64{Bicubic: 4e-4, Biquintic: 1e-5}},
		{0.25, map[Interpolation]float64{Bicubic: 5e-3, Biquintic: 5e-4}},
	}
	rng := rand.New(rand.NewPCG(4, 4))
	f := fourier.NewCmplxFFT(n)
	for _, c := range cases {
		spec := make([]complex128, n*n)
		for i := range spec {
			spec[i] = complex(rng.NormFloat64(), 0)
		}
		fft2(spec, n, true)
		for ky := 0; ky < n; ky++ {
			for kx := 0; kx < n; kx++ {
				if math.Hypot(f.Freq(kx), f.Freq(ky)) > c.cutoff {
					spec[ky*n+kx] = 0
				}
			}
		}
		shifted := make([]complex128, n*n)
		for ky := 0; ky < n; ky++ {
			for kx := 0; kx < n; kx++ {
				phase := -2 * math.Pi * (f.Freq(kx)*dx + f.Freq(ky)*dy)
				shifted[ky*n+kx] = spec[ky*n+kx] * complex(math.Cos(phase), math.Sin(phase))
			}
		}
		fft2(spec, n, false)
		fft2(shifted, n, false)
		// Scale to a 0–255-like range.
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, v := range spec {
			lo, hi = math.Min(lo, real(v)), math.Max(hi, real(v))
		}
		scale := 200 / (hi - lo)
		img := NewImage(n, n, 8)
		for i, v := range spec {
			img.Pix[i] = float32(28 + scale*(real(v)-lo))
		}
		for _, kind := range kinds {
			sp := NewSpline(img, kind)
			var worst float64
			for y := 16; y < 48; y++ {
				for x := 16; x < 48; x++ {
					want := 28 + scale*(real(shifted[y*n+x])-lo)
					worst = math.Max(worst, math.Abs(sp.Value(float64(x)-dx, float64(y)-dy)-want))
				}
			}
			rel := worst / 200
			t.Logf("cut-off %.3g cycles/px, %v: peak error %.3g of range", c.cutoff, kind, rel)
			if rel > c.tol[kind] {
				t.Errorf("cut-off %.3g, %v: peak shift error %.3g of range, want < %.3g", c.cutoff, kind, rel, c.tol[kind])
			}
		}
	}
}

// TestSplineInside checks the documented domain of Inside on a 10×8 image
// (common practice, no source).
func TestSplineInside(t *testing.T) {
	sp := NewSpline(NewImage(10, 8, 8), Bicubic)
	cases := []struct {
		x, y, m float64
		want    bool
	}{
		{0, 0, 0, true}, {9, 7, 0, true}, {9.01, 7, 0, false}, {-0.01, 3, 0, false},
		{2, 2, 2, true}, {1.99, 2, 2, false}, {7, 5, 2, true}, {7.01, 5, 2, false},
		{math.NaN(), 3, 0, false},
	}
	for _, c := range cases {
		if got := sp.Inside(c.x, c.y, c.m); got != c.want {
			t.Errorf("Inside(%g, %g, %g) = %v, want %v", c.x, c.y, c.m, got, c.want)
		}
	}
	if sp.Width() != 10 || sp.Height() != 8 {
		t.Errorf("size %dx%d, want 10x8", sp.Width(), sp.Height())
	}
}

// TestInterpolationNames checks the round trip of the names used on the
// command line (common practice, no source).
func TestInterpolationNames(t *testing.T) {
	for _, k := range kinds {
		got, err := ParseInterpolation(k.String())
		if err != nil || got != k {
			t.Errorf("ParseInterpolation(%q) = %v, %v", k.String(), got, err)
		}
	}
	if got, err := ParseInterpolation("quintic"); err != nil || got != Biquintic {
		t.Errorf("ParseInterpolation(quintic) = %v, %v, want the short name accepted", got, err)
	}
	if _, err := ParseInterpolation("bilinear"); err == nil {
		t.Error("ParseInterpolation(bilinear) succeeded, want an error")
	}
}

func BenchmarkNewSpline(b *testing.B) {
	img := randomImage(rand.New(rand.NewPCG(5, 5)), 1024, 1024)
	for _, kind := range kinds {
		b.Run(kind.String(), func(b *testing.B) {
			for b.Loop() {
				NewSpline(img, kind)
			}
		})
	}
}

// benchSink keeps benchmarked results alive.
var benchSink float64

func BenchmarkValueGrad(b *testing.B) {
	img := randomImage(rand.New(rand.NewPCG(6, 6)), 256, 256)
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		b.Run(kind.String(), func(b *testing.B) {
			i := 0
			for b.Loop() {
				x := 10 + float64(i%200) + 0.37
				_, gx, gy := sp.ValueGrad(x, 100.61)
				benchSink += gx + gy
				i++
			}
		})
	}
}

// A spline reloaded with another image is that image's spline to the last
// bit (the coefficients, padding included, are all rewritten), for both
// kernels; a reload with an image of another size panics.
func TestSplineReload(t *testing.T) {
	a, b := testPattern(51).render(40, 30, nil), testPattern(52).render(40, 30, nil)
	for _, kind := range []Interpolation{Bicubic, Biquintic} {
		sp := NewSpline(a, kind)
		sp.Reload(b)
		want := NewSpline(b, kind)
		if !slices.Equal(sp.coef, want.coef) {
			t.Errorf("%v: reloaded coefficients differ from a new spline's", kind)
		}
	}
	defer func() {
		if recover() == nil {
			t.Errorf("Reload with a 40x31 image into a 40x30 spline did not panic")
		}
	}()
	NewSpline(a, Bicubic).Reload(testPattern(53).render(40, 31, nil))
}

// speckleImage returns a w×h speckle pattern at the given full scale
// (255 or 65535): Gaussian spots of radius 1.5–3 px, dark on bright,
// with Gaussian sensor noise of 1 % of full scale, rounded to whole gray
// levels and clipped to the range, as a camera gives them.
func speckleImage(rng *rand.Rand, w, h int, full float64) *Image {
	img := NewImage(w, h, 8)
	if full > 255 {
		img.Depth = 16
	}
	v := make([]float64, w*h)
	for range w * h / 12 {
		cx, cy, r := rng.Float64()*float64(w), rng.Float64()*float64(h), 1.5+1.5*rng.Float64()
		for y := max(0, int(cy-3*r)); y < min(h, int(cy+3*r)+1); y++ {
			for x := max(0, int(cx-3*r)); x < min(w, int(cx+3*r)+1); x++ {
				d2 := (float64(x)-cx)*(float64(x)-cx) + (float64(y)-cy)*(float64(y)-cy)
				v[y*w+x] += math.Exp(-d2 / (r * r))
			}
		}
	}
	for i := range v {
		g := full*(0.9-0.8*math.Min(v[i], 1)) + 0.01*full*rng.NormFloat64()
		img.Pix[i] = float32(math.Round(math.Max(0, math.Min(full, g))))
	}
	return img
}

// float64Interpolant is the interpolant a Spline stored in float64 gave:
// the same recursive filters (filterLines) over a float64 plane, rounded
// nowhere, evaluated from the B-spline weights. It is the reference the
// float32 storage is measured against.
type float64Interpolant struct {
	kind Interpolation
	w, h int
	coef []float64 // w×h, unpadded
}

func newFloat64Interpolant(img *Image, kind Interpolation) *float64Interpolant {
	w, h := img.Width, img.Height
	c := make([]float64, w*h)
	for i, v := range img.Pix {
		c[i] = float64(v)
	}
	sum := make([]float64, max(w, h))
	for _, z := range splinePoles(kind) {
		gain := (1 - z) * (1 - 1/z)
		for i := range c {
			c[i] *= gain * gain
		}
		for y := 0; y < h; y++ {
			filterLines(c, y*w, 1, w, 1, z, sum)
		}
		filterLines(c, 0, w, h, w, z, sum)
	}
	return &float64Interpolant{kind: kind, w: w, h: h, coef: c}
}

// valueGrad returns the interpolant and its gradient at (x, y), which
// must lie at least 3 px inside the image.
func (f *float64Interpolant) valueGrad(x, y float64) (v, gx, gy float64) {
	ix, iy := int(math.Floor(x)), int(math.Floor(y))
	tx, ty := x-float64(ix), y-float64(iy)
	var wx, wy, dx, dy []float64
	first := -1
	if f.kind == Biquintic {
		first = -2
		a, b, c, d, e, g := quinticWeights(tx)
		wx = []float64{a, b, c, d, e, g}
		a, b, c, d, e, g = quinticWeights(ty)
		wy = []float64{a, b, c, d, e, g}
		a, b, c, d, e, g = quinticDerivs(tx)
		dx = []float64{a, b, c, d, e, g}
		a, b, c, d, e, g = quinticDerivs(ty)
		dy = []float64{a, b, c, d, e, g}
	} else {
		a, b, c, d := cubicWeights(tx)
		wx = []float64{a, b, c, d}
		a, b, c, d = cubicWeights(ty)
		wy = []float64{a, b, c, d}
		a, b, c, d = cubicDerivs(tx)
		dx = []float64{a, b, c, d}
		a, b, c, d = cubicDerivs(ty)
		dy = []float64{a, b, c, d}
	}
	for j := range wy {
		for i := range wx {
			c := f.coef[(iy+first+j)*f.w+ix+first+i]
			v += wy[j] * wx[i] * c
			gx += wy[j] * dx[i] * c
			gy += dy[j] * wx[i] * c
		}
	}
	return v, gx, gy
}

// The coefficients are stored as float32 (half the memory of float64 on
// 20 MP frames); the interpolant and its gradient, accumulated in
// float64, stay within float32Bound of the float64-coefficient
// interpolant the solver used before, on a noisy speckle image at 8-bit
// and at full 16-bit range, at random positions, at pixel centres
// (centres) and through the bulk evaluation (values). The differences
// are logged relative to full scale, with those of the float64
// coefficients rounded once (the least float32 storage can do).
func TestSplineFloat32Coefficients(t *testing.T) {
	const n = 160
	for _, full := range []float64{255, 65535} {
		img := speckleImage(rand.New(rand.NewPCG(7, uint64(full))), n, n, full)
		for _, kind := range kinds {
			sp := NewSpline(img, kind)
			ref := newFloat64Interpolant(img, kind)
			once := &Spline{kind: kind, width: n, height: n, stride: n + 2*splinePad,
				coef: make([]float32, (n+2*splinePad)*(n+2*splinePad))}
			for y := 0; y < n; y++ {
				for x := 0; x < n; x++ {
					once.coef[(y+splinePad)*once.stride+x+splinePad] = float32(ref.coef[y*n+x])
				}
			}
			once.fillPadding()
			var dv, dg, dvOnce, dgOnce diffStat
			rng := rand.New(rand.NewPCG(8, 8))
			xs, ys, out := make([]float64, 1), make([]float64, 1), make([]float64, 1)
			for range 20000 {
				x, y := 4+(n-9)*rng.Float64(), 4+(n-9)*rng.Float64()
				v, gx, gy := sp.ValueGrad(x, y)
				rv, rgx, rgy := ref.valueGrad(x, y)
				ov, ogx, ogy := once.ValueGrad(x, y)
				xs[0], ys[0] = x, y
				sp.values(xs, ys, out)
				dv.add(v - rv)
				dv.add(out[0] - rv)
				dg.add(gx - rgx)
				dg.add(gy - rgy)
				dvOnce.add(ov - rv)
				dgOnce.add(ogx - rgx)
				dgOnce.add(ogy - rgy)
			}
			const side = 21
			cv, cgx, cgy := make([]float64, side*side), make([]float64, side*side), make([]float64, side*side)
			colV, colD := make([]float64, centreScratch(side)), make([]float64, centreScratch(side))
			for y0 := 4; y0+side <= n-4; y0 += side {
				for x0 := 4; x0+side <= n-4; x0 += side {
					sp.centres(x0, y0, side, 0, cv, cgx, cgy, colV, colD)
					for k := range cv {
						rv, rgx, rgy := ref.valueGrad(float64(x0+k%side), float64(y0+k/side))
						dv.add(cv[k] - rv)
						dg.add(cgx[k] - rgx)
						dg.add(cgy[k] - rgy)
					}
				}
			}
			tol := float32Bound(kind, full)
			t.Logf("%v, full scale %.0f: value max %.2g rms %.2g, gradient max %.2g rms %.2g of full scale (bound %.2g); coefficients rounded once: value max %.2g rms %.2g, gradient max %.2g rms %.2g",
				kind, full, dv.max/full, dv.rms()/full, dg.max/full, dg.rms()/full, tol/full,
				dvOnce.max/full, dvOnce.rms()/full, dgOnce.max/full, dgOnce.rms()/full)
			if dv.max > tol || dg.max > tol {
				t.Errorf("%v, full scale %.0f: float32 coefficients move the value by up to %.3g and the gradient by %.3g gray levels, want ≤ %.3g",
					kind, full, dv.max, dg.max, tol)
			}
		}
	}
}

// diffStat accumulates the largest magnitude and the mean square of
// differences.
type diffStat struct {
	max, sq float64
	n       int
}

func (s *diffStat) add(d float64) {
	s.max = math.Max(s.max, math.Abs(d))
	s.sq += d * d
	s.n++
}

func (s *diffStat) rms() float64 { return math.Sqrt(s.sq / float64(s.n)) }
