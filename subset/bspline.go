package subset

import (
	"fmt"
	"math"
	"runtime"
	"sync"
)

// Interpolation selects the B-spline degree used to evaluate an image
// between pixel centres.
type Interpolation int

const (
	// Bicubic is the tensor-product cubic B-spline interpolant (4×4 taps).
	Bicubic Interpolation = iota
	// Biquintic is the tensor-product quintic B-spline interpolant (6×6
	// taps). It costs about twice as much as Bicubic and has a markedly
	// smaller interpolation bias on fine speckle.
	Biquintic
)

// String returns "bicubic" or "biquintic".
func (k Interpolation) String() string {
	switch k {
	case Bicubic:
		return "bicubic"
	case Biquintic:
		return "biquintic"
	}
	return fmt.Sprintf("Interpolation(%d)", int(k))
}

// ParseInterpolation is the inverse of Interpolation.String.
func ParseInterpolation(s string) (Interpolation, error) {
	switch s {
	case "bicubic", "cubic":
		return Bicubic, nil
	case "biquintic", "quintic":
		return Biquintic, nil
	}
	return 0, fmt.Errorf("subset: unknown interpolation %q (want bicubic or biquintic; cubic and quintic for short)", s)
}

// splinePad is the number of mirrored coefficients stored around the image
// on every side. Positions are clamped to [-1, W] × [-1, H] before
// evaluation, which needs at most 4 extra coefficients for the quintic
// kernel (taps floor(x)-2 … floor(x)+3).
const splinePad = 4

// Spline is the B-spline interpolant of an Image: the continuous function
// that passes through every pixel value and is a piecewise polynomial of
// the chosen degree between pixel centres (Unser 1999, "Splines: a perfect
// fit for signal and image processing", IEEE Signal Processing Magazine
// 16(6):22–38).
//
// The coefficients are computed once by NewSpline with the recursive
// causal/anticausal prefilter in float64, rounded to float32 after the
// row pass and at the end, and padded with mirrored coefficients so that
// evaluation needs no boundary tests; every evaluation widens them and
// accumulates in float64. float32 halves the two planes a tracker holds
// (160 MB instead of 320 MB at 20 MP). The prefilter's gain is at most 3
// (cubic) or 7.5 (quintic) per axis, at the Nyquist frequency, so a
// coefficient is at most 56 times full scale and its rounding at most
// 4e-6 of full scale. Measured on a noisy speckle image, 8-bit or 16-bit,
// the interpolant and its gradient differ from those of float64
// coefficients by at most 9e-8 of full scale, RMS 8e-9, for either
// kernel (TestSplineFloat32Coefficients): 2e-5 gray levels at 8 bits,
// against 0.29 of quantisation noise. The sub-pixel translation bias
// curve (dic's TestSubpixelTranslationBias: up to 0.0021 px bicubic,
// 0.0006 px biquintic) moves by at most 2.3e-9 px at any shift.
//
// A Spline is read-only after construction and safe for concurrent use.
type Spline struct {
	kind          Interpolation
	width, height int
	stride        int       // width + 2*splinePad
	coef          []float32 // (height+2*splinePad) rows of stride coefficients
}

// NewSpline computes the B-spline coefficients of img for the given kind,
// with mirror (whole-sample symmetric) boundary conditions: the image is
// treated as if reflected about its first and last pixel centres.
//
// NewSpline panics if the image is empty, its Pix slice does not match its
// size, or kind is unknown.
func NewSpline(img *Image, kind Interpolation) *Spline {
	if img.Width < 1 || img.Height < 1 {
		panic(fmt.Sprintf("subset: NewSpline of empty %dx%d image", img.Width, img.Height))
	}
	w, h := img.Width, img.Height
	sp := &Spline{kind: kind, width: w, height: h, stride: w + 2*splinePad}
	sp.coef = make([]float32, sp.stride*(h+2*splinePad))
	// Huge pages for the planes of large images: asked before the first
	// write, so that fresh memory faults in as huge pages, and collapsed
	// after it, for memory the allocator reused.
	adviseHugePages(sp.coef, false)
	sp.fit(img)
	adviseHugePages(sp.coef, true)
	return sp
}

// Reload makes sp the interpolant of img, an image of sp's size, in
// sp's own storage: a tracker reloads one Spline frame after frame rather
// than leaving a new one of 4 bytes per pixel to the garbage collector
// each frame. Readers of sp must be done with it. Reload panics if img's
// size differs from sp's or its Pix slice does not match its size.
func (sp *Spline) Reload(img *Image) {
	if img.Width != sp.width || img.Height != sp.height {
		panic(fmt.Sprintf("subset: Reload of a %dx%d spline with a %dx%d image", sp.width, sp.height, img.Width, img.Height))
	}
	sp.fit(img)
}

// fit computes the coefficients of img, of sp's size, into sp.coef; every
// coefficient, padding included, is written.
func (sp *Spline) fit(img *Image) {
	if len(img.Pix) != img.Width*img.Height {
		panic(fmt.Sprintf("subset: spline of a %dx%d image of %d pixels", img.Width, img.Height, len(img.Pix)))
	}
	poles := splinePoles(sp.kind)
	w, h := sp.width, sp.height

	// The filters along an axis have a combined gain Π(1-z)(1-1/z), applied
	// once up front for both axes; an axis of one pixel is not filtered.
	axisGain := 1.0
	for _, z := range poles {
		axisGain *= (1 - z) * (1 - 1/z)
	}
	gain := 1.0
	if w > 1 {
		gain *= axisGain
	}
	if h > 1 {
		gain *= axisGain
	}
	// The inner loops run across independent lines rather than along one
	// recursion, whose every step waits on the previous one: columns are
	// filtered all at once, each step one contiguous row, and rows in
	// bundles, read transposed into scratch (with the gain applied) so that
	// their steps are contiguous too.
	// The vector kernels of the cubic spline's one pole take four rows at a
	// time, transposed and filtered in one (rowsVector), the same
	// operations in the same order.
	origin := splinePad*sp.stride + splinePad
	rowsFused := useVector && len(poles) == 1 && w > 1
	bundles := (h + rowBundle - 1) / rowBundle
	inParallel(bundles, w*h, func(lo, hi int) {
		bundle := make([]float64, rowBundle*w)
		sum := make([]float64, rowBundle)
		for b := lo * rowBundle; b < min(hi*rowBundle, h); b += rowBundle {
			y, m := b, min(rowBundle, h-b)
			if rowsFused {
				// Four rows at a time by the vector kernels, the rest
				// (fewer than four) below.
				for ; m >= 4; y, m = y+4, m-4 {
					sp.rowsVector(img, y, gain, poles[0], bundle[:4*w], sum[:4])
				}
				if m == 0 {
					continue
				}
			}
			t := bundle[:m*w]
			for l := 0; l < m; l++ {
				for x, v := range img.Row(y + l) {
					t[x*m+l] = gain * float64(v)
				}
			}
			for _, z := range poles {
				filterLines(t, 0, m, w, m, z, sum)
			}
			for l := 0; l < m; l++ {
				row := sp.coef[origin+(y+l)*sp.stride:][:w]
				for x := range row {
					row[x] = float32(t[x*m+l])
				}
			}
		}
	})
	// Columns, in strips of up to colStrip columns read into float64
	// scratch, filtered there and rounded once more on the way back; every
	// column's arithmetic is the same whatever the split. The vector
	// kernels of the cubic spline's one pole read a strip into the causal
	// recursion and write it back from the anticausal one (splineColumnsInVector,
	// splineColumnsOutVector), the same operations in the same order.
	fused := useVector && len(poles) == 1 && h > 1
	strips := (w + colStrip - 1) / colStrip
	inParallel(strips, w*h, func(lo, hi int) {
		strip := make([]float64, h*colStrip)
		sum := make([]float64, colStrip)
		for x := lo * colStrip; x < min(hi*colStrip, w); x += colStrip {
			m := min(colStrip, w-x)
			t := strip[:h*m]
			col := sp.coef[origin+x:]
			if fused {
				z := poles[0]
				causalStart(h, z, sum[:m], func(k int) []float32 { return col[k*sp.stride:][:m] })
				copy(t, sum[:m])
				splineColumnsInVector(col, sp.stride, t, h, m, z)
				anticausalStart(t[(h-1)*m:], t[(h-2)*m:(h-1)*m], z)
				splineColumnsOutVector(t, h, m, z, col, sp.stride)
				continue
			}
			for y := 0; y < h; y++ {
				for l, c := range col[y*sp.stride:][:m] {
					t[y*m+l] = float64(c)
				}
			}
			for _, z := range poles {
				filterLines(t, 0, m, h, m, z, sum)
			}
			for y := 0; y < h; y++ {
				row := col[y*sp.stride:][:m]
				for l := range row {
					row[l] = float32(t[y*m+l])
				}
			}
		}
	})
	sp.fillPadding()
}

// rowsVector filters the four rows y … y+3 of img, the gain applied, into
// their coefficients (rounded to float32) by the vector kernels, as the
// row pass's Go loops filter a bundle, bit for bit: t is scratch of 4·w
// values and sum of 4.
func (sp *Spline) rowsVector(img *Image, y int, gain, z float64, t, sum []float64) {
	w := sp.width
	rows := img.Pix[y*w : (y+4)*w]
	var at [4]float64
	causalStart(w, z, sum, func(x int) []float64 {
		for l := range at {
			at[l] = gain * float64(rows[l*w+x])
		}
		return at[:]
	})
	copy(t, sum)
	splineRowsInVector(rows, w, t, w, gain, z)
	anticausalStart(t[4*(w-1):4*w], t[4*(w-2):4*(w-1)], z)
	splineRowsOutVector(t, w, z, sp.coef[(y+splinePad)*sp.stride+splinePad:], sp.stride)
}

// splinePoles returns the poles of the direct B-spline filter of the given
// degree, the roots of modulus below one of the z-transform of the sampled
// B-spline (Unser 1999, Table 1). For the quintic spline the sampled kernel
// is (1, 26, 66, 26, 1)/120; with w = z + 1/z its roots satisfy
// w² + 26w + 64 = 0.
func splinePoles(kind Interpolation) []float64 {
	switch kind {
	case Bicubic:
		return []float64{math.Sqrt(3) - 2}
	case Biquintic:
		pole := func(w float64) float64 { return (w + math.Sqrt(w*w-4)) / 2 }
		return []float64{pole(-13 + math.Sqrt(105)), pole(-13 - math.Sqrt(105))}
	}
	panic(fmt.Sprintf("subset: unknown interpolation %d", int(kind)))
}

// inParallel calls fn on contiguous ranges [lo, hi) covering 0…n−1, on
// up to GOMAXPROCS goroutines when the work (of about cost values) is
// large enough to be worth them, else once on the whole range.
func inParallel(n, cost int, fn func(lo, hi int)) {
	const minPerWorker = 1 << 15 // values: below this a goroutine costs more than it saves
	workers := min(runtime.GOMAXPROCS(0), n, max(cost/minPerWorker, 1))
	if workers <= 1 {
		fn(0, n)
		return
	}
	var wg sync.WaitGroup
	for k := range workers {
		lo, hi := k*n/workers, (k+1)*n/workers
		wg.Add(1)
		go func() {
			defer wg.Done()
			fn(lo, hi)
		}()
	}
	wg.Wait()
}

// rowBundle is the number of rows filtered together, and colStrip the
// number of columns.
const (
	rowBundle = 16
	colStrip  = 64
)

// filterLines applies one causal and one anticausal first-order recursive
// filter with pole z, in place, to m contiguous lines of n values: value k
// of line l is c[first + k·step + l]. The boundary conditions are those of
// the whole-sample mirror extension (Unser 1999, Box 2). sum is scratch of
// at least m values. The recursions run in the vector kernels when there
// are some (useVector), with the same values bit for bit.
func filterLines(c []float64, first, step, n, m int, z float64, sum []float64) {
	if n == 1 {
		return // constant lines: the coefficients equal the values
	}
	line := func(k int) []float64 { return c[first+k*step : first+k*step+m] }
	sum = sum[:m]
	causalStart(n, z, sum, line)
	copy(line(0), sum)
	lines := c[first : first+(n-1)*step+m]
	if useVector {
		splineCausalVector(lines, step, n, m, z)
	} else {
		splineCausalGo(lines, step, n, m, z)
	}
	anticausalStart(line(n-1), line(n-2), z)
	if useVector {
		splineAnticausalVector(lines, step, n, m, z)
	} else {
		splineAnticausalGo(lines, step, n, m, z)
	}
}

// causalStart sets sum to the causal initial values of lines of n values
// (n > 1; line(k) holds value k of each line, len(sum) of them):
// c⁺[0] = Σ_{k≥0} z^k s[-k], summed over the mirror extension until z^k is
// below float64 resolution (Unser 1999, Box 2).
func causalStart[E float32 | float64](n int, z float64, sum []float64, line func(k int) []E) {
	horizon := int(math.Ceil(math.Log(1e-17) / math.Log(math.Abs(z))))
	clear(sum)
	zk := 1.0
	for k := 0; k < horizon; k++ {
		src := line(mirrorIndex(k, n))
		for l, v := range src[:len(sum)] {
			sum[l] += zk * float64(v)
		}
		zk *= z
	}
}

// anticausalStart sets the last line of the causal output, last, to the
// anticausal initial values for the mirror extension, prev being the line
// before it.
func anticausalStart(last, prev []float64, z float64) {
	prev = prev[:len(last)]
	g := z / (z*z - 1)
	for l := range last {
		last[l] = g * (last[l] + z*prev[l])
	}
}

// splineCausalGo runs the causal recursion c[k] += z·c[k−1], k = 1 … n−1,
// over the m lines whose value k is c[k·step + l]: the reference of the
// vector kernel.
func splineCausalGo(c []float64, step, n, m int, z float64) {
	for k := 1; k < n; k++ {
		dst, src := c[k*step:k*step+m], c[(k-1)*step:(k-1)*step+m]
		src = src[:len(dst)]
		for l := range dst {
			dst[l] += z * src[l]
		}
	}
}

// splineAnticausalGo runs the anticausal recursion c[k] = z·(c[k+1] − c[k]),
// k = n−2 … 0, over the same lines: the reference of the vector kernel.
func splineAnticausalGo(c []float64, step, n, m int, z float64) {
	for k := n - 2; k >= 0; k-- {
		dst, src := c[k*step:k*step+m], c[(k+1)*step:(k+1)*step+m]
		src = src[:len(dst)]
		for l := range dst {
			dst[l] = z * (src[l] - dst[l])
		}
	}
}

// mirrorIndex maps any integer k onto 0…n-1 by whole-sample symmetric
// reflection (period 2n-2).
func mirrorIndex(k, n int) int {
	if n == 1 {
		return 0
	}
	period := 2*n - 2
	k %= period
	if k < 0 {
		k += period
	}
	if k >= n {
		k = period - k
	}
	return k
}

// fillPadding copies mirrored coefficients into the border of width
// splinePad. The coefficients of a mirror-extended image are themselves
// mirror-extended because the prefilter is symmetric.
func (sp *Spline) fillPadding() {
	w, h, s := sp.width, sp.height, sp.stride
	for y := 0; y < h; y++ {
		row := sp.coef[(y+splinePad)*s : (y+splinePad+1)*s]
		for x := -splinePad; x < 0; x++ {
			row[x+splinePad] = row[mirrorIndex(x, w)+splinePad]
		}
		for x := w; x < w+splinePad; x++ {
			row[x+splinePad] = row[mirrorIndex(x, w)+splinePad]
		}
	}
	for y := -splinePad; y < h+splinePad; y++ {
		if y >= 0 && y < h {
			continue
		}
		src := (mirrorIndex(y, h) + splinePad) * s
		copy(sp.coef[(y+splinePad)*s:(y+splinePad+1)*s], sp.coef[src:src+s])
	}
}

// Width returns the width of the interpolated image in pixels.
func (sp *Spline) Width() int { return sp.width }

// Height returns the height of the interpolated image in pixels.
func (sp *Spline) Height() int { return sp.height }

// Kind returns the B-spline degree of the interpolant.
func (sp *Spline) Kind() Interpolation { return sp.kind }

// Inside reports whether (x, y) lies at least margin pixels inside the
// rectangle spanned by the outer pixel centres, [0, W-1] × [0, H-1].
// NaN positions are never inside.
func (sp *Spline) Inside(x, y, margin float64) bool {
	return x >= margin && y >= margin &&
		x <= float64(sp.width-1)-margin && y <= float64(sp.height-1)-margin
}

// Value returns the interpolated gray level at (x, y). At integer positions
// it returns the pixel value (to rounding). Positions outside the image see
// the mirror-extended image up to one pixel beyond the outer pixel centres
// and are clamped farther out. Value does not allocate.
func (sp *Spline) Value(x, y float64) float64 {
	ix, tx := split(x, sp.width)
	iy, ty := split(y, sp.height)
	s := sp.stride
	if sp.kind == Biquintic {
		x0, x1, x2, x3, x4, x5 := quinticWeights(tx)
		y0, y1, y2, y3, y4, y5 := quinticWeights(ty)
		base := (iy+splinePad-2)*s + ix + splinePad - 2
		row := func(j int) float64 {
			r := sp.coef[base+j*s : base+j*s+6 : base+j*s+6]
			return x0*float64(r[0]) + x1*float64(r[1]) + x2*float64(r[2]) + x3*float64(r[3]) + x4*float64(r[4]) + x5*float64(r[5])
		}
		return y0*row(0) + y1*row(1) + y2*row(2) + y3*row(3) + y4*row(4) + y5*row(5)
	}
	x0, x1, x2, x3 := cubicWeights(tx)
	y0, y1, y2, y3 := cubicWeights(ty)
	base := (iy+splinePad-1)*s + ix + splinePad - 1
	row := func(j int) float64 {
		r := sp.coef[base+j*s : base+j*s+4 : base+j*s+4]
		return x0*float64(r[0]) + x1*float64(r[1]) + x2*float64(r[2]) + x3*float64(r[3])
	}
	return y0*row(0) + y1*row(1) + y2*row(2) + y3*row(3)
}

// ValueGrad returns the interpolated gray level at (x, y) and its partial
// derivatives ∂/∂x and ∂/∂y. The derivatives are those of the interpolant
// itself (derivative of the B-spline kernel), so they are consistent with
// Value: a finite difference of Value converges to them. ValueGrad does
// not allocate.
func (sp *Spline) ValueGrad(x, y float64) (v, gx, gy float64) {
	ix, tx := split(x, sp.width)
	iy, ty := split(y, sp.height)
	s := sp.stride
	if sp.kind == Biquintic {
		var wx, wy, dx, dy [6]float64
		wx[0], wx[1], wx[2], wx[3], wx[4], wx[5] = quinticWeights(tx)
		wy[0], wy[1], wy[2], wy[3], wy[4], wy[5] = quinticWeights(ty)
		dx[0], dx[1], dx[2], dx[3], dx[4], dx[5] = quinticDerivs(tx)
		dy[0], dy[1], dy[2], dy[3], dy[4], dy[5] = quinticDerivs(ty)
		base := (iy+splinePad-2)*s + ix + splinePad - 2
		for j := 0; j < 6; j++ {
			q := sp.coef[base+j*s : base+j*s+6 : base+j*s+6]
			r := [6]float64{float64(q[0]), float64(q[1]), float64(q[2]), float64(q[3]), float64(q[4]), float64(q[5])}
			rv := wx[0]*r[0] + wx[1]*r[1] + wx[2]*r[2] + wx[3]*r[3] + wx[4]*r[4] + wx[5]*r[5]
			rd := dx[0]*r[0] + dx[1]*r[1] + dx[2]*r[2] + dx[3]*r[3] + dx[4]*r[4] + dx[5]*r[5]
			v += wy[j] * rv
			gx += wy[j] * rd
			gy += dy[j] * rv
		}
		return v, gx, gy
	}
	x0, x1, x2, x3 := cubicWeights(tx)
	y0, y1, y2, y3 := cubicWeights(ty)
	dx0, dx1, dx2, dx3 := cubicDerivs(tx)
	dy0, dy1, dy2, dy3 := cubicDerivs(ty)
	base := (iy+splinePad-1)*s + ix + splinePad - 1
	row := func(j int) (float64, float64) {
		q := sp.coef[base+j*s : base+j*s+4 : base+j*s+4]
		r0, r1, r2, r3 := float64(q[0]), float64(q[1]), float64(q[2]), float64(q[3])
		return x0*r0 + x1*r1 + x2*r2 + x3*r3, dx0*r0 + dx1*r1 + dx2*r2 + dx3*r3
	}
	r0, d0 := row(0)
	r1, d1 := row(1)
	r2, d2 := row(2)
	r3, d3 := row(3)
	v = y0*r0 + y1*r1 + y2*r2 + y3*r3
	gx = y0*d0 + y1*d1 + y2*d2 + y3*d3
	gy = dy0*r0 + dy1*r1 + dy2*r2 + dy3*r3
	return v, gx, gy
}

// split clamps a coordinate to [-1, n] (NaN goes to -1) and returns its
// integer part and fraction in [0, 1).
func split(x float64, n int) (int, float64) {
	if !(x >= -1) {
		x = -1
	}
	if !(x <= float64(n)) {
		x = float64(n)
	}
	f := math.Floor(x)
	return int(f), x - f
}

// cubicWeights returns the cubic B-spline weights of taps i-1 … i+2 for a
// position i+t, t in [0, 1): β³ at t+1, t, t-1, t-2, with
// β³(x) = [(2-|x|)³₊ - 4(1-|x|)³₊]/6.
func cubicWeights(t float64) (w0, w1, w2, w3 float64) {
	const sixth = 1.0 / 6
	s := 1 - t
	t3, s3 := t*t*t, s*s*s
	return s3 * sixth, ((1+s)*(1+s)*(1+s) - 4*s3) * sixth, ((1+t)*(1+t)*(1+t) - 4*t3) * sixth, t3 * sixth
}

// cubicDerivs returns the derivatives of cubicWeights with respect to t.
func cubicDerivs(t float64) (d0, d1, d2, d3 float64) {
	s := 1 - t
	return -0.5 * s * s, -0.5 * ((1+s)*(1+s) - 4*s*s), 0.5 * ((1+t)*(1+t) - 4*t*t), 0.5 * t * t
}

// quinticWeights returns the quintic B-spline weights of taps i-2 … i+3
// for a position i+t, t in [0, 1), from the truncated-power form
// β⁵(x) = [(3-|x|)⁵₊ - 6(2-|x|)⁵₊ + 15(1-|x|)⁵₊]/120.
func quinticWeights(t float64) (w0, w1, w2, w3, w4, w5 float64) {
	const k = 1.0 / 120
	s := 1 - t
	s5, s15, s25 := pow5(s), pow5(1+s), pow5(2+s)
	t5, t15, t25 := pow5(t), pow5(1+t), pow5(2+t)
	return s5 * k, (s15 - 6*s5) * k, (s25 - 6*s15 + 15*s5) * k,
		(t25 - 6*t15 + 15*t5) * k, (t15 - 6*t5) * k, t5 * k
}

// quinticDerivs returns the derivatives of quinticWeights with respect to t.
func quinticDerivs(t float64) (d0, d1, d2, d3, d4, d5 float64) {
	const k = 1.0 / 24
	s := 1 - t
	s4, s14, s24 := pow4(s), pow4(1+s), pow4(2+s)
	t4, t14, t24 := pow4(t), pow4(1+t), pow4(2+t)
	return -s4 * k, -(s14 - 6*s4) * k, -(s24 - 6*s14 + 15*s4) * k,
		(t24 - 6*t14 + 15*t4) * k, (t14 - 6*t4) * k, t4 * k
}

func pow4(a float64) float64 { a2 := a * a; return a2 * a2 }
func pow5(a float64) float64 { a2 := a * a; return a2 * a2 * a }
