package subset

import (
	"math"
	"testing"
)

// TestSSSIGRamp checks SSSIG on a linear ramp a·x + b·y, whose gradient is
// (a, b) everywhere (calculus), so over a (2r+1)² subset the directional
// sums are n·a² and n·b² exactly (Pan et al. 2008 definition).
func TestSSSIGRamp(t *testing.T) {
	const a, b, r = 1.5, -0.5, 7
	img := NewImage(90, 90, 0)
	for y := 0; y < 90; y++ {
		for x := 0; x < 90; x++ {
			img.Set(x, y, float32(a*float64(x)+b*float64(y)+20))
		}
	}
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		n := float64((2*r + 1) * (2*r + 1))
		sx, sy := SSSIGXY(sp, 45, 45, r)
		if math.Abs(sx-n*a*a) > 1e-6 || math.Abs(sy-n*b*b) > 1e-6 {
			t.Errorf("%v: SSSIGXY = (%g, %g), want (%g, %g)", kind, sx, sy, n*a*a, n*b*b)
		}
		if s := SSSIG(sp, 45, 45, r); math.Abs(s-n*b*b) > 1e-6 {
			t.Errorf("%v: SSSIG = %g, want the smaller sum %g", kind, s, n*b*b)
		}
	}
}

// TestSSSIGSinusoid checks SSSIG on A·sin(2πx/T) with T = 6 px over a
// 15-px-wide subset (a whole number of half-periods of cos², so the mean
// of cos² is exactly 1/2): Σ fx² = n·A²(2π/T)²/2 (calculus). The spline's
// derivative at T = 6 px differs from the analytic one by its
// interpolation error; measured 0.07 % (quintic) and 1.5 % (cubic).
func TestSSSIGSinusoid(t *testing.T) {
	const amp, period, r = 50.0, 6.0, 7
	img := NewImage(90, 90, 8)
	for y := 0; y < 90; y++ {
		for x := 0; x < 90; x++ {
			img.Set(x, y, float32(128+amp*math.Sin(2*math.Pi*float64(x)/period)))
		}
	}
	n := float64((2*r + 1) * (2*r + 1))
	k := 2 * math.Pi / period
	want := n * amp * amp * k * k / 2
	tol := map[Interpolation]float64{Bicubic: 0.03, Biquintic: 0.002}
	for _, kind := range kinds {
		sx, sy := SSSIGXY(NewSpline(img, kind), 45, 45, r)
		rel := math.Abs(sx-want) / want
		t.Logf("%v: SSSIG_x relative error %.3g", kind, rel)
		if rel > tol[kind] || sy > 1e-12*want {
			t.Errorf("%v: SSSIGXY = (%g, %g), want (%g ± %g %%, 0)", kind, sx, sy, want, 100*tol[kind])
		}
	}
}

// TestPredictedNoise checks the formula √2·σ/√SSSIG (Pan et al. 2008) on a
// worked value: σ = 2, SSSIG = 8e4 gives √2·2/282.84 = 0.01 px.
func TestPredictedNoise(t *testing.T) {
	if got := PredictedNoise(2, 8e4); math.Abs(got-0.01) > 1e-15 {
		t.Errorf("PredictedNoise(2, 8e4) = %g, want 0.01", got)
	}
}
