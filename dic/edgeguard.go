package dic

import (
	"runtime"
	"sync"

	"spallscope/dic/region"
)

// guardEdges returns a copy of m without the measured pixels that lie
// within guard px (Euclidean) of an excluded pixel. The rim of an opening
// or of a masked label is an edge of far higher contrast than the speckles
// and not painted texture (in a photo it is chipped or in shadow); left in
// a subset it dominates the match, and its position follows the shape
// function rather than the rock. Pixels outside the image do not count as
// excluded.
func guardEdges(m *region.Mask, guard int) *region.Mask {
	out := &region.Mask{Width: m.Width, Height: m.Height, Pix: append([]uint8(nil), m.Pix...)}
	if guard <= 0 {
		return out
	}
	w, h := m.Width, m.Height
	// The rim — excluded pixels with a measured 8-neighbour — found by row
	// bands in parallel (the scan of every pixel is the cost), then the
	// disc of radius guard around each rim pixel cleared.
	bands := min(runtime.GOMAXPROCS(0), max(h/64, 1))
	rims := make([][]int, bands)
	var wg sync.WaitGroup
	for b := range bands {
		wg.Add(1)
		go func() {
			defer wg.Done()
			rims[b] = rimPixels(m, b*h/bands, (b+1)*h/bands)
		}()
	}
	wg.Wait()
	g2 := guard * guard
	for _, rim := range rims {
		for _, k := range rim {
			x, y := k%w, k/w
			for dy := max(-guard, -y); dy <= min(guard, h-1-y); dy++ {
				row := out.Pix[(y+dy)*w : (y+dy+1)*w]
				for dx := max(-guard, -x); dx <= min(guard, w-1-x); dx++ {
					if dx*dx+dy*dy <= g2 {
						row[x+dx] = 0
					}
				}
			}
		}
	}
	return out
}

// rimPixels returns the indices of the excluded pixels of rows y0 … y1−1
// that have a measured 8-neighbour.
func rimPixels(m *region.Mask, y0, y1 int) []int {
	w, h := m.Width, m.Height
	var rim []int
	// near[x] says whether column x of rows y-1…y+1 has a measured pixel;
	// an excluded pixel is on the rim when near is set at x-1, x or x+1.
	near := make([]bool, w)
	for y := y0; y < y1; y++ {
		for x := range near {
			near[x] = false
			for yy := max(y-1, 0); yy <= min(y+1, h-1); yy++ {
				if m.Pix[yy*w+x] != 0 {
					near[x] = true
					break
				}
			}
		}
		for x, v := range m.Pix[y*w : (y+1)*w] {
			if v == 0 && (near[x] || x > 0 && near[x-1] || x+1 < w && near[x+1]) {
				rim = append(rim, y*w+x)
			}
		}
	}
	return rim
}
