package lens

import (
	"errors"
	"fmt"
	"math"
)

// Model is a calibrated camera: the image size it was calibrated for, the
// camera matrix (focal lengths and principal point, in px) and the
// Brown–Conrady distortion coefficients. Pixel positions follow the
// project's convention (origin at the centre of the top-left pixel, x
// right, y down), which is also OpenCV's for corner positions.
//
// A point at ideal pixel (X, Y) has the normalized coordinates
// x = (X − Cx)/Fx, y = (Y − Cy)/Fy; with r² = x² + y² the lens shows it at
//
//	x' = x·(1 + K1·r² + K2·r⁴ + K3·r⁶) + 2·P1·x·y + P2·(r² + 2x²)
//	y' = y·(1 + K1·r² + K2·r⁴ + K3·r⁶) + P1·(r² + 2y²) + 2·P2·x·y
//
// that is at photo pixel (Fx·x' + Cx, Fy·y' + Cy) (Brown 1966; the form
// and coefficient order of OpenCV's calib3d module).
type Model struct {
	Width  int     `json:"width_px"`
	Height int     `json:"height_px"`
	Fx     float64 `json:"fx_px"`
	Fy     float64 `json:"fy_px"`
	Cx     float64 `json:"cx_px"`
	Cy     float64 `json:"cy_px"`
	K1     float64 `json:"k1"`
	K2     float64 `json:"k2"`
	K3     float64 `json:"k3"`
	P1     float64 `json:"p1"`
	P2     float64 `json:"p2"`
}

// Coefficients returns the distortion coefficients in OpenCV's order
// k1, k2, p1, p2, k3.
func (m Model) Coefficients() [5]float64 { return [5]float64{m.K1, m.K2, m.P1, m.P2, m.K3} }

// distortNormalized applies the distortion to normalized coordinates and
// returns the distorted ones with their Jacobian ∂(x', y')/∂(x, y).
func (m *Model) distortNormalized(x, y float64) (xd, yd, a, b, c, d float64) {
	r2 := x*x + y*y
	radial := 1 + r2*(m.K1+r2*(m.K2+r2*m.K3))
	dr := m.K1 + r2*(2*m.K2+3*r2*m.K3) // ∂radial/∂(r²)
	xd = x*radial + 2*m.P1*x*y + m.P2*(r2+2*x*x)
	yd = y*radial + m.P1*(r2+2*y*y) + 2*m.P2*x*y
	a = radial + 2*x*x*dr + 2*m.P1*y + 6*m.P2*x
	b = 2*x*y*dr + 2*m.P1*x + 2*m.P2*y
	c = b
	d = radial + 2*y*y*dr + 6*m.P1*y + 2*m.P2*x
	return
}

// Distort returns the photo pixel at which the lens shows ideal pixel
// (X, Y). It is the model's forward map and needs no iteration.
func (m *Model) Distort(X, Y float64) (x, y float64) {
	xd, yd, _, _, _, _ := m.distortNormalized((X-m.Cx)/m.Fx, (Y-m.Cy)/m.Fy)
	return m.Fx*xd + m.Cx, m.Fy*yd + m.Cy
}

// Jacobian returns ∂(photo x, photo y)/∂(ideal X, ideal Y) at ideal pixel
// (X, Y), row-major: [∂x/∂X ∂x/∂Y; ∂y/∂X ∂y/∂Y].
func (m *Model) Jacobian(X, Y float64) [4]float64 {
	_, _, a, b, c, d := m.distortNormalized((X-m.Cx)/m.Fx, (Y-m.Cy)/m.Fy)
	return [4]float64{a, b * m.Fx / m.Fy, c * m.Fy / m.Fx, d}
}

// undistortTolerance is the residual, in normalized coordinates, at which
// Undistort stops: 1e-12 of the focal length is below 1e-8 px for any
// camera with a focal length under 10,000 px.
const undistortTolerance = 1e-12

// Undistort returns the ideal pixel that the lens shows at photo pixel
// (x, y): it solves Distort(X, Y) = (x, y) by Newton's method with the
// analytic Jacobian, starting from the photo position. ok is false when
// the iteration does not settle within 50 steps, or reaches a point where
// the distortion folds (the Jacobian's determinant is not positive): the
// model has no unique inverse there.
func (m *Model) Undistort(x, y float64) (X, Y float64, ok bool) {
	tx, ty := (x-m.Cx)/m.Fx, (y-m.Cy)/m.Fy
	nx, ny := tx, ty
	for it := 0; it < 50; it++ {
		xd, yd, a, b, c, d := m.distortNormalized(nx, ny)
		rx, ry := xd-tx, yd-ty
		det := a*d - b*c
		if !(det > 0) {
			return x, y, false
		}
		if rx*rx+ry*ry < undistortTolerance*undistortTolerance {
			return m.Fx*nx + m.Cx, m.Fy*ny + m.Cy, true
		}
		nx -= (d*rx - b*ry) / det
		ny -= (a*ry - c*rx) / det
	}
	return x, y, false
}

// Identity reports whether the model has no distortion at all.
func (m *Model) Identity() bool {
	return m.K1 == 0 && m.K2 == 0 && m.K3 == 0 && m.P1 == 0 && m.P2 == 0
}

// validationSteps is the number of intervals per side of the photo grid
// on which Validate checks that the model inverts.
const validationSteps = 32

// Validate reports a model that cannot correct photos of its size: a size
// or camera matrix that is not positive and finite, a principal point
// outside the image, coefficients that are not finite, or a distortion
// that does not invert uniquely over the frame. Invertibility is checked
// on a 33 × 33 grid of photo pixels spanning the frame: each must undistort
// (Newton converging where the distortion does not fold) and distort back
// to within 1e-6 px, and neighbouring grid points must keep their order in
// ideal pixels (no fold between them).
func (m *Model) Validate() error {
	finite := func(v ...float64) bool {
		for _, x := range v {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return false
			}
		}
		return true
	}
	switch {
	case m.Width < 2 || m.Height < 2:
		return fmt.Errorf("image size %dx%d px, expected at least 2 px a side", m.Width, m.Height)
	case !finite(m.Fx, m.Fy, m.Cx, m.Cy) || !(m.Fx > 0) || !(m.Fy > 0):
		return fmt.Errorf("focal lengths fx %g px and fy %g px, expected positive finite numbers", m.Fx, m.Fy)
	case m.Cx < 0 || m.Cy < 0 || m.Cx > float64(m.Width-1) || m.Cy > float64(m.Height-1):
		return fmt.Errorf("principal point (%g, %g) px lies outside the %dx%d image", m.Cx, m.Cy, m.Width, m.Height)
	case !finite(m.K1, m.K2, m.K3, m.P1, m.P2):
		return errors.New("distortion coefficients k1, k2, k3, p1, p2 must be finite numbers")
	}
	n := validationSteps
	prev := make([][2]float64, n+1)
	for j := 0; j <= n; j++ {
		y := float64(j) * float64(m.Height-1) / float64(n)
		var left [2]float64
		for i := 0; i <= n; i++ {
			x := float64(i) * float64(m.Width-1) / float64(n)
			X, Y, ok := m.Undistort(x, y)
			if ok {
				bx, by := m.Distort(X, Y)
				ok = math.Hypot(bx-x, by-y) < 1e-6
			}
			if !ok {
				return fmt.Errorf("the distortion does not invert at photo pixel (%.0f, %.0f): the coefficients fold the image there (a calibration that went wrong, or a lens for another image size)", x, y)
			}
			if (i > 0 && !(X > left[0])) || (j > 0 && !(Y > prev[i][1])) {
				return fmt.Errorf("the distortion folds the image near photo pixel (%.0f, %.0f): neighbouring pixels swap places once undistorted", x, y)
			}
			left = [2]float64{X, Y}
			prev[i] = left
		}
	}
	return nil
}
