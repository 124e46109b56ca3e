package baseline

import "testing"

// The two timed methods of the bench table on its first case (512² frame,
// 21 px subsets): spallscope's tracker and OpenCV's pyramidal
// Lucas–Kanade. Compare b.N-normalised ns/op of the two in one run. The
// frames are converted to OpenCV's images before the timing, as Compare
// does.
func benchmarkMethod(b *testing.B, m func(*Case, int) ([]float64, []float64, error)) {
	cases, err := Cases(512)
	if err != nil {
		b.Fatal(err)
	}
	c := cases[0]
	release, err := c.holdMats()
	if err != nil {
		b.Fatal(err)
	}
	defer release()
	b.ResetTimer()
	for range b.N {
		if _, _, err := m(c, 21); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(c.Points)), "ns/point")
}

func BenchmarkSpallscope(b *testing.B)  { benchmarkMethod(b, Spallscope) }
func BenchmarkLucasKanade(b *testing.B) { benchmarkMethod(b, LucasKanade) }
