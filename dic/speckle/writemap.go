package speckle

import (
	"fmt"
	"math"

	"gocv.io/x/gocv"

	"spallscope/dic/frames"
)

// colormapViridis is OpenCV's COLORMAP_VIRIDIS (16 in OpenCV 4.6's
// imgproc.hpp), which gocv v0.31 does not name. Viridis (van der Walt &
// Smith, released CC0) is perceptually uniform and reads in gray and for
// colour-blind viewers.
const colormapViridis gocv.ColormapTypes = 16

// noiseOctaves is the half-width of the colour scale of the noise map, in
// factors of two either side of the target.
const noiseOctaves = 2

// WriteMap draws r.Map as a colour PNG (or any format OpenCV writes, by the
// extension) the size of the image: each pixel shows the subset whose
// centre is nearest, and pixels nearer the border than half a subset show
// the nearest subset inside. Bright (yellow) is good texture, dark
// (purple) poor, in the viridis colour map:
//
//   - with a known noise level, the colour is log₂(target/σ_u) on a fixed
//     scale from −2 (σ_u four times the target or worse, or no texture) to
//     +2 (a quarter of the target or better); the middle of the scale
//     (teal) is a subset that just meets the target;
//   - without one, the colour is log₁₀ SSSIG from the map's smallest
//     positive value to its largest (a relative scale); subsets without
//     texture are darkest.
//
// The file is written under a temporary name and renamed.
func WriteMap(path string, r *Report) error {
	m := r.Map
	if m.Columns < 1 || m.Rows < 1 || len(m.SSSIG) != m.Columns*m.Rows || m.Step < 1 {
		return fmt.Errorf("write map %s: the report has no SSSIG map", path)
	}
	if r.Width < 1 || r.Height < 1 {
		return fmt.Errorf("write map %s: report of a %dx%d image", path, r.Width, r.Height)
	}
	cells := mapLevels(r)
	pix := make([]byte, r.Width*r.Height)
	col := make([]int, r.Width)
	for x := range col {
		col[x] = nearestCell(x, m.X0, m.Step, m.Columns)
	}
	for y := 0; y < r.Height; y++ {
		row := nearestCell(y, m.Y0, m.Step, m.Rows) * m.Columns
		line := pix[y*r.Width : (y+1)*r.Width]
		for x := range line {
			line[x] = cells[row+col[x]]
		}
	}
	gray, err := gocv.NewMatFromBytes(r.Height, r.Width, gocv.MatTypeCV8U, pix)
	if err != nil {
		return fmt.Errorf("write map %s: %w", path, err)
	}
	defer gray.Close()
	colour := gocv.NewMat()
	defer colour.Close()
	gocv.ApplyColorMap(gray, &colour, colormapViridis)
	return frames.WriteMat(path, colour)
}

// nearestCell returns the grid index, clamped to [0, n), of the grid point
// x0 + i·step nearest to pixel coordinate p.
func nearestCell(p, x0, step, n int) int {
	i := int(math.Floor(float64(p-x0)/float64(step) + 0.5))
	return min(max(i, 0), n-1)
}

// mapLevels returns the 8-bit colour-scale level of every map cell, as
// WriteMap describes.
func mapLevels(r *Report) []byte {
	m := r.Map
	out := make([]byte, len(m.SSSIG))
	scale := func(q float64) byte { return byte(math.Round(255 * min(max(q, 0), 1))) }
	if r.Noise > 0 {
		for i, s := range m.SSSIG {
			if s > 0 {
				q := math.Log2(r.Target * math.Sqrt(s) / (math.Sqrt2 * r.Noise)) // log₂(target/σ_u)
				out[i] = scale((q + noiseOctaves) / (2 * noiseOctaves))
			}
		}
		return out
	}
	lo, hi := math.Inf(1), 0.0
	for _, s := range m.SSSIG {
		if s > 0 {
			lo, hi = min(lo, s), max(hi, s)
		}
	}
	for i, s := range m.SSSIG {
		switch {
		case !(s > 0):
		case hi > lo:
			out[i] = scale(math.Log10(s/lo) / math.Log10(hi/lo))
		default:
			out[i] = 255
		}
	}
	return out
}
