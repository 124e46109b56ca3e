package strain

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat"

	"spallscope/dic"
	"spallscope/subset"
)

// NoiseFit's one-pass per-point noise (Welford's running variance) is the
// sample standard deviation gonum's stat.StdDev gives over each point's
// held values of the indicator about the baseline, to 1e-12 relative, with
// points missing in some frames and too few frames at others; and the
// baseline fitted one frame at a time is FitBaseline's bit for bit.
func TestNoiseFitMatchesGonumStdDev(t *testing.T) {
	const frames = 12
	g := dic.Grid{X0: 4, Y0: 4, Step: 8, Cols: 12, Rows: 10}
	ref := &dic.Field{Grid: g, Points: make([]dic.Point, g.Len())}
	for i := range ref.Points {
		x, y := g.Pos(i)
		ref.Points[i] = dic.Point{X: x, Y: y, Status: subset.Converged, ZNCC: 1}
	}
	rng := rand.New(rand.NewPCG(4, 2))
	var calib []*Field
	var stress []float64
	for k := range frames {
		sf := &Field{Index: k, Grid: g, Window: 7, Points: make([]Point, g.Len())}
		s := 0.5 * float64(k)
		for i := range sf.Points {
			x, y := g.Pos(i)
			// Every 7th point is missing in every third frame; point 5 is
			// there in two frames only; points right of x = 60 are noisier.
			valid := !(i%7 == 0 && k%3 == 0) && !(i == 5 && k >= 2)
			sigma := 1e-4
			if x > 60 {
				sigma = 2.5e-4
			}
			exx, eyy, exy := 1e-4*s+sigma*rng.NormFloat64(), -3e-5*s+sigma*rng.NormFloat64(), sigma*rng.NormFloat64()
			sf.Points[i] = Point{X: x, Y: y, Exx: exx, Eyy: eyy, Exy: exy, Valid: valid}
		}
		calib, stress = append(calib, sf), append(stress, s)
	}
	var fit BaselineFit
	for k, sf := range calib {
		fit.Add(sf, stress[k])
	}
	bl, want := fit.Baseline(), FitBaseline(calib, stress)
	for c := range bl.a {
		for i := range bl.a[c] {
			if bl.a[c][i] != want.a[c][i] || bl.b[c][i] != want.b[c][i] || bl.ok[i] != want.ok[i] {
				t.Fatalf("component %d point %d: fit one frame at a time %g + %g·σ (%t), FitBaseline %g + %g·σ (%t)", c, i, bl.a[c][i], bl.b[c][i], bl.ok[i], want.a[c][i], want.b[c][i], want.ok[i])
			}
		}
	}
	f, err := NewFinder(FinderConfig{Indicators: []Indicator{MaxShear, MaxPrincipal}}, ref, bl)
	if err != nil {
		t.Fatal(err)
	}
	nf := f.NoiseFit()
	for k, sf := range calib {
		nf.Add(sf, stress[k])
	}
	for _, ind := range []Indicator{MaxShear, MaxPrincipal} {
		pn := nf.points[ind]
		for i := range g.Len() {
			var vals []float64
			for k, sf := range calib {
				if r, ok := bl.Residual(sf, i, stress[k]); ok {
					vals = append(vals, ind.value(r))
				}
			}
			if pn.n[i] != len(vals) {
				t.Fatalf("%s point %d: %d values counted, %d held", ind, i, pn.n[i], len(vals))
			}
			if len(vals) < 3 {
				continue
			}
			got, ref := math.Sqrt(pn.m2[i]/float64(pn.n[i]-1)), stat.StdDev(vals, nil)
			if math.Abs(got-ref) > 1e-12*ref {
				t.Errorf("%s point %d: one-pass standard deviation %.17g, gonum's %.17g", ind, i, got, ref)
			}
		}
		scale := nf.pointScale(ind)
		if scale[5] != 1 {
			t.Errorf("%s: point 5 with values in two frames has scale %g, expected 1 (no noise of its own)", ind, scale[5])
		}
	}
}
