package model

import (
	"math"
	"slices"
)

// lattice is a model field whose points sit on the nodes of a regular
// rectangular grid (in reference px): node (i, j) at (x0 + i·dx, y0 + j·dy).
// Nodes may be missing, as where the grid is cut by an opening. On such a
// field bilinear interpolation in the cell around a point is exact for
// fields linear along each axis and second-order accurate in the spacing,
// with no choice of radius or weights.
type lattice struct {
	x0, y0, dx, dy float64
	nx, ny         int
	node           []int // point index per node, row-major; −1 where missing
}

// findLattice returns the lattice the points sit on, or nil when they do
// not form one: unevenly spaced, two points on one node, fewer than two
// nodes along an axis, or so sparse (more than four nodes per point) that
// the grid is not the field's own.
func findLattice(pts []Point) *lattice {
	xs := make([]float64, len(pts))
	ys := make([]float64, len(pts))
	for i := range pts {
		xs[i], ys[i] = pts[i].X, pts[i].Y
	}
	x0, dx, nx, okx := evenAxis(xs)
	y0, dy, ny, oky := evenAxis(ys)
	if !okx || !oky || nx*ny > 4*len(pts) {
		return nil
	}
	l := &lattice{x0: x0, y0: y0, dx: dx, dy: dy, nx: nx, ny: ny, node: make([]int, nx*ny)}
	for i := range l.node {
		l.node[i] = -1
	}
	for k := range pts {
		i := int(math.Round((pts[k].X - x0) / dx))
		j := int(math.Round((pts[k].Y - y0) / dy))
		if l.node[j*nx+i] >= 0 {
			return nil
		}
		l.node[j*nx+i] = k
	}
	return l
}

// evenAxis reports whether the values are the nodes x0 + k·h of an evenly
// spaced axis of n nodes (within a thousandth of the spacing), and returns
// it. The spacing is the smallest gap between distinct values.
func evenAxis(vals []float64) (x0, h float64, n int, ok bool) {
	s := slices.Clone(vals)
	slices.Sort(s)
	lo, hi := s[0], s[len(s)-1]
	ext := hi - lo
	if !(ext > 0) {
		return 0, 0, 0, false
	}
	h = math.Inf(1)
	for i := 1; i < len(s); i++ {
		if g := s[i] - s[i-1]; g > 1e-6*ext && g < h {
			h = g
		}
	}
	n = int(math.Round(ext/h)) + 1
	if n < 2 || n > len(vals) {
		return 0, 0, 0, false
	}
	h = ext / float64(n-1)
	for _, v := range s {
		k := math.Round((v - lo) / h)
		if math.Abs(v-(lo+k*h)) > 1e-3*h {
			return 0, 0, 0, false
		}
	}
	return lo, h, n, true
}

// at returns the bilinear interpolate of q at (x, y) from the cell around
// it, and false when (x, y) is off the lattice or a corner of its cell is
// missing or has no value of q.
func (l *lattice) at(pts []Point, q Quantity, x, y float64) (float64, bool) {
	fx, fy := (x-l.x0)/l.dx, (y-l.y0)/l.dy
	const eps = 1e-9
	if fx < -eps || fy < -eps || fx > float64(l.nx-1)+eps || fy > float64(l.ny-1)+eps {
		return 0, false
	}
	i := min(max(int(math.Floor(fx)), 0), l.nx-2)
	j := min(max(int(math.Floor(fy)), 0), l.ny-2)
	tx, ty := fx-float64(i), fy-float64(j)
	var c [4]float64
	for k, n := range [4]int{j*l.nx + i, j*l.nx + i + 1, (j+1)*l.nx + i, (j+1)*l.nx + i + 1} {
		p := l.node[n]
		if p < 0 || math.IsNaN(pts[p].Values[q]) {
			return 0, false
		}
		c[k] = pts[p].Values[q]
	}
	return (1-ty)*((1-tx)*c[0]+tx*c[1]) + ty*((1-tx)*c[2]+tx*c[3]), true
}
