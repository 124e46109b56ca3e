package frames

import (
	"math"

	"spallscope/subset"
)

// Stats summarises the gray levels of one frame: what a lab checks before
// trusting a photo (exposure, clipping, unmeasured pixels).
type Stats struct {
	// Min, Mean and Max are over the finite pixels; NaN when there is
	// none.
	Min, Mean, Max float64
	// Saturated and Dark are the fractions of pixels at the top and bottom
	// gray level of the depth (clipped highlights and shadows).
	Saturated, Dark float64
	// NonFinite counts the pixels that are NaN or ±Inf: a 32-bit float
	// image's unmeasured pixels, which tracking leaves out.
	NonFinite int
}

// NonFinite returns the number of pixels of img that are NaN or ±Inf. Only
// float images (32-bit TIFF) can hold them; tracking treats them as
// unmeasured (outside the mask in the reference, a lost point where a
// deformed subset lands on one).
func NonFinite(img *subset.Image) int {
	n := 0
	for _, v := range img.Pix {
		if f := float64(v); math.IsNaN(f) || math.IsInf(f, 0) {
			n++
		}
	}
	return n
}

// Describe returns the gray-level statistics of img. Non-finite pixels are
// counted in NonFinite and left out of the rest.
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
		if math.IsNaN(f) || math.IsInf(f, 0) {
			s.NonFinite++
			continue
		}
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
	s.Saturated, s.Dark = float64(sat)/n, float64(dark)/n
	if s.NonFinite == len(img.Pix) {
		s.Min, s.Mean, s.Max = math.NaN(), math.NaN(), math.NaN()
		return s
	}
	s.Mean = sum / float64(len(img.Pix)-s.NonFinite)
	return s
}
