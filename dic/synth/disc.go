package synth

import "math"

// BrazilianDisc is the elastic field of a disc of radius Radius centred at
// (Cx, Cy) squeezed between two equal and opposite concentrated forces of
// total magnitude Load (P, compressive for positive values) acting along the
// vertical diameter, at the top (Cx, Cy−Radius) and bottom (Cx, Cy+Radius)
// of the disc: the Brazilian (indirect tensile) test of the ISRM suggested
// method (1978), in the concentrated-load limit of Hondros (1959).
//
// The stresses are the classical solution (Timoshenko & Goodier, Theory of
// Elasticity, §41; Jaeger, Cook & Zimmerman, Fundamentals of Rock
// Mechanics): the radial Flamant stresses of the two point loads,
//
//	σr = −2p cos θ / (π r),   p = P/t (force per unit thickness),
//
// with r and θ measured from each load point and its load direction, plus a
// uniform all-round tension 2p/(πD) that frees the rim of traction. At the
// centre this gives σxx = 2P/(πDt), σyy = −6P/(πDt).
//
// The displacements follow exactly from the Kolosov–Muskhelishvili complex
// potentials of each Flamant load, written in a frame ζ = e^{−iβ}(z − z₀)
// whose real axis is the load direction β at the load point z₀
// (Muskhelishvili 1953; derived here, checked by the tests):
//
//	φ(ζ) = −(p/2π) log ζ,   ψ(ζ) = (p/2π) log ζ,
//	2G(ũ + iṽ) = κφ − ζ·conj(φ′) − conj(ψ) = −(p/2π)[(κ+1) ln r + i(κ−1)θ − e^{2iθ}],
//
// rotated back by e^{iβ}, plus the uniform tension σ₀ = 2p/(πD), whose
// displacement is (κ−1)σ₀/(4G)·(x, y). With X, Y the offsets from the centre
// (mm, y down), a₁ = R+Y, a₂ = R−Y, r₁² = X²+a₁², r₂² = X²+a₂²,
// θ₁ = atan2(−X, a₁), θ₂ = atan2(X, a₂) and c = p/(4πG):
//
//	u = c[(κ−1)(θ₁−θ₂) + 2Xa₁/r₁² + 2Xa₂/r₂²] + (κ−1)σ₀X/(4G)
//	v = c[(κ+1) ln(r₂/r₁) + (a₁²−X²)/r₁² − (a₂²−X²)/r₂²] + (κ−1)σ₀Y/(4G)
//
// κ = (3−ν)/(1+ν) in plane stress (the default, the usual assumption for a
// thin disc) and 3−4ν in plane strain. The logarithmic terms of the two loads
// cancel at the centre, so the centre is fixed and, by the double mirror
// symmetry, does not rotate; u is odd in X and v odd in Y. No rigid-body
// terms are added.
//
// Lengths are given in pixels and converted with MMPerPx; Load is in N,
// Thickness in mm, E and stresses in MPa (N/mm²); displacements come out in
// pixels. The field is singular (logarithmically in displacement, as 1/r in
// stress) at the two load points: it is meant for the disc interior away
// from them, say r ≤ 0.95R and more than a few pixels from the loads. Outside
// the disc At returns the analytic continuation, which has branch cuts
// along the load axis beyond the two load points; exactly at a load point
// the point is nudged by 1e-9 R so the result stays finite.
type BrazilianDisc struct {
	Cx          float64 `json:"cx_px"`
	Cy          float64 `json:"cy_px"`
	Radius      float64 `json:"radius_px"`
	Load        float64 `json:"load_N"`
	Thickness   float64 `json:"thickness_mm"`
	MMPerPx     float64 `json:"mm_per_px"`
	E           float64 `json:"E_MPa"`
	Nu          float64 `json:"nu"`
	PlaneStrain bool    `json:"plane_strain,omitempty"`
}

// Scaled returns the field at s times the load.
func (d BrazilianDisc) Scaled(s float64) Field { d.Load *= s; return d }

// Shear returns the shear modulus G = E / (2(1+ν)).
func (d BrazilianDisc) Shear() float64 { return d.E / (2 * (1 + d.Nu)) }

func (d BrazilianDisc) kappa() float64 {
	if d.PlaneStrain {
		return 3 - 4*d.Nu
	}
	return (3 - d.Nu) / (1 + d.Nu)
}

// loadPerMM returns p = P/t, the line load in N/mm.
func (d BrazilianDisc) loadPerMM() float64 { return d.Load / d.Thickness }

// TensileStress returns σ₀ = 2P/(πDt), the indirect tensile stress of the
// ISRM suggested method (1978), in MPa: the horizontal stress at the centre
// and the uniform tension of the superposition.
func (d BrazilianDisc) TensileStress() float64 {
	D := 2 * d.Radius * d.MMPerPx
	return 2 * d.Load / (math.Pi * D * d.Thickness)
}

// CentreStress returns the stresses at the disc centre, σxx = 2P/(πDt)
// (tension) and σyy = −6P/(πDt) (compression), MPa (ISRM 1978; Hondros
// 1959 for vanishing contact arc).
func (d BrazilianDisc) CentreStress() (sxx, syy float64) {
	s0 := d.TensileStress()
	return s0, -3 * s0
}

// local returns the offsets (mm) of pixel (x, y) from the disc centre and the
// radius in mm, nudging the point off a load point.
func (d BrazilianDisc) local(x, y float64) (X, Y, R float64) {
	s := d.MMPerPx
	X, Y, R = (x-d.Cx)*s, (y-d.Cy)*s, d.Radius*s
	if X == 0 && math.Abs(math.Abs(Y)-R) <= 1e-12*R {
		X = 1e-9 * R
	}
	return X, Y, R
}

// Stress returns the closed-form stresses (MPa, tension positive) at pixel
// (x, y): the two Flamant radial stresses σr·n nᵀ, n the unit vector from
// each load point, plus the uniform tension 2P/(πDt) (Timoshenko & Goodier
// §41). σxy follows the image axes (y down).
func (d BrazilianDisc) Stress(x, y float64) (sxx, syy, sxy float64) {
	X, Y, R := d.local(x, y)
	k := 2 * d.loadPerMM() / math.Pi
	s0 := d.TensileStress()
	// Top load at (0, −R) pushing +y: n = (X, Y+R)/r₁, cos θ = (Y+R)/r₁.
	// Bottom load at (0, R) pushing −y: n = (X, Y−R)/r₂, cos θ = (R−Y)/r₂.
	a1, a2 := R+Y, R-Y
	r1s, r2s := X*X+a1*a1, X*X+a2*a2
	f1 := -k * a1 / (r1s * r1s) // σr/r₁² so that σr n nᵀ = f·(dx, dy)(dx, dy)ᵀ
	f2 := -k * a2 / (r2s * r2s)
	sxx = f1*X*X + f2*X*X + s0
	syy = f1*a1*a1 + f2*a2*a2 + s0
	sxy = f1*X*a1 - f2*X*a2
	return
}

// At returns the motion (pixels; gradient dimensionless) of the material
// point at (x, y).
func (d BrazilianDisc) At(x, y float64) Motion {
	X, Y, R := d.local(x, y)
	kap := d.kappa()
	g := d.Shear()
	c := d.loadPerMM() / (4 * math.Pi * g)
	c0 := (kap - 1) * d.TensileStress() / (4 * g)

	a1, a2 := R+Y, R-Y
	r1s, r2s := X*X+a1*a1, X*X+a2*a2
	q1, q2 := r1s*r1s, r2s*r2s
	th1, th2 := math.Atan2(-X, a1), math.Atan2(X, a2)

	u := c*((kap-1)*(th1-th2)+2*X*a1/r1s+2*X*a2/r2s) + c0*X
	v := c*((kap+1)*0.5*math.Log(r2s/r1s)+(a1*a1-X*X)/r1s-(a2*a2-X*X)/r2s) + c0*Y

	// Derivatives with ∂θ₁/∂X = −a₁/r₁², ∂θ₁/∂Y = X/r₁²,
	// ∂θ₂/∂X = a₂/r₂², ∂θ₂/∂Y = X/r₂², ∂a₁/∂Y = 1, ∂a₂/∂Y = −1.
	ux := c*((kap-1)*(-a1/r1s-a2/r2s)+2*a1*(a1*a1-X*X)/q1+2*a2*(a2*a2-X*X)/q2) + c0
	uy := c * ((kap-1)*(X/r1s-X/r2s) + 2*X*(X*X-a1*a1)/q1 + 2*X*(a2*a2-X*X)/q2)
	vx := c * ((kap+1)*(X/r2s-X/r1s) - 4*X*a1*a1/q1 + 4*X*a2*a2/q2)
	vy := c*((kap+1)*(-a2/r2s-a1/r1s)+4*a1*X*X/q1+4*a2*X*X/q2) + c0

	s := d.MMPerPx
	return Motion{U: u / s, V: v / s, UX: ux, UY: uy, VX: vx, VY: vy}
}

// HookeStress returns the in-plane stresses (MPa, tension positive) that
// isotropic linear elasticity gives for the small strains of a motion, in
// plane stress or plane strain as the disc is set: the bridge from a
// measured or true displacement gradient to Stress and CentreStress.
func (d BrazilianDisc) HookeStress(m Motion) (sxx, syy, sxy float64) {
	return Kirsch{E: d.E, Nu: d.Nu, PlaneStress: !d.PlaneStrain}.HookeStress(m)
}
