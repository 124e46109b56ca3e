package frames

import (
	"cmp"
	"math"
	"slices"

	"spallscope/subset"
)

// RegionMean returns the mean gray level of img's finite pixels whose
// centres inside reports true (nil: every pixel), with their number; the
// mean is NaN when there is none.
func RegionMean(img *subset.Image, inside func(x, y float64) bool) (mean float64, n int) {
	var sum float64
	for y := 0; y < img.Height; y++ {
		row := img.Row(y)
		for x, v := range row {
			f := float64(v)
			if math.IsNaN(f) || math.IsInf(f, 0) || (inside != nil && !inside(float64(x), float64(y))) {
				continue
			}
			sum += f
			n++
		}
	}
	if n == 0 {
		return math.NaN(), 0
	}
	return sum / float64(n), n
}

// Flash is a frame whose brightness jumps up from the frames before it: a
// flash or an LED in view, fired at a known time of the load log, gives a
// sync pair (the frame's camera time ↔ that log time).
type Flash struct {
	Frame int
	// Jump is the frame's mean over the brightest of the frames before it
	// (up to FlashBaseline of them), less 1.
	Jump float64
}

// FlashBaseline is how many frames before a frame make its baseline.
const FlashBaseline = 5

// FindFlashes returns the frames of a sequence, whose mean gray levels
// are means, that are brighter than each of the FlashBaseline frames
// before them by more than minJump (a fraction), strongest first. Against
// the brightest frame before it, a lamp that flickers or dims does not
// rise, a flash does. A light that stays on counts once, at its first
// frame. Frames without a mean (NaN) are skipped.
func FindFlashes(means []float64, minJump float64) []Flash {
	var out []Flash
	lastFlagged := -2
	for i := 1; i < len(means); i++ {
		top := math.Inf(-1)
		for j := max(0, i-FlashBaseline); j < i; j++ {
			if !math.IsNaN(means[j]) {
				top = math.Max(top, means[j])
			}
		}
		if !(top > 0) || math.IsNaN(means[i]) || math.IsInf(top, 0) {
			continue
		}
		if jump := means[i]/top - 1; jump > minJump {
			if lastFlagged != i-1 {
				out = append(out, Flash{Frame: i, Jump: jump})
			}
			lastFlagged = i
		}
	}
	slices.SortStableFunc(out, func(a, b Flash) int { return cmp.Compare(b.Jump, a.Jump) })
	return out
}
