package baseline

import (
	"fmt"
	"math"
)

// Method names, as they appear in Row.Method.
const (
	NameSpallscope       = "spallscope"
	NameLucasKanade      = "lucas-kanade"
	NameFarneback        = "farneback"
	NamePhaseCorrelation = "phase-correlation"
	NameTemplate         = "template-parabolic"
)

// MeasureFunc measures the displacement (u, v) in px at every point of c
// with square windows window px on a side: where the reference material
// point at c.Points[i] went in c.Def. A point the method itself reports as
// failed is NaN; err is for a failure of the whole run.
type MeasureFunc func(c *Case, window int) (u, v []float64, err error)

// Method is a named displacement estimator.
type Method struct {
	Name    string
	Measure MeasureFunc
}

// Methods returns spallscope followed by the baselines.
func Methods() []Method {
	return []Method{
		{NameSpallscope, Spallscope},
		{NameLucasKanade, LucasKanade},
		{NameFarneback, Farneback},
		{NamePhaseCorrelation, PhaseCorrelation},
		{NameTemplate, TemplateParabolic},
	}
}

// checkWindow reports a window that is not odd and at least 5 px, or that
// with c's search range does not fit in the grid's margin.
func checkWindow(c *Case, window int) error {
	if window < 5 || window%2 == 0 {
		return fmt.Errorf("window %d px, want odd and at least 5", window)
	}
	if window/2+c.Search > Margin {
		return fmt.Errorf("window %d px with a %d px search does not fit the %d px margin", window, c.Search, Margin)
	}
	return nil
}

// nanSlices returns two slices of n NaNs, for results not yet measured.
func nanSlices(n int) (u, v []float64) {
	u, v = make([]float64, n), make([]float64, n)
	for i := range u {
		u[i], v[i] = math.NaN(), math.NaN()
	}
	return u, v
}
