package baseline

import (
	"math"
	"testing"
)

// The vertex of y = 1 − (x − x0)² sampled at −1, 0, 1 is x0 exactly for a
// true parabola (algebra; tolerance 1e-12), and a flat triple gives 0.
func TestParabolicPeak(t *testing.T) {
	for _, x0 := range []float64{-0.45, -0.2, 0, 0.3, 0.49} {
		y := func(x float64) float64 { return 1 - (x-x0)*(x-x0) }
		if got := parabolicPeak(y(-1), y(0), y(1)); math.Abs(got-x0) > 1e-12 {
			t.Errorf("vertex at %g: got %g", x0, got)
		}
	}
	if got := parabolicPeak(2, 2, 2); got != 0 {
		t.Errorf("flat triple: got %g, want 0", got)
	}
}
