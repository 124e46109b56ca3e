package strain

import (
	"fmt"
	"math"
)

// Measure is a finite strain measure computed from the displacement
// gradient H = ∇u (F = I + H), all in the reference configuration.
type Measure string

const (
	// Engineering is the infinitesimal strain ε = ½(H + Hᵀ): exact to first
	// order, and it shows a spurious 1 − cos θ strain under a rotation θ.
	Engineering Measure = "engineering"
	// Green is the Green–Lagrange strain E = ½(FᵀF − I): zero under any
	// rigid rotation.
	Green Measure = "green"
	// Hencky is the logarithmic (Hencky) strain ln U = ½ ln(FᵀF), material
	// frame: additive for coaxial stretches, zero under rotation.
	Hencky Measure = "hencky"
)

// ParseMeasure reads a measure's name.
func ParseMeasure(s string) (Measure, error) {
	switch m := Measure(s); m {
	case Engineering, Green, Hencky:
		return m, nil
	}
	return "", fmt.Errorf("strain measure %q, expected engineering, green or hencky", s)
}

// Tensor returns the in-plane strain (exx, eyy, exy) of measure m for the
// displacement gradient (ux, uy, vx, vy) = (∂u/∂x, ∂u/∂y, ∂v/∂x, ∂v/∂y).
func (m Measure) Tensor(ux, uy, vx, vy float64) (exx, eyy, exy float64) {
	switch m {
	case Green:
		// E = ½(H + Hᵀ + HᵀH).
		return ux + (ux*ux+vx*vx)/2, vy + (uy*uy+vy*vy)/2, (uy + vx + ux*uy + vx*vy) / 2
	case Hencky:
		// C = FᵀF, then ½ ln C by its eigen-decomposition.
		f11, f12, f21, f22 := 1+ux, uy, vx, 1+vy
		c11 := f11*f11 + f21*f21
		c22 := f12*f12 + f22*f22
		c12 := f11*f12 + f21*f22
		l1, l2, c, s := symEigen(c11, c22, c12)
		h1, h2 := math.Log(l1)/2, math.Log(l2)/2
		return h1*c*c + h2*s*s, h1*s*s + h2*c*c, (h1 - h2) * c * s
	}
	return ux, vy, (uy + vx) / 2
}

// symEigen returns the eigenvalues l1 ≥ l2 of the symmetric matrix
// [[a, b], [b, d]] and the unit eigenvector (c, s) of l1.
func symEigen(a, d, b float64) (l1, l2, c, s float64) {
	m, h := (a+d)/2, math.Hypot((a-d)/2, b)
	th := math.Atan2(2*b, a-d) / 2
	s, c = math.Sincos(th)
	return m + h, m - h, c, s
}

// Principal returns the principal strains e1 ≥ e2 of (exx, eyy, exy) and
// the direction of e1 in degrees from +x towards +y, in (−90, 90].
func Principal(exx, eyy, exy float64) (e1, e2, angleDeg float64) {
	e1, e2, c, s := symEigen(exx, eyy, exy)
	a := math.Atan2(s, c) * 180 / math.Pi
	if a <= -90 {
		a += 180
	} else if a > 90 {
		a -= 180
	}
	return e1, e2, a
}

// Equivalent returns the von Mises equivalent strain of an in-plane strain
// with the out-of-plane strain of an incompressible material,
// ezz = −(exx + eyy):  e_eq = √(⅔ e:e) = (2/√3)·√(exx² + eyy² + exx·eyy + exy²)
// (the plasticity definition, e.g. Hill, The Mathematical Theory of
// Plasticity, 1950).
func Equivalent(exx, eyy, exy float64) float64 {
	return 2 / math.Sqrt(3) * math.Sqrt(exx*exx+eyy*eyy+exx*eyy+exy*exy)
}
