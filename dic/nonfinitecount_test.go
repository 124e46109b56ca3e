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

// anyNonFinite agrees with math.IsNaN and math.IsInf for each edge value
// of the binary32 encoding (see TestCountNonFiniteMatchesMath) placed
// alone at every position of finite values, in slices of odd and even
// length that start on and off an 8-byte boundary, and for slices large
// enough to be scanned in parts, with the value in each part.
func TestAnyNonFiniteMatchesMath(t *testing.T) {
	edges := []uint32{
		0x7f800000, 0xff800000, 0x7fc00000, 0x7f800001, 0xffc00000, 0xffffffff, 0x7fffffff,
		0x7f7fffff, 0xff7fffff, 0x00000001, 0x807fffff, 0x00800000, 0x00000000, 0x80000000, 0x3f800000,
	}
	back := make([]float32, 24)
	for i := range back {
		back[i] = math.Float32frombits(0x7f7fffff) // the largest finite value, one step below all ones
	}
	for _, bits := range edges {
		v := math.Float32frombits(bits)
		want := math.IsNaN(float64(v)) || math.IsInf(float64(v), 0)
		for start := 0; start < 2; start++ {
			for n := 0; n+start <= len(back); n++ {
				pix := back[start : start+n]
				if anyNonFinite(pix) {
					t.Fatalf("start %d length %d: finite values reported non-finite", start, n)
				}
				for k := range pix {
					old := pix[k]
					pix[k] = v
					if got := anyNonFinite(pix); got != want {
						t.Errorf("%#08x at %d of %d (start %d): anyNonFinite %v, want %v", bits, k, n, start, got, want)
					}
					pix[k] = old
				}
			}
		}
	}
	big := make([]float32, 3<<20+1)
	if anyNonFinite(big) {
		t.Fatal("zero image reported non-finite")
	}
	for _, k := range []int{0, 1 << 20, len(big)/2 + 1, len(big) - 1} {
		big[k] = float32(math.Inf(-1))
		if !anyNonFinite(big) || !anyNonFinite(big[1:]) && k != 0 {
			t.Errorf("−Inf at %d of %d not found", k, len(big))
		}
		big[k] = 0
	}
}

// BenchmarkCountNonFinite is the scan of a 20 MP frame; against it,
// BenchmarkFiniteByPixel is the test pixel by pixel it replaced.
func BenchmarkCountNonFinite(b *testing.B) {
	pix := frame20MP()
	for b.Loop() {
		if countNonFinite(pix) != 0 {
			b.Fatal("non-finite pixel in a zero image")
		}
	}
}

// BenchmarkAnyNonFinite is the question a frame asks first (about a
// tenth of BenchmarkCountNonFinite's time on two cores, measured).
func BenchmarkAnyNonFinite(b *testing.B) {
	pix := frame20MP()
	for b.Loop() {
		if anyNonFinite(pix) {
			b.Fatal("non-finite pixel in a zero image")
		}
	}
}

func BenchmarkFiniteByPixel(b *testing.B) {
	pix := frame20MP()
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

// frame20MP returns the pixels of a 20 MP frame of whole gray levels,
// written, so that a scan reads them from memory as a frame's would (an
// untouched zero slice maps every page to one zero page, which stays in
// the cache).
func frame20MP() []float32 {
	pix := make([]float32, 5472*3648)
	for i := range pix {
		pix[i] = float32(i % 251)
	}
	return pix
}
