package subset

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// TestWarp checks Warp against the second-order Taylor form of Lu & Cary
// 2000 worked by hand: with u = 1, ux = 0.1, uxx = 2, vy = -0.5, vxy = 0.25,
// the offset (3, 2) moves to (3 + 1 + 0.3 + 9, 2 - 1 + 1.5) = (13.3, 2.5).
func TestWarp(t *testing.T) {
	p := Params{PU: 1, PUx: 0.1, PUxx: 2, PVy: -0.5, PVxy: 0.25}
	x, y := p.Warp(3, 2)
	if math.Abs(x-13.3) > 1e-14 || math.Abs(y-2.5) > 1e-14 {
		t.Errorf("Warp(3, 2) = (%g, %g), want (13.3, 2.5)", x, y)
	}
}

func randomAffine(rng *rand.Rand, scale float64) Params {
	var p Params
	p[PU], p[PV] = 5*rng.NormFloat64(), 5*rng.NormFloat64()
	for _, i := range []int{PUx, PUy, PVx, PVy} {
		p[i] = scale * rng.NormFloat64()
	}
	return p
}

func denseAffine(p Params) *mat.Dense {
	return mat.NewDense(3, 3, []float64{1 + p[PUx], p[PUy], p[PU], p[PVx], 1 + p[PVy], p[PV], 0, 0, 1})
}

// TestAffineComposeInverse checks the affine composition and inverse
// against gonum's matrix product and inverse of the homogeneous 3×3 warp
// matrices (reference library).
func TestAffineComposeInverse(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for range 20 {
		p, q := randomAffine(rng, 0.2), randomAffine(rng, 0.2)
		var want, inv, invQ mat.Dense
		want.Mul(denseAffine(p), denseAffine(q))
		if !mat.EqualApprox(denseAffine(p.Compose(q, Affine)), &want, 1e-12) {
			t.Errorf("Compose(%v, %v) differs from gonum's product", p[:6], q[:6])
		}
		if err := inv.Inverse(denseAffine(p)); err != nil {
			t.Fatal(err)
		}
		pi, err := p.Inverse(Affine)
		if err != nil {
			t.Fatal(err)
		}
		if !mat.EqualApprox(denseAffine(pi), &inv, 1e-12) {
			t.Errorf("Inverse(%v) differs from gonum's inverse", p[:6])
		}
		if err := invQ.Inverse(denseAffine(q)); err != nil {
			t.Fatal(err)
		}
		want.Mul(denseAffine(p), &invQ)
		ci, err := p.ComposeInverse(q, Affine)
		if err != nil {
			t.Fatal(err)
		}
		if !mat.EqualApprox(denseAffine(ci), &want, 1e-12) {
			t.Errorf("ComposeInverse(%v, %v) differs from gonum's product", p[:6], q[:6])
		}
	}
	if _, err := (Params{PUx: -1}).Inverse(Affine); err == nil {
		t.Error("inverse of a warp collapsing x succeeded, want an error")
	}
}

// TestInvert6 checks the 6×6 Gauss–Jordan inverse against gonum's inverse
// (reference library) on random well-conditioned matrices.
func TestInvert6(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 8))
	for range 20 {
		var a [36]float64
		for i := range a {
			a[i] = rng.NormFloat64()
		}
		for i := 0; i < 6; i++ {
			a[7*i] += 4
		}
		var want mat.Dense
		if err := want.Inverse(mat.NewDense(6, 6, append([]float64(nil), a[:]...))); err != nil {
			t.Fatal(err)
		}
		if !invert6(&a) {
			t.Fatal("invert6 reported a singular matrix")
		}
		if !mat.EqualApprox(mat.NewDense(6, 6, a[:]), &want, 1e-12) {
			t.Error("invert6 differs from gonum's inverse")
		}
	}
}

// bipoly is a bivariate polynomial of degree ≤ 4 in each variable,
// c[i][j] multiplying x^i y^j, used to compose warps exactly.
type bipoly [5][5]float64

func (a bipoly) mul(b bipoly) bipoly {
	var c bipoly
	for i := range a {
		for j := range a[i] {
			for k := range b {
				for l := range b[k] {
					if i+k < 5 && j+l < 5 {
						c[i+k][j+l] += a[i][j] * b[k][l]
					}
				}
			}
		}
	}
	return c
}

func (a bipoly) axpy(s float64, b bipoly) bipoly {
	for i := range a {
		for j := range a[i] {
			a[i][j] += s * b[i][j]
		}
	}
	return a
}

// warpPolys returns the polynomials x'(dx, dy) and y'(dx, dy) of p.
func warpPolys(p Params) (bipoly, bipoly) {
	var x, y bipoly
	x[0][0], x[1][0], x[0][1] = p[PU], 1+p[PUx], p[PUy]
	x[2][0], x[1][1], x[0][2] = p[PUxx]/2, p[PUxy], p[PUyy]/2
	y[0][0], y[1][0], y[0][1] = p[PV], p[PVx], 1+p[PVy]
	y[2][0], y[1][1], y[0][2] = p[PVxx]/2, p[PVxy], p[PVyy]/2
	return x, y
}

func randomQuadratic(rng *rand.Rand, scale float64) Params {
	p := randomAffine(rng, scale)
	for i := PUxx; i <= PVyy; i++ {
		p[i] = scale / 10 * rng.NormFloat64()
	}
	return p
}

// TestQuadraticCompose checks Compose for the quadratic order against the
// exact composite warp, a quartic polynomial obtained by substitution:
// Compose must return its terms of degree ≤ 2, that is the second-order
// Taylor expansion at the subset centre (chain rule).
func TestQuadraticCompose(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	for range 20 {
		p, q := randomQuadratic(rng, 0.05), randomQuadratic(rng, 0.05)
		qx, qy := warpPolys(q)
		var one bipoly
		one[0][0] = 1
		comp := func(c [6]float64) bipoly { // c: 1, x', y', x'², x'y', y'² weights
			var r bipoly
			r = r.axpy(c[0], one).axpy(c[1], qx).axpy(c[2], qy)
			return r.axpy(c[3], qx.mul(qx)).axpy(c[4], qx.mul(qy)).axpy(c[5], qy.mul(qy))
		}
		ex := comp([6]float64{p[PU], 1 + p[PUx], p[PUy], p[PUxx] / 2, p[PUxy], p[PUyy] / 2})
		ey := comp([6]float64{p[PV], p[PVx], 1 + p[PVy], p[PVxx] / 2, p[PVxy], p[PVyy] / 2})
		got := p.Compose(q, Quadratic)
		want := Params{
			PU: ex[0][0], PUx: ex[1][0] - 1, PUy: ex[0][1],
			PV: ey[0][0], PVx: ey[1][0], PVy: ey[0][1] - 1,
			PUxx: 2 * ex[2][0], PUxy: ex[1][1], PUyy: 2 * ex[0][2],
			PVxx: 2 * ey[2][0], PVxy: ey[1][1], PVyy: 2 * ey[0][2],
		}
		for i := range want {
			if math.Abs(got[i]-want[i]) > 1e-13 {
				t.Errorf("Compose parameter %d = %.15g, want %.15g", i, got[i], want[i])
			}
		}
	}
}

// TestQuadraticInverse checks the quadratic inverse. ComposeInverse(p, p)
// must be the identity exactly (the matrix times its inverse), and
// W(W⁻¹(x)) - x over a subset must shrink at least quadratically with the
// size of the second-order terms (the inverse is a second-order
// approximation from the 6×6 warp matrix of Gao et al. 2015).
func TestQuadraticInverse(t *testing.T) {
	rng := rand.New(rand.NewPCG(10, 10))
	const r = 15.0
	residual := func(p Params) float64 {
		inv, err := p.Inverse(Quadratic)
		if err != nil {
			t.Fatal(err)
		}
		var worst float64
		for dy := -r; dy <= r; dy += 5 {
			for dx := -r; dx <= r; dx += 5 {
				ix, iy := inv.Warp(dx, dy)
				x, y := p.Warp(ix, iy)
				worst = math.Max(worst, math.Hypot(x-dx, y-dy))
			}
		}
		return worst
	}
	for range 10 {
		p := randomQuadratic(rng, 0.02)
		id, err := p.ComposeInverse(p, Quadratic)
		if err != nil {
			t.Fatal(err)
		}
		for i, v := range id {
			if math.Abs(v) > 1e-12 {
				t.Errorf("ComposeInverse(p, p)[%d] = %g, want 0", i, v)
			}
		}
		var small Params
		copy(small[:PUxx], p[:PUxx])
		for i := PUxx; i <= PVyy; i++ {
			small[i] = p[i] / 2
		}
		r1, r2 := residual(p), residual(small)
		if !(r2 <= r1/3.5) {
			t.Errorf("inverse residual %.3g px, %.3g px with halved quadratic terms; want a ratio ≥ 3.5", r1, r2)
		}
	}
}

// TestCornerMotion checks the convergence measure by hand: a pure
// translation (0.3, 0.4) moves every corner by 0.5 px, and ux = 0.01 moves
// the corners of a radius-10 subset by 0.1 px.
func TestCornerMotion(t *testing.T) {
	p := Translation(0.3, 0.4)
	if m := p.cornerMotion(10); math.Abs(m-0.5) > 1e-15 {
		t.Errorf("translation corner motion %g, want 0.5", m)
	}
	p = Params{PUx: 0.01}
	if m := p.cornerMotion(10); math.Abs(m-0.1) > 1e-15 {
		t.Errorf("ux corner motion %g, want 0.1", m)
	}
}

// TestShapeOrderNames checks the round trip of the names used on the
// command line (common practice, no source).
func TestShapeOrderNames(t *testing.T) {
	for _, o := range []ShapeOrder{Affine, Quadratic} {
		got, err := ParseShapeOrder(o.String())
		if err != nil || got != o {
			t.Errorf("ParseShapeOrder(%q) = %v, %v", o.String(), got, err)
		}
	}
	if _, err := ParseShapeOrder("cubic"); err == nil {
		t.Error("ParseShapeOrder(cubic) succeeded, want an error")
	}
	if Affine.NumParams() != 6 || Quadratic.NumParams() != 12 {
		t.Errorf("NumParams = %d, %d; want 6, 12", Affine.NumParams(), Quadratic.NumParams())
	}
}
