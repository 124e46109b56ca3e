package render

import (
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
)

// The legend goes to a corner the data leave empty: a falling line (a
// loaded face's apparent magnification) leaves the top right free, a rising
// one the top left (the default), a V that dips in the middle and comes
// back (a load cycle) the bottom corners, and a tie goes to the default.
func TestLegendAwayFromTheData(t *testing.T) {
	line := func(f func(x float64) float64) []plotter.XY {
		var pts []plotter.XY
		for x := 0.0; x <= 10; x++ {
			pts = append(pts, plotter.XY{X: x, Y: f(x)})
		}
		return pts
	}
	for _, c := range []struct {
		name      string
		pts       []plotter.XY
		top, left bool
	}{
		{"falling", line(func(x float64) float64 { return -x }), true, false},
		{"rising", line(func(x float64) float64 { return x }), true, true},
		{"dip", line(func(x float64) float64 { return -(5 - abs(x-5)) }), false, true},
		// A ∧ reaches the top corners' boxes once each near the middle and the
		// bottom ones twice at its feet: the top left, by the tie rule.
		{"bump", line(func(x float64) float64 { return 5 - abs(x-5) }), true, true},
	} {
		p := plot.New()
		legendAwayFrom(p, c.pts)
		if p.Legend.Top != c.top || p.Legend.Left != c.left {
			t.Errorf("%s: legend top %v left %v, want top %v left %v", c.name, p.Legend.Top, p.Legend.Left, c.top, c.left)
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
