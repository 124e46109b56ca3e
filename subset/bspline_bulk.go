package subset

// Bulk evaluation of the interpolant for the solver. Value and ValueGrad
// serve any position one at a time; the solver instead evaluates hundreds
// of positions per iteration, all known to lie inside the image, and the
// gradient only at pixel centres. The routines here exploit both facts:
// no clamping, no kernel switch per position and, at pixel centres, the
// fixed weights of the kernel at integer offsets. They compute the same
// interpolant as Value and ValueGrad, to rounding.

// quinticCentreTaps holds the quintic B-spline kernel and its derivative
// sampled at the integer offsets -2 … 2: (1, 26, 66, 26, 1)/120 and
// (-1, -10, 0, 10, 1)/24 (Unser 1999; they are quinticWeights and
// quinticDerivs at t = 0, without the zero last tap). The cubic ones,
// (1, 4, 1)/6 and (-1, 0, 1)/2, are written out in cubicCentres.
var quinticCentreTaps = struct{ w, d []float64 }{
	w: []float64{1.0 / 120, 26.0 / 120, 66.0 / 120, 26.0 / 120, 1.0 / 120},
	d: []float64{-1.0 / 24, -10.0 / 24, 0, 10.0 / 24, 1.0 / 24},
}

// centreScratch returns the length of each of the two scratch slices that
// centres needs for a window of the given side.
func centreScratch(side int) int { return side + 4 }

// centres sets v, gx and gy (row-major, side×side) to the interpolated
// value less level, and the gradient, at the pixel centres (x0+i, y0+j),
// 0 ≤ i, j < side, which must lie inside the image: the value rounded,
// then level taken off and rounded again, as a caller subtracting it
// after would have it (with level 0 the value itself). At a pixel centre
// the tensor-product kernel reduces to a fixed separable stencil: the
// coefficients are first combined along y (kernel and derivative), then
// along x. colV and colD are scratch of at least centreScratch(side)
// values.
func (sp *Spline) centres(x0, y0, side int, level float64, v, gx, gy, colV, colD []float64) {
	if sp.kind == Bicubic && useVector {
		sp.cubicCentresVector(x0, y0, side, level, v, gx, gy)
		return
	}
	if sp.kind == Bicubic {
		sp.cubicCentres(x0, y0, side, level, v, gx, gy)
		return
	}
	w, d := quinticCentreTaps.w, quinticCentreTaps.d
	h := len(w) / 2
	s := sp.stride
	colV, colD = colV[:side+2*h], colD[:side+2*h]
	v, gx, gy = v[:side*side], gx[:side*side], gy[:side*side]
	for j := 0; j < side; j++ {
		// Columns x0-h … x0+side-1+h of rows y0+j-h … y0+j+h, smoothed
		// and differentiated along y.
		top := (y0+j-h+splinePad)*s + x0 - h + splinePad
		for i := range colV {
			var sv, sd float64
			for t, wt := range w {
				c := float64(sp.coef[top+t*s+i])
				sv += wt * c
				sd += d[t] * c
			}
			colV[i], colD[i] = sv, sd
		}
		row := j * side
		for i := 0; i < side; i++ {
			cv, cd := colV[i:i+len(w)], colD[i:i+len(w)]
			var vv, vx, vy float64
			for t, wt := range w {
				vv += wt * cv[t]
				vx += d[t] * cv[t]
				vy += wt * cd[t]
			}
			v[row+i], gx[row+i], gy[row+i] = vv-level, vx, vy
		}
	}
}

// cubicCentres is centres for the cubic kernel, with the 3-tap stencils
// written out and the column sums kept in registers as the row is swept.
func (sp *Spline) cubicCentres(x0, y0, side int, level float64, v, gx, gy []float64) {
	const sixth, twoThirds = 1.0 / 6, 4.0 / 6
	s := sp.stride
	for j := 0; j < side; j++ {
		top := (y0+j-1+splinePad)*s + x0 - 1 + splinePad
		a := sp.coef[top : top+side+2]
		b := sp.coef[top+s : top+s+side+2]
		c := sp.coef[top+2*s : top+2*s+side+2]
		b, c = b[:len(a)], c[:len(a)]
		vr, xr, yr := v[j*side:(j+1)*side], gx[j*side:(j+1)*side], gy[j*side:(j+1)*side]
		xr, yr = xr[:len(vr)], yr[:len(vr)]
		a, b, c = a[:len(vr)+2], b[:len(vr)+2], c[:len(vr)+2]
		// Column i: kernel sum cv and derivative cd along y.
		col := func(i int) (cv, cd float64) {
			ai, bi, ci := float64(a[i]), float64(b[i]), float64(c[i])
			return sixth*(ai+ci) + twoThirds*bi, 0.5 * (ci - ai)
		}
		cv0, cd0 := col(0)
		cv1, cd1 := col(1)
		for i := range vr {
			cv2, cd2 := col(i + 2)
			vr[i] = float64(sixth*(cv0+cv2)+twoThirds*cv1) - level
			xr[i] = 0.5 * (cv2 - cv0)
			yr[i] = sixth*(cd0+cd2) + twoThirds*cd1
			cv0, cv1, cd0, cd1 = cv1, cv2, cd1, cd2
		}
	}
}

// values sets out[k] to the interpolated value at (xs[k], ys[k]) for every
// k. Every position must lie in [0, W-1] × [0, H-1] (NaN excluded), which
// the caller has checked: values neither clamps nor mirrors, and relies on
// truncation toward zero being the floor of a non-negative number.
func (sp *Spline) values(xs, ys, out []float64) {
	if sp.kind == Biquintic {
		sp.quinticValues(xs, ys, out)
		return
	}
	sp.cubicValues(xs, ys, out)
}

// cubicValues is values for the cubic kernel: by the vector kernel when
// there is one (useVector), else by cubicValuesGo.
func (sp *Spline) cubicValues(xs, ys, out []float64) {
	if useVector {
		sp.cubicValuesVector(xs, ys, out)
		return
	}
	sp.cubicValuesGo(xs, ys, out)
}

// cubicValuesGo is cubicValues in Go: the reference of the vector kernel.
func (sp *Spline) cubicValuesGo(xs, ys, out []float64) {
	s, c := sp.stride, sp.coef
	origin := (splinePad-1)*s + splinePad - 1
	xs, ys = xs[:len(out)], ys[:len(out)]
	for k := range out {
		out[k] = cubicAt(c, s, origin, xs[k], ys[k])
	}
}

// quinticValues is values for the quintic kernel.
func (sp *Spline) quinticValues(xs, ys, out []float64) {
	s, c := sp.stride, sp.coef
	origin := (splinePad-2)*s + splinePad - 2
	xs, ys = xs[:len(out)], ys[:len(out)]
	for k := range out {
		out[k] = quinticAt(c, s, origin, xs[k], ys[k])
	}
}

// lineValues sets out[i] to the interpolated value at (x0 + t·ax,
// y0 + t·ay), t = i0 + i, for every i: the pixels of one row of a subset
// under an affine warp, their positions formed as affineWarp would form
// them, so the values equal those of values at those positions bit for
// bit, without the positions going through memory. The product t·ax is
// rounded before the sum (the conversions keep the compiler from fusing
// the two at GOAMD64=v3), as the vector kernel rounds it. Every position
// must lie in [0, W-1] × [0, H-1], as for values.
func (sp *Spline) lineValues(x0, y0, ax, ay float64, i0 int, out []float64) {
	s, c := sp.stride, sp.coef
	if sp.kind == Biquintic {
		origin := (splinePad-2)*s + splinePad - 2
		for k := range out {
			t := float64(i0 + k)
			out[k] = quinticAt(c, s, origin, x0+float64(t*ax), y0+float64(t*ay))
		}
		return
	}
	if useVector {
		sp.cubicLineVector(x0, y0, ax, ay, i0, out)
		return
	}
	sp.cubicLineGo(x0, y0, ax, ay, i0, out)
}

// cubicLineGo is lineValues for the cubic kernel in Go: the reference of
// the vector kernel.
func (sp *Spline) cubicLineGo(x0, y0, ax, ay float64, i0 int, out []float64) {
	s, c := sp.stride, sp.coef
	origin := (splinePad-1)*s + splinePad - 1
	for k := range out {
		t := float64(i0 + k)
		out[k] = cubicAt(c, s, origin, x0+float64(t*ax), y0+float64(t*ay))
	}
}

// cubicAt returns the cubic interpolant of the coefficients c (row stride
// s, origin the index of the coefficient up and left of pixel (0, 0)) at
// (x, y), inside the image. The weights are those of cubicWeights written
// as β³(t) = 2/3 - t² + t³/2 for the two inner taps, which saves two
// cubes; pairwise sums shorten the chain of dependent additions. It is
// the one cubic kernel of values and lineValues, so the two agree bit for
// bit.
func cubicAt(c []float32, s, origin int, x, y float64) float64 {
	const sixth, twoThirds = 1.0 / 6, 2.0 / 3
	ix, iy := int(x), int(y)
	tx, ty := x-float64(ix), y-float64(iy)
	ux, uy := 1-tx, 1-ty
	tx2, ux2, ty2, uy2 := tx*tx, ux*ux, ty*ty, uy*uy
	w0, w3 := sixth*ux2*ux, sixth*tx2*tx
	v0, v3 := sixth*uy2*uy, sixth*ty2*ty
	w1, w2 := twoThirds-tx2+3*w3, twoThirds-ux2+3*w0
	v1, v2 := twoThirds-ty2+3*v3, twoThirds-uy2+3*v0
	base := origin + iy*s + ix
	// One bounds check for the 4×4 window (its last row's end), then the
	// rows by constant offsets from its start.
	win := c[base : base+3*s+4]
	row := func(r *[4]float32) float64 {
		return (w0*float64(r[0]) + w1*float64(r[1])) + (w2*float64(r[2]) + w3*float64(r[3]))
	}
	c0 := row((*[4]float32)(win))
	c1 := row((*[4]float32)(win[s:]))
	c2 := row((*[4]float32)(win[2*s:]))
	c3 := row((*[4]float32)(win[3*s:]))
	return (v0*c0 + v1*c1) + (v2*c2 + v3*c3)
}

// quinticAt is cubicAt for the quintic kernel (origin two coefficients up
// and left of pixel (0, 0)).
func quinticAt(c []float32, s, origin int, x, y float64) float64 {
	ix, iy := int(x), int(y)
	x0, x1, x2, x3, x4, x5 := quinticWeights(x - float64(ix))
	y0, y1, y2, y3, y4, y5 := quinticWeights(y - float64(iy))
	base := origin + iy*s + ix
	row := func(j int) float64 {
		r := (*[6]float32)(c[base+j*s:])
		return (x0*float64(r[0]) + x1*float64(r[1])) + (x2*float64(r[2]) + x3*float64(r[3])) + (x4*float64(r[4]) + x5*float64(r[5]))
	}
	return (y0*row(0) + y1*row(1)) + (y2*row(2) + y3*row(3)) + (y4*row(4) + y5*row(5))
}
