package speckle

import (
	"math"
	"testing"

	"spallscope/dic/synth"
	"spallscope/subset"
)

// render records the synthetic lab's pattern p on an n×n 8-bit frame,
// moved by field (nil: still), with camera noise sigma; frame selects
// independent noise.
func render(t *testing.T, p synth.Pattern, n int, field synth.Field, sigma float64, frame int) *subset.Image {
	t.Helper()
	sp, err := synth.NewSpeckles(p, n, n)
	if err != nil {
		t.Fatal(err)
	}
	img, err := synth.Render(synth.Scene{Speckles: sp, Field: field}, synth.Camera{Depth: 8, Noise: sigma, Seed: 1000 + p.Seed}, n, n, frame)
	if err != nil {
		t.Fatal(err)
	}
	return img
}

// ramp returns a w×h image with gray level c + a·x + b·y at pixel (x, y).
func ramp(w, h, depth int, a, b, c float64) *subset.Image {
	img := subset.NewImage(w, h, depth)
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			img.Set(x, y, float32(c+a*float64(x)+b*float64(y)))
		}
	}
	return img
}

// row returns the table row of the given subset size.
func row(t *testing.T, r *Report, size int) SubsetNoise {
	t.Helper()
	for _, s := range r.Subsets {
		if s.Size == size {
			return s
		}
	}
	t.Fatalf("no table row for subset %d px", size)
	return SubsetNoise{}
}

// relErr is |got − want|/|want|.
func relErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }
