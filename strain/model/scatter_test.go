package model

import (
	"math"
	"strings"
	"testing"
	"time"
)

// Points whose spread overflows float64 (±1e308 px: their distance is
// +Inf), or a cluster with outliers near both ends of float64's range,
// must not hang the interpolation. Before, the nearest-neighbour search
// for the default radius doubled an infinite radius forever, over 2^63
// bucket indices (found by FuzzRead). Now two points 2e308 px apart get no
// radius, with an error that says why, and the cluster with outliers is
// interpolated: at its centre the plane u = x + 2y of its four points
// gives 0.5 + 2·0.5 = 1.5 (exact for a linear field, the scheme's
// property; tolerance 1e-9).
func TestInterpolateFarPoints(t *testing.T) {
	run := func(name, text string, check func(*interpolator, error)) {
		done := make(chan struct{})
		go func() {
			defer close(done)
			m, err := parse(strings.NewReader(text), name, Format{Units: PX})
			if err != nil {
				t.Errorf("%s: %v", name, err)
				return
			}
			check(newInterpolator(m, 0))
		}()
		select {
		case <-done:
		case <-time.After(20 * time.Second):
			t.Fatalf("%s: interpolation did not finish in 20 s", name)
		}
	}
	run("far.csv", "x,y,u\n1e308,2,3\n-1e308,2,3\n", func(_ *interpolator, err error) {
		if err == nil || !strings.Contains(err.Error(), "far.csv: cannot set an interpolation radius") {
			t.Errorf("points 2e308 px apart: %v, want no radius", err)
		}
	})
	run("outliers.csv", "x,y,u\n0,0,0\n1,0,1\n0,1,2\n1,1,3\n1e300,1e300,0\n-1e300,-1e300,0\n", func(ip *interpolator, err error) {
		if err != nil {
			t.Errorf("cluster with outliers: %v", err)
			return
		}
		if v, how := ip.at(U, 0.5, 0.5); how == noValue || math.Abs(v-1.5) > 1e-9 {
			t.Errorf("u at (0.5, 0.5) = %g (%v), want 1.5", v, how)
		}
	})
}
