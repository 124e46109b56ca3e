package render

import (
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// plotStressTime draws the nominal stress history with a marker at each
// onset (glyph by sector, colour by class) and the peak. It reports false
// when the run has no stress history.
func plotStressTime(r *runRecords) (Figure, bool, error) {
	var xs, ys []float64
	source := ""
	switch {
	case r.Load != nil && len(r.Load.Times) > 1 && len(r.Load.Times) == len(r.Load.Stress):
		xs, ys, source = r.Load.Times, r.Load.Stress, "the load log"
	case r.Axis.Timed && r.Axis.HasStress():
		xs, ys, source = r.Axis.X, r.Axis.Stress, "the frames' stresses"
	default:
		return Figure{}, false, nil
	}
	line := finiteXYs(xs, ys)
	if len(line) < 2 {
		return Figure{}, false, nil
	}
	p := newPlot("Nominal stress and onsets", "time, s", "nominal stress, MPa")
	hist, err := plotter.NewLine(line)
	if err != nil {
		return Figure{}, false, fmt.Errorf("stress plot: %w", err)
	}
	seriesLine(hist, plotInk, false)
	hist.Width = 1.1
	p.Add(hist)
	p.Legend.Add("nominal stress", hist)

	// The photos: a small tick at each frame's time and stress.
	if r.Axis.Timed && r.Axis.HasStress() {
		shots, err := plotter.NewScatter(finiteXYs(r.Axis.X, r.Axis.Stress))
		if err == nil {
			seriesPoints(shots, color.RGBA{0x8c, 0x94, 0xa0, 0xff}, draw.RingGlyph{}, 1.6)
			p.Add(shots)
			p.Legend.Add("photos", shots)
		}
	}

	// Onsets, one legend entry per sector and class.
	type key struct{ sector, class string }
	groups := map[key]plotter.XYs{}
	var order []key
	if r.Onset != nil {
		for _, o := range r.Onset.Onsets {
			if !plotFinite(o.Stress) || !plotFinite(o.Time) {
				continue
			}
			k := key{string(o.Sector), o.Class}
			if _, ok := groups[k]; !ok {
				order = append(order, k)
			}
			groups[k] = append(groups[k], plotter.XY{X: o.Time, Y: o.Stress})
		}
	}
	slices.SortStableFunc(order, func(a, b key) int { return legendSectorRank(a.sector) - legendSectorRank(b.sector) })
	for _, k := range order {
		s, err := plotter.NewScatter(groups[k])
		if err != nil {
			return Figure{}, false, fmt.Errorf("stress plot: %w", err)
		}
		seriesPoints(s, classColour(k.class), sectorGlyph(k.sector), 4.2)
		p.Add(s)
		p.Legend.Add(fmt.Sprintf("%s onset (%s)", k.sector, k.class), s)
	}

	// The peak.
	peak, at, ok := r.peak()
	if ok {
		pk, _ := plotter.NewScatter(plotter.XYs{{X: at, Y: peak}})
		seriesPoints(pk, plotInk, diamondGlyph{}, 4.5)
		p.Add(pk)
		lab, err := plotter.NewLabels(plotter.XYLabels{XYs: plotter.XYs{{X: at, Y: peak}}, Labels: []string{fmt.Sprintf("peak %.3g MPa", peak)}})
		if err == nil {
			for i := range lab.TextStyle {
				lab.TextStyle[i].Font = font.From(plotFace, 8.5)
				lab.TextStyle[i].Color = plotInk
				lab.TextStyle[i].XAlign = draw.XRight
			}
			lab.Offset = vg.Point{X: -7, Y: 3}
			p.Add(lab)
		}
		p.Legend.Add("peak", pk)
	}
	p.Y.Min = math.Min(p.Y.Min, 0)
	if ok {
		p.Y.Max = math.Max(p.Y.Max, 1.08*peak)
	}
	caption := "Nominal stress (force over loaded area) from " + source +
		"; markers show where each onset was timed, by sector (shape) and class (colour)."
	fig, err := writeFigure(r.plotRoot(), "stress_time", "Nominal stress and onsets", caption, p.Draw)
	return fig, err == nil, err
}

// peak returns the peak nominal stress and its time.
func (r *runRecords) peak() (stress, at float64, ok bool) {
	switch {
	case r.Load != nil && r.Load.Peak > 0:
		return r.Load.Peak, r.Load.PeakAt, true
	case r.Onset != nil && r.Onset.Peak.Stress > 0:
		return r.Onset.Peak.Stress, r.Onset.Peak.Time, true
	}
	return 0, 0, false
}

// legendSectorRank orders sectors in the legends: around the opening, then the
// rest.
func legendSectorRank(sector string) int {
	order := []string{"crown", "left-sidewall", "right-sidewall", "invert", "pillar", "through", "other"}
	if k := slices.Index(order, sector); k >= 0 {
		return k
	}
	return len(order)
}

// finiteXYs pairs xs and ys, leaving out pairs with a NaN or infinity.
func finiteXYs(xs, ys []float64) plotter.XYs {
	out := make(plotter.XYs, 0, len(xs))
	for i := range min(len(xs), len(ys)) {
		if plotFinite(xs[i]) && plotFinite(ys[i]) {
			out = append(out, plotter.XY{X: xs[i], Y: ys[i]})
		}
	}
	return out
}

func plotFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
