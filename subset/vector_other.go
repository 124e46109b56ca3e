//go:build !amd64 || purego

package subset

// useVector is false where there are no vector kernels (other
// architectures, or the purego build tag): the pure-Go loops run.
var useVector = false

// affineSumsVector is affineSumsGo where there is no vector kernel.
func (s *Solver) affineSumsVector(sJg *[12]float64) (sg, sgg, sfg float64) {
	return s.affineSumsGo(sJg)
}

// quadraticSumsVector is quadraticSumsGo where there is no vector kernel.
func (s *Solver) quadraticSumsVector(sJg *[12]float64) (sg, sgg, sfg float64) {
	return s.quadraticSumsGo(sJg)
}
