package subset

import "math"

// Prefetching. A subset's window of spline coefficients spans some 24 rows
// of the image, each a stride apart, and the solver visits its subsets in
// the order of reliability rather than of memory: on a large image the
// rows of the next subset are seldom in the processor's caches, and the
// interpolation kernels, which take the rows one after the other, meet
// their misses one row at a time (profiled at 20 MP: about half the time
// of the reference centres kernel and a quarter of the deformed sampling's
// stalled on the first load of a row). Asking for all the rows of the
// next subset while the current one is solved puts those misses in flight
// together and behind useful work. A prefetch is a hint: it reads no value
// into the computation, so results do not depend on it (the tests solve
// the same subsets with and without it).

// Prefetch asks the processor to bring into its caches the coefficients
// that solving the subset centred on reference pixel (x, y) from guess
// will read first: those of ref under the subset, and those of def under
// the subset warped by guess (its affine part; the quadratic terms of a
// first guess move the corners by a fraction of a pixel). Either spline
// may be nil. It changes no result and is a no-op where there is no
// prefetch instruction to issue (see prefetchRowsOf); windows partly or
// wholly outside an image are clipped to it.
func (s *Solver) Prefetch(ref, def *Spline, x, y int, guess Params) {
	r := s.cfg.Radius
	if ref != nil {
		ref.prefetchBox(x-r, y-r, x+r, y+r)
	}
	if def == nil {
		return
	}
	if x0, y0, x1, y1, ok := warpedBox(x, y, r, &guess, def.width, def.height); ok {
		def.prefetchBox(x0, y0, x1, y1)
	}
}

// warpedBox returns the pixel box, clipped to a w×h image, that holds the
// square subset of radius r centred on (x, y) under the affine part of p:
// the bounding box of its corners, widened to whole pixels. ok is false
// when p is not finite, the box misses the image, or the warped subset
// spans more than maxWarpedSpan times its side (a guess that will not
// converge: asking for its window would only cost time).
func warpedBox(x, y, r int, p *Params, w, h int) (x0, y0, x1, y1 int, ok bool) {
	if !p.IsFinite() {
		return 0, 0, 0, 0, false
	}
	xmin, ymin := math.Inf(1), math.Inf(1)
	xmax, ymax := math.Inf(-1), math.Inf(-1)
	fr := float64(r)
	for _, c := range [4][2]float64{{-fr, -fr}, {fr, -fr}, {-fr, fr}, {fr, fr}} {
		dx, dy := c[0], c[1]
		wx := float64(x) + dx + p[PU] + p[PUx]*dx + p[PUy]*dy
		wy := float64(y) + dy + p[PV] + p[PVx]*dx + p[PVy]*dy
		xmin, xmax = math.Min(xmin, wx), math.Max(xmax, wx)
		ymin, ymax = math.Min(ymin, wy), math.Max(ymax, wy)
	}
	fw, fh := float64(w-1), float64(h-1)
	if !(xmax >= 0 && ymax >= 0 && xmin <= fw && ymin <= fh) {
		return 0, 0, 0, 0, false
	}
	if span := maxWarpedSpan * float64(2*r+1); xmax-xmin > span || ymax-ymin > span {
		return 0, 0, 0, 0, false
	}
	// Clipped first, so that the conversions stay in range.
	return int(math.Max(xmin, 0)), int(math.Max(ymin, 0)), int(math.Ceil(math.Min(xmax, fw))), int(math.Ceil(math.Min(ymax, fh))), true
}

// maxWarpedSpan bounds the extent of a warped subset, in subset sides,
// whose window Prefetch asks for.
const maxWarpedSpan = 4

// prefetchBox asks for the coefficients that interpolating anywhere in
// the pixel box [x0, x1] × [y0, y1] reads (see prefetchBlock).
func (sp *Spline) prefetchBox(x0, y0, x1, y1 int) {
	if off, rows, width, ok := sp.prefetchBlock(x0, y0, x1, y1); ok {
		prefetchRowsOf(sp.coef, off, sp.stride, rows, width)
	}
}

// prefetchBlock returns the block of coefficients (the offset in coef of
// its first, its rows and its width) that interpolating anywhere in the
// pixel box [x0, x1] × [y0, y1], clipped to the image, reads: the box
// widened by the kernel's reach, which the padding around the image
// holds. ok is false for an empty box.
func (sp *Spline) prefetchBlock(x0, y0, x1, y1 int) (off, rows, width int, ok bool) {
	lo, hi := 1, 2 // the cubic kernel reads 1 coefficient before, 2 after
	if sp.kind == Biquintic {
		lo, hi = 2, 3
	}
	x0, x1 = max(x0, 0), min(x1, sp.width-1)
	y0, y1 = max(y0, 0), min(y1, sp.height-1)
	if x1 < x0 || y1 < y0 {
		return 0, 0, 0, false
	}
	c0, r0 := x0-lo+splinePad, y0-lo+splinePad
	return r0*sp.stride + c0, y1 + hi + splinePad - r0 + 1, x1 + hi + splinePad - c0 + 1, true
}
