package speckle

import "spallscope/subset"

// gradientTables hold summed-area tables (Crow 1984, "Summed-area tables
// for texture mapping", SIGGRAPH) of the squared interpolant gradients fx²
// and fy² at the pixel centres, so that the SSSIG of any square subset
// costs four look-ups per direction instead of one gradient per pixel.
// This is what makes a table of many subset sizes over a fine grid cheap;
// the sums are those subset.SSSIGXY forms pixel by pixel.
type gradientTables struct {
	w, h   int
	sx, sy []float64 // (w+1)×(h+1); s[(y+1)(w+1)+x+1] = Σ over [0,x]×[0,y]
}

// newGradientTables evaluates the gradient of sp at every pixel centre and
// accumulates the tables.
func newGradientTables(sp *subset.Spline) gradientTables {
	w, h := sp.Width(), sp.Height()
	t := gradientTables{w: w, h: h, sx: make([]float64, (w+1)*(h+1)), sy: make([]float64, (w+1)*(h+1))}
	for y := 0; y < h; y++ {
		var rx, ry float64
		for x := 0; x < w; x++ {
			_, gx, gy := sp.ValueGrad(float64(x), float64(y))
			rx += gx * gx
			ry += gy * gy
			k := (y+1)*(w+1) + x + 1
			t.sx[k] = t.sx[k-w-1] + rx
			t.sy[k] = t.sy[k-w-1] + ry
		}
	}
	return t
}

// sssigXY returns the directional sums Σfx² and Σfy² over the
// (2r+1)² subset centred on pixel (x, y), which must lie inside the image.
func (t gradientTables) sssigXY(x, y, r int) (sx, sy float64) {
	s := t.w + 1
	a := (y-r)*s + x - r       // top-left corner, exclusive
	b := (y-r)*s + x + r + 1   // top-right
	c := (y+r+1)*s + x - r     // bottom-left
	d := (y+r+1)*s + x + r + 1 // bottom-right
	return t.sx[d] - t.sx[b] - t.sx[c] + t.sx[a], t.sy[d] - t.sy[b] - t.sy[c] + t.sy[a]
}

// sssig returns the smaller directional sum, as subset.SSSIG does.
func (t gradientTables) sssig(x, y, r int) float64 {
	sx, sy := t.sssigXY(x, y, r)
	return min(sx, sy)
}
