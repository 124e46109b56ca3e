package dic

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// sortedMedian is median's reference: the middle of the values sorted
// (reordering them) by the standard library (slices.Sort, NaNs first).
func sortedMedian(s []float64) float64 {
	slices.Sort(s)
	n := len(s)
	if n%2 == 1 {
		return s[n/2]
	}
	return (s[n/2-1] + s[n/2]) / 2
}

// median selects the value slices.Sort puts in the middle, bit for bit,
// for odd and even lengths, many ties, NaNs, and already sorted or
// reversed values.
func TestMedianMatchesSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 3000 {
		n := 1 + rng.IntN(60)
		if trial%100 == 0 {
			n = 1 + rng.IntN(20000)
		}
		xs := make([]float64, n)
		for i := range xs {
			switch trial % 5 {
			case 0:
				xs[i] = float64(rng.IntN(4)) // ties
			case 1:
				xs[i] = rng.NormFloat64()
				if rng.IntN(8) == 0 {
					xs[i] = math.NaN()
				}
			case 2:
				xs[i] = float64(i) // sorted
			case 3:
				xs[i] = float64(-i) // reversed
			default:
				xs[i] = 2 * (1 - rng.Float64()) // a ZNCC's residual
			}
		}
		want := sortedMedian(slices.Clone(xs))
		got := median(slices.Clone(xs))
		if math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want)) {
			t.Fatalf("trial %d, %d values: median %v, sorted middle %v", trial, n, got, want)
		}
	}
	if !math.IsNaN(median(nil)) {
		t.Error("median of no values is not NaN")
	}
}

// BenchmarkMedian is the median of a 20 MP frame's ZNCC residuals at a
// 10 px step; BenchmarkMedianSorted the sort it replaced.
func BenchmarkMedian(b *testing.B)       { benchmarkMedian(b, median) }
func BenchmarkMedianSorted(b *testing.B) { benchmarkMedian(b, sortedMedian) }

func benchmarkMedian(b *testing.B, m func([]float64) float64) {
	rng := rand.New(rand.NewPCG(7, 8))
	src := make([]float64, 200000)
	for i := range src {
		src[i] = 2 * (1 - (0.99 + 0.01*rng.Float64()))
	}
	xs := make([]float64, len(src))
	for b.Loop() {
		copy(xs, src)
		m(xs)
	}
}
