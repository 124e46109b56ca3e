package speckle

import (
	"math"

	"spallscope/subset"
)

// grayLevels returns the mean and the standard deviation (population form)
// of the gray levels of img, summed in float64 with the mean removed first
// so that 16-bit images lose no precision.
func grayLevels(img *subset.Image) (mean, std float64) {
	var sum float64
	for _, v := range img.Pix {
		sum += float64(v)
	}
	mean = sum / float64(len(img.Pix))
	var ss float64
	for _, v := range img.Pix {
		d := float64(v) - mean
		ss += d * d
	}
	return mean, math.Sqrt(ss / float64(len(img.Pix)))
}
