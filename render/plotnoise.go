package render

import (
	"fmt"
	"image/color"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// plotNoiseFloor draws the measurement resolution of the run, the
// standard deviation of each quantity over its static frames: the
// displacements in px on the left, the strain components in µε on the
// right, each bar labelled with its value. It reports false when the run
// has no resolution record.
func plotNoiseFloor(r *runRecords) (Figure, bool, error) {
	res := r.Resolution
	if res == nil || res.Frames == 0 {
		return Figure{}, false, nil
	}
	disp, err := noiseBars("Displacement", "standard deviation, px", []string{"u", "v"},
		[]float64{res.U, res.V}, "%.3g", plotColour(0))
	if err != nil {
		return Figure{}, false, err
	}
	str, err := noiseBars("Strain", "standard deviation, µε",
		[]string{"exx", "eyy", "exy", "e1", "e2", "γmax", "e_eq"},
		[]float64{1e6 * res.Exx, 1e6 * res.Eyy, 1e6 * res.Exy, 1e6 * res.E1, 1e6 * res.E2, 1e6 * res.GammaMax, 1e6 * res.Eeq},
		"%.0f", plotColour(1))
	if err != nil {
		return Figure{}, false, err
	}
	drawFig := func(c draw.Canvas) {
		// The displacement panel takes a third of the width.
		left, right := c, c
		split := c.Min.X + (c.Max.X-c.Min.X)/3
		left.Max.X, right.Min.X = split-2*vg.Millimeter, split+2*vg.Millimeter
		right.Max.X -= 3 * vg.Millimeter
		disp.Draw(left)
		str.Draw(right)
	}
	caption := fmt.Sprintf("Noise floor: standard deviation over the field of each quantity on %d static frame(s) (no load, so all variation is measurement error), pooled as the root mean square over the frames.", res.Frames)
	fig, err := writeFigure(r.plotRoot(), "noise_floor", "Noise floor", caption, drawFig)
	return fig, err == nil, err
}

// noiseBars is one panel of the noise-floor figure: a bar per quantity,
// labelled with its value.
func noiseBars(title, yLabel string, names []string, values []float64, format string, c color.Color) (*plot.Plot, error) {
	p := newPlot(title, "", yLabel)
	bars, err := plotter.NewBarChart(plotter.Values(values), 14)
	if err != nil {
		return nil, fmt.Errorf("noise floor plot: %w", err)
	}
	bars.Color = c
	bars.LineStyle.Width = 0
	p.Add(bars)
	p.NominalX(names...)
	xy := make(plotter.XYs, len(values))
	labels := make([]string, len(values))
	for i, v := range values {
		xy[i] = plotter.XY{X: float64(i), Y: v}
		labels[i] = fmt.Sprintf(format, v)
	}
	lab, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: labels})
	if err != nil {
		return nil, fmt.Errorf("noise floor plot: %w", err)
	}
	for i := range lab.TextStyle {
		lab.TextStyle[i].Font = font.From(plotFace, 8)
		lab.TextStyle[i].Color = plotInk
		lab.TextStyle[i].XAlign = draw.XCenter
	}
	lab.Offset = vg.Point{Y: 3}
	p.Add(lab)
	p.Y.Min = 0
	hi := 0.0
	for _, v := range values {
		hi = max(hi, v)
	}
	if hi > 0 {
		p.Y.Max = 1.15 * hi
	}
	return p, nil
}
