// Package sector names the parts of the rock around the openings of a
// specimen face — crown, invert, sidewalls and the pillar between two
// openings — by where a point lies relative to the loading direction and
// to the other openings. It is pure geometry in reference px, shared by
// the synthetic lab (which names where its damage features start) and the
// strain stage (which names where zones lie), so both use one rule.
package sector

import (
	"math"

	"spallscope/dic/region"
)

// Sector names the part of the rock around an opening, by where it lies
// relative to the loading direction: the crown (the roof, at the end of
// the opening the load comes from), the invert (the floor), the two
// sidewalls (the springlines, across the load, where the compressive
// tangential stress peaks), and the pillar (the ligament between two
// neighbouring openings). The names are the trade's (common practice, no
// source).
type Sector string

const (
	Crown         Sector = "crown"
	Invert        Sector = "invert"
	LeftSidewall  Sector = "left-sidewall"
	RightSidewall Sector = "right-sidewall"
	Pillar        Sector = "pillar"
	// Other is rock beyond the reach of every opening.
	Other Sector = "other"
)

// Opening is an excavation in the specimen face, in reference px.
type Opening struct {
	Name  string
	Shape region.Shape
}

// Centre returns the opening's centre (the centroid of its bounding box,
// exact for circles and ellipses) and its equivalent radius: √(Rx·Ry) for
// an ellipse, else that of the circle with the bounding box's area.
func (o Opening) Centre() (cx, cy, r float64) {
	x0, y0, x1, y1 := o.Shape.Bounds()
	if e, ok := o.Shape.(region.Ellipse); ok {
		return e.Cx, e.Cy, math.Sqrt(e.Rx * e.Ry)
	}
	return (x0 + x1) / 2, (y0 + y1) / 2, math.Sqrt((x1 - x0) * (y1 - y0) / math.Pi)
}
