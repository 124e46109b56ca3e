package dic

import (
	"math/rand/v2"
	"testing"

	"spallscope/dic/region"
)

// guardEdges against its definition, checked by brute force: a measured
// pixel stays measured only if no excluded pixel of the image lies within
// guard px (Euclidean) of it. Random masks of blobs and isolated holes,
// touching the image edges; the tall ones are scanned in row bands.
func TestGuardEdgesDefinition(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := 0; trial < 20; trial++ {
		w, h := 20+rng.IntN(40), 20+rng.IntN(40)
		if trial >= 16 { // tall enough to be split into row bands
			w, h = 60+rng.IntN(40), 200+rng.IntN(100)
		}
		m := &region.Mask{Width: w, Height: h, Pix: make([]uint8, w*h)}
		for i := range m.Pix {
			m.Pix[i] = 1
		}
		for k := 0; k < 1+rng.IntN(6)+h/20; k++ { // holes of radius 0–6 px
			cx, cy, r := rng.IntN(w), rng.IntN(h), rng.IntN(7)
			for y := 0; y < h; y++ {
				for x := 0; x < w; x++ {
					if (x-cx)*(x-cx)+(y-cy)*(y-cy) <= r*r {
						m.Pix[y*w+x] = 0
					}
				}
			}
		}
		guard := rng.IntN(4)
		got := guardEdges(m, guard)
		for y := 0; y < h; y++ {
			for x := 0; x < w; x++ {
				want := m.Pix[y*w+x] != 0
				for ey := max(y-guard, 0); want && ey <= min(y+guard, h-1); ey++ {
					for ex := max(x-guard, 0); ex <= min(x+guard, w-1); ex++ {
						if m.Pix[ey*w+ex] == 0 && (ex-x)*(ex-x)+(ey-y)*(ey-y) <= guard*guard {
							want = false
							break
						}
					}
				}
				if (got.Pix[y*w+x] != 0) != want {
					t.Fatalf("trial %d (%dx%d, guard %d): pixel (%d,%d) measured %v, want %v", trial, w, h, guard, x, y, got.Pix[y*w+x] != 0, want)
				}
			}
		}
	}
}
