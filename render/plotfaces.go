package render

import (
	"fmt"
	"image/color"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg/draw"
)

// TimelineMark is one onset on a common timeline: which face and what it
// was, where on the load log's clock and at what stress, with its
// interval and its trigger when known.
type TimelineMark struct {
	Face, Label  string
	Time, Stress float64
	// Interval is the onset's interval on the load log's clock and the
	// stress over it (HasInterval false: none, as in records from before
	// back-dating).
	HasInterval        bool
	TimeLo, TimeHi     float64
	StressLo, StressHi float64
	// Trigger is the trigger frame's place on the load log's clock and
	// its stress (HasTrigger false: unknown).
	HasTrigger                 bool
	TriggerTime, TriggerStress float64
}

// WriteTimeline draws several faces' onsets on one time axis — the load
// log's clock — over the nominal stress history (times, stress), with the
// cumulative AE hits scaled to the peak stress when aeTimes is given, into
// dir/plots/timeline.png and .svg. Onsets of each face share one glyph.
func WriteTimeline(dir string, times, stress []float64, marks []TimelineMark, aeTimes, aeHits []float64) (Figure, error) {
	if len(times) < 2 {
		return Figure{}, fmt.Errorf("timeline: no stress history")
	}
	p := newPlot("All faces on the load log's clock", "load log time, s", "nominal stress, MPa")
	line, err := plotter.NewLine(finiteXYs(times, stress))
	if err != nil {
		return Figure{}, fmt.Errorf("timeline: %w", err)
	}
	seriesLine(line, plotInk, false)
	p.Add(line)
	p.Legend.Add("nominal stress", line)
	peak := 0.0
	for _, s := range stress {
		if plotFinite(s) && s > peak {
			peak = s
		}
	}
	if n := len(aeHits); n > 1 && aeHits[n-1] > 0 {
		scaled := make([]float64, n)
		for i, h := range aeHits {
			scaled[i] = h / aeHits[n-1] * peak
		}
		ae, err := plotter.NewLine(finiteXYs(aeTimes, scaled))
		if err == nil {
			seriesLine(ae, color.RGBA{0x2b, 0x6c, 0xb0, 0xff}, true)
			p.Add(ae)
			p.Legend.Add(fmt.Sprintf("cumulative AE hits (top = %.0f)", aeHits[n-1]), ae)
		}
	}
	pad := 0.025 * max(peak, 1)
	curve := finiteXYs(times, stress)
	faceIndex := map[string]int{}
	for _, m := range marks {
		if _, ok := faceIndex[m.Face]; !ok {
			faceIndex[m.Face] = len(faceIndex)
		}
	}
	bands := 0
	for _, m := range marks {
		if b, ok := timelineBand(m, curve, pad, timelineInk(faceIndex[m.Face])); ok {
			p.Add(b)
			bands++
		}
	}
	glyphs := []draw.GlyphDrawer{draw.TriangleGlyph{}, draw.CircleGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{}, draw.PyramidGlyph{}}
	var faces []string
	byFace := map[string]plotter.XYs{}
	triggers := map[string]plotter.XYs{}
	for _, m := range marks {
		if !plotFinite(m.Time) || !plotFinite(m.Stress) {
			continue
		}
		if _, ok := byFace[m.Face]; !ok {
			faces = append(faces, m.Face)
		}
		byFace[m.Face] = append(byFace[m.Face], plotter.XY{X: m.Time, Y: m.Stress})
		if m.HasTrigger && plotFinite(m.TriggerTime) && plotFinite(m.TriggerStress) {
			triggers[m.Face] = append(triggers[m.Face], plotter.XY{X: m.TriggerTime, Y: m.TriggerStress})
		}
	}
	anyTrigger := false
	for _, f := range faces {
		k := faceIndex[f]
		sc, err := plotter.NewScatter(byFace[f])
		if err != nil {
			continue
		}
		seriesPoints(sc, timelineInk(k), glyphs[k%len(glyphs)], 3.5)
		p.Add(sc)
		p.Legend.Add("onsets, face "+f, sc)
		if tr := triggers[f]; len(tr) > 0 {
			ts, err := plotter.NewScatter(tr)
			if err == nil {
				seriesPoints(ts, timelineInk(k), triggerGlyph{}, 4)
				p.Add(ts)
				anyTrigger = true
			}
		}
	}
	if bands > 0 {
		p.Legend.Add("95 % interval of an onset", spanBand{Fill: bandColour(plotMuted), Edge: edgeColour(plotMuted)})
	}
	if anyTrigger {
		legend, _ := plotter.NewScatter(plotter.XYs{{}})
		seriesPoints(legend, plotMuted, triggerGlyph{}, 4)
		p.Legend.Add("trigger (threshold confirmed)", legend)
	}
	caption := "Nominal stress on the load log's clock with every face's onsets (each face's camera clock shifted by its own offset): filled glyphs the back-dated onsets, shaded boxes their 95 % intervals (times across, stress up and down), crossed circles the triggers; and, when recorded, the cumulative acoustic emission scaled to the peak stress."
	return writeFigure(dir, "timeline", "All faces on the load log's clock", caption, withSideLegend(p))
}

// timelineInks are the faces' colours on the timeline, in face order.
var timelineInks = []color.RGBA{{0xc0, 0x39, 0x2b, 0xff}, {0x1e, 0x84, 0x49, 0xff}, {0x8e, 0x44, 0xad, 0xff}, {0xb5, 0x65, 0x1d, 0xff}}

// timelineInk is the colour of the k-th face.
func timelineInk(k int) color.RGBA { return timelineInks[k%len(timelineInks)] }

// timelineBand is the shaded box of a mark's interval (intervalBox), in
// the face's colour; false without an interval.
func timelineBand(m TimelineMark, curve plotter.XYs, pad float64, c color.RGBA) (spanBand, bool) {
	if !m.HasInterval || !plotFinite(m.TimeLo) || !plotFinite(m.TimeHi) {
		return spanBand{}, false
	}
	return intervalBox(m.TimeLo, m.TimeHi, m.StressLo, m.StressHi, curve, pad, c), true
}
