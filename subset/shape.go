package subset

import (
	"errors"
	"fmt"
	"math"
)

// ErrSingularWarp is returned when a warp to be inverted is singular: it
// folds the subset onto a line or worse. It is a plain sentinel, without
// the parameters, so that the solver's iterations never allocate.
var ErrSingularWarp = errors.New("subset: singular warp")

// ShapeOrder selects the subset shape function: how the displacement is
// allowed to vary across one subset.
type ShapeOrder int

const (
	// Affine is the first-order shape function: a translation plus the four
	// displacement gradients (6 parameters).
	Affine ShapeOrder = iota
	// Quadratic is the second-order shape function of Lu & Cary 2000
	// ("Deformation measurements by digital image correlation:
	// implementation of a second-order displacement gradient", Experimental
	// Mechanics 40(4):393–400): Affine plus the six second derivatives
	// (12 parameters).
	Quadratic
)

// NumParams returns the number of shape parameters, 6 or 12.
func (o ShapeOrder) NumParams() int {
	if o == Quadratic {
		return 12
	}
	return 6
}

// String returns "affine" or "quadratic".
func (o ShapeOrder) String() string {
	switch o {
	case Affine:
		return "affine"
	case Quadratic:
		return "quadratic"
	}
	return fmt.Sprintf("ShapeOrder(%d)", int(o))
}

// ParseShapeOrder is the inverse of ShapeOrder.String.
func ParseShapeOrder(s string) (ShapeOrder, error) {
	switch s {
	case "affine":
		return Affine, nil
	case "quadratic":
		return Quadratic, nil
	}
	return 0, fmt.Errorf("subset: unknown shape order %q (want affine or quadratic)", s)
}

// Params are the shape parameters of one subset, in the order
//
//	u, ux, uy, v, vx, vy, uxx, uxy, uyy, vxx, vxy, vyy
//
// where u, v are the displacement of the subset centre in pixels, ux is
// ∂u/∂x and so on, evaluated at the subset centre. An offset (dx, dy) from
// the centre moves to
//
//	dx' = dx + u + ux·dx + uy·dy + ½uxx·dx² + uxy·dx·dy + ½uyy·dy²
//	dy' = dy + v + vx·dx + vy·dy + ½vxx·dx² + vxy·dx·dy + ½vyy·dy²
//
// (the second-order Taylor expansion of Lu & Cary 2000). For the Affine
// order the last six entries are zero.
type Params [12]float64

// Indices into Params.
const (
	PU = iota
	PUx
	PUy
	PV
	PVx
	PVy
	PUxx
	PUxy
	PUyy
	PVxx
	PVxy
	PVyy
)

// Translation returns the parameters of a rigid translation by (u, v).
func Translation(u, v float64) Params { return Params{PU: u, PV: v} }

// Warp returns where the local offset (dx, dy) from the subset centre moves
// under p, as an offset from the undeformed centre.
func (p *Params) Warp(dx, dy float64) (x, y float64) {
	x = dx + p[PU] + p[PUx]*dx + p[PUy]*dy + 0.5*p[PUxx]*dx*dx + p[PUxy]*dx*dy + 0.5*p[PUyy]*dy*dy
	y = dy + p[PV] + p[PVx]*dx + p[PVy]*dy + 0.5*p[PVxx]*dx*dx + p[PVxy]*dx*dy + 0.5*p[PVyy]*dy*dy
	return x, y
}

// IsFinite reports whether every parameter is finite.
func (p *Params) IsFinite() bool {
	for _, v := range p {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// Compose returns the parameters of the warp that applies q first and then
// p: x ↦ W(W(x; q); p). For Affine it is exact. For Quadratic the true
// composite is a quartic polynomial; Compose returns its second-order
// Taylor expansion about the subset centre, which is what the 6×6
// warp-matrix product of Gao et al. 2015 (Optics and Lasers in Engineering
// 65) computes.
func (p Params) Compose(q Params, order ShapeOrder) Params {
	if order == Affine {
		a, b := p.affineMatrix(), q.affineMatrix()
		return paramsFromAffine(mul3(&a, &b))
	}
	a, b := p.quadraticMatrix(), q.quadraticMatrix()
	return paramsFromQuadratic(mul6(&a, &b))
}

// Inverse returns the parameters of the inverse warp. For Affine it is
// exact; for Quadratic it is read from the inverse of the 6×6 warp matrix
// (Gao et al. 2015), a second-order approximation of the true inverse. It
// returns ErrSingularWarp if the warp is singular.
func (p Params) Inverse(order ShapeOrder) (Params, error) {
	if order == Affine {
		a := p.affineMatrix()
		inv, ok := invert3(&a)
		if !ok {
			return Params{}, ErrSingularWarp
		}
		return paramsFromAffine(inv), nil
	}
	a := p.quadraticMatrix()
	if !invert6(&a) {
		return Params{}, ErrSingularWarp
	}
	return paramsFromQuadratic(a), nil
}

// ComposeInverse returns the inverse compositional update of p by dp,
// W(x; p) ∘ W(x; dp)⁻¹, computed as the product of p's warp matrix with the
// inverse of dp's (Baker & Matthews 2004, "Lucas–Kanade 20 years on: a
// unifying framework", IJCV 56(3):221–255; Gao et al. 2015 for the 6×6
// quadratic matrix). It returns ErrSingularWarp if dp is singular.
func (p Params) ComposeInverse(dp Params, order ShapeOrder) (Params, error) {
	if order == Affine {
		d := dp.affineMatrix()
		inv, ok := invert3(&d)
		if !ok {
			return Params{}, ErrSingularWarp
		}
		a := p.affineMatrix()
		return paramsFromAffine(mul3(&a, &inv)), nil
	}
	d := dp.quadraticMatrix()
	if !invert6(&d) {
		return Params{}, ErrSingularWarp
	}
	a := p.quadraticMatrix()
	return paramsFromQuadratic(mul6(&a, &d)), nil
}

// cornerMotion returns the largest distance any corner (±r, ±r) of a subset
// of half-size r is moved by the warp p.
func (p *Params) cornerMotion(r float64) float64 {
	var m float64
	for _, c := range [4][2]float64{{-r, -r}, {r, -r}, {-r, r}, {r, r}} {
		x, y := p.Warp(c[0], c[1])
		m = math.Max(m, math.Hypot(x-c[0], y-c[1]))
	}
	return m
}

// affineMatrix returns the homogeneous 3×3 matrix of the affine part of p,
// row-major, acting on (dx, dy, 1).
func (p *Params) affineMatrix() [9]float64 {
	return [9]float64{
		1 + p[PUx], p[PUy], p[PU],
		p[PVx], 1 + p[PVy], p[PV],
		0, 0, 1,
	}
}

func paramsFromAffine(m [9]float64) Params {
	return Params{PU: m[2], PUx: m[0] - 1, PUy: m[1], PV: m[5], PVx: m[3], PVy: m[4] - 1}
}

func mul3(a, b *[9]float64) [9]float64 {
	var c [9]float64
	for i := 0; i < 3; i++ {
		for j := 0; j < 3; j++ {
			c[3*i+j] = a[3*i]*b[j] + a[3*i+1]*b[3+j] + a[3*i+2]*b[6+j]
		}
	}
	return c
}

func invert3(a *[9]float64) ([9]float64, bool) {
	// The last row is (0, 0, 1): invert the 2×2 block and the translation.
	det := a[0]*a[4] - a[1]*a[3]
	if det == 0 || math.IsNaN(det) || math.IsInf(det, 0) {
		return [9]float64{}, false
	}
	i0, i1, i3, i4 := a[4]/det, -a[1]/det, -a[3]/det, a[0]/det
	return [9]float64{
		i0, i1, -(i0*a[2] + i1*a[5]),
		i3, i4, -(i3*a[2] + i4*a[5]),
		0, 0, 1,
	}, true
}

// quadraticMatrix returns the 6×6 warp matrix of p, row-major. It maps the
// monomials (dx², dx·dy, dy², dx, dy, 1) of an offset to those of the warped
// offset, each truncated to degree two in (dx, dy); rows 3 and 4 are the
// warp itself (Gao et al. 2015).
func (p *Params) quadraticMatrix() [36]float64 {
	// x' = a0 dx² + a1 dx dy + a2 dy² + a3 dx + a4 dy + a5, and y' alike.
	a := [6]float64{0.5 * p[PUxx], p[PUxy], 0.5 * p[PUyy], 1 + p[PUx], p[PUy], p[PU]}
	b := [6]float64{0.5 * p[PVxx], p[PVxy], 0.5 * p[PVyy], p[PVx], 1 + p[PVy], p[PV]}
	var m [36]float64
	// Degree ≤ 2 part of the product of two such polynomials.
	prod := func(row []float64, a, b *[6]float64) {
		row[0] = a[3]*b[3] + a[5]*b[0] + a[0]*b[5]
		row[1] = a[3]*b[4] + a[4]*b[3] + a[5]*b[1] + a[1]*b[5]
		row[2] = a[4]*b[4] + a[5]*b[2] + a[2]*b[5]
		row[3] = a[3]*b[5] + a[5]*b[3]
		row[4] = a[4]*b[5] + a[5]*b[4]
		row[5] = a[5] * b[5]
	}
	prod(m[0:6], &a, &a)
	prod(m[6:12], &a, &b)
	prod(m[12:18], &b, &b)
	copy(m[18:24], a[:])
	copy(m[24:30], b[:])
	m[35] = 1
	return m
}

func paramsFromQuadratic(m [36]float64) Params {
	a, b := m[18:24], m[24:30]
	return Params{
		PU: a[5], PUx: a[3] - 1, PUy: a[4],
		PV: b[5], PVx: b[3], PVy: b[4] - 1,
		PUxx: 2 * a[0], PUxy: a[1], PUyy: 2 * a[2],
		PVxx: 2 * b[0], PVxy: b[1], PVyy: 2 * b[2],
	}
}

func mul6(a, b *[36]float64) [36]float64 {
	var c [36]float64
	for i := 0; i < 6; i++ {
		for k := 0; k < 6; k++ {
			aik := a[6*i+k]
			if aik == 0 {
				continue
			}
			for j := 0; j < 6; j++ {
				c[6*i+j] += aik * b[6*k+j]
			}
		}
	}
	return c
}

// invert6 inverts a row-major 6×6 matrix in place by Gauss–Jordan
// elimination with partial pivoting. It reports false, leaving a
// undefined, if the matrix is singular to working precision.
func invert6(a *[36]float64) bool {
	const n = 6
	var scale float64
	for _, v := range a {
		scale = math.Max(scale, math.Abs(v))
	}
	if !(scale > 0) || math.IsInf(scale, 0) {
		return false
	}
	var inv [36]float64
	for i := 0; i < n; i++ {
		inv[n*i+i] = 1
	}
	for col := 0; col < n; col++ {
		piv := col
		for r := col + 1; r < n; r++ {
			if math.Abs(a[n*r+col]) > math.Abs(a[n*piv+col]) {
				piv = r
			}
		}
		if math.Abs(a[n*piv+col]) <= 1e-14*scale {
			return false
		}
		if piv != col {
			for j := 0; j < n; j++ {
				a[n*col+j], a[n*piv+j] = a[n*piv+j], a[n*col+j]
				inv[n*col+j], inv[n*piv+j] = inv[n*piv+j], inv[n*col+j]
			}
		}
		d := 1 / a[n*col+col]
		for j := 0; j < n; j++ {
			a[n*col+j] *= d
			inv[n*col+j] *= d
		}
		for r := 0; r < n; r++ {
			f := a[n*r+col]
			if r == col || f == 0 {
				continue
			}
			for j := 0; j < n; j++ {
				a[n*r+j] -= f * a[n*col+j]
				inv[n*r+j] -= f * inv[n*col+j]
			}
		}
	}
	*a = inv
	return true
}
