package subset

// The reference side of the IC-GN normal equations: the sums of the
// steepest-descent images and the Gauss–Newton Hessian, formed from
// moments of the reference gradients.
//
// The steepest-descent image of parameter a is J_a = ∇f·∂W/∂p_a = w_a·g_c·m
// with g_c one gradient component and m = dx^i·dy^j one monomial of the
// shape function (paramTerms), so every Hessian entry Σ J_a·J_b is a
// moment Σ q·dx^i·dy^j of a gradient product q ∈ {gx², gx·gy, gy²}, and
// every entry of Σ J and Σ J·(f - f̄) one of a first-order quantity. A
// handful of moments thus gives the 21 (Affine) or 78 (Quadratic) Hessian
// entries, and the moments in dy are formed once per run, where dy is
// constant.

// paramTerms gives, for each shape parameter in Params order, the gradient
// component c (0 for gx, 1 for gy), the monomial dx^i·dy^j and the factor
// w of its steepest-descent image w·g_c·dx^i·dy^j (see Params.Warp).
var paramTerms = [12]struct {
	c, i, j int
	w       float64
}{
	{0, 0, 0, 1}, {0, 1, 0, 1}, {0, 0, 1, 1},
	{1, 0, 0, 1}, {1, 1, 0, 1}, {1, 0, 1, 1},
	{0, 2, 0, 0.5}, {0, 1, 1, 1}, {0, 0, 2, 0.5},
	{1, 2, 0, 0.5}, {1, 1, 1, 1}, {1, 0, 2, 0.5},
}

// gradMoments are sums over the valid pixels of the subset. Entry [i][j]
// is the sum weighted by dx^i·dy^j, set for i + j up to twice (q) or once
// (h) the degree of the shape function.
type gradMoments struct {
	q [3][5][5]float64 // of gx², gx·gy, gy²
	h [4][5][5]float64 // of gx, gy, gx·(f - f̄), gy·(f - f̄)
}

// normal sets sumJ, sumJf and the lower triangle of the leading np×np
// block of chol to the Gauss–Newton Hessian Σ J·Jᵀ (Pan, Li & Tong 2013);
// the rest of chol is not used.
func (s *Solver) normal() {
	var m gradMoments
	if s.np == 6 {
		s.affineMoments(&m)
	} else {
		s.quadraticMoments(&m)
	}
	for a := 0; a < s.np; a++ {
		ta := paramTerms[a]
		s.sumJ[a] = ta.w * m.h[ta.c][ta.i][ta.j]
		s.sumJf[a] = ta.w * m.h[2+ta.c][ta.i][ta.j]
		for b := 0; b <= a; b++ {
			tb := paramTerms[b]
			s.chol[12*a+b] = ta.w * tb.w * m.q[ta.c+tb.c][ta.i+tb.i][ta.j+tb.j]
		}
	}
}

// foldRun adds the per-run sums r[i] = Σ v·dx^i of a run at offset dy to
// the moments: mo[i][j] += dy^j·r[i] for i + j ≤ deg.
func foldRun(mo [][5]float64, r []float64, dy float64, deg int) {
	for i, ri := range r {
		p := ri
		for j := 0; i+j <= deg; j++ {
			mo[i][j] += p
			p *= dy
		}
	}
}

// affineMoments sets the moments of m that the Affine order needs: by the
// vector kernel when there is one (useVector), else by affineMomentsGo.
func (s *Solver) affineMoments(m *gradMoments) {
	if useVector {
		s.affineMomentsVector(m)
		return
	}
	s.affineMomentsGo(m)
}

// affineMomentsGo is affineMoments in Go, run by run: the reference the
// vector kernel is tested against. The per-run sums are split over three
// sweeps so that their accumulators stay in registers.
func (s *Solver) affineMomentsGo(m *gradMoments) {
	if s.square {
		s.affineMomentsSquare(m)
		return
	}
	for _, rn := range s.runs {
		k0, k1 := rn.k0, rn.k0+rn.n
		gx := s.gx[k0:k1]
		gy, fc, dx := s.gy[k0:k1], s.fc[k0:k1], s.dx[k0:k1]
		gy, fc, dx = gy[:len(gx)], fc[:len(gx)], dx[:len(gx)]
		// Σ q, Σ q·dx and Σ q·dx² for q = gx², gx·gy.
		var xx0, xx1, xx2, xy0, xy1, xy2 float64
		for i, X := range gx {
			d := dx[i]
			xx, xy := X*X, X*gy[i]
			xxd, xyd := xx*d, xy*d
			xx0 += xx
			xx1 += xxd
			xx2 += xxd * d
			xy0 += xy
			xy1 += xyd
			xy2 += xyd * d
		}
		// The same for gy², and Σ g, Σ g·dx for g = gx, gy.
		var yy0, yy1, yy2, x0, x1, y0, y1 float64
		for i, X := range gx {
			Y, d := gy[i], dx[i]
			yy := Y * Y
			yyd := yy * d
			yy0 += yy
			yy1 += yyd
			yy2 += yyd * d
			x0 += X
			x1 += X * d
			y0 += Y
			y1 += Y * d
		}
		// Σ g·f and Σ g·f·dx for g = gx, gy.
		var xf0, xf1, yf0, yf1 float64
		for i, X := range gx {
			d, f := dx[i], fc[i]
			xf, yf := X*f, gy[i]*f
			xf0 += xf
			xf1 += xf * d
			yf0 += yf
			yf1 += yf * d
		}
		dy := rn.dy
		foldRun2(&m.q[0], xx0, xx1, xx2, dy)
		foldRun2(&m.q[1], xy0, xy1, xy2, dy)
		foldRun2(&m.q[2], yy0, yy1, yy2, dy)
		foldRun1(&m.h[0], x0, x1, dy)
		foldRun1(&m.h[1], y0, y1, dy)
		foldRun1(&m.h[2], xf0, xf1, dy)
		foldRun1(&m.h[3], yf0, yf1, dy)
	}
}

// affineMomentsSquare is affineMoments for the full square subset, whose
// rows run over dx = −r … r: the pixels at −d and +d of a row are taken
// together, Σ q = Σ (q₋ + q₊), Σ q·dx = Σ d·(q₊ − q₋) and
// Σ q·dx² = Σ d²·(q₋ + q₊), which saves a fifth of the arithmetic.
func (s *Solver) affineMomentsSquare(m *gradMoments) {
	r := s.cfg.Radius
	side := 2*r + 1
	for _, rn := range s.runs {
		gx := s.gx[rn.k0 : rn.k0+side]
		gy, fc := s.gy[rn.k0:rn.k0+side], s.fc[rn.k0:rn.k0+side]
		gy, fc = gy[:len(gx)], fc[:len(gx)]
		// The centre pixel (d = 0) adds to the plain sums only.
		X, Y, F := gx[r], gy[r], fc[r]
		xx0, xy0, yy0 := X*X, X*Y, Y*Y
		x0, y0, xf0, yf0 := X, Y, X*F, Y*F
		var xx1, xx2, xy1, xy2, yy1, yy2 float64
		for d := 1; d <= r; d++ {
			a, b := r-d, r+d
			dd := float64(d)
			d2 := dd * dd
			Xa, Xb, Ya, Yb := gx[a], gx[b], gy[a], gy[b]
			sxx, txx := Xa*Xa+Xb*Xb, Xb*Xb-Xa*Xa
			sxy, txy := Xa*Ya+Xb*Yb, Xb*Yb-Xa*Ya
			xx0 += sxx
			xx1 += dd * txx
			xx2 += d2 * sxx
			xy0 += sxy
			xy1 += dd * txy
			xy2 += d2 * sxy
			syy, tyy := Ya*Ya+Yb*Yb, Yb*Yb-Ya*Ya
			yy0 += syy
			yy1 += dd * tyy
			yy2 += d2 * syy
		}
		var x1, y1, xf1, yf1 float64
		for d := 1; d <= r; d++ {
			a, b := r-d, r+d
			dd := float64(d)
			Xa, Xb, Ya, Yb := gx[a], gx[b], gy[a], gy[b]
			Fa, Fb := fc[a], fc[b]
			x0 += Xa + Xb
			x1 += dd * (Xb - Xa)
			y0 += Ya + Yb
			y1 += dd * (Yb - Ya)
			xfa, xfb, yfa, yfb := Xa*Fa, Xb*Fb, Ya*Fa, Yb*Fb
			xf0 += xfa + xfb
			xf1 += dd * (xfb - xfa)
			yf0 += yfa + yfb
			yf1 += dd * (yfb - yfa)
		}
		dy := rn.dy
		foldRun2(&m.q[0], xx0, xx1, xx2, dy)
		foldRun2(&m.q[1], xy0, xy1, xy2, dy)
		foldRun2(&m.q[2], yy0, yy1, yy2, dy)
		foldRun1(&m.h[0], x0, x1, dy)
		foldRun1(&m.h[1], y0, y1, dy)
		foldRun1(&m.h[2], xf0, xf1, dy)
		foldRun1(&m.h[3], yf0, yf1, dy)
	}
}

// foldRun1 is foldRun to degree 1 written out.
func foldRun1(mo *[5][5]float64, r0, r1, dy float64) {
	mo[0][0] += r0
	mo[1][0] += r1
	mo[0][1] += dy * r0
}

// foldRun2 is foldRun to degree 2 written out.
func foldRun2(mo *[5][5]float64, r0, r1, r2, dy float64) {
	mo[0][0] += r0
	mo[1][0] += r1
	mo[2][0] += r2
	mo[0][1] += dy * r0
	mo[1][1] += dy * r1
	mo[0][2] += dy * dy * r0
}

// quadraticMoments sets the moments of m that the Quadratic order needs.
func (s *Solver) quadraticMoments(m *gradMoments) {
	for _, rn := range s.runs {
		k0, k1 := rn.k0, rn.k0+rn.n
		gx := s.gx[k0:k1]
		gy, fc, dx := s.gy[k0:k1], s.fc[k0:k1], s.dx[k0:k1]
		gy, fc, dx = gy[:len(gx)], fc[:len(gx)], dx[:len(gx)]
		var rq [3][5]float64 // Σ q·dx^i
		var rh [4][3]float64 // Σ h·dx^i
		for i, X := range gx {
			Y, d, f := gy[i], dx[i], fc[i]
			pw := [5]float64{1, d, d * d, d * d * d, d * d * d * d}
			for k, q := range [3]float64{X * X, X * Y, Y * Y} {
				for e, p := range pw {
					rq[k][e] += q * p
				}
			}
			for k, v := range [4]float64{X, Y, X * f, Y * f} {
				for e, p := range pw[:3] {
					rh[k][e] += v * p
				}
			}
		}
		for k := range rq {
			foldRun(m.q[k][:], rq[k][:], rn.dy, 4)
		}
		for k := range rh {
			foldRun(m.h[k][:], rh[k][:], rn.dy, 2)
		}
	}
}
