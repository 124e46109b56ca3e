package dic

import (
	"math"

	"spallscope/dic/region"
)

// carryMask moves a mask drawn on the original reference to a later frame
// whose field is f: pixel p of that frame is measured when the material
// point p − u(p) was measured in the original. u is interpolated
// bilinearly from the grid, with invalid grid points filled from their
// valid neighbours first; using the Lagrangian displacement at p for the
// Eulerian one errs by |u|·|∇u|, a small fraction of a pixel at the strains
// DIC measures.
func carryMask(m *region.Mask, f *Field) []uint8 {
	g := f.Grid
	u, v := filledDisplacements(f)
	out := make([]uint8, len(m.Pix))
	for y := 0; y < m.Height; y++ {
		for x := 0; x < m.Width; x++ {
			du, dv := bilinear(g, u, float64(x), float64(y)), bilinear(g, v, float64(x), float64(y))
			X, Y := int(math.Round(float64(x)-du)), int(math.Round(float64(y)-dv))
			if m.At(X, Y) {
				out[y*m.Width+x] = 255
			}
		}
	}
	return out
}

// filledDisplacements returns u and v at every grid point, invalid points
// taking the mean of their filled neighbours, sweep after sweep, until all
// are filled (zero if the field has no valid point at all).
func filledDisplacements(f *Field) (u, v []float64) {
	n := f.Grid.Len()
	u, v = make([]float64, n), make([]float64, n)
	known := make([]bool, n)
	left := 0
	for i := range f.Points {
		if f.Points[i].Valid() {
			u[i], v[i] = f.Points[i].U()
			known[i] = true
		} else {
			left++
		}
	}
	if left == n {
		return u, v
	}
	var nbr []int
	for left > 0 {
		var newly []int
		for i := 0; i < n; i++ {
			if known[i] {
				continue
			}
			su, sv, k := 0.0, 0.0, 0
			nbr = f.Grid.Neighbours(nbr[:0], i)
			for _, j := range nbr {
				if known[j] {
					su, sv, k = su+u[j], sv+v[j], k+1
				}
			}
			if k > 0 {
				u[i], v[i] = su/float64(k), sv/float64(k)
				newly = append(newly, i)
			}
		}
		for _, i := range newly {
			known[i] = true
		}
		left -= len(newly)
	}
	return u, v
}

// bilinear interpolates grid values w at pixel (x, y), clamping to the
// grid's edge outside it.
func bilinear(g Grid, w []float64, x, y float64) float64 {
	fx := (x - float64(g.X0)) / float64(g.Step)
	fy := (y - float64(g.Y0)) / float64(g.Step)
	fx = math.Min(math.Max(fx, 0), float64(g.Cols-1))
	fy = math.Min(math.Max(fy, 0), float64(g.Rows-1))
	c0, r0 := min(int(fx), g.Cols-2), min(int(fy), g.Rows-2)
	c0, r0 = max(c0, 0), max(r0, 0)
	tx, ty := fx-float64(c0), fy-float64(r0)
	at := func(c, r int) float64 {
		if c >= g.Cols {
			c = g.Cols - 1
		}
		if r >= g.Rows {
			r = g.Rows - 1
		}
		return w[r*g.Cols+c]
	}
	return (1-ty)*((1-tx)*at(c0, r0)+tx*at(c0+1, r0)) + ty*((1-tx)*at(c0, r0+1)+tx*at(c0+1, r0+1))
}
