// Package region describes areas of a specimen face in reference pixels —
// the region of interest, openings and other exclusions — and rasterises
// them into masks with the convention used throughout spallscope: one byte
// per pixel, nonzero = measured, zero = excluded.
//
// A pixel belongs to a shape when its centre does; pixel (i, j) has its
// centre at (i, j), origin at the top-left pixel, x right, y down.
package region

import (
	"fmt"
	"math"
)

// Shape is an area of the face.
type Shape interface {
	// Contains reports whether point (x, y) lies inside.
	Contains(x, y float64) bool
	// Bounds returns the bounding box (x0, y0, x1, y1).
	Bounds() (x0, y0, x1, y1 float64)
	// Validate reports a shape that cannot be drawn: numbers that are not
	// finite, sizes that are not positive, too few vertices. Such a shape
	// would contain no pixel, or every pixel, without saying so.
	Validate() error
}

// finite reports whether every v is neither NaN nor infinite.
func finite(v ...float64) bool {
	for _, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// Rect is the axis-aligned rectangle X0 ≤ x ≤ X1, Y0 ≤ y ≤ Y1.
type Rect struct {
	X0 float64 `json:"x0_px" yaml:"x0"`
	Y0 float64 `json:"y0_px" yaml:"y0"`
	X1 float64 `json:"x1_px" yaml:"x1"`
	Y1 float64 `json:"y1_px" yaml:"y1"`
}

// Contains reports whether (x, y) is inside the rectangle, edges included.
func (r Rect) Contains(x, y float64) bool { return x >= r.X0 && x <= r.X1 && y >= r.Y0 && y <= r.Y1 }

// Bounds returns the rectangle itself.
func (r Rect) Bounds() (x0, y0, x1, y1 float64) { return r.X0, r.Y0, r.X1, r.Y1 }

// Validate reports corners that are not finite or out of order.
func (r Rect) Validate() error {
	switch {
	case !finite(r.X0, r.Y0, r.X1, r.Y1):
		return fmt.Errorf("rect corners (%g, %g) and (%g, %g), expected finite numbers of px", r.X0, r.Y0, r.X1, r.Y1)
	case r.X1 < r.X0 || r.Y1 < r.Y0:
		return fmt.Errorf("rect corners (%g, %g) and (%g, %g), expected x0 ≤ x1 and y0 ≤ y1", r.X0, r.Y0, r.X1, r.Y1)
	}
	return nil
}

// Ellipse is an ellipse centred at (Cx, Cy) with semi-axes Rx and Ry,
// turned by AngleDeg (x towards y). A circle has Rx = Ry.
type Ellipse struct {
	Cx       float64 `json:"cx_px" yaml:"cx"`
	Cy       float64 `json:"cy_px" yaml:"cy"`
	Rx       float64 `json:"rx_px" yaml:"rx"`
	Ry       float64 `json:"ry_px" yaml:"ry"`
	AngleDeg float64 `json:"angle_deg,omitempty" yaml:"angle_deg"`
}

// Circle returns the circle of radius r about (cx, cy).
func Circle(cx, cy, r float64) Ellipse { return Ellipse{Cx: cx, Cy: cy, Rx: r, Ry: r} }

// Contains reports whether (x, y) is strictly inside the ellipse.
func (e Ellipse) Contains(x, y float64) bool {
	if e.Rx <= 0 || e.Ry <= 0 {
		return false
	}
	dx, dy := x-e.Cx, y-e.Cy
	if e.AngleDeg != 0 {
		s, c := math.Sincos(-e.AngleDeg * math.Pi / 180)
		dx, dy = c*dx-s*dy, s*dx+c*dy
	}
	qx, qy := dx/e.Rx, dy/e.Ry
	return qx*qx+qy*qy < 1
}

// Validate reports a centre, semi-axis or angle that is not finite and a
// semi-axis that is not positive.
func (e Ellipse) Validate() error {
	kind := "ellipse"
	if e.Rx == e.Ry || (math.IsNaN(e.Rx) && math.IsNaN(e.Ry)) {
		kind = "circle"
	}
	switch {
	case !finite(e.Cx, e.Cy):
		return fmt.Errorf("%s centre (%g, %g), expected a finite point in px", kind, e.Cx, e.Cy)
	case (!finite(e.Rx, e.Ry) || !(e.Rx > 0) || !(e.Ry > 0)) && kind == "circle":
		return fmt.Errorf("circle radius %g, expected a finite positive number of px", e.Rx)
	case !finite(e.Rx, e.Ry) || !(e.Rx > 0) || !(e.Ry > 0):
		return fmt.Errorf("ellipse semi-axes %g and %g, expected finite positive numbers of px", e.Rx, e.Ry)
	case !finite(e.AngleDeg):
		return fmt.Errorf("%s angle %g°, expected a finite number of degrees", kind, e.AngleDeg)
	}
	return nil
}

// Bounds returns a box that holds the ellipse.
func (e Ellipse) Bounds() (x0, y0, x1, y1 float64) {
	s, c := math.Sincos(e.AngleDeg * math.Pi / 180)
	hx := math.Hypot(e.Rx*c, e.Ry*s)
	hy := math.Hypot(e.Rx*s, e.Ry*c)
	return e.Cx - hx, e.Cy - hy, e.Cx + hx, e.Cy + hy
}

// Polygon is a closed polygon given by its vertices (the last joins the
// first); inside is decided by the even–odd rule, so it may be concave
// (a horseshoe opening, say).
type Polygon [][2]float64

// Contains reports whether (x, y) is inside by ray crossing (even–odd).
func (p Polygon) Contains(x, y float64) bool {
	in := false
	for i, j := 0, len(p)-1; i < len(p); j, i = i, i+1 {
		xi, yi := p[i][0], p[i][1]
		xj, yj := p[j][0], p[j][1]
		if (yi > y) != (yj > y) && x < (xj-xi)*(y-yi)/(yj-yi)+xi {
			in = !in
		}
	}
	return in
}

// Bounds returns the vertices' bounding box.
func (p Polygon) Bounds() (x0, y0, x1, y1 float64) {
	x0, y0, x1, y1 = math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, v := range p {
		x0, y0 = math.Min(x0, v[0]), math.Min(y0, v[1])
		x1, y1 = math.Max(x1, v[0]), math.Max(y1, v[1])
	}
	return
}

// Validate reports a polygon with fewer than three vertices, non-finite
// coordinates, or no area (all vertices on one line).
func (p Polygon) Validate() error {
	if len(p) < 3 {
		return fmt.Errorf("polygon with %d vertices, expected at least 3", len(p))
	}
	for i, v := range p {
		if !finite(v[0], v[1]) {
			return fmt.Errorf("polygon vertex %d (%g, %g) is not a finite point", i+1, v[0], v[1])
		}
	}
	if p.collinear() {
		return fmt.Errorf("polygon of %d vertices encloses no area (its vertices lie on one line), expected a closed outline", len(p))
	}
	return nil
}

// collinear reports whether all vertices lie on one line (or one point):
// no vertex is off the line from the first vertex to the one farthest
// from it.
func (p Polygon) collinear() bool {
	far, fd := 0, 0.0
	for i, v := range p {
		if d := math.Hypot(v[0]-p[0][0], v[1]-p[0][1]); d > fd {
			far, fd = i, d
		}
	}
	dx, dy := p[far][0]-p[0][0], p[far][1]-p[0][1]
	for _, v := range p {
		if (v[0]-p[0][0])*dy-(v[1]-p[0][1])*dx != 0 {
			return false
		}
	}
	return true
}
