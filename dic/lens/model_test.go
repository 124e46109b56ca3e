package lens

import (
	"math"
	"testing"
)

// A lens of the strength of a short machine-vision lens (values of our
// own, typical of such lenses from memory): barrel k1 with smaller higher
// terms and a little decentring.
var typical = Model{Width: 640, Height: 480, Fx: 820, Fy: 815, Cx: 322.5, Cy: 236.25,
	K1: -0.21, K2: 0.12, K3: -0.03, P1: 0.0012, P2: -0.0008}

// Undistort inverts Distort: over the whole frame the round trip returns
// the photo pixel to 1e-8 px (the definition of an inverse; the tolerance
// is the iteration's own, undistortTolerance times the focal length).
func TestUndistortInvertsDistort(t *testing.T) {
	m := typical
	worst := 0.0
	for y := 0.0; y <= 479; y += 7.9 {
		for x := 0.0; x <= 639; x += 7.9 {
			X, Y, ok := m.Undistort(x, y)
			if !ok {
				t.Fatalf("no inverse at (%g, %g)", x, y)
			}
			bx, by := m.Distort(X, Y)
			worst = math.Max(worst, math.Hypot(bx-x, by-y))
		}
	}
	if worst > 1e-8 {
		t.Errorf("round trip off by up to %.3g px, want < 1e-8", worst)
	}
}

// The analytic Jacobian agrees with central differences of Distort to
// 1e-7 (the truncation error of a 1e-3 px step on these polynomials is
// ~1e-10; round-off ~1e-10).
func TestJacobianMatchesDifferences(t *testing.T) {
	m := typical
	const h = 1e-3
	for _, p := range [][2]float64{{0, 0}, {639, 479}, {100, 400}, {322, 236}, {600, 20}} {
		J := m.Jacobian(p[0], p[1])
		xp, yp := m.Distort(p[0]+h, p[1])
		xm, ym := m.Distort(p[0]-h, p[1])
		xq, yq := m.Distort(p[0], p[1]+h)
		xn, yn := m.Distort(p[0], p[1]-h)
		num := [4]float64{(xp - xm) / (2 * h), (xq - xn) / (2 * h), (yp - ym) / (2 * h), (yq - yn) / (2 * h)}
		for k := range J {
			if math.Abs(J[k]-num[k]) > 1e-7 {
				t.Errorf("at %v: Jacobian[%d] = %.10f, differences give %.10f", p, k, J[k], num[k])
			}
		}
	}
}

// Rodrigues' formula gives an orthonormal matrix whose rotation of the
// axis is the axis itself and whose angle is |r| (the definition of the
// rotation vector), and the quarter turn about z sends x to y.
func TestPoseMatrix(t *testing.T) {
	p := Pose{Rotation: [3]float64{0.3, -0.2, 0.5}}
	R := p.Matrix()
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			dot := 0.0
			for k := 0; k < 3; k++ {
				dot += R[3*i+k] * R[3*j+k]
			}
			want := 0.0
			if i == j {
				want = 1
			}
			if math.Abs(dot-want) > 1e-15 {
				t.Errorf("rows %d·%d = %g, want %g", i, j, dot, want)
			}
		}
	}
	r := p.Rotation
	for i := 0; i < 3; i++ {
		if got := R[3*i]*r[0] + R[3*i+1]*r[1] + R[3*i+2]*r[2]; math.Abs(got-r[i]) > 1e-15 {
			t.Errorf("R·axis[%d] = %g, want %g", i, got, r[i])
		}
	}
	theta := math.Acos((R[0] + R[4] + R[8] - 1) / 2)
	if want := math.Sqrt(0.3*0.3 + 0.2*0.2 + 0.5*0.5); math.Abs(theta-want) > 1e-12 {
		t.Errorf("angle %g, want %g", theta, want)
	}
	q := Pose{Rotation: [3]float64{0, 0, math.Pi / 2}}.Matrix()
	if math.Abs(q[3]-1) > 1e-15 || math.Abs(q[0]) > 1e-15 {
		t.Errorf("quarter turn about z sends x to (%g, %g, %g), want (0, 1, 0)", q[0], q[3], q[6])
	}
}

// Validate accepts the typical lens and refuses one whose k1 folds the
// frame (barrel distortion x(1 + k1 r²) turns back where 1 + 3 k1 r² = 0,
// r² = 1/(−3 k1): for k1 = −1.5 at r ≈ 0.47, inside this frame's corners
// at r ≈ 0.49).
func TestValidate(t *testing.T) {
	m := typical
	if err := m.Validate(); err != nil {
		t.Errorf("typical lens: %v", err)
	}
	m.K1, m.K2, m.K3 = -1.5, 0, 0
	if err := m.Validate(); err == nil {
		t.Error("a folding lens was accepted")
	}
	m = typical
	m.Cx = 700
	if err := m.Validate(); err == nil {
		t.Error("a principal point outside the image was accepted")
	}
}

func BenchmarkUndistort(b *testing.B) {
	m := typical
	for i := 0; i < b.N; i++ {
		m.Undistort(float64(i%640), float64(i%480))
	}
}
