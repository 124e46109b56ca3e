package subset

// sampleRuns sets gs to the deformed values of the subset's valid pixels
// under the affine warp already set (affineWarp), run by run with
// lineValues; a full square subset on a cubic spline takes all its rows
// in one call of the vector kernel when there is one (useVector), with
// the values lineValues would give.
func (s *Solver) sampleRuns(def *Spline) {
	if useVector && s.square && def.kind == Bicubic {
		side := 2*s.cfg.Radius + 1
		def.cubicGridVector(s.ox[:side], s.oy[:side], s.ax, s.ay, side, s.gs[:s.n])
		return
	}
	for k, rn := range s.runs {
		def.lineValues(s.ox[k], s.oy[k], s.ax, s.ay, 0, s.gs[rn.k0:rn.k0+rn.n])
	}
}
