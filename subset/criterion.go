package subset

import "math"

// ZNSSD returns the zero-normalized sum of squared differences of two
// equal-length intensity samples,
//
//	Σ [ (f-f̄)/‖f-f̄‖ - (g-ḡ)/‖g-ḡ‖ ]²,
//
// which lies in [0, 4] and is insensitive to an offset and a positive scale
// of either sample. It equals 2(1 - ZNCC) (Pan, Xie & Wang 2010,
// "Equivalence of digital image correlation criteria for pattern
// matching", Applied Optics 49(28):5501–5509).
//
// ZNSSD returns NaN if either sample has zero variance or is empty, and
// panics if the lengths differ. It does not allocate.
func ZNSSD(f, g []float64) float64 { return 2 * (1 - ZNCC(f, g)) }

// ZNCC returns the zero-normalized cross-correlation coefficient of two
// equal-length intensity samples, Σ(f-f̄)(g-ḡ) / (‖f-f̄‖‖g-ḡ‖), in [-1, 1]
// (Pan, Xie & Wang 2010). It is the Pearson correlation coefficient of the
// two samples.
//
// ZNCC returns NaN if either sample has zero variance or is empty, and
// panics if the lengths differ. It does not allocate.
func ZNCC(f, g []float64) float64 {
	if len(f) != len(g) {
		panic("subset: ZNCC of samples of different lengths")
	}
	if len(f) == 0 {
		return math.NaN()
	}
	var fm, gm float64
	for i := range f {
		fm += f[i]
		gm += g[i]
	}
	fm /= float64(len(f))
	gm /= float64(len(g))
	var sff, sgg, sfg float64
	for i := range f {
		df, dg := f[i]-fm, g[i]-gm
		sff += df * df
		sgg += dg * dg
		sfg += df * dg
	}
	if sff == 0 || sgg == 0 {
		return math.NaN()
	}
	return sfg / math.Sqrt(sff*sgg)
}

// ZNCCFromZNSSD converts a ZNSSD value to the equivalent ZNCC,
// 1 - ZNSSD/2 (Pan, Xie & Wang 2010).
func ZNCCFromZNSSD(znssd float64) float64 { return 1 - znssd/2 }
