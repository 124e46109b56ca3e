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
// if all share one stress), else it has no baseline and no residual. It
// is BaselineFit over the fields in order.
func FitBaseline(fields []*Field, stress []float64) Baseline {
	var fit BaselineFit
	for k, f := range fields {
		fit.Add(f, stress[k])
	}
	return fit.Baseline()
}

// BaselineFit accumulates FitBaseline's least-squares sums one calibration
// frame at a time, so that a long test's calibration frames need not be
// held at once (300 frames of 200,000 points are 5 GB of strain fields;
// the sums are 72 bytes a point). The frames' order is the sums' order:
// the same frames in the same order give FitBaseline's result bit for
// bit. The zero value is ready to use.
type BaselineFit struct {
	sw, ss, sss []float64
	se, sse     [3][]float64
	first       float64 // the first frame's stress
	frames      int
	spread      bool // not all frames at one stress
}

// Add adds one calibration frame's strain field at its stress (MPa); every
// frame must be on the first one's grid (its points are matched by index).
func (b *BaselineFit) Add(f *Field, stress float64) {
	n := len(f.Points)
	if b.frames == 0 {
		b.sw, b.ss, b.sss = make([]float64, n), make([]float64, n), make([]float64, n)
		for c := range b.se {
			b.se[c], b.sse[c] = make([]float64, n), make([]float64, n)
		}
		b.first = stress
	}
	b.frames++
	if math.Abs(stress-b.first) > 1e-9*math.Max(1, math.Abs(b.first)) {
		b.spread = true
	}
	for i := range min(n, len(b.sw)) {
		p := &f.Points[i]
		if !p.Valid {
			continue
		}
		b.sw[i]++
		b.ss[i] += stress
		b.sss[i] += stress * stress
		for c, v := range [3]float64{p.Exx, p.Eyy, p.Exy} {
			b.se[c][i] += v
			b.sse[c][i] += stress * v
		}
	}
}

// Baseline is the fit of the frames added so far (FitBaseline's rules);
// the zero Baseline without frames.
func (b *BaselineFit) Baseline() Baseline {
	if b.frames == 0 {
		return Baseline{}
	}
	n := len(b.sw)
	var bl Baseline
	for c := range bl.a {
		bl.a[c], bl.b[c] = make([]float64, n), make([]float64, n)
	}
	bl.ok = make([]bool, n)
	need := 2.0
	if !b.spread {
		need = 1
	}
	for i := range n {
		sw, ss, sss := b.sw[i], b.ss[i], b.sss[i]
		if sw < need {
			continue
		}
		det := sw*sss - ss*ss
		for c := range b.se {
			se, sse := b.se[c][i], b.sse[c][i]
			if b.spread && det > 0 {
				bl.b[c][i] = (sw*sse - ss*se) / det
				bl.a[c][i] = (se - bl.b[c][i]*ss) / sw
			} else {
				bl.a[c][i] = se / sw
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
