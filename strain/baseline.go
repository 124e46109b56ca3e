package strain

import (
	"math"
)

// Baseline is each point's own elastic response: its strain components
// as a linear function of the nominal stress, e = a + b·σ, fitted by least
// squares over the calibration frames (the early, elastic part of the
// test). The residual e − (a + b·σ) is the strain the elastic response
// does not explain — localization, cracking — and, unlike the raw strain,
// it does not light up the elastic stress concentration at an opening's
// wall, nor a static error pattern (the intercept a absorbs it).
//
// With calibration frames at a single stress (static shots only, or no
// load log), the slope is zero and the residual is the change from their
// mean.
type Baseline struct {
	a, b [3][]float64 // per component (exx, eyy, exy) and point
	ok   []bool
}

// Tensor is an in-plane strain (exx, eyy, exy).
type Tensor [3]float64

// FitBaseline fits the per-point elastic response over calibration strain
// fields and their stresses (MPa). A point enters the fit where its strain
// is valid; it needs valid values in at least two calibration frames (one
// if all share one stress), else it has no baseline and no residual.
func FitBaseline(fields []*Field, stress []float64) Baseline {
	if len(fields) == 0 {
		return Baseline{}
	}
	n := len(fields[0].Points)
	var bl Baseline
	for c := range bl.a {
		bl.a[c], bl.b[c] = make([]float64, n), make([]float64, n)
	}
	bl.ok = make([]bool, n)
	spread := false
	for _, s := range stress {
		if math.Abs(s-stress[0]) > 1e-9*math.Max(1, math.Abs(stress[0])) {
			spread = true
		}
	}
	for i := 0; i < n; i++ {
		var sw, ss, sss float64
		var se, sse [3]float64
		for k, f := range fields {
			p := &f.Points[i]
			if !p.Valid {
				continue
			}
			s := stress[k]
			sw++
			ss += s
			sss += s * s
			for c, v := range [3]float64{p.Exx, p.Eyy, p.Exy} {
				se[c] += v
				sse[c] += s * v
			}
		}
		need := 2.0
		if !spread {
			need = 1
		}
		if sw < need {
			continue
		}
		det := sw*sss - ss*ss
		for c := range se {
			if spread && det > 0 {
				bl.b[c][i] = (sw*sse[c] - ss*se[c]) / det
				bl.a[c][i] = (se[c] - bl.b[c][i]*ss) / sw
			} else {
				bl.a[c][i] = se[c] / sw
			}
		}
		bl.ok[i] = true
	}
	return bl
}

// Residual returns the strain of point i of f beyond its elastic
// response at stress σ, and whether there is one.
func (bl Baseline) Residual(f *Field, i int, stress float64) (Tensor, bool) {
	p := &f.Points[i]
	if !p.Valid {
		return Tensor{}, false
	}
	t := Tensor{p.Exx, p.Eyy, p.Exy}
	if bl.ok == nil {
		return t, true // no baseline: the raw strain
	}
	if !bl.ok[i] {
		return Tensor{}, false
	}
	for c := range t {
		t[c] -= bl.a[c][i] + bl.b[c][i]*stress
	}
	return t, true
}
