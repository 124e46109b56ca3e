package strain

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// The running median of three on a worked example (by hand from the
// definition, Tukey 1977, ch. 7; from memory): a monotone series passes
// unchanged, one spike is replaced by the nearer neighbour and the value
// next to it by the median it then sees, the ends are copied on.
func TestRunningMedian3Worked(t *testing.T) {
	for _, c := range []struct{ in, want []float64 }{
		{[]float64{0, 1, 2, 3, 5, 8}, []float64{0, 1, 2, 3, 5, 8}},
		{[]float64{0, 1, 2, 9, 4, 5, 6}, []float64{0, 1, 2, 4, 5, 5, 6}},
		{[]float64{3, -4, 1, 0, 2}, []float64{3, 1, 0, 1, 2}},
		{[]float64{7, 2}, []float64{7, 2}},
		{nil, []float64{}},
	} {
		if got := runningMedian3(c.in); !slices.Equal(got, c.want) {
			t.Errorf("runningMedian3(%v) = %v, want %v", c.in, got, c.want)
		}
	}
	// median3 over every order of three values.
	for _, p := range [][3]float64{{1, 2, 3}, {1, 3, 2}, {2, 1, 3}, {2, 3, 1}, {3, 1, 2}, {3, 2, 1}} {
		if got := median3(p[0], p[1], p[2]); got != 2 {
			t.Errorf("median3%v = %g, want 2", p, got)
		}
	}
}

// The median of three independent standard normal values has variance
// 0.4487 (the sample median's variance for n = 3, tables of normal order
// statistics, e.g. David and Nagaraja 2003, Order Statistics; from
// memory): the running median of white Gaussian noise, away from the
// ends, over 3·10⁵ values, within 0.01 of it (the estimate's standard
// error is about 0.002).
func TestRunningMedian3Variance(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 1977))
	xs := make([]float64, 300002)
	for k := range xs {
		xs[k] = rng.NormFloat64()
	}
	m := runningMedian3(xs)
	// Every third value: medians three apart share no input.
	var s, s2 float64
	n := 0
	for k := 1; k+1 < len(m); k += 3 {
		s += m[k]
		s2 += m[k] * m[k]
		n++
	}
	mean := s / float64(n)
	v := s2/float64(n) - mean*mean
	if math.Abs(v-0.4487) > 0.01 {
		t.Errorf("variance of the running median of three of unit Gaussian noise %.4f, want 0.4487 ± 0.01", v)
	}
}

// One noisy frame moves the CUSUM's onset (detectable) by at most one
// frame: a ramp of 0.3 of the limit a frame from frame 5 on, no drift,
// first above the limit at frame 8 (0.3·4 = 1.2; worked by hand). A spike
// of +2 limits at frame 6 would start the excursion there without the
// running median (S_6 = 1.6, S_7 = 1.5, S_8 = 1.7: onset 6), a dip to −1
// at frame 9 would end it (S_9 = 0: onset 10); with it the spike leaves
// frame 7 at the median of 2.6 and 1.2 (onset 7) and the dip frame 8 at
// the median of 0.9 and −1 (onset 9), and the ramp alone gives 8.
func TestDetectableIgnoresOneNoisyFrame(t *testing.T) {
	const n, trigger, limit = 16, 13, 1.0
	ramp := func() []float64 {
		y := make([]float64, n)
		for k := 5; k < n; k++ {
			y[k] = 0.3 * float64(k-4)
		}
		return y
	}
	c := DriftChange{ChangePoint: ChangePoint{Model: SlopeChange, Onset: 5, Size: 0.3}}
	spike, dip := ramp(), ramp()
	spike[6] += 2
	dip[9] = -1
	for _, s := range []struct {
		name string
		y    []float64
		want int
	}{{"ramp", ramp(), 8}, {"spike at 6", spike, 7}, {"dip at 9", dip, 9}} {
		if got := detectable(c, s.y, nil, limit, 0, trigger); got != s.want {
			t.Errorf("%s: onset %d, want %d", s.name, got, s.want)
		}
	}
}
