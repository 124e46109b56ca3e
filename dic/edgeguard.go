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
	for y := 0; y < m.Height; y++ {
		for x := 0; x < m.Width; x++ {
			if m.Pix[y*m.Width+x] != 0 || !touchesMeasured(m, x, y) {
				continue
			}
			for dy := -guard; dy <= guard; dy++ {
				for dx := -guard; dx <= guard; dx++ {
					px, py := x+dx, y+dy
					if dx*dx+dy*dy <= g2 && px >= 0 && py >= 0 && px < m.Width && py < m.Height {
						out.Pix[py*m.Width+px] = 0
					}
				}
			}
		}
	}
	return out
}

// touchesMeasured reports whether excluded pixel (x, y) has a measured
// 8-neighbour, i.e. lies on the rim of the exclusion.
func touchesMeasured(m *region.Mask, x, y int) bool {
	for dy := -1; dy <= 1; dy++ {
		for dx := -1; dx <= 1; dx++ {
			if m.At(x+dx, y+dy) {
				return true
			}
		}
	}
	return false
}
