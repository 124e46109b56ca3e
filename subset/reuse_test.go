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

// A subset with every pixel measured gives the same solution whether it
// comes with a mask of all-measured pixels (the general path over runs)
// or without one (the full-square path, with its paired moments), to
// rounding; both orders.
func TestFullSquareEqualsMaskedPath(t *testing.T) {
	pat := testPattern(22)
	refImg := pat.render(testSize, testSize, nil)
	field := globalWarp{cx: 64, cy: 64, p: Params{PU: 1.3, PUx: 0.008, PUy: -0.004, PV: 0.6, PVx: 0.002, PVy: -0.01}}
	defImg := pat.render(testSize, testSize, field.inverse)
	ref, def := NewSpline(refImg, Bicubic), NewSpline(defImg, Bicubic)
	mask := make([]uint8, testSize*testSize)
	for i := range mask {
		mask[i] = 255
	}
	for _, order := range []ShapeOrder{Affine, Quadratic} {
		s := NewSolver(Config{Radius: 10, Order: order})
		for _, pt := range gridPoints() {
			guess := nearestTranslation(field.at(float64(pt[0]), float64(pt[1])))
			a := s.Solve(ref, def, nil, pt[0], pt[1], guess)
			b := s.Solve(ref, def, mask, pt[0], pt[1], guess)
			if a.Status != Converged || b.Status != Converged || a.Iterations != b.Iterations {
				t.Fatalf("%v at %v: %v in %d, masked %v in %d", order, pt, a.Status, a.Iterations, b.Status, b.Iterations)
			}
			for k := range a.P {
				if math.Abs(a.P[k]-b.P[k]) > 1e-9 {
					t.Errorf("%v at %v: parameter %d %.12g, masked path %.12g", order, pt, k, a.P[k], b.P[k])
				}
			}
		}
	}
}
