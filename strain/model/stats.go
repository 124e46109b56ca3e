package model

import (
	"math"

	"gonum.org/v1/gonum/stat"
)

// Stats summarises the difference field of one quantity over the points
// where it was compared.
type Stats struct {
	Quantity Quantity `json:"quantity"`
	// Unit of the values: px for displacements, none for strains.
	Unit string `json:"unit,omitempty"`
	// Count is the number of points compared; Bilinear of them found the
	// model value in a regular grid's cell, the rest by moving least
	// squares. Uncovered counts the validly measured points (outside
	// Options.Exclude) that had no model value within reach.
	Count     int `json:"count"`
	Bilinear  int `json:"bilinear"`
	Uncovered int `json:"uncovered"`
	// Bias is the mean difference (measured − model), RMS its root mean
	// square (bias included) and MaxAbs its largest magnitude.
	Bias   float64 `json:"bias"`
	RMS    float64 `json:"rms"`
	MaxAbs float64 `json:"max_abs"`
	// Correlation is Pearson's correlation between the measured and the
	// model values: near 1 when the model has the measured pattern
	// whatever its magnitude, near −1 for a sign mistake; NaN with fewer
	// than two points or no variation.
	Correlation float64 `json:"correlation"`
	// ModelRMS is the root mean square of the model values compared, the
	// scale against which RMS is small or not.
	ModelRMS float64 `json:"model_rms"`
	// Resolution is the measurement's resolution (noise floor) of the
	// quantity when given in Options, else 0.
	Resolution float64 `json:"resolution,omitempty"`
}

// Ratio returns RMS over the resolution: how many noise floors apart the
// measurement and the model are (NaN without a resolution).
func (s Stats) Ratio() float64 {
	if !(s.Resolution > 0) {
		return math.NaN()
	}
	return s.RMS / s.Resolution
}

// summarise fills the statistics from the measured and model values at the
// compared points.
func (s *Stats) summarise(measured, model []float64) {
	s.Count = len(measured)
	s.Bias, s.RMS, s.MaxAbs, s.ModelRMS, s.Correlation = math.NaN(), math.NaN(), math.NaN(), math.NaN(), math.NaN()
	if s.Count == 0 {
		return
	}
	var sum, sq, mx, msq float64
	for i := range measured {
		d := measured[i] - model[i]
		sum, sq, mx = sum+d, sq+d*d, math.Max(mx, math.Abs(d))
		msq += model[i] * model[i]
	}
	n := float64(s.Count)
	s.Bias, s.RMS, s.MaxAbs, s.ModelRMS = sum/n, math.Sqrt(sq/n), mx, math.Sqrt(msq/n)
	if s.Count >= 2 {
		s.Correlation = stat.Correlation(measured, model, nil)
	}
}
