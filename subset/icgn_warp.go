package subset

// The warp step of an IC-GN iteration: where the subset's valid pixels
// land in the deformed image under the current shape parameters.

// affineWarp sets xs and ys to the positions in the deformed image of the
// subset's valid pixels under the affine warp p and reports whether all
// of them lie in [0, maxX] × [0, maxY]. Along a run the position advances
// by the constant step (1 + ux, vx) per pixel; being affine, hence
// monotone, in the pixel index, its extremes are those of the run's ends.
func (s *Solver) affineWarp(p *Params, maxX, maxY float64) bool {
	ax, ay := 1+p[PUx], p[PVx]
	for _, rn := range s.runs {
		x0 := s.cx + rn.dx0 + p[PU] + p[PUx]*rn.dx0 + p[PUy]*rn.dy
		y0 := s.cy + rn.dy + p[PV] + p[PVx]*rn.dx0 + p[PVy]*rn.dy
		xs := s.xs[rn.k0 : rn.k0+rn.n]
		ys := s.ys[rn.k0 : rn.k0+rn.n]
		ys = ys[:len(xs)]
		for i := range xs {
			t := float64(i)
			xs[i] = x0 + t*ax
			ys[i] = y0 + t*ay
		}
		xa, xb, ya, yb := xs[0], xs[len(xs)-1], ys[0], ys[len(ys)-1]
		if !(xa >= 0 && xa <= maxX && xb >= 0 && xb <= maxX && ya >= 0 && ya <= maxY && yb >= 0 && yb <= maxY) {
			return false
		}
	}
	return true
}

// quadraticWarp sets xs and ys to the positions in the deformed image of
// the subset's valid pixels under the quadratic warp p and reports whether
// all of them lie in [0, maxX] × [0, maxY].
func (s *Solver) quadraticWarp(p *Params, maxX, maxY float64) bool {
	n := s.n
	xs, ys, dxs, dys := s.xs[:n], s.ys[:n], s.dx[:n], s.dy[:n]
	for k, dx := range dxs {
		dy := dys[k]
		xx, xy, yy := 0.5*dx*dx, dx*dy, 0.5*dy*dy
		wx := s.cx + dx + p[PU] + p[PUx]*dx + p[PUy]*dy + p[PUxx]*xx + p[PUxy]*xy + p[PUyy]*yy
		wy := s.cy + dy + p[PV] + p[PVx]*dx + p[PVy]*dy + p[PVxx]*xx + p[PVxy]*xy + p[PVyy]*yy
		if !(wx >= 0 && wy >= 0 && wx <= maxX && wy <= maxY) {
			return false
		}
		xs[k], ys[k] = wx, wy
	}
	return true
}
