package synth

import "math"

// Opening is an elliptical region of the face in reference pixels (a circle
// when Rx = Ry): an excavation in the specimen, rendered untextured, or a
// region where spalled material exposes fresh rock.
type Opening struct {
	Cx       float64 `json:"cx_px"`
	Cy       float64 `json:"cy_px"`
	Rx       float64 `json:"rx_px"`
	Ry       float64 `json:"ry_px"`
	AngleDeg float64 `json:"angle_deg,omitempty"`
}

// Circle returns a circular opening.
func Circle(cx, cy, r float64) Opening { return Opening{Cx: cx, Cy: cy, Rx: r, Ry: r} }

// Contains reports whether reference point (x, y) lies inside the ellipse.
func (o Opening) Contains(x, y float64) bool {
	dx, dy := x-o.Cx, y-o.Cy
	if o.AngleDeg != 0 {
		s, c := math.Sincos(-o.AngleDeg * math.Pi / 180)
		dx, dy = c*dx-s*dy, s*dx+c*dy
	}
	if o.Rx <= 0 || o.Ry <= 0 {
		return false
	}
	qx, qy := dx/o.Rx, dy/o.Ry
	return qx*qx+qy*qy < 1
}
