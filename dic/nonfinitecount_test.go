package dic

import (
	"math"
	"math/rand/v2"
	"testing"
)

// countNonFinite agrees with the standard library's math.IsNaN and
// math.IsInf on the edges of the IEEE 754 binary32 encoding (the
// infinities, quiet, signalling and negative NaNs, the largest finite
// values, denormals, signed zeros) and on random bit patterns, where about
// 1 in 256 has an all-ones exponent.
func TestCountNonFiniteMatchesMath(t *testing.T) {
	edges := []uint32{
		0x7f800000, 0xff800000, // ±Inf
		0x7fc00000, 0x7f800001, 0xffc00000, 0xffffffff, 0x7fffffff, // NaNs
		0x7f7fffff, 0xff7fffff, // ±largest finite
		0x00000001, 0x807fffff, 0x00800000, // denormals, smallest normal
		0x00000000, 0x80000000, 0x3f800000, // ±0, 1
	}
	rng := rand.New(rand.NewPCG(3, 4))
	pix := make([]float32, 0, len(edges)+100003)
	for _, b := range edges {
		pix = append(pix, math.Float32frombits(b))
	}
	for len(pix) < cap(pix) {
		pix = append(pix, math.Float32frombits(rng.Uint32()))
	}
	want := 0
	for _, v := range pix {
		if math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) {
			want++
		}
	}
	if got := countNonFinite(pix); got != want {
		t.Errorf("countNonFinite = %d, math.IsNaN/IsInf count %d", got, want)
	}
	if got := countNonFinite(pix[:len(edges)]); got != 7 {
		t.Errorf("countNonFinite of the edge values = %d, want the 7 infinities and NaNs", got)
	}
}

// BenchmarkCountNonFinite is the scan of a 20 MP frame; against it,
// BenchmarkFiniteByPixel is the test pixel by pixel it replaced.
func BenchmarkCountNonFinite(b *testing.B) {
	pix := make([]float32, 5472*3648)
	for b.Loop() {
		if countNonFinite(pix) != 0 {
			b.Fatal("non-finite pixel in a zero image")
		}
	}
}

func BenchmarkFiniteByPixel(b *testing.B) {
	pix := make([]float32, 5472*3648)
	for b.Loop() {
		n := 0
		for _, v := range pix {
			if !finite(v) {
				n++
			}
		}
		if n != 0 {
			b.Fatal("non-finite pixel in a zero image")
		}
	}
}
