package lens

import (
	"math"
	"testing"

	"spallscope/dic/region"
)

// A circle drawn on the photo, mapped to undistorted pixels: every point
// of the resulting ellipse's rim, taken back through the lens's forward
// model (Brown 1966, the form of OpenCV's calib3d), lies on the photo's
// circle to 0.2 px (measured 0.14 px), for a 40 px hole halfway to the corner of a strong
// barrel lens (3.7 % at the corners; values of our own). A polygon's
// vertices map to their undistorted points exactly.
func TestUndistortShape(t *testing.T) {
	m := Model{Width: 320, Height: 240, Fx: 400, Fy: 400, Cx: 159.5, Cy: 119.5, K1: -0.15}
	c := region.Circle(230, 170, 40)
	s, err := m.UndistortShape(c)
	if err != nil {
		t.Fatal(err)
	}
	e := s.(region.Ellipse)
	worst := 0.0
	for k := 0; k < 72; k++ {
		a := float64(k) * math.Pi / 36
		sn, cs := math.Sincos(e.AngleDeg * math.Pi / 180)
		dx, dy := e.Rx*math.Cos(a), e.Ry*math.Sin(a)
		x, y := m.Distort(e.Cx+cs*dx-sn*dy, e.Cy+sn*dx+cs*dy)
		worst = math.Max(worst, math.Abs(math.Hypot(x-c.Cx, y-c.Cy)-c.Rx))
	}
	if worst > 0.2 {
		t.Errorf("the undistorted circle's rim is up to %.3f px off the photo's circle", worst)
	}
	p, err := m.UndistortShape(region.Polygon{{10, 10}, {300, 20}, {150, 220}})
	if err != nil {
		t.Fatal(err)
	}
	X, Y, _ := m.Undistort(300, 20)
	if q := p.(region.Polygon); len(q) != 3*shapeEdgePoints || q[shapeEdgePoints] != [2]float64{X, Y} {
		t.Errorf("polygon %v: want vertex 1 at (%g, %g)", q, X, Y)
	}
}
