package strain

import (
	"math"
	"testing"
)

// A rigid rotation θ has F = R(θ): Green–Lagrange and Hencky strains are
// exactly zero, while the infinitesimal measure shows the spurious normal
// strains cos θ − 1 (continuum kinematics, e.g. Malvern, Introduction to
// the Mechanics of a Continuous Medium, §4.5).
func TestMeasuresUnderRotation(t *testing.T) {
	th := 2 * math.Pi / 180
	s, c := math.Sincos(th)
	ux, uy, vx, vy := c-1, -s, s, c-1
	for _, m := range []Measure{Green, Hencky} {
		exx, eyy, exy := m.Tensor(ux, uy, vx, vy)
		if math.Abs(exx) > 1e-15 || math.Abs(eyy) > 1e-15 || math.Abs(exy) > 1e-15 {
			t.Errorf("%s strain of a 2° rotation: (%g, %g, %g), want 0", m, exx, eyy, exy)
		}
	}
	exx, eyy, exy := Engineering.Tensor(ux, uy, vx, vy)
	if math.Abs(exx-(c-1)) > 1e-15 || math.Abs(eyy-(c-1)) > 1e-15 || exy != 0 {
		t.Errorf("engineering strain of a 2° rotation: (%g, %g, %g), want (%g, %g, 0)", exx, eyy, exy, c-1, c-1)
	}
}

// For a pure stretch λ along x, Green–Lagrange gives (λ² − 1)/2 and Hencky
// ln λ (their definitions); for a stretch turned by a rotation the
// material-frame measures do not change (objectivity).
func TestStretchMeasures(t *testing.T) {
	const l = 1.05
	exx, _, _ := Green.Tensor(l-1, 0, 0, 0)
	if math.Abs(exx-(l*l-1)/2) > 1e-15 {
		t.Errorf("green stretch %g, want %g", exx, (l*l-1)/2)
	}
	exx, _, _ = Hencky.Tensor(l-1, 0, 0, 0)
	if math.Abs(exx-math.Log(l)) > 1e-15 {
		t.Errorf("hencky stretch %g, want %g", exx, math.Log(l))
	}
	// F = R·U with U = diag(1.05, 0.97): material measures equal those of U.
	s, c := math.Sincos(0.3)
	f11, f12, f21, f22 := c*1.05, -s*0.97, s*1.05, c*0.97
	for _, m := range []Measure{Green, Hencky} {
		a, b, d := m.Tensor(f11-1, f12, f21, f22-1)
		wa, wb, wd := m.Tensor(0.05, 0, 0, -0.03)
		if math.Abs(a-wa) > 1e-14 || math.Abs(b-wb) > 1e-14 || math.Abs(d-wd) > 1e-14 {
			t.Errorf("%s: rotated stretch (%g,%g,%g), unrotated (%g,%g,%g)", m, a, b, d, wa, wb, wd)
		}
	}
}

// Principal values of a plane strain state by Mohr's circle (any
// mechanics of materials text): e1,2 = (exx+eyy)/2 ± √(((exx−eyy)/2)² + exy²),
// tan 2θ = 2exy/(exx − eyy).
func TestPrincipal(t *testing.T) {
	e1, e2, a := Principal(3e-3, -1e-3, 2e-3)
	c, r := 1e-3, math.Hypot(2e-3, 2e-3)
	if math.Abs(e1-(c+r)) > 1e-15 || math.Abs(e2-(c-r)) > 1e-15 || math.Abs(a-22.5) > 1e-9 {
		t.Errorf("principal (%g, %g, %g°), want (%g, %g, 22.5°)", e1, e2, a, c+r, c-r)
	}
	if _, _, a := Principal(-1e-3, 2e-3, 0); math.Abs(a-90) > 1e-9 {
		t.Errorf("e1 along y: angle %g°, want 90", a)
	}
	// Uniaxial strain e with incompressible lateral contraction has
	// equivalent strain e (definition of the von Mises equivalent strain).
	if eq := Equivalent(2e-3, -1e-3, 0); math.Abs(eq-2e-3) > 1e-15 {
		t.Errorf("equivalent strain of (2e-3, −1e-3): %g, want 2e-3", eq)
	}
}
