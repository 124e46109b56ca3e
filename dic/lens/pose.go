package lens

import "math"

// Pose places a planar target in front of the camera: a board point
// (X, Y, 0) in mm sits at R·(X, Y, 0) + T in camera coordinates (x right,
// y down, z along the optical axis, in mm). R is given by its rotation
// vector (axis times angle in radians, the Rodrigues form OpenCV returns).
type Pose struct {
	Rotation    [3]float64 `json:"rotation_rad"`
	Translation [3]float64 `json:"translation_mm"`
}

// Matrix returns the pose's rotation matrix, row-major, by Rodrigues'
// formula R = cos θ·I + (1 − cos θ)·k·kᵀ + sin θ·[k]×, k = r/θ, θ = |r|.
func (p Pose) Matrix() [9]float64 {
	r := p.Rotation
	theta := math.Sqrt(r[0]*r[0] + r[1]*r[1] + r[2]*r[2])
	if theta == 0 {
		return [9]float64{1, 0, 0, 0, 1, 0, 0, 0, 1}
	}
	kx, ky, kz := r[0]/theta, r[1]/theta, r[2]/theta
	c, s := math.Cos(theta), math.Sin(theta)
	v := 1 - c
	return [9]float64{
		c + v*kx*kx, v*kx*ky - s*kz, v*kx*kz + s*ky,
		v*ky*kx + s*kz, c + v*ky*ky, v*ky*kz - s*kx,
		v*kz*kx - s*ky, v*kz*ky + s*kx, c + v*kz*kz,
	}
}

// Homography returns the 3×3 matrix H (row-major) that maps a board point
// (X, Y, 1) in mm to the homogeneous ideal pixel of the model's camera:
// H = K·[r1 r2 t] (Zhang 2000, eq. 2).
func (p Pose) Homography(m *Model) [9]float64 {
	R := p.Matrix()
	t := p.Translation
	cols := [3][3]float64{{R[0], R[3], R[6]}, {R[1], R[4], R[7]}, {t[0], t[1], t[2]}}
	var h [9]float64
	for j, col := range cols {
		h[0+j] = m.Fx*col[0] + m.Cx*col[2]
		h[3+j] = m.Fy*col[1] + m.Cy*col[2]
		h[6+j] = col[2]
	}
	return h
}

// Project returns the photo pixel at which the camera sees board point
// (X, Y) mm in pose p, and false when the point is not in front of the
// camera.
func (p Pose) Project(m *Model, X, Y float64) (x, y float64, ok bool) {
	h := p.Homography(m)
	w := h[6]*X + h[7]*Y + h[8]
	if !(w > 0) {
		return 0, 0, false
	}
	x, y = m.Distort((h[0]*X+h[1]*Y+h[2])/w, (h[3]*X+h[4]*Y+h[5])/w)
	return x, y, true
}
