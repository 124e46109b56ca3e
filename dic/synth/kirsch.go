package synth

import (
	"math"
	"math/cmplx"
)

// Kirsch is the elastic field around a circular hole of radius Radius
// centred at (Cx, Cy) in an infinite plate under far-field principal
// stresses: Stress in the vertical (y, loading) direction and K·Stress in
// the horizontal direction, both compressive for positive values (the
// usual rock-mechanics statement of a test: vertical load with lateral
// confinement ratio K). Displacements are total displacements from the
// unloaded state, with the hole centre fixed and no rigid rotation.
//
// The stresses are those of Kirsch (1898) as given in Jaeger, Cook &
// Zimmerman, Fundamentals of Rock Mechanics (4th ed., §8.4). The
// displacements follow from the Kolosov–Muskhelishvili complex potentials
// of the same problem (Muskhelishvili 1953, §56):
//
//	φ(z) = P z/2 + Q a²/z,   ψ(z) = −Q z − P a²/z + Q a⁴/z³,
//	2G(u + i v) = κ φ(z) − z·conj(φ′(z)) − conj(ψ(z)),
//
// with P = (Sx+Sy)/2, Q = (Sx−Sy)/2 (tension positive), z measured from the
// hole centre, κ = 3−4ν in plane strain and (3−ν)/(1+ν) in plane stress.
//
// Lengths are in pixels, E and stresses in MPa; displacements come out in
// pixels. The field is defined for r ≥ Radius; inside the hole it is the
// analytic continuation (used only while inverting the map when rendering).
type Kirsch struct {
	Cx          float64 `json:"cx_px"`
	Cy          float64 `json:"cy_px"`
	Radius      float64 `json:"radius_px"`
	Stress      float64 `json:"stress_MPa"`
	K           float64 `json:"k"`
	E           float64 `json:"E_MPa"`
	Nu          float64 `json:"nu"`
	PlaneStress bool    `json:"plane_stress,omitempty"`
}

// Scaled returns the field at s times the far-field stress.
func (k Kirsch) Scaled(s float64) Field { k.Stress *= s; return k }

// farField returns the far-field stresses Sx, Sy (tension positive).
func (k Kirsch) farField() (sx, sy float64) { return -k.K * k.Stress, -k.Stress }

// Shear returns the shear modulus G = E / (2(1+ν)).
func (k Kirsch) Shear() float64 { return k.E / (2 * (1 + k.Nu)) }

func (k Kirsch) kappa() float64 {
	if k.PlaneStress {
		return (3 - k.Nu) / (1 + k.Nu)
	}
	return 3 - 4*k.Nu
}

// At returns the motion of the material point at (x, y).
func (k Kirsch) At(x, y float64) Motion {
	sx, sy := k.farField()
	p, q := (sx+sy)/2, (sx-sy)/2
	a2 := k.Radius * k.Radius
	z := complex(x-k.Cx, y-k.Cy)
	if z == 0 {
		z = complex(1e-9, 0)
	}
	cP, cQ, cA2 := complex(p, 0), complex(q, 0), complex(a2, 0)
	w := 1 / z // powers of 1/z by multiplication: one complex division
	w2 := w * w
	w3 := w2 * w
	phi := cP*z/2 + cQ*cA2*w
	dphi := cP/2 - cQ*cA2*w2
	d2phi := 2 * cQ * cA2 * w3
	psi := -cQ*z - cP*cA2*w + cQ*cA2*cA2*w3
	dpsi := -cQ + cP*cA2*w2 - 3*cQ*cA2*cA2*w2*w2
	kap := complex(k.kappa(), 0)
	g2 := complex(2*k.Shear(), 0)

	disp := (kap*phi - z*cmplx.Conj(dphi) - cmplx.Conj(psi)) / g2
	// ∂/∂x and ∂/∂y of the displacement, with ∂z/∂x = 1, ∂z/∂y = i and
	// ∂conj(f)/∂x = conj(f′), ∂conj(f)/∂y = −i·conj(f′).
	dx := (kap*dphi - cmplx.Conj(dphi) - z*cmplx.Conj(d2phi) - cmplx.Conj(dpsi)) / g2
	dy := 1i * (kap*dphi - cmplx.Conj(dphi) + z*cmplx.Conj(d2phi) + cmplx.Conj(dpsi)) / g2
	return Motion{
		U: real(disp), V: imag(disp),
		UX: real(dx), VX: imag(dx),
		UY: real(dy), VY: imag(dy),
	}
}

// PolarStress returns the Kirsch stresses (MPa, tension positive) at
// distance r ≥ Radius from the hole centre and angle θ measured from the
// horizontal (x) axis: radial σrr, tangential σθθ and shear σrθ
// (Jaeger, Cook & Zimmerman, eqs. 8.4.9–8.4.11, written here for far-field
// principal stresses along x and y).
func (k Kirsch) PolarStress(r, theta float64) (srr, stt, srt float64) {
	sx, sy := k.farField()
	p, q := (sx+sy)/2, (sx-sy)/2
	a2 := k.Radius * k.Radius / (r * r)
	a4 := a2 * a2
	c2, s2 := math.Cos(2*theta), math.Sin(2*theta)
	srr = p*(1-a2) + q*(1-4*a2+3*a4)*c2
	stt = p*(1+a2) - q*(1+3*a4)*c2
	srt = -q * (1 + 2*a2 - 3*a4) * s2
	return
}

// HookeStress returns the in-plane stresses (MPa, tension positive) that
// isotropic linear elasticity gives for the small strains of a motion:
// plane strain or plane stress as the field is set. It turns a measured or
// true displacement gradient into stresses comparable with PolarStress.
func (k Kirsch) HookeStress(m Motion) (sxx, syy, sxy float64) {
	exx, eyy, exy := m.UX, m.VY, (m.UY+m.VX)/2
	g := k.Shear()
	var lam float64
	if k.PlaneStress {
		lam = k.E * k.Nu / (1 - k.Nu*k.Nu)
	} else {
		lam = k.E * k.Nu / ((1 + k.Nu) * (1 - 2*k.Nu))
	}
	tr := exx + eyy
	return lam*tr + 2*g*exx, lam*tr + 2*g*eyy, 2 * g * exy
}
