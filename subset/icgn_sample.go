package subset

// sampleRuns sets gs to the deformed values of the subset's valid pixels
// under the affine warp already set (affineWarp), run by run with
// lineValues; a full square subset on a cubic spline takes all its rows
// in one call of the vector kernel when there is one (useVector), with
// the values lineValues would give.
func (s *Solver) sampleRuns(def *Spline) {
	if useVector && s.square && def.kind == Bicubic {
		side := 2*s.cfg.Radius + 1
		def.cubicGridVector(s.ox[:side], s.oy[:side], s.ax, s.ay, 0, side, s.gs[:s.n])
		return
	}
	for k, rn := range s.runs {
		def.lineValues(s.ox[k], s.oy[k], s.ax, s.ay, 0, s.gs[rn.k0:rn.k0+rn.n])
	}
}

// sampleRows sets the rows k0 ≤ k < k1 of gs (row k of a full square
// subset is run k) to the deformed values under the affine warp already
// set (see sampleRowsInto).
func (s *Solver) sampleRows(def *Spline, k0, k1 int) {
	side := 2*s.cfg.Radius + 1
	s.sampleRowsInto(def, k0, k1, 0, side, s.gs[k0*side:max(k0, k1)*side])
}

// sampleRowsInto sets out to the deformed values of the width pixels
// from pixel i0 of each of the rows k0 ≤ k < k1 of a full square subset
// under the affine warp already set, row after row: in one call of the
// rows kernel on a cubic spline when there is one (useVector), else row
// by row with lineValues, the same values bit for bit.
func (s *Solver) sampleRowsInto(def *Spline, k0, k1, i0, width int, out []float64) {
	if k0 >= k1 || width <= 0 {
		return
	}
	if useVector && def.kind == Bicubic {
		def.cubicGridVector(s.ox[k0:k1], s.oy[k0:k1], s.ax, s.ay, i0, width, out)
		return
	}
	for k := k0; k < k1; k++ {
		o := (k - k0) * width
		def.lineValues(s.ox[k], s.oy[k], s.ax, s.ay, i0, out[o:o+width])
	}
}
