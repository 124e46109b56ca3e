package subset

// The deformed side of an IC-GN iteration: sums over the sampled deformed
// subset g (offset by the reference mean f̄) that give its mean, its norm,
// the ZNSSD and the right-hand side Σ J·g. With J = w·g_c·dx^i·dy^j
// (paramTerms), Σ J·g needs only Σ gx·g·dx^i and Σ gy·g·dx^i per run,
// where dy is constant.

// affineSums returns Σg, Σg² and Σ(f - f̄)·g and adds Σ J·g for the Affine
// order to the first six entries of sJg: by the vector kernel when there
// is one (useVector), else by affineSumsGo.
func (s *Solver) affineSums(sJg *[12]float64) (sg, sgg, sfg float64) {
	if useVector {
		return s.affineSumsVector(sJg)
	}
	return s.affineSumsGo(sJg)
}

// quadraticSums is affineSums for the Quadratic order: it adds Σ J·g to
// all twelve entries of sJg.
func (s *Solver) quadraticSums(sJg *[12]float64) (sg, sgg, sfg float64) {
	if useVector {
		return s.quadraticSumsVector(sJg)
	}
	return s.quadraticSumsGo(sJg)
}

// affineSumsGo is affineSums in Go, run by run: the reference the vector
// kernel is tested against.
func (s *Solver) affineSumsGo(sJg *[12]float64) (sg, sgg, sfg float64) {
	fm := s.fMean
	for _, rn := range s.runs {
		k0, k1 := rn.k0, rn.k0+rn.n
		gs := s.gs[k0:k1]
		fc, gx, gy, dx := s.fc[k0:k1], s.gx[k0:k1], s.gy[k0:k1], s.dx[k0:k1]
		fc, gx, gy, dx = fc[:len(gs)], gx[:len(gs)], gy[:len(gs)], dx[:len(gs)]
		var a0, a1, b0, b1 float64
		for i, v := range gs {
			g := v - fm
			sg += g
			sgg += g * g
			sfg += fc[i] * g
			a, b := gx[i]*g, gy[i]*g
			a0 += a
			a1 += a * dx[i]
			b0 += b
			b1 += b * dx[i]
		}
		dy := rn.dy
		sJg[PU] += a0
		sJg[PUx] += a1
		sJg[PUy] += dy * a0
		sJg[PV] += b0
		sJg[PVx] += b1
		sJg[PVy] += dy * b0
	}
	return sg, sgg, sfg
}

// quadraticSumsGo is quadraticSums in Go (see affineSumsGo).
func (s *Solver) quadraticSumsGo(sJg *[12]float64) (sg, sgg, sfg float64) {
	fm := s.fMean
	for _, rn := range s.runs {
		k0, k1 := rn.k0, rn.k0+rn.n
		gs := s.gs[k0:k1]
		fc, gx, gy, dx := s.fc[k0:k1], s.gx[k0:k1], s.gy[k0:k1], s.dx[k0:k1]
		fc, gx, gy, dx = fc[:len(gs)], gx[:len(gs)], gy[:len(gs)], dx[:len(gs)]
		var a0, a1, a2, b0, b1, b2 float64
		for i, v := range gs {
			g := v - fm
			sg += g
			sgg += g * g
			sfg += fc[i] * g
			d := dx[i]
			a, b := gx[i]*g, gy[i]*g
			ad, bd := a*d, b*d
			a0 += a
			a1 += ad
			a2 += ad * d
			b0 += b
			b1 += bd
			b2 += bd * d
		}
		dy := rn.dy
		sJg[PU] += a0
		sJg[PUx] += a1
		sJg[PUy] += dy * a0
		sJg[PV] += b0
		sJg[PVx] += b1
		sJg[PVy] += dy * b0
		sJg[PUxx] += 0.5 * a2
		sJg[PUxy] += dy * a1
		sJg[PUyy] += 0.5 * dy * dy * a0
		sJg[PVxx] += 0.5 * b2
		sJg[PVxy] += dy * b1
		sJg[PVyy] += 0.5 * dy * dy * b0
	}
	return sg, sgg, sfg
}
