package render

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
)

// plotTicks marks an axis at round numbers, 1, 2, 2.5 or 5 times a power
// of ten apart, the closest spacing that labels at most eight, with a
// minor tick between labelled ones; labels carry only the decimals the
// spacing needs.
type plotTicks struct{}

// Ticks implements plot.Ticker.
func (plotTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) || !plotFinite(lo) || !plotFinite(hi) {
		return []plot.Tick{{Value: lo, Label: strconv.FormatFloat(lo, 'g', 4, 64)}}
	}
	step := niceStep(lo, hi)
	e := int(math.Floor(math.Log10(step) + 1e-9))
	decimals := max(0, -e)
	if m := step / math.Pow(10, float64(e)); math.Abs(m-2.5) < 1e-6 && e <= 0 {
		decimals = 1 - e // 2.5, 0.25, ...
	}
	var ticks []plot.Tick
	first := math.Ceil(lo/step-1e-9) * step
	for k := 0; ; k++ {
		v := first + float64(k)*step
		if v > hi+1e-9*step {
			break
		}
		if math.Abs(v) < 1e-12*step {
			v = 0
		}
		ticks = append(ticks, plot.Tick{Value: v, Label: strconv.FormatFloat(v, 'f', decimals, 64)})
		if mid := v + step/2; mid <= hi {
			ticks = append(ticks, plot.Tick{Value: mid})
		}
	}
	if mid := first - step/2; mid >= lo {
		ticks = append(ticks, plot.Tick{Value: mid})
	}
	return ticks
}

// plotMaxLabels is the most labelled ticks an axis gets.
const plotMaxLabels = 8

// niceStep returns the smallest round step (1, 2, 2.5 or 5 times a power
// of ten) that puts at most plotMaxLabels round numbers in [lo, hi].
func niceStep(lo, hi float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10((hi-lo)/(4*plotMaxLabels))))
	for {
		for _, m := range []float64{1, 2, 2.5, 5} {
			step := m * p
			if n := math.Floor(hi/step+1e-9) - math.Ceil(lo/step-1e-9) + 1; n <= plotMaxLabels {
				return step
			}
		}
		p *= 10
	}
}
