package dic

import (
	"fmt"
	"slices"

	"spallscope/dic/region"
)

// Grid is the regular lattice of points of interest: point (c, r) is at
// reference pixel (X0 + c·Step, Y0 + r·Step); points are stored row-major.
type Grid struct {
	X0   int `json:"x0_px"`
	Y0   int `json:"y0_px"`
	Step int `json:"step_px"`
	Cols int `json:"cols"`
	Rows int `json:"rows"`
}

// Len is the number of grid points.
func (g Grid) Len() int { return g.Cols * g.Rows }

// Pos returns the reference pixel of point i.
func (g Grid) Pos(i int) (x, y int) {
	return g.X0 + (i%g.Cols)*g.Step, g.Y0 + (i/g.Cols)*g.Step
}

// Index returns the point at column c, row r, or −1 outside the grid.
func (g Grid) Index(c, r int) int {
	if c < 0 || r < 0 || c >= g.Cols || r >= g.Rows {
		return -1
	}
	return r*g.Cols + c
}

// Neighbours appends the 4-connected neighbours of point i to dst.
func (g Grid) Neighbours(dst []int, i int) []int {
	c, r := i%g.Cols, i/g.Cols
	for _, d := range [4][2]int{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
		if j := g.Index(c+d[0], r+d[1]); j >= 0 {
			dst = append(dst, j)
		}
	}
	return dst
}

// NewGrid lays a grid with the given step over the measured pixels of a
// mask: it spans the mask's bounding box, centred in it so the margins on
// both sides are equal.
func NewGrid(m *region.Mask, step int) (Grid, error) {
	if step <= 0 {
		return Grid{}, fmt.Errorf("grid step %d px, expected a positive number of pixels", step)
	}
	// The bounding box: per row, the first and last measured pixel.
	x0, y0, x1, y1 := m.Width, m.Height, -1, -1
	for y := 0; y < m.Height; y++ {
		row := m.Pix[y*m.Width : (y+1)*m.Width]
		first := slices.IndexFunc(row, func(v uint8) bool { return v != 0 })
		if first < 0 {
			continue
		}
		last := len(row) - 1
		for row[last] == 0 {
			last--
		}
		x0, y0 = min(x0, first), min(y0, y)
		x1, y1 = max(x1, last), max(y1, y)
	}
	if x1 < 0 {
		return Grid{}, fmt.Errorf("grid: the mask measures no pixel")
	}
	g := Grid{Step: step, Cols: (x1-x0)/step + 1, Rows: (y1-y0)/step + 1}
	g.X0 = x0 + ((x1-x0)%step)/2
	g.Y0 = y0 + ((y1-y0)%step)/2
	return g, nil
}
