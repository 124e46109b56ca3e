package subset

// The warp step of an IC-GN iteration: where the subset's valid pixels
// land in the deformed image under the current shape parameters.

// affineWarp sets ox and oy to the positions in the deformed image of the
// first pixel of each run under the affine warp p, and (ax, ay) to the
// step from one pixel of a run to the next, and reports whether all the
// subset's valid pixels lie in [0, maxX] × [0, maxY]. Pixel i of a run
// lands at (ox + i·ax, oy + i·ay) (lineValues forms the positions on the
// fly); being affine, hence monotone, in i, its extremes are those of the
// run's ends.
func (s *Solver) affineWarp(p *Params, maxX, maxY float64) bool {
	ax, ay := 1+p[PUx], p[PVx]
	s.ax, s.ay = ax, ay
	ox, oy := s.ox[:len(s.runs)], s.oy[:len(s.runs)]
	for k, rn := range s.runs {
		x0 := s.cx + rn.dx0 + p[PU] + p[PUx]*rn.dx0 + p[PUy]*rn.dy
		y0 := s.cy + rn.dy + p[PV] + p[PVx]*rn.dx0 + p[PVy]*rn.dy
		t := float64(rn.n - 1)
		x1, y1 := x0+t*ax, y0+t*ay
		if !(x0 >= 0 && x0 <= maxX && x1 >= 0 && x1 <= maxX && y0 >= 0 && y0 <= maxY && y1 >= 0 && y1 <= maxY) {
			return false
		}
		ox[k], oy[k] = x0, y0
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
