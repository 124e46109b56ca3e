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

// distance returns the distance ρ from local point (ξ, d) to the feature —
// |d| beside it, the distance to the mouth behind it (ξ < 0) — and its
// derivatives ∂ρ/∂ξ and ∂ρ/∂d (taking sgn 0 = +1).
func (s segment) distance(xi, d float64) (rho, dxi, dd float64) {
	if xi < 0 {
		rho = math.Hypot(xi, d)
		if rho == 0 {
			return 0, 0, 0
		}
		return rho, xi / rho, d / rho
	}
	if d < 0 {
		return -d, 0, -1
	}
	return d, 0, 1
}

// scaledTip returns the tip of the feature grown to fraction g of its length.
func scaledTip(x0, y0, x1, y1, g float64) (float64, float64) {
	return x0 + g*(x1-x0), y0 + g*(y1-y0)
}
