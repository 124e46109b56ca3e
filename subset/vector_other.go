//go:build !amd64 || purego

package subset

// hasVector is false where there are no vector kernels (other
// architectures, or the purego build tag).
const hasVector = false

// useVector is false where there are no vector kernels: the pure-Go
// loops run.
var useVector = false

// affineSumsVector is affineSumsGo where there is no vector kernel.
func (s *Solver) affineSumsVector(sJg *[12]float64) (sg, sgg, sfg float64) {
	return s.affineSumsGo(sJg)
}

// quadraticSumsVector is quadraticSumsGo where there is no vector kernel.
func (s *Solver) quadraticSumsVector(sJg *[12]float64) (sg, sgg, sfg float64) {
	return s.quadraticSumsGo(sJg)
}

// cubicValuesVector is cubicValuesGo where there is no vector kernel.
func (sp *Spline) cubicValuesVector(xs, ys, out []float64) { sp.cubicValuesGo(xs, ys, out) }

// cubicLineVector is cubicLineGo where there is no vector kernel.
func (sp *Spline) cubicLineVector(x0, y0, ax, ay float64, i0 int, out []float64) {
	sp.cubicLineGo(x0, y0, ax, ay, i0, out)
}

// cubicGridVector is cubicLineGo over each row where there is no vector
// kernel.
func (sp *Spline) cubicGridVector(ox, oy []float64, ax, ay float64, i0, side int, out []float64) {
	for r := range ox {
		sp.cubicLineGo(ox[r], oy[r], ax, ay, i0, out[r*side:(r+1)*side])
	}
}

// cubicCentresVector is cubicCentres where there is no vector kernel.
func (sp *Spline) cubicCentresVector(x0, y0, side int, level float64, v, gx, gy []float64) {
	sp.cubicCentres(x0, y0, side, level, v, gx, gy)
}

// affineMomentsVector is affineMomentsGo where there is no vector kernel.
func (s *Solver) affineMomentsVector(m *gradMoments) { s.affineMomentsGo(m) }

// splineCausalVector is splineCausalGo where there is no vector kernel.
func splineCausalVector(c []float64, step, n, m int, z float64) { splineCausalGo(c, step, n, m, z) }

// splineAnticausalVector is splineAnticausalGo where there is no vector
// kernel.
func splineAnticausalVector(c []float64, step, n, m int, z float64) {
	splineAnticausalGo(c, step, n, m, z)
}

// splineColumnsInVector is the column pass's copy into float64 followed
// by splineCausalGo where there is no vector kernel.
func splineColumnsInVector(col []float32, stride int, t []float64, n, m int, z float64) {
	for k := 1; k < n; k++ {
		for l, c := range col[k*stride:][:m] {
			t[k*m+l] = float64(c)
		}
	}
	splineCausalGo(t[:n*m], m, n, m, z)
}

// splineColumnsOutVector is splineAnticausalGo followed by the column
// pass's copy back where there is no vector kernel.
func splineColumnsOutVector(t []float64, n, m int, z float64, col []float32, stride int) {
	splineAnticausalGo(t[:n*m], m, n, m, z)
	for k := 0; k < n; k++ {
		row := col[k*stride:][:m]
		for l := range row {
			row[l] = float32(t[k*m+l])
		}
	}
}

// splineRowsInVector is the row pass's transposed copy followed by
// splineCausalGo where there is no vector kernel.
func splineRowsInVector(rows []float32, stride int, t []float64, w int, gain, z float64) {
	for l := range 4 {
		for x := 1; x < w; x++ {
			t[4*x+l] = gain * float64(rows[l*stride+x])
		}
	}
	splineCausalGo(t[:4*w], 4, w, 4, z)
}

// splineRowsOutVector is splineAnticausalGo followed by the row pass's
// copy back where there is no vector kernel; t keeps the causal values,
// as the vector kernel leaves them.
func splineRowsOutVector(t []float64, w int, z float64, dst []float32, stride int) {
	next := [4]float64(t[4*(w-1) : 4*w])
	for x := w - 1; x >= 0; x-- {
		for l := range next {
			if x < w-1 {
				next[l] = z * (next[l] - t[4*x+l])
			}
			dst[l*stride+x] = float32(next[l])
		}
	}
}

// prefetchRowsOf does nothing where there is no prefetch kernel: a
// prefetch is a hint and changes no value.
func prefetchRowsOf(coef []float32, off, stride, rows, width int) {}
