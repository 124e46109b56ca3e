package render

import (
	"math"

	"spallscope/subset"
)

// colourSteps is the number of positions on the colour map an overlay's
// colour table holds. Between two of them a component moves by at most
// 0.007 of a gray level (the steepest entry-to-entry step of the maps is
// below 0.03 of full scale, TestColourTableSpacing: 0.03 × 255 × 255 /
// 262143 levels), so a table colour is the exactly interpolated one, or
// one level off where the exact one rounds within that of a half.
const colourSteps = 1 << 18

// blendTable colours an overlay's pixels: the map's colour at colourSteps
// positions of its range and the blend of every colour level over every
// gray level at the opacity, as OpenCV's AddWeighted computes it (single
// precision, rounded to nearest) in the path this replaces.
type blendTable struct {
	lim    Limits
	colour [colourSteps][3]uint8 // BGR
	blend  [256 * 256]uint8      // [colour<<8 | gray]
	full   float64               // the photo's full scale
	// lo, hi scale a value to its table index (Limits.Position's rule):
	// index = (v − from)·scale on one side, below zero with lo for centred
	// limits; centred says which rule.
	from, loScale, hiScale float64
	centred                bool
	// table and alpha are the map's table and the opacity it was built for.
	table *[256][3]float64
	alpha float64
}

// newBlendTable returns the table of map m with limits lim at opacity
// alpha for photo, old when it is that table (a sequence's frames share
// one).
func newBlendTable(old *blendTable, m Colormap, lim Limits, alpha float64, photo *subset.Image) *blendTable {
	if old != nil && old.table == m.table && old.lim == lim && old.alpha == alpha && old.full == photo.MaxLevel() {
		return old
	}
	t := &blendTable{table: m.table, lim: lim, alpha: alpha, full: photo.MaxLevel()}
	const n = colourSteps - 1
	switch {
	case lim.Centred && lim.Lo < 0 && lim.Hi > 0:
		t.centred, t.loScale, t.hiScale = true, -0.5*n/lim.Lo, 0.5*n/lim.Hi
	case lim.Hi > lim.Lo:
		t.from, t.loScale, t.hiScale = lim.Lo, n/(lim.Hi-lim.Lo), n/(lim.Hi-lim.Lo)
	default:
		t.from = math.Inf(-1) // every value at the middle
	}
	for i := range t.colour {
		r, g, b := m.At(float64(i) / (colourSteps - 1))
		t.colour[i] = [3]uint8{b, g, r}
	}
	a, ia := float32(alpha), float32(1-alpha)
	for c := 0; c < 256; c++ {
		for g := 0; g < 256; g++ {
			v := float32(g)*ia + float32(c)*a
			t.blend[c<<8|g] = uint8(min(255, max(0, math.RoundToEven(float64(v)))))
		}
	}
	return t
}

// index returns the table index of value v: Limits.Position scaled to the
// table, rounded (NaN is not passed).
func (t *blendTable) index(v float64) int {
	const n = colourSteps - 1
	var f float64
	switch {
	case t.centred && v < 0:
		f = 0.5*n + v*t.loScale
	case t.centred:
		f = 0.5*n + v*t.hiScale
	case math.IsInf(t.from, -1):
		f = 0.5 * n
	default:
		f = (v - t.from) * t.loScale
	}
	if !(f > 0) {
		return 0
	}
	if f >= n {
		return n
	}
	return int(f + 0.5)
}

// row writes photo row y with the field's values vals (NaN: the photo's
// gray shows) blended in to dst, BGR, 3 bytes a pixel.
func (t *blendTable) row(dst []byte, vals []float32, photo *subset.Image, y int) {
	src := photo.Pix[y*photo.Width : (y+1)*photo.Width]
	for x, v := range vals {
		g := unit8(float64(src[x]) / t.full)
		d := dst[3*x : 3*x+3 : 3*x+3]
		if v != v { // NaN
			d[0], d[1], d[2] = g, g, g
			continue
		}
		c := &t.colour[t.index(float64(v))]
		d[0], d[1], d[2] = t.blend[int(c[0])<<8|int(g)], t.blend[int(c[1])<<8|int(g)], t.blend[int(c[2])<<8|int(g)]
	}
}
