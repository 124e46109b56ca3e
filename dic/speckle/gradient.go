package speckle

import (
	"math"

	"spallscope/subset"
)

// meanIntensityGradient returns the mean of the gradient modulus
// √(fx² + fy²) over the pixels that have a full 3×3 neighbourhood (Pan, Lu
// & Xie 2010). fx and fy are the Sobel operator divided by 8,
//
//	fx = [(p(x+1,y−1) + 2p(x+1,y) + p(x+1,y+1)) − (p(x−1,y−1) + 2p(x−1,y) + p(x−1,y+1))]/8,
//
// and likewise for fy: a central difference smoothed across, which gives
// the slope of a linear ramp exactly. Images narrower than 3 px have no
// such pixel; the result is then 0.
func meanIntensityGradient(img *subset.Image) float64 {
	w, h := img.Width, img.Height
	if w < 3 || h < 3 {
		return 0
	}
	var sum float64
	for y := 1; y < h-1; y++ {
		up, row, down := img.Row(y-1), img.Row(y), img.Row(y+1)
		for x := 1; x < w-1; x++ {
			right := float64(up[x+1]) + 2*float64(row[x+1]) + float64(down[x+1])
			left := float64(up[x-1]) + 2*float64(row[x-1]) + float64(down[x-1])
			below := float64(down[x-1]) + 2*float64(down[x]) + float64(down[x+1])
			above := float64(up[x-1]) + 2*float64(up[x]) + float64(up[x+1])
			sum += math.Hypot(right-left, below-above) / 8
		}
	}
	return sum / float64((w-2)*(h-2))
}
