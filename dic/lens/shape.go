package lens

import (
	"fmt"
	"math"

	"spallscope/dic/region"
)

// shapeEdgePoints is how many points each edge of a polygon or rect, and
// a quarter of an ellipse's rim, is sampled at when a shape is mapped
// through the lens: the distortion bends straight edges.
const shapeEdgePoints = 8

// UndistortShape returns photo-pixel shape s in undistorted pixels, the
// fields' pixels of a run with this lens: an ellipse as the ellipse whose
// centre is the mean of its axes' undistorted end points and whose semi-axes are half the
// undistorted lengths of its two axes (a circle's taken along and across
// the direction from the principal point) (exact where the distortion is a
// similarity across the opening; TestUndistortShape measures how close it
// is for a strong lens), a rect or polygon as the polygon through its
// edges' undistorted points. It fails where a point does not undistort
// (beyond the lens's fold).
func (m *Model) UndistortShape(s region.Shape) (region.Shape, error) {
	switch v := s.(type) {
	case region.Ellipse:
		if v.Rx == v.Ry && (v.Cx != m.Cx || v.Cy != m.Cy) {
			// a circle: its axes along and across the direction from the
			// principal point, the directions a radial distortion
			// stretches differently
			v.AngleDeg = math.Atan2(v.Cy-m.Cy, v.Cx-m.Cx) * 180 / math.Pi
		}
		s, c := math.Sincos(v.AngleDeg * math.Pi / 180)
		var ends [4][2]float64
		for k, d := range [4][2]float64{{v.Rx, 0}, {-v.Rx, 0}, {0, v.Ry}, {0, -v.Ry}} {
			x, y, err := m.undistortShapePoint(v.Cx+c*d[0]-s*d[1], v.Cy+s*d[0]+c*d[1])
			if err != nil {
				return nil, err
			}
			ends[k] = [2]float64{x, y}
		}
		cx := (ends[0][0] + ends[1][0] + ends[2][0] + ends[3][0]) / 4
		cy := (ends[0][1] + ends[1][1] + ends[2][1] + ends[3][1]) / 4
		return region.Ellipse{Cx: cx, Cy: cy,
			Rx: math.Hypot(ends[0][0]-ends[1][0], ends[0][1]-ends[1][1]) / 2,
			Ry: math.Hypot(ends[2][0]-ends[3][0], ends[2][1]-ends[3][1]) / 2, AngleDeg: v.AngleDeg}, nil
	case region.Rect:
		return m.undistortRing([][2]float64{{v.X0, v.Y0}, {v.X1, v.Y0}, {v.X1, v.Y1}, {v.X0, v.Y1}})
	case region.Polygon:
		return m.undistortRing(v)
	}
	return nil, fmt.Errorf("shape %T cannot be mapped through the lens", s)
}

// undistortRing returns the polygon through the undistorted points of the
// closed ring of vertices pts, each edge sampled at shapeEdgePoints.
func (m *Model) undistortRing(pts [][2]float64) (region.Shape, error) {
	var out region.Polygon
	for i, p := range pts {
		q := pts[(i+1)%len(pts)]
		for k := 0; k < shapeEdgePoints; k++ {
			f := float64(k) / shapeEdgePoints
			x, y, err := m.undistortShapePoint(p[0]+f*(q[0]-p[0]), p[1]+f*(q[1]-p[1]))
			if err != nil {
				return nil, err
			}
			out = append(out, [2]float64{x, y})
		}
	}
	return out, nil
}

// undistortShapePoint undistorts photo point (x, y) of a shape, failing
// with the point named where it does not undistort.
func (m *Model) undistortShapePoint(x, y float64) (float64, float64, error) {
	X, Y, ok := m.Undistort(x, y)
	if !ok {
		return 0, 0, fmt.Errorf("point (%g, %g) px of the shape does not undistort through the lens", x, y)
	}
	return X, Y, nil
}
