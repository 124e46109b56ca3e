package frames

import (
	"math"

	"spallscope/subset"
)

// Stats summarises the gray levels of one frame: what a lab checks before
// trusting a photo (exposure, clipping).
type Stats struct {
	Min, Mean, Max float64
	// Saturated and Dark are the fractions of pixels at the top and bottom
	// gray level of the depth (clipped highlights and shadows).
	Saturated, Dark float64
}

// Describe returns the gray-level statistics of img.
func Describe(img *subset.Image) Stats {
	if len(img.Pix) == 0 {
		return Stats{}
	}
	top := float32(img.MaxLevel())
	s := Stats{Min: math.Inf(1), Max: math.Inf(-1)}
	var sum float64
	var sat, dark int
	for _, v := range img.Pix {
		f := float64(v)
		sum += f
		s.Min = math.Min(s.Min, f)
		s.Max = math.Max(s.Max, f)
		if img.Depth != 0 && v >= top {
			sat++
		}
		if img.Depth != 0 && v <= 0 {
			dark++
		}
	}
	n := float64(len(img.Pix))
	s.Mean = sum / n
	s.Saturated, s.Dark = float64(sat)/n, float64(dark)/n
	return s
}
