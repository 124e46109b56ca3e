package render

import (
	"fmt"
	"math"

	"spallscope/dic/lens"
	"spallscope/dic/region"
)

// Deformation is the displacement of one frame on its grid, u and v in
// reference px: the material point at reference position X is at X + u(X)
// in that frame. It places reference-grid results on the current photo.
//
// With a Lens, the fields are in the lens's undistorted px (a run with a
// lens file) and the photos as taken: positions go through the lens's
// distortion to the photo (lens.Model.Distort), and photo pixels through
// its inverse to the fields. U and V nil is no motion: the reference photo
// seen through the lens.
type Deformation struct {
	U, V *GridValues
	Lens *lens.Model
}

// Current returns where reference position (X, Y) is in the frame's
// photo.
func (d *Deformation) Current(X, Y float64) (x, y float64, ok bool) {
	x, y, ok = X, Y, true
	if d.U != nil && d.V != nil {
		u, ok1 := d.U.At(X, Y)
		v, ok2 := d.V.At(X, Y)
		if !ok1 || !ok2 {
			return X, Y, false
		}
		x, y = X+u, Y+v
	}
	if d.Lens != nil {
		x, y = d.Lens.Distort(x, y)
	}
	return x, y, ok
}

// moves reports whether d holds a displacement (not only a lens).
func (d *Deformation) moves() bool { return d != nil && d.U != nil && d.V != nil }

// warpIterations and warpTolerance bound the fixed-point search of
// Reference: with displacement gradients below 0.1 (strains of 10 %, beyond
// anything a speckle pattern survives) each iteration gains a digit, and
// 0.01 px is far below a pixel of the drawing.
const (
	warpIterations = 8
	warpTolerance  = 0.01
)

// Reference returns the reference position X that moves to frame position
// (x, y), solving X + u(X) = x by the fixed-point iteration X ← x − u(X)
// from the guess x − (gu, gv). It fails where the iteration leaves the
// measured region or does not settle.
func (d *Deformation) Reference(x, y, gu, gv float64) (X, Y float64, ok bool) {
	X, Y = x-gu, y-gv
	for it := 0; it < warpIterations; it++ {
		u, ok1 := d.U.At(X, Y)
		v, ok2 := d.V.At(X, Y)
		if !ok1 || !ok2 {
			return X, Y, false
		}
		nx, ny := x-u, y-v
		if math.Abs(nx-X) < warpTolerance && math.Abs(ny-Y) < warpTolerance {
			return nx, ny, true
		}
		X, Y = nx, ny
	}
	return X, Y, false
}

// RasterOn samples g at every pixel of a width×height frame on which the
// material has moved by d: each pixel takes the value at the reference
// position that moved there (a Lagrangian field drawn where the material
// now is). keep is the reference mask of measured pixels (nil: all); a pixel
// whose reference position it excludes stays NaN, so openings stay clear as
// they deform.
func (g *GridValues) RasterOn(d *Deformation, width, height int, keep *region.Mask) (*Raster, error) {
	return g.rasterOnIn(nil, d, width, height, keep)
}

// rasterOnIn is RasterOn into buf's raster array when buf is not nil.
func (g *GridValues) rasterOnIn(buf *overlayBuffers, d *Deformation, width, height int, keep *region.Mask) (*Raster, error) {
	if d == nil || (d.Lens == nil && !d.moves()) {
		return nil, fmt.Errorf("raster on the current frame: no displacement field")
	}
	s, err := g.sampler(d, width, height, keep)
	if err != nil {
		return nil, err
	}
	r := buf.newRaster(width, height)
	s.fill(r)
	return r, nil
}

// photoBounds returns the photo's pixel box that shows the field's box
// x0…x1, y0…y1 through the lens: the box of its rim's distorted points
// (a radial distortion's extremes lie on the rim), grown by 2 px.
func (d *Deformation) photoBounds(x0, y0, x1, y1, width, height int) (int, int, int, int) {
	lx, ly, hx, hy := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	const n = 32
	for k := 0; k <= n; k++ {
		f := float64(k) / n
		ax, ay := float64(x0)+f*float64(x1-x0), float64(y0)+f*float64(y1-y0)
		for _, p := range [4][2]float64{{ax, float64(y0)}, {ax, float64(y1)}, {float64(x0), ay}, {float64(x1), ay}} {
			x, y := d.Lens.Distort(p[0], p[1])
			lx, ly, hx, hy = math.Min(lx, x), math.Min(ly, y), math.Max(hx, x), math.Max(hy, y)
		}
	}
	return max(0, int(math.Floor(lx))-2), max(0, int(math.Floor(ly))-2), min(width-1, int(math.Ceil(hx))+2), min(height-1, int(math.Ceil(hy))+2)
}

// finiteRange returns the smallest and largest finite values (NaN, NaN if
// none).
func finiteRange(vs []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if lo > hi {
		return math.NaN(), math.NaN()
	}
	return lo, hi
}
