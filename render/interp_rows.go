package render

import (
	"fmt"
	"math"
	"runtime"
	"sync"
	"sync/atomic"

	"spallscope/dic/region"
)

// fieldSampler samples a field at the pixels of one image row at a time,
// so that an overlay can colour each row as it is sampled (no photo-sized
// raster) and rows can go to several workers. Each pixel's value depends on
// its own position only (the warp's first guess on its row's pixels
// before it), so the picture does not depend on how rows are shared out.
type fieldSampler struct {
	g    *GridValues
	d    *Deformation // nil: the field where it was measured
	keep *region.Mask
	w, h int
	// x0…x1, y0…y1 is the pixel box that can hold a value.
	x0, y0, x1, y1 int
	// gu, gv start the warp's search on each row (the displacement's mid
	// range); empty is true when nothing was measured.
	gu, gv float64
	empty  bool
}

// sampler checks g (and d's displacement) against a width×height image and
// returns their row sampler: At where the field was measured (d nil), or
// RasterOn's rule on a frame the material moved to by d.
func (g *GridValues) sampler(d *Deformation, width, height int, keep *region.Mask) (*fieldSampler, error) {
	if err := g.check(); err != nil {
		return nil, err
	}
	if keep != nil && (keep.Width != width || keep.Height != height) {
		return nil, fmt.Errorf("raster: mask %dx%d for a %dx%d image", keep.Width, keep.Height, width, height)
	}
	s := &fieldSampler{g: g, d: d, keep: keep, w: width, h: height}
	s.x0, s.y0, s.x1, s.y1 = g.bounds(width, height)
	if d == nil {
		return s, nil
	}
	umin, umax, vmin, vmax := 0.0, 0.0, 0.0, 0.0
	if d.moves() {
		if err := d.U.check(); err != nil {
			return nil, fmt.Errorf("displacement u: %w", err)
		}
		if err := d.V.check(); err != nil {
			return nil, fmt.Errorf("displacement v: %w", err)
		}
		umin, umax = finiteRange(d.U.Values)
		vmin, vmax = finiteRange(d.V.Values)
		if math.IsNaN(umin) || math.IsNaN(vmin) {
			s.empty = true // nothing measured
			return s, nil
		}
	}
	s.x0, s.x1 = max(0, s.x0+int(math.Floor(umin))), min(width-1, s.x1+int(math.Ceil(umax)))
	s.y0, s.y1 = max(0, s.y0+int(math.Floor(vmin))), min(height-1, s.y1+int(math.Ceil(vmax)))
	if d.Lens != nil {
		s.x0, s.y0, s.x1, s.y1 = d.photoBounds(s.x0, s.y0, s.x1, s.y1, width, height)
	}
	s.gu, s.gv = (umin+umax)/2, (vmin+vmax)/2
	return s, nil
}

// fill samples every row into r.
func (s *fieldSampler) fill(r *Raster) {
	for y := 0; y < s.h; y++ {
		s.row(y, r.Pix[y*s.w:(y+1)*s.w])
	}
}

// row samples image row y into dst (the row's w pixels): the value, or NaN
// where nothing is drawn.
func (s *fieldSampler) row(y int, dst []float32) {
	nan := float32(math.NaN())
	for x := range dst {
		dst[x] = nan
	}
	if s.empty || y < s.y0 || y > s.y1 {
		return
	}
	if s.d == nil {
		s.rowMeasured(y, dst)
	} else {
		s.rowMoved(y, dst)
	}
}

// rowMeasured is row for the field where it was measured: At at each
// pixel, with what At works out per row (the grid row, its weight, the
// rows' measured corners) done once for the row; the same values as At
// bit for bit (TestRowMatchesAt).
func (s *fieldSampler) rowMeasured(y int, dst []float32) {
	g, keep := s.g, s.keep
	gr := g.Grid
	st := float64(gr.Step)
	fr := (float64(y) - float64(gr.Y0)) / st
	if fr < -0.5 || fr > float64(gr.Rows)-0.5 {
		return
	}
	r0 := int(math.Floor(fr))
	if r0 == gr.Rows-1 && fr == float64(r0) && r0 > 0 {
		r0--
	}
	inRows := r0 >= 0 && r0 < gr.Rows-1
	wy := fr - float64(r0)
	// The nearest grid row, for pixels outside a whole cell.
	rn := min(max(int(math.Round(fr)), 0), gr.Rows-1)
	var top, bot []float64
	if inRows {
		top, bot = g.Values[r0*gr.Cols:(r0+1)*gr.Cols], g.Values[(r0+1)*gr.Cols:(r0+2)*gr.Cols]
	}
	near := g.Values[rn*gr.Cols : (rn+1)*gr.Cols]
	var mask []uint8
	if keep != nil {
		mask = keep.Pix[y*s.w : (y+1)*s.w]
	}
	last := float64(gr.Cols) - 0.5
	for x := s.x0; x <= s.x1; x++ {
		if mask != nil && mask[x] == 0 {
			continue
		}
		fc := (float64(x) - float64(gr.X0)) / st
		if fc < -0.5 || fc > last {
			continue
		}
		c0 := int(math.Floor(fc))
		if c0 == gr.Cols-1 && fc == float64(c0) && c0 > 0 {
			c0--
		}
		if inRows && c0 >= 0 && c0 < gr.Cols-1 {
			v00, v10, v01, v11 := top[c0], top[c0+1], bot[c0], bot[c0+1]
			if !math.IsNaN(v00 + v10 + v01 + v11) {
				wx := fc - float64(c0)
				dst[x] = float32((1-wy)*((1-wx)*v00+wx*v10) + wy*((1-wx)*v01+wx*v11))
				continue
			}
		}
		c := min(max(int(math.Round(fc)), 0), gr.Cols-1)
		if v := near[c]; !math.IsNaN(v) {
			dst[x] = float32(v)
		}
	}
}

// rowMoved is row on a frame the material moved to (and through the
// lens): each pixel takes the value at the reference position that moved
// there, the search starting from the pixel before it on the row.
func (s *fieldSampler) rowMoved(y int, dst []float32) {
	g, d, keep := s.g, s.d, s.keep
	gu, gv := s.gu, s.gv
	for x := s.x0; x <= s.x1; x++ {
		px, py := float64(x), float64(y)
		if d.Lens != nil {
			var seen bool
			if px, py, seen = d.Lens.Undistort(px, py); !seen {
				continue
			}
		}
		X, Y, ok := px, py, true
		if d.moves() {
			if X, Y, ok = d.Reference(px, py, gu, gv); !ok {
				continue
			}
			gu, gv = px-X, py-Y
		}
		if keep != nil {
			kx, ky := X, Y // the mask is in the reference photo's pixels
			if d.Lens != nil {
				kx, ky = d.Lens.Distort(X, Y)
			}
			if !keep.At(int(math.Round(kx)), int(math.Round(ky))) {
				continue
			}
		}
		if v, ok := g.At(X, Y); ok {
			dst[x] = float32(v)
		}
	}
}

// rowBand is the number of image rows a worker takes at a time.
const rowBand = 16

// parallelRows calls band for consecutive bands of rows 0…n−1 on up to
// GOMAXPROCS workers; worker is the calling worker's index (0…workers−1),
// for its own scratch space.
func parallelRows(n int, band func(worker, y0, y1 int)) {
	workers := min(runtime.GOMAXPROCS(0), (n+rowBand-1)/rowBand)
	if workers <= 1 {
		for y := 0; y < n; y += rowBand {
			band(0, y, min(n, y+rowBand))
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for k := 0; k < workers; k++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				y := int(next.Add(rowBand)) - rowBand
				if y >= n {
					return
				}
				band(k, y, min(n, y+rowBand))
			}
		}()
	}
	wg.Wait()
}

// workerCount is the number of workers parallelRows uses for n rows.
func workerCount(n int) int { return max(1, min(runtime.GOMAXPROCS(0), (n+rowBand-1)/rowBand)) }
