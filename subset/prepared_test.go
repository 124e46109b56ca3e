package subset

import (
	"math/rand/v2"
	"testing"
)

// A subset solved with its reference side restored from a Prepared gives
// Solve's result bit for bit: the first frame records what Prepare
// computed, the frames after take it back (the reference is the same) and
// load the values with the mean already taken off, on full and masked
// subsets, both orders and both kernels, on noisy images. The imposed translations are the frames' answers;
// Solve's own accuracy is held by the tests of icgn_test.go.
func TestPrepareWithEqualsPrepare(t *testing.T) {
	pat := testPattern(37)
	const size = testSize
	// Noise of 2 gray levels in both images, so that the noise-aware
	// stopping rule, which reads the restored invUV, decides.
	rng := rand.New(rand.NewPCG(37, 38))
	refImg := addNoise(pat.render(size, size, nil), rng, 2)
	mask := make([]uint8, size*size)
	for i := range mask {
		mask[i] = 1
	}
	for y := 40; y < 90; y++ {
		mask[y*size+70] = 0 // one column out of the subsets at x = 64 and 84
	}
	pts := gridPoints()
	for _, c := range []struct {
		kind  Interpolation
		order ShapeOrder
	}{{Bicubic, Affine}, {Bicubic, Quadratic}, {Biquintic, Affine}} {
		kind, order := c.kind, c.order
		ref := NewSpline(refImg, kind)
		for _, m := range [][]uint8{nil, mask} {
			s := NewSolver(Config{Radius: 10, Order: order})
			cache := NewPrepared(len(pts)+1, order)
			for f, shift := range [][2]float64{{0.4, -0.3}, {1.2, 0.7}, {-0.6, 2.1}} {
				u, v := shift[0], shift[1]
				def := NewSpline(addNoise(pat.render(size, size, func(x, y float64) (float64, float64) { return x - u, y - v }), rng, 2), kind)
				for k, pt := range pts {
					guess := nearestTranslation(Translation(u, v))
					// The cached solve first, so that nothing of the
					// reference solve's is left in the solver.
					st := s.PrepareWith(ref, m, pt[0], pt[1], &cache[k])
					got := s.Iterate(def, guess)
					want := s.Solve(ref, def, m, pt[0], pt[1], guess)
					if st != Converged {
						t.Fatalf("%v %v frame %d at %v: PrepareWith %v", kind, order, f, pt, st)
					}
					if got != want {
						t.Errorf("%v %v, mask %v, frame %d at %v: %+v with the cache (set %v), Solve %+v", kind, order, m != nil, f, pt, got, f > 0, want)
					}
				}
			}
			// A subset crossing the image's edge is not recorded.
			if st := s.PrepareWith(ref, m, 5, 64, &cache[len(pts)]); st != OutOfImage || cache[len(pts)].set {
				t.Errorf("%v: crossing the edge: %v, recorded %v", order, st, cache[len(pts)].set)
			}
		}
	}
}
