package render

import (
	"fmt"
	"math"

	"spallscope/dic"
	"spallscope/dic/region"
)

// GridValues is one scalar per point of a measurement grid, NaN where
// nothing was measured (an invalid point, a point in an opening).
type GridValues struct {
	Grid   dic.Grid
	Values []float64
}

// At returns the value at reference position (x, y) in px:
//   - inside a grid cell whose four corners are measured, the bilinear
//     interpolant of the corners;
//   - otherwise the value of the nearest grid point when that point is
//     measured and (x, y) is within half a step of it in x and in y (the
//     edge of the measured region, next to an opening or an invalid point);
//   - otherwise nothing (false): no value is made up beyond half a step
//     from a measurement.
func (g *GridValues) At(x, y float64) (float64, bool) {
	gr := g.Grid
	s := float64(gr.Step)
	fc, fr := (x-float64(gr.X0))/s, (y-float64(gr.Y0))/s
	if fc < -0.5 || fr < -0.5 || fc > float64(gr.Cols)-0.5 || fr > float64(gr.Rows)-0.5 {
		return 0, false
	}
	c0, r0 := int(math.Floor(fc)), int(math.Floor(fr))
	// On the last column or row, the cell before it (weight 1 on its far
	// side), so the grid's edges interpolate along them too.
	if c0 == gr.Cols-1 && fc == float64(c0) && c0 > 0 {
		c0--
	}
	if r0 == gr.Rows-1 && fr == float64(r0) && r0 > 0 {
		r0--
	}
	if c0 >= 0 && r0 >= 0 && c0 < gr.Cols-1 && r0 < gr.Rows-1 {
		i := r0*gr.Cols + c0
		v00, v10 := g.Values[i], g.Values[i+1]
		v01, v11 := g.Values[i+gr.Cols], g.Values[i+gr.Cols+1]
		if !math.IsNaN(v00 + v10 + v01 + v11) {
			wx, wy := fc-float64(c0), fr-float64(r0)
			return (1-wy)*((1-wx)*v00+wx*v10) + wy*((1-wx)*v01+wx*v11), true
		}
	}
	c, r := int(math.Round(fc)), int(math.Round(fr))
	c, r = min(max(c, 0), gr.Cols-1), min(max(r, 0), gr.Rows-1)
	v := g.Values[r*gr.Cols+c]
	if math.IsNaN(v) {
		return 0, false
	}
	return v, true
}

// Raster is a field sampled at every pixel of an image, NaN where it is not
// drawn (the photo shows through).
type Raster struct {
	Width, Height int
	Pix           []float32
}

// Raster samples g at every pixel centre of a width×height image (reference
// pixels) with At. Pixels that keep says are not measured (openings and
// other exclusions; nil keeps all) stay NaN whatever the grid holds, so an
// opening stays clear even where its edge points are valid.
func (g *GridValues) Raster(width, height int, keep *region.Mask) (*Raster, error) {
	return g.rasterIn(nil, width, height, keep)
}

// rasterIn is Raster into buf's raster array when buf is not nil.
func (g *GridValues) rasterIn(buf *overlayBuffers, width, height int, keep *region.Mask) (*Raster, error) {
	s, err := g.sampler(nil, width, height, keep)
	if err != nil {
		return nil, err
	}
	r := buf.newRaster(width, height)
	s.fill(r)
	return r, nil
}

// newRaster returns a raster with nothing drawn, in buf's raster array
// when buf is not nil.
func (buf *overlayBuffers) newRaster(width, height int) *Raster {
	var pix []float32
	if buf != nil {
		buf.raster = resize(buf.raster, width*height)
		pix = buf.raster
	} else {
		pix = make([]float32, width*height)
	}
	r := &Raster{Width: width, Height: height, Pix: pix}
	nan := float32(math.NaN())
	for i := range r.Pix {
		r.Pix[i] = nan
	}
	return r
}

// check reports a grid and value count that do not agree.
func (g *GridValues) check() error {
	if g.Grid.Step <= 0 || g.Grid.Cols <= 0 || g.Grid.Rows <= 0 {
		return fmt.Errorf("grid of %dx%d points with step %d px: expected a non-empty grid", g.Grid.Cols, g.Grid.Rows, g.Grid.Step)
	}
	if len(g.Values) != g.Grid.Len() {
		return fmt.Errorf("%d values for a %dx%d grid", len(g.Values), g.Grid.Cols, g.Grid.Rows)
	}
	return nil
}

// bounds returns the pixel box, within the image, that At can fill: the
// grid's extent plus half a step.
func (g *GridValues) bounds(width, height int) (x0, y0, x1, y1 int) {
	gr := g.Grid
	h := float64(gr.Step) / 2
	x0 = max(0, int(math.Floor(float64(gr.X0)-h)))
	y0 = max(0, int(math.Floor(float64(gr.Y0)-h)))
	x1 = min(width-1, int(math.Ceil(float64(gr.X0+(gr.Cols-1)*gr.Step)+h)))
	y1 = min(height-1, int(math.Ceil(float64(gr.Y0+(gr.Rows-1)*gr.Step)+h)))
	return
}

// Finite returns the measured values of g (for limits).
func (g *GridValues) Finite() []float64 {
	out := make([]float64, 0, len(g.Values))
	for _, v := range g.Values {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			out = append(out, v)
		}
	}
	return out
}
