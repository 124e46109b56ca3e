package render

import (
	"fmt"
	"math"

	"gocv.io/x/gocv"

	"spallscope/dic"
	"spallscope/dic/region"
	"spallscope/subset"
)

// ModelSideBySide draws a model, the measurement and their difference
// (measured − model) of one quantity over the reference photo, left to
// right, each with its own colour bar: the model and the measurement on
// one set of symmetric limits so their colours compare, the difference on
// its own. label names the frame compared. The caller closes the result.
func ModelSideBySide(photo *subset.Image, model, measured, diff *GridValues, q Quantity, keep *region.Mask, scale dic.Scale, label string) (gocv.Mat, error) {
	both := math.Max(maxAbs(model.Values), maxAbs(measured.Values))
	dl := maxAbs(diff.Values)
	if !(both > 0) || !(dl > 0) {
		return gocv.Mat{}, fmt.Errorf("side by side of %s: no values to show", q.Name)
	}
	panels := []struct {
		v     *GridValues
		lim   float64
		title string
	}{{model, both, "model — " + label}, {measured, both, "measured — " + label}, {diff, dl, "measured − model — " + label}}
	var mats []gocv.Mat
	defer func() {
		for _, m := range mats {
			m.Close()
		}
	}()
	for _, p := range panels {
		m, err := Overlay(photo, p.v, OverlayOptions{Quantity: q, Limits: Limits{Lo: -p.lim, Hi: p.lim, Centred: true, Mode: LimitsFixed},
			Map: Diverging(), Keep: keep, Scale: scale, Stamp: Stamp{Frame: p.title}})
		if err != nil {
			return gocv.Mat{}, err
		}
		mats = append(mats, m)
	}
	out := gocv.NewMat()
	row := gocv.NewMat()
	defer row.Close()
	gocv.Hconcat(mats[0], mats[1], &row)
	gocv.Hconcat(row, mats[2], &out)
	return out, nil
}

func maxAbs(xs []float64) float64 {
	m := 0.0
	for _, x := range xs {
		if !math.IsNaN(x) {
			m = math.Max(m, math.Abs(x))
		}
	}
	return m
}
