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
func (sp *Spline) cubicGridVector(ox, oy []float64, ax, ay float64, side int, out []float64) {
	for r := range ox {
		sp.cubicLineGo(ox[r], oy[r], ax, ay, 0, out[r*side:(r+1)*side])
	}
}

// cubicCentresVector is cubicCentres where there is no vector kernel.
func (sp *Spline) cubicCentresVector(x0, y0, side int, v, gx, gy []float64) {
	sp.cubicCentres(x0, y0, side, v, gx, gy)
}

// affineMomentsVector is affineMomentsGo where there is no vector kernel.
func (s *Solver) affineMomentsVector(m *gradMoments) { s.affineMomentsGo(m) }
