package synth

import "math"

// segment is the local frame of a straight feature from a mouth P0 towards
// a tip P1: ξ along t (from P0), d along the normal n = (−t_y, t_x).
type segment struct {
	x0, y0, tx, ty, nx, ny, length float64
}

func newSegment(x0, y0, x1, y1 float64) segment {
	l := math.Hypot(x1-x0, y1-y0)
	s := segment{x0: x0, y0: y0, length: l, tx: 1}
	if l > 0 {
		s.tx, s.ty = (x1-x0)/l, (y1-y0)/l
	}
	s.nx, s.ny = -s.ty, s.tx
	return s
}

// local returns (ξ, d) of point (x, y).
func (s segment) local(x, y float64) (xi, d float64) {
	dx, dy := x-s.x0, y-s.y0
	return dx*s.tx + dy*s.ty, dx*s.nx + dy*s.ny
}

// scaledTip returns the tip of the feature grown to fraction g of its length.
func scaledTip(x0, y0, x1, y1, g float64) (float64, float64) {
	return x0 + g*(x1-x0), y0 + g*(y1-y0)
}
