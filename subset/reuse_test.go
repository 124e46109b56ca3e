package subset

import (
	"fmt"
	"math"
	"math/rand/v2"
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

// sampleSharedRows is sampleShared as it was written first, the
// reference of the batched one: the shared span of each row copied from
// the prior's samples, the pieces either side interpolated by lineValues.
func (s *Solver) sampleSharedRows(def *Spline) {
	r := s.cfg.Radius
	side := 2*r + 1
	dx, dy := s.priorDX, s.priorDY
	c0, c1 := max(-r, dx-r), min(r, dx+r)
	for j := -r; j <= r; j++ {
		k0 := (j + r) * side
		pj := j - dy
		ox, oy := s.ox[j+r], s.oy[j+r]
		if pj < -r || pj > r || c0 > c1 {
			def.lineValues(ox, oy, s.ax, s.ay, 0, s.gs[k0:k0+side])
			continue
		}
		a, b := k0+c0+r, k0+c1+r+1
		if a > k0 {
			def.lineValues(ox, oy, s.ax, s.ay, 0, s.gs[k0:a])
		}
		pk := (pj+r)*side + c0 - dx + r
		copy(s.gs[a:b], s.prior.G[pk:pk+b-a])
		if b < k0+side {
			def.lineValues(ox, oy, s.ax, s.ay, b-k0, s.gs[b:k0+side])
		}
	}
}

// sampleShared, which interpolates the pixels it does not share in one
// listed call, gives bit for bit what lineValues row piece by row piece
// gives (the kernels' values do not depend on where a position falls in
// a call): both interpolations, both kernel paths, prior offsets sharing
// most, a corner, a single column or row, everything, and nothing (an
// offset of a whole side, which SolveShared never passes on, but the
// code must still handle).
func TestSampleSharedEqualsRows(t *testing.T) {
	pat := testPattern(23)
	refImg := pat.render(testSize, testSize, nil)
	defImg := pat.render(testSize, testSize, func(x, y float64) (float64, float64) { return x - 0.37, y + 0.61 })
	const radius = 10
	const side = 2*radius + 1
	offsets := [][2]int{{0, 0}, {5, 0}, {-10, 0}, {1, 0}, {-1, 0}, {0, 7}, {3, -4}, {-3, 4}, {-20, 20}, {20, 0}, {0, -20}, {side, 0}, {0, -side}, {side, side}}
	p := Params{PU: 0.37, PUx: 0.013, PUy: -0.007, PV: -0.61, PVx: 0.004, PVy: -0.011}
	for _, kind := range kinds {
		ref, def := NewSpline(refImg, kind), NewSpline(defImg, kind)
		for _, vector := range []bool{false, true} {
			if vector && !useVector {
				continue
			}
			withPath(t, vector, func() {
				s := NewSolver(Config{Radius: radius, Order: Affine})
				if st := s.Prepare(ref, nil, 64, 64); st != Converged || !s.square {
					t.Fatalf("prepare: %v, full square %v", st, s.square)
				}
				if !s.affineWarp(&p, float64(def.width-1), float64(def.height-1)) {
					t.Fatal("the warped subset leaves the image")
				}
				prior := NewSamples(radius)
				rng := rand.New(rand.NewPCG(7, 9))
				for k := range prior.G {
					prior.G[k] = 1000 + rng.Float64() // unlike any interpolated value
				}
				s.prior = prior
				want := make([]float64, s.n)
				for _, d := range offsets {
					s.priorDX, s.priorDY = d[0], d[1]
					for k := range s.gs[:s.n] {
						s.gs[k] = math.NaN()
					}
					s.sampleSharedRows(def)
					copy(want, s.gs[:s.n])
					for k := range s.gs[:s.n] {
						s.gs[k] = math.NaN()
					}
					s.sampleShared(def)
					copied := 0
					for k, w := range want {
						if g := s.gs[k]; math.Float64bits(g) != math.Float64bits(w) {
							t.Fatalf("%v vector=%t offset %v: pixel %d is %.17g, per row %.17g", kind, vector, d, k, g, w)
						}
						if w >= 1000 {
							copied++
						}
					}
					// The shared pixels are the overlap of two side×side squares.
					ow, oh := max(0, side-abs(d[0])), max(0, side-abs(d[1]))
					if copied != ow*oh {
						t.Errorf("%v vector=%t offset %v: %d pixels copied, want %d", kind, vector, d, copied, ow*oh)
					}
				}
				s.prior = nil
			})
		}
	}
}

func abs(a int) int {
	if a < 0 {
		return -a
	}
	return a
}

// BenchmarkSampleShared times one sampling of a full square subset with
// samples shared with a neighbour a step away to the right, left, below
// or above: sampleShared
// (the pixels not shared in one listed call) against sampleSharedRows
// (lineValues per row piece) on the same inputs in one run; their ratio
// is the batching's gain.
func BenchmarkSampleShared(b *testing.B) {
	pat := testPattern(23)
	refImg := pat.render(testSize, testSize, nil)
	defImg := pat.render(testSize, testSize, func(x, y float64) (float64, float64) { return x - 0.37, y + 0.61 })
	ref, def := NewSpline(refImg, Bicubic), NewSpline(defImg, Bicubic)
	p := Params{PU: 0.37, PUx: 0.013, PUy: -0.007, PV: -0.61, PVx: 0.004, PVy: -0.011}
	for _, radius := range []int{10, 15} {
		s := NewSolver(Config{Radius: radius, Order: Affine})
		if s.Prepare(ref, nil, 64, 64) != Converged || !s.affineWarp(&p, float64(def.width-1), float64(def.height-1)) {
			b.Fatal("cannot prepare the subset")
		}
		s.prior = NewSamples(radius)
		for _, step := range []int{5, 10} {
			for _, along := range []struct {
				name   string
				dx, dy int
			}{{"right", step, 0}, {"left", -step, 0}, {"below", 0, step}, {"above", 0, -step}} {
				s.priorDX, s.priorDY = along.dx, along.dy
				for _, way := range []struct {
					name string
					f    func(*Spline)
				}{{"rows", s.sampleSharedRows}, {"listed", s.sampleShared}} {
					b.Run(fmt.Sprintf("side=%d/step=%d/%s/%s", 2*radius+1, step, along.name, way.name), func(b *testing.B) {
						for b.Loop() {
							way.f(def)
						}
					})
				}
			}
		}
	}
}
