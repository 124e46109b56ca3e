package dic

import "spallscope/dic/region"

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
	g2 := guard * guard
	w, h := m.Width, m.Height
	// near[x] says whether column x of rows y-1…y+1 has a measured pixel;
	// an excluded pixel is on the rim when near is set at x-1, x or x+1.
	near := make([]bool, w)
	for y := 0; y < h; y++ {
		for x := range near {
			near[x] = false
			for yy := max(y-1, 0); yy <= min(y+1, h-1); yy++ {
				if m.Pix[yy*w+x] != 0 {
					near[x] = true
					break
				}
			}
		}
		row := m.Pix[y*w : (y+1)*w]
		for x, v := range row {
			if v != 0 || !(near[x] || x > 0 && near[x-1] || x+1 < w && near[x+1]) {
				continue
			}
			for dy := -guard; dy <= guard; dy++ {
				py := y + dy
				if py < 0 || py >= h {
					continue
				}
				for dx := -guard; dx <= guard; dx++ {
					px := x + dx
					if dx*dx+dy*dy <= g2 && px >= 0 && px < w {
						out.Pix[py*w+px] = 0
					}
				}
			}
		}
	}
	return out
}
