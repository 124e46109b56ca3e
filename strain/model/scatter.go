package model

import (
	"math"
	"slices"
)

// scatter interpolates a model field given at scattered points (a mesh's
// nodes or centroids, in any order) by moving least squares of order one:
// at a query point it fits a plane, by weighted least squares, to the
// model values within the radius and takes the plane's value there. The
// weight (1 − d²/R²)² falls smoothly to zero at the radius R, so the
// interpolated field is continuous as the query moves; the plane makes the
// scheme exact for linear fields, where inverse-distance weighting flattens
// every gradient towards the nearest points. Where the points within the
// radius do not fix a plane (fewer than three, or all on a line, as past
// the edge of the model) there is no value: a mean of one or two points
// would pass an extrapolation off as the model. No triangulation is
// needed, so the scheme works the same on any cloud of points.
type scatter struct {
	pts  []Point
	cell float64
	grid map[[2]int][]int // bucket of side cell → point indices
}

// newScatter buckets the points into square cells of side cell px.
func newScatter(pts []Point, cell float64) *scatter {
	s := &scatter{pts: pts, cell: cell, grid: make(map[[2]int][]int)}
	for i := range pts {
		k := s.key(pts[i].X, pts[i].Y)
		s.grid[k] = append(s.grid[k], i)
	}
	return s
}

// maxKey bounds a bucket index, so that a coordinate far beyond the
// cells (or ±Inf, for a query box without bounds) converts to an int
// exactly; the clamp keeps the order of keys, so a box's range of keys
// still holds every point inside it.
const maxKey = 1 << 52

func (s *scatter) key(x, y float64) [2]int {
	k := func(v float64) int {
		q := math.Floor(v / s.cell)
		switch {
		case q < -maxKey || (math.IsNaN(q) && v < 0): // ±Inf over an infinite cell is NaN
			return -maxKey
		case q > maxKey || (math.IsNaN(q) && v > 0):
			return maxKey
		case math.IsNaN(q):
			return 0
		}
		return int(q)
	}
	return [2]int{k(x), k(y)}
}

// within calls fn for every point closer than r to (x, y), with its
// squared distance. When the box of side 2r spans more buckets than there
// are points (a radius grown past the cloud, or points near float64's
// range, whose spread overflows to +Inf), it goes through the points
// instead: walking the buckets would not end in any useful time.
func (s *scatter) within(x, y, r float64, fn func(i int, d2 float64)) {
	if !(r > 0) || math.IsNaN(x) || math.IsNaN(y) {
		return
	}
	lo, hi := s.key(x-r, y-r), s.key(x+r, y+r)
	r2 := r * r
	if float64(hi[0]-lo[0]+1)*float64(hi[1]-lo[1]+1) > float64(len(s.pts)) {
		for i := range s.pts {
			dx, dy := s.pts[i].X-x, s.pts[i].Y-y
			if d2 := dx*dx + dy*dy; d2 < r2 {
				fn(i, d2)
			}
		}
		return
	}
	for cy := lo[1]; cy <= hi[1]; cy++ {
		for cx := lo[0]; cx <= hi[0]; cx++ {
			for _, i := range s.grid[[2]int{cx, cy}] {
				dx, dy := s.pts[i].X-x, s.pts[i].Y-y
				if d2 := dx*dx + dy*dy; d2 < r2 {
					fn(i, d2)
				}
			}
		}
	}
}

// spacing returns the median distance from a point to its nearest
// neighbour (px), over at most 2000 points taken evenly through the file;
// coincident points are passed over. Zero when the points are all one.
func spacing(pts []Point) float64 {
	x0, y0, x1, y1 := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for i := range pts {
		x0, x1 = min(x0, pts[i].X), max(x1, pts[i].X)
		y0, y1 = min(y0, pts[i].Y), max(y1, pts[i].Y)
	}
	n := float64(len(pts))
	cell := math.Sqrt(x1-x0) * math.Sqrt(y1-y0) / math.Sqrt(n) // in this order: no overflow before the root
	if !(cell > 0) {
		cell = math.Max(x1-x0, y1-y0) / n // points on a line
	}
	if !(cell > 0) {
		return 0
	}
	s := newScatter(pts, cell)
	stride := max(1, len(pts)/2000)
	var nn []float64
	for i := 0; i < len(pts); i += stride {
		best := math.Inf(1)
		// Double the search until a neighbour turns up; the nearest one
		// within the searched radius is the nearest of all. An infinite
		// radius (a cloud whose spread overflows) is searched once.
		for r := cell; r <= 4*math.Max(x1-x0, y1-y0) && math.IsInf(best, 1); r *= 2 {
			s.within(pts[i].X, pts[i].Y, r, func(j int, d2 float64) {
				if j != i && d2 > 0 {
					best = math.Min(best, d2)
				}
			})
			if math.IsInf(r, 1) {
				break
			}
		}
		if !math.IsInf(best, 1) {
			nn = append(nn, math.Sqrt(best))
		}
	}
	if len(nn) == 0 {
		return 0
	}
	slices.Sort(nn)
	return nn[len(nn)/2]
}

// at returns the moving-least-squares value of q at (x, y) from the points
// within radius r (the bucket side), and false when those with a value of
// q do not fix a plane.
func (s *scatter) at(q Quantity, x, y, r float64) (float64, bool) {
	// Weighted normal equations of the plane c0 + c1·ξ + c2·η in local
	// coordinates ξ = (xi − x)/r, η = (yi − y)/r (well scaled, and the
	// value at the query point is c0).
	var s00, s01, s02, s11, s12, s22, b0, b1, b2 float64
	n := 0
	s.within(x, y, r, func(i int, d2 float64) {
		v := s.pts[i].Values[q]
		if math.IsNaN(v) {
			return
		}
		t := 1 - d2/(r*r)
		w := t * t
		xi, eta := (s.pts[i].X-x)/r, (s.pts[i].Y-y)/r
		s00 += w
		s01 += w * xi
		s02 += w * eta
		s11 += w * xi * xi
		s12 += w * xi * eta
		s22 += w * eta * eta
		b0 += w * v
		b1 += w * xi * v
		b2 += w * eta * v
		n++
	})
	if n == 0 || !(s00 > 0) {
		return 0, false
	}
	// Cramer's rule for c0. The determinant relative to s00³ is the
	// (weighted) spread of the points as the area they cover in units of
	// r²: below 1e-6 they lie on a line, or one point dominates, and the
	// plane is not determined.
	m11 := s11*s22 - s12*s12
	m12 := s01*s22 - s12*s02
	m13 := s01*s12 - s11*s02
	det := s00*m11 - s01*m12 + s02*m13
	if n < 3 || det < 1e-6*s00*s00*s00 {
		return 0, false
	}
	c0 := (b0*m11 - s01*(b1*s22-s12*b2) + s02*(b1*s12-s11*b2)) / det
	return c0, true
}
