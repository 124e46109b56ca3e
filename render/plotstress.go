package render

import (
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"spallscope/strain/strainfile"
)

// plotStressTime draws the nominal stress history with each onset: its
// 95 % interval as a shaded box (the interval's times across, the stress
// over them up and down), the back-dated onset as a filled glyph (shape by
// sector, colour by class) and the trigger — the frame whose threshold
// confirmed the zone — as an open, crossed circle; and the peak. It
// reports false when the run has no stress history.
func plotStressTime(r *runRecords) (Figure, bool, error) {
	p, source, ok, err := stressTimePlot(r)
	if !ok || err != nil {
		return Figure{}, false, err
	}
	caption := "Nominal stress (force over loaded area) from " + source +
		"; filled markers show each back-dated onset, by sector (shape) and class (colour); each shaded box spans the onset's " +
		"95 % interval, its width the interval's times and its height the stress over them; crossed circles mark the trigger, " +
		"the frame whose threshold confirmed the zone."
	fig, err := writeFigure(r.plotRoot(), "stress_time", "Nominal stress and onsets", caption, withSideLegend(p))
	return fig, err == nil, err
}

// stressTimePlot builds the stress–time plot of r and names the source of
// its stress history; false when there is none.
func stressTimePlot(r *runRecords) (*plot.Plot, string, bool, error) {
	var xs, ys []float64
	source := ""
	switch {
	case r.Load != nil && len(r.Load.Times) > 1 && len(r.Load.Times) == len(r.Load.Stress):
		xs, ys, source = r.Load.Times, r.Load.Stress, "the load log"
	case r.Axis.Timed && r.Axis.HasStress():
		xs, ys, source = r.Axis.X, r.Axis.Stress, "the frames' stresses"
	default:
		return nil, "", false, nil
	}
	line := finiteXYs(xs, ys)
	if len(line) < 2 {
		return nil, "", false, nil
	}
	// Drawn with its legend beside it (withSideLegend): the onsets and
	// their intervals may sit anywhere along the curve.
	p := newPlot("Nominal stress and onsets", "time, s", "nominal stress, MPa")
	peak, at, hasPeak := r.peak()
	pad := 0.025 * max(peak, 1)

	// The intervals first, under everything else.
	var onsets []strainfile.OnsetRecord
	if r.Onset != nil {
		onsets = r.Onset.Onsets
	}
	bands := 0
	for _, o := range onsets {
		b, ok := onsetBand(o, line, pad)
		if !ok {
			continue
		}
		p.Add(b)
		bands++
	}

	hist, err := plotter.NewLine(line)
	if err != nil {
		return nil, "", false, fmt.Errorf("stress plot: %w", err)
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

	// Onsets, one legend entry per sector and class; triggers by class.
	type key struct{ sector, class string }
	groups := map[key]plotter.XYs{}
	triggers := map[string]plotter.XYs{}
	var order []key
	var classes []string
	for _, o := range onsets {
		if plotFinite(o.Stress) && plotFinite(o.Time) {
			k := key{string(o.Sector), o.Class}
			if _, ok := groups[k]; !ok {
				order = append(order, k)
			}
			groups[k] = append(groups[k], plotter.XY{X: o.Time, Y: o.Stress})
		}
		if tx, ts, ok := r.TriggerAt(o); ok && r.Axis.Timed {
			if !plotFinite(ts) {
				ts, ok = interpolate(xs, ys, tx)
			}
			if ok && plotFinite(ts) {
				if _, seen := triggers[o.Class]; !seen {
					classes = append(classes, o.Class)
				}
				triggers[o.Class] = append(triggers[o.Class], plotter.XY{X: tx, Y: ts})
			}
		}
	}
	slices.SortStableFunc(order, func(a, b key) int { return legendSectorRank(a.sector) - legendSectorRank(b.sector) })
	for _, k := range order {
		s, err := plotter.NewScatter(groups[k])
		if err != nil {
			return nil, "", false, fmt.Errorf("stress plot: %w", err)
		}
		seriesPoints(s, classColour(k.class), sectorGlyph(k.sector), 4.2)
		p.Add(s)
		p.Legend.Add(fmt.Sprintf("%s onset (%s)", k.sector, k.class), s)
	}
	if bands > 0 {
		p.Legend.Add("95 % interval of an onset", spanBand{Fill: bandColour(plotMuted), Edge: edgeColour(plotMuted)})
	}
	for i, c := range classes {
		s, err := plotter.NewScatter(triggers[c])
		if err != nil {
			return nil, "", false, fmt.Errorf("stress plot: %w", err)
		}
		seriesPoints(s, classColour(c), triggerGlyph{}, 4.6)
		p.Add(s)
		if i == 0 {
			legend, _ := plotter.NewScatter(plotter.XYs{{}})
			seriesPoints(legend, plotMuted, triggerGlyph{}, 4.6)
			p.Legend.Add("trigger (threshold confirmed)", legend)
		}
	}

	// The peak.
	if hasPeak {
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
	if hasPeak {
		p.Y.Max = math.Max(p.Y.Max, 1.08*peak)
	}
	return p, source, true, nil
}

// onsetBand is the shaded box of an onset's interval on the stress–time
// plot (intervalBox) in the colour of its class; an onset outside the load
// log has no measured stress and gets a band of the plot's whole height.
// False when the onset has no interval.
func onsetBand(o strainfile.OnsetRecord, curve plotter.XYs, pad float64) (spanBand, bool) {
	iv := o.Interval
	if iv == nil || !plotFinite(iv.TimeLo) || !plotFinite(iv.TimeHi) {
		return spanBand{}, false
	}
	lo, hi := iv.StressLo, iv.StressHi
	if !o.InSpan {
		lo, hi = math.NaN(), math.NaN()
	}
	return intervalBox(iv.TimeLo, iv.TimeHi, lo, hi, curve, pad, classColour(o.Class)), true
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
