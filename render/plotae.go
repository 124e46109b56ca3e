package render

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// plotStressAE puts the acoustic-emission record on the test's timeline:
// the nominal stress, the cumulative AE hits scaled so that the last hit
// reaches the peak stress (the plot has one vertical axis; the caption
// gives the hit count), the AE onset as a vertical line, the DIC onsets as
// markers on the stress curve, and any gap in the AE record as a shaded
// span — a gap is shown, never bridged. It reports false without an AE
// record or a stress history.
func plotStressAE(r *runRecords) (Figure, bool, error) {
	if r.AE == nil || len(r.AE.Times) < 2 {
		return Figure{}, false, nil
	}
	peak, _, ok := r.peak()
	if !ok || r.Load == nil || len(r.Load.Times) < 2 {
		return Figure{}, false, nil
	}
	p := newPlot("Stress, acoustic emission and onsets", "time, s", "nominal stress, MPa")
	for _, g := range r.AE.Gaps {
		band, err := plotter.NewPolygon(plotter.XYs{{X: g.Start, Y: 0}, {X: g.End, Y: 0}, {X: g.End, Y: peak * 1.05}, {X: g.Start, Y: peak * 1.05}})
		if err != nil {
			return Figure{}, false, fmt.Errorf("AE plot: %w", err)
		}
		band.Color = color.RGBA{0xd9, 0xdd, 0xe3, 0xff}
		band.LineStyle.Width = 0
		p.Add(band)
	}
	stress, err := plotter.NewLine(finiteXYs(r.Load.Times, r.Load.Stress))
	if err != nil {
		return Figure{}, false, fmt.Errorf("AE plot: %w", err)
	}
	seriesLine(stress, plotInk, false)
	p.Add(stress)
	p.Legend.Add("nominal stress", stress)
	total := r.AE.Cumulative[len(r.AE.Cumulative)-1]
	if total > 0 {
		scaled := make([]float64, len(r.AE.Cumulative))
		for i, h := range r.AE.Cumulative {
			scaled[i] = h / total * peak
		}
		cum, err := plotter.NewLine(finiteXYs(r.AE.Times, scaled))
		if err != nil {
			return Figure{}, false, fmt.Errorf("AE plot: %w", err)
		}
		seriesLine(cum, color.RGBA{0x2b, 0x6c, 0xb0, 0xff}, true)
		p.Add(cum)
		p.Legend.Add(fmt.Sprintf("cumulative AE hits (top = %.0f)", total), cum)
	}
	if o := r.AE.Onset; o != nil && plotFinite(o.Time) {
		line, err := plotter.NewLine(plotter.XYs{{X: o.Time, Y: 0}, {X: o.Time, Y: peak * 1.05}})
		if err == nil {
			seriesLine(line, color.RGBA{0xb5, 0x65, 0x1d, 0xff}, true)
			line.Width = vg.Points(1.2)
			p.Add(line)
			p.Legend.Add(fmt.Sprintf("AE onset %.1f s", o.Time), line)
		}
	}
	if r.Onset != nil {
		var pts plotter.XYs
		for _, o := range r.Onset.Onsets {
			if plotFinite(o.Time) && plotFinite(o.Stress) {
				pts = append(pts, plotter.XY{X: o.Time, Y: o.Stress})
			}
		}
		if len(pts) > 0 {
			sc, err := plotter.NewScatter(pts)
			if err == nil {
				seriesPoints(sc, color.RGBA{0xc0, 0x39, 0x2b, 0xff}, draw.TriangleGlyph{}, 3.5)
				p.Add(sc)
				p.Legend.Add("DIC onsets", sc)
			}
		}
	}
	caption := fmt.Sprintf("Nominal stress and the cumulative acoustic-emission hits (%.0f in all, scaled to the peak stress) on the camera's clock; the dashed line is the AE onset (the hit rate first above k × its early background), triangles the DIC onsets; shaded spans are gaps in the AE record (%d).", total, len(r.AE.Gaps))
	if math.IsNaN(total) {
		caption = "Nominal stress and acoustic emission."
	}
	fig, err := writeFigure(r.plotRoot(), "stress_ae", "Stress, acoustic emission and onsets", caption, p.Draw)
	return fig, err == nil, err
}
