package synth

import (
	"math"

	"spallscope/dic"
)

// Accuracy summarises a measured field against a scenario's exact truth.
type Accuracy struct {
	// Points is the number of valid measured points compared.
	Points int `json:"points"`
	// RMS and Max are the displacement-vector errors in px; Bias is the
	// mean error (u, v).
	RMS  float64    `json:"rms_px"`
	Max  float64    `json:"max_px"`
	Bias [2]float64 `json:"bias_px"`
}

// Compare measures field f of frame index against the exact displacement
// of the scenario at its valid points that are rock in that frame.
func (sc *Scenario) Compare(f *dic.Field, frame int) Accuracy {
	truth := sc.FieldAt(frame)
	var a Accuracy
	var sum float64
	for i := range f.Points {
		p := &f.Points[i]
		if !p.Valid() || !sc.Material(float64(p.X), float64(p.Y), frame) {
			continue
		}
		var m Motion
		if truth != nil {
			m = truth.At(float64(p.X), float64(p.Y))
		}
		u, v := p.U()
		du, dv := u-m.U, v-m.V
		e := math.Hypot(du, dv)
		sum += e * e
		a.Max = math.Max(a.Max, e)
		a.Bias[0] += du
		a.Bias[1] += dv
		a.Points++
	}
	if a.Points > 0 {
		a.RMS = math.Sqrt(sum / float64(a.Points))
		a.Bias[0] /= float64(a.Points)
		a.Bias[1] /= float64(a.Points)
	}
	return a
}
