package dic

import "spallscope/dic/region"

// summedArea counts measured mask pixels over rectangles in constant time
// (a summed-area table: Crow 1984, "Summed-area tables for texture
// mapping", SIGGRAPH).
type summedArea struct {
	w   int
	sum []int32 // (w+1)×(h+1), sum[(y+1)(w+1)+x+1] = pixels in [0,x]×[0,y]
}

func newSummedArea(m *region.Mask) summedArea {
	a := summedArea{w: m.Width, sum: make([]int32, (m.Width+1)*(m.Height+1))}
	for y := 0; y < m.Height; y++ {
		var row int32
		for x := 0; x < m.Width; x++ {
			if m.Pix[y*m.Width+x] != 0 {
				row++
			}
			k := (y+1)*(a.w+1) + x + 1
			a.sum[k] = a.sum[k-a.w-1] + row
		}
	}
	return a
}

// count returns the measured pixels in [x0,x1]×[y0,y1] (inside the image).
func (a summedArea) count(x0, y0, x1, y1 int) int {
	w := a.w + 1
	return int(a.sum[(y1+1)*w+x1+1] - a.sum[y0*w+x1+1] - a.sum[(y1+1)*w+x0] + a.sum[y0*w+x0])
}
