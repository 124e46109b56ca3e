package subset

import (
	"math"
	"math/rand/v2"
	"testing"
)

// The block a prefetch asks for must hold every coefficient the
// interpolation reads in its box (else the hint misses the point) and lie
// inside the stored coefficients (else the kernel forms addresses outside
// them). The reads are cubicAt's and quinticAt's own windows: 4×4 and
// 6×6 coefficients from the one up and left of the position's pixel by
// 1 (cubic) or 2 (quintic), which the kernels' definitions give.
func TestPrefetchBlockCoversReads(t *testing.T) {
	img := testPattern(31).render(40, 30, nil)
	rng := rand.New(rand.NewPCG(31, 32))
	for _, kind := range kinds {
		sp := NewSpline(img, kind)
		reach, taps := 1, 4
		if kind == Biquintic {
			reach, taps = 2, 6
		}
		boxes := [][4]int{{0, 0, 39, 29}, {-5, -5, 3, 2}, {37, 27, 60, 50}, {10, 12, 10, 12}}
		for k := 0; k < 40; k++ {
			x0, y0 := rng.IntN(50)-5, rng.IntN(40)-5
			boxes = append(boxes, [4]int{x0, y0, x0 + rng.IntN(25), y0 + rng.IntN(25)})
		}
		for _, b := range boxes {
			off, rows, width, ok := sp.prefetchBlock(b[0], b[1], b[2], b[3])
			meets := b[0] < sp.width && b[1] < sp.height && b[2] >= 0 && b[3] >= 0
			if ok != meets {
				t.Errorf("%v box %v: block %v, want %v (the box meets the image: %v)", kind, b, ok, meets, meets)
			}
			if !ok {
				continue
			}
			if off < 0 || off%sp.stride+width > sp.stride || off+(rows-1)*sp.stride+width > len(sp.coef) {
				t.Errorf("%v box %v: block off %d rows %d width %d leaves the coefficients (stride %d, %d of them)", kind, b, off, rows, width, sp.stride, len(sp.coef))
			}
			r0, c0 := off/sp.stride, off%sp.stride
			// Positions at the clipped box's corners and inside it.
			x0, x1 := max(b[0], 0), min(b[2], sp.width-1)
			y0, y1 := max(b[1], 0), min(b[3], sp.height-1)
			for _, p := range [][2]float64{{float64(x0), float64(y0)}, {float64(x1), float64(y1)}, {float64(x0) + 0.5, float64(y1)}, {float64(x1), float64(y0) + 0.25}} {
				x, y := math.Min(p[0], float64(x1)), math.Min(p[1], float64(y1))
				// The window's first coefficient: row and column in coef.
				wr, wc := int(y)-reach+splinePad, int(x)-reach+splinePad
				if wr < r0 || wr+taps > r0+rows || wc < c0 || wc+taps > c0+width {
					t.Errorf("%v box %v: the window at (%g, %g), rows %d… columns %d…, is not in the block rows %d…%d columns %d…%d", kind, b, x, y, wr, wc, r0, r0+rows-1, c0, c0+width-1)
				}
			}
		}
	}
}

// warpedBox must hold every pixel of the subset under an affine shape
// (the positions affineWarp gives), clipped to the image.
func TestWarpedBoxHoldsSubset(t *testing.T) {
	const w, h, r = 200, 150, 10
	rng := rand.New(rand.NewPCG(33, 34))
	for k := 0; k < 200; k++ {
		x, y := rng.IntN(w), rng.IntN(h)
		p := Params{PU: 30 * (rng.Float64() - 0.5), PV: 30 * (rng.Float64() - 0.5),
			PUx: 0.2 * (rng.Float64() - 0.5), PUy: 0.2 * (rng.Float64() - 0.5),
			PVx: 0.2 * (rng.Float64() - 0.5), PVy: 0.2 * (rng.Float64() - 0.5)}
		x0, y0, x1, y1, ok := warpedBox(x, y, r, &p, w, h)
		for dy := -r; dy <= r; dy++ {
			for dx := -r; dx <= r; dx++ {
				wx := float64(x+dx) + p[PU] + p[PUx]*float64(dx) + p[PUy]*float64(dy)
				wy := float64(y+dy) + p[PV] + p[PVx]*float64(dx) + p[PVy]*float64(dy)
				if wx < 0 || wy < 0 || wx > w-1 || wy > h-1 {
					continue
				}
				if !ok || wx < float64(x0) || wx > float64(x1) || wy < float64(y0) || wy > float64(y1) {
					t.Fatalf("subset at (%d, %d), shape %v: pixel (%d, %d) lands at (%g, %g), outside the box %d…%d × %d…%d (ok %v)", x, y, p, dx, dy, wx, wy, x0, x1, y0, y1, ok)
				}
			}
		}
		if ok && (x0 < 0 || y0 < 0 || x1 > w-1 || y1 > h-1 || x0 > x1 || y0 > y1) {
			t.Errorf("subset at (%d, %d): box %d…%d × %d…%d not in the image", x, y, x0, x1, y0, y1)
		}
	}
	nan := Params{PU: math.NaN()}
	if _, _, _, _, ok := warpedBox(5, 5, r, &nan, w, h); ok {
		t.Errorf("a box for a NaN shape")
	}
	far := Translation(1e6, 0)
	if _, _, _, _, ok := warpedBox(5, 5, r, &far, w, h); ok {
		t.Errorf("a box for a subset far right of the image")
	}
	// A gradient of 5 stretches the 21 px subset over 126 px, 6 sides.
	wild := Params{PUx: 5}
	if _, _, _, _, ok := warpedBox(100, 75, r, &wild, w, h); ok {
		t.Errorf("a box for a subset stretched over 6 of its sides")
	}
}

// A prefetch is a hint: solving subsets after prefetching them (and
// others, off the image and from shapes that are not finite) gives the
// very results of solving them without, bit for bit.
func TestPrefetchChangesNoResult(t *testing.T) {
	pat := testPattern(35)
	field := globalWarp{cx: 64, cy: 64, p: Params{PU: 1.7, PUx: 0.004, PV: -0.8, PVy: -0.006}}
	for _, kind := range kinds {
		ref := NewSpline(pat.render(testSize, testSize, nil), kind)
		def := NewSpline(pat.render(testSize, testSize, field.inverse), kind)
		s := NewSolver(Config{Radius: 10, Order: Affine})
		pts := append(gridPoints(), [2]int{10, 10}, [2]int{117, 117}, [2]int{3, 60})
		for _, pt := range pts {
			guess := nearestTranslation(field.at(float64(pt[0]), float64(pt[1])))
			want := s.Solve(ref, def, nil, pt[0], pt[1], guess)
			s.Prefetch(ref, def, pt[0], pt[1], guess)
			s.Prefetch(ref, def, -50, 500, Translation(math.Inf(1), 0))
			s.Prefetch(nil, def, 0, 0, Params{PV: math.NaN()})
			s.Prefetch(ref, nil, testSize+40, -40, Translation(-1e9, 1e9))
			got := s.Solve(ref, def, nil, pt[0], pt[1], guess)
			if got != want {
				t.Errorf("%v at %v: %+v after prefetching, %+v without", kind, pt, got, want)
			}
		}
	}
}
