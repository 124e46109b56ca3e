package speckle

import (
	"math"

	"spallscope/subset"
)

// staticPairNoise estimates the image noise σ from two photos of the same
// still face taken alike: they differ by noise alone, whose variance the
// difference carries twice, so σ = std(I1 − I2)/√2 (common practice, no
// source). The mean difference is removed first, so that a uniform change
// of exposure between the shots does not count as noise. Pixels clipped at
// the bottom or top level of the depth in either image are left out: there
// the noise is cut off and would be underestimated. n is the number of
// pixels used; σ is 0 when fewer than two are left.
//
// With 8-bit quantisation each photo also carries the rounding error, of
// variance 1/12 level² when σ is a level or more (Widrow's quantisation
// theorem; Widrow & Kollár 2008, Quantization Noise, from memory), so the
// estimate is √(σ_sensor² + 1/12): the noise the correlation actually sees.
func staticPairNoise(a, b *subset.Image) (sigma float64, n int) {
	clipped := func(v float32, m *subset.Image) bool {
		return m.Depth != 0 && (v <= 0 || float64(v) >= m.MaxLevel())
	}
	var sum float64
	for i, v := range a.Pix {
		if clipped(v, a) || clipped(b.Pix[i], b) {
			continue
		}
		sum += float64(v) - float64(b.Pix[i])
		n++
	}
	if n < 2 {
		return 0, n
	}
	mean := sum / float64(n)
	var ss float64
	for i, v := range a.Pix {
		if clipped(v, a) || clipped(b.Pix[i], b) {
			continue
		}
		d := float64(v) - float64(b.Pix[i]) - mean
		ss += d * d
	}
	return math.Sqrt(ss/float64(n-1)) / math.Sqrt2, n
}
