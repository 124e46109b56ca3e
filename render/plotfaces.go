package render

import (
	"fmt"
	"image/color"
	"path/filepath"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg/draw"
)

// TimelineMark is one onset on a common timeline: which face and what it
// was, where on the load log's clock and at what stress.
type TimelineMark struct {
	Face, Label  string
	Time, Stress float64
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
	glyphs := []draw.GlyphDrawer{draw.TriangleGlyph{}, draw.CircleGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{}, draw.PyramidGlyph{}}
	inks := []color.Color{color.RGBA{0xc0, 0x39, 0x2b, 0xff}, color.RGBA{0x1e, 0x84, 0x49, 0xff}, color.RGBA{0x8e, 0x44, 0xad, 0xff}, color.RGBA{0xb5, 0x65, 0x1d, 0xff}}
	var faces []string
	byFace := map[string]plotter.XYs{}
	for _, m := range marks {
		if !plotFinite(m.Time) || !plotFinite(m.Stress) {
			continue
		}
		if _, ok := byFace[m.Face]; !ok {
			faces = append(faces, m.Face)
		}
		byFace[m.Face] = append(byFace[m.Face], plotter.XY{X: m.Time, Y: m.Stress})
	}
	for k, f := range faces {
		sc, err := plotter.NewScatter(byFace[f])
		if err != nil {
			continue
		}
		seriesPoints(sc, inks[k%len(inks)], glyphs[k%len(glyphs)], 3.5)
		p.Add(sc)
		p.Legend.Add("onsets, face "+f, sc)
	}
	caption := "Nominal stress on the load log's clock with every face's onsets (each face's camera clock shifted by its own offset) and, when recorded, the cumulative acoustic emission scaled to the peak stress."
	return writeFigure(dir, "timeline", "All faces on the load log's clock", caption, p.Draw)
}

// TimelinePNG is the timeline figure's path in a run folder.
func TimelinePNG(dir string) string { return filepath.Join(dir, "plots", "timeline.png") }
