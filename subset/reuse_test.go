package subset

import (
	"math"
	"testing"
)

// A subset started from a solved neighbour's last sampled shape, sharing
// its samples, lands where Solve from the same start lands, to rounding
// (the positions of the shared pixels differ by about 1e-13 px), in the
// same number of iterations; with the shared values spoiled it lands
// elsewhere, so the sharing is really used. Neighbours 5 and 8 px away
// along x and y, on the affine field of TestSolveAffine.
func TestSolveSharedEqualsSolve(t *testing.T) {
	pat := testPattern(21)
	refImg := pat.render(testSize, testSize, nil)
	field := globalWarp{cx: 64, cy: 64, p: Params{PU: 2.3, PUx: 0.01, PUy: 0.005, PV: -1.6, PVx: -0.003, PVy: -0.02}}
	defImg := pat.render(testSize, testSize, field.inverse)
	ref, def := NewSpline(refImg, Bicubic), NewSpline(defImg, Bicubic)
	const radius = 10
	s := NewSolver(Config{Radius: radius, Order: Affine})
	keep := NewSamples(radius)
	first := s.SolveShared(ref, def, nil, 64, 64, nearestTranslation(field.at(64, 64)), nil, nil, keep)
	if first.Status != Converged || !keep.OK() {
		t.Fatalf("first subset: %v, samples kept %v", first.Status, keep.OK())
	}
	for _, d := range [][2]int{{5, 0}, {-8, 0}, {0, 5}, {0, -8}} {
		x, y := 64+d[0], 64+d[1]
		guess := keep.Guess(x, y)
		want := s.Solve(ref, def, nil, x, y, guess)
		got := s.SolveShared(ref, def, nil, x, y, guess, nil, keep, nil)
		if got.Status != want.Status || got.Iterations != want.Iterations {
			t.Errorf("offset %v: %v in %d iterations, Solve %v in %d", d, got.Status, got.Iterations, want.Status, want.Iterations)
		}
		for k := 0; k < 6; k++ {
			if math.Abs(got.P[k]-want.P[k]) > 1e-9 {
				t.Errorf("offset %v: parameter %d %.12g, Solve %.12g", d, k, got.P[k], want.P[k])
			}
		}
		spoiled := *keep
		spoiled.G = make([]float64, len(keep.G)) // all black
		bad := s.SolveShared(ref, def, nil, x, y, guess, nil, &spoiled, nil)
		if bad.Status == Converged && math.Abs(bad.P[PU]-want.P[PU]) < 1e-6 && bad.Iterations == want.Iterations {
			t.Errorf("offset %v: spoiled shared values changed nothing: the samples are not shared", d)
		}
	}
	// A start other than the neighbour's carried shape shares nothing.
	other := keep.Guess(69, 64)
	other[PU] += 0.01
	a := s.Solve(ref, def, nil, 69, 64, other)
	b := s.SolveShared(ref, def, nil, 69, 64, other, nil, keep, nil)
	if a != b {
		t.Errorf("another start: %+v, Solve %+v", b, a)
	}
}
