package render

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"spallscope/strain"
	"spallscope/strain/strainfile"
)

// Small multiples of the onsets' histories: one panel per onset, two to a
// row, under a legend strip shared by all.
const (
	historyCols        = 2
	historyPanelHeight = 5.2 * vg.Centimeter
	historyLegendStrip = 0.9 * vg.Centimeter
)

// historyPanel is one onset's indicator history as drawn: its number in
// onset.json's order (the badge on the overlays), its plot and the places
// of what it marks, for the tests.
type historyPanel struct {
	Number int
	Onset  strainfile.OnsetRecord
	Plot   *plot.Plot
	// Onset, interval and trigger places on the frame axis.
	OnsetX, LoX, HiX, TriggerX float64
	HasTrigger                 bool
}

// onsetHistoryPanels builds a panel for every onset that carries its
// zone's history (onset.json from before back-dating carries none): the
// zone's mean indicator frame by frame, the frame's threshold (dashed;
// for decorrelation, whose rule is per point, the per-point limit
// 1 − minimum ZNCC, dotted), the 95 % interval as a shaded band, the
// back-dated onset as a solid line and the trigger as a dotted line with
// the crossed circle.
func onsetHistoryPanels(r *runRecords) []historyPanel {
	if r.Onset == nil {
		return nil
	}
	var panels []historyPanel
	for n, o := range r.Onset.Onsets {
		h := o.History
		if h == nil || len(h.Frames) < 2 || len(h.ZoneMean) != len(h.Frames) {
			continue
		}
		decor := o.Indicator == strain.Decorrelation
		scale, unit := 1e6, "zone mean, µε"
		if decor {
			scale, unit = 1, "zone mean 1 − ZNCC"
		}
		hp := historyPanel{Number: n + 1, Onset: o}
		p := newPlot(historyTitle(n+1, o), r.Axis.Label(), unit)
		p.Title.TextStyle.Font = font.From(plotFace, 9)
		p.Title.Padding = 3
		p.X.Label.TextStyle.Font = font.From(plotFace, 8)
		p.Y.Label.TextStyle.Font = font.From(plotFace, 8)
		p.X.Tick.Label.Font = font.From(plotFace, 7.5)
		p.Y.Tick.Label.Font = font.From(plotFace, 7.5)
		c := classColour(o.Class)

		var mean, thr []framePoint
		for i, k := range h.Frames {
			x, ok := r.FrameX(k)
			if !ok {
				continue
			}
			if v := h.ZoneMean[i]; plotFinite(v) {
				mean = append(mean, framePoint{k, plotter.XY{X: x, Y: scale * v}})
			}
			if i < len(h.Threshold) && h.Threshold[i] > 0 && plotFinite(h.Threshold[i]) {
				thr = append(thr, framePoint{k, plotter.XY{X: x, Y: scale * h.Threshold[i]}})
			}
		}
		if len(mean) < 2 {
			continue
		}
		if iv := o.Interval; iv != nil {
			lo, okLo := historyFrameX(r, iv.First, iv.FirstFrame)
			hi, okHi := historyFrameX(r, iv.Last, iv.LastFrame)
			if okLo && okHi {
				hp.LoX, hp.HiX = lo, hi
				p.Add(spanBand{X0: lo, X1: hi, Y0: math.NaN(), Y1: math.NaN(), Fill: bandColour(c)})
			}
		}
		for _, run := range frameRuns(thr) {
			l, err := plotter.NewLine(run)
			if err != nil {
				continue
			}
			seriesLine(l, plotInk, true)
			l.Width = 1
			p.Add(l)
		}
		if decor && r.Onset.Settings.Thresholds.MinZNCC > 0 {
			limit := 1 - r.Onset.Settings.Thresholds.MinZNCC
			p.Add(hLine{Y: limit, Style: draw.LineStyle{Color: plotInk, Width: 0.9, Dashes: dotted}})
		}
		for _, run := range frameRuns(mean) {
			l, pts, err := plotter.NewLinePoints(run)
			if err != nil {
				continue
			}
			seriesLine(l, c, false)
			l.Width = 1.2
			seriesPoints(pts, c, draw.CircleGlyph{}, 1.5)
			p.Add(l, pts)
		}
		if x, ok := historyFrameX(r, o.Name, o.Frame); ok {
			hp.OnsetX = x
			p.Add(vLine{X: x, Style: draw.LineStyle{Color: c, Width: 1.4}})
		}
		if x, _, ok := r.TriggerAt(o); ok {
			hp.TriggerX, hp.HasTrigger = x, true
			p.Add(vLine{X: x, Style: draw.LineStyle{Color: plotInk, Width: 0.9, Dashes: dotted}})
			for _, m := range mean {
				if m.X == x {
					g, err := plotter.NewScatter(plotter.XYs{m.XY})
					if err == nil {
						seriesPoints(g, c, triggerGlyph{}, 3.6)
						p.Add(g)
					}
				}
			}
		}
		p.Y.Min = math.Min(p.Y.Min, 0)
		hp.Plot = p
		panels = append(panels, hp)
	}
	return panels
}

// historyTitle is a panel's title: the onset's number, place, indicator
// and class.
func historyTitle(n int, o strainfile.OnsetRecord) string {
	place := string(o.Sector)
	if o.OpeningName != "" {
		place = o.OpeningName + " " + place
	}
	if string(o.Indicator) == o.Class {
		return fmt.Sprintf("#%d %s · %s", n, place, o.Class)
	}
	return fmt.Sprintf("#%d %s · %s · %s", n, place, indicatorLabel(o.Indicator), o.Class)
}

// indicatorLabel is how the page and the plots write an indicator.
func indicatorLabel(ind strain.Indicator) string {
	switch ind {
	case strain.MaxShear:
		return "γmax"
	case strain.EquivalentStrain:
		return "e_eq"
	}
	return string(ind)
}

// historyFrameX places a frame of an onset record: by name when the run
// knows it, else by its index.
func historyFrameX(r *runRecords, name string, index int) (float64, bool) {
	if x, ok := r.Axis.Of(name); ok {
		return x, true
	}
	return r.FrameX(index)
}

// plotOnsetHistories draws the panels of onsetHistoryPanels into one
// figure, two to a row. It reports false when no onset carries a history.
func plotOnsetHistories(r *runRecords) (Figure, bool, error) {
	panels := onsetHistoryPanels(r)
	if len(panels) == 0 {
		return Figure{}, false, nil
	}
	cols := min(historyCols, len(panels))
	rows := (len(panels) + cols - 1) / cols
	grid := make([][]*plot.Plot, rows)
	for i := range grid {
		grid[i] = make([]*plot.Plot, cols)
	}
	for k, hp := range panels {
		grid[k/cols][k%cols] = hp.Plot
	}
	decor := false
	for _, hp := range panels {
		decor = decor || hp.Onset.Indicator == strain.Decorrelation
	}
	height := historyLegendStrip + vg.Length(rows)*historyPanelHeight
	draw := func(c draw.Canvas) {
		strip := c
		strip.Min.Y = c.Max.Y - historyLegendStrip
		drawHistoryLegend(strip, decor)
		body := c
		body.Max.Y = strip.Min.Y
		tiles := plotTiles(rows, cols)
		canvases := plot.Align(grid, tiles, body)
		for i := range grid {
			for j, p := range grid[i] {
				if p != nil {
					p.Draw(canvases[i][j])
				}
			}
		}
	}
	caption := "For each onset (numbered as in the onset table and on the overlays), the mean of its zone's indicator over the zone's grid points, frame by frame (solid, with dots); " +
		"the frame's threshold for that indicator (dashed; decorrelation is judged point by point, so its panels show the per-point limit 1 − minimum ZNCC, dotted); " +
		"the back-dated onset (solid vertical line) with its 95 % interval (shaded) and the trigger, the frame whose threshold confirmed the zone (dotted vertical line, crossed circle)."
	fig, err := writeFigureSized(r.plotRoot(), "onset_histories", "Onset histories", caption, height, draw)
	return fig, err == nil, err
}

// plotTiles are the tiles of a grid of small plots.
func plotTiles(rows, cols int) draw.Tiles {
	return draw.Tiles{Rows: rows, Cols: cols, PadX: 0.5 * vg.Centimeter, PadY: 0.35 * vg.Centimeter,
		PadTop: 0.1 * vg.Centimeter, PadBottom: 0.1 * vg.Centimeter, PadLeft: 0.1 * vg.Centimeter, PadRight: 0.3 * vg.Centimeter}
}

// drawHistoryLegend draws the legend shared by the history panels in one
// row across strip: a sample of each mark and its name (with the
// per-point limit when a panel is of decorrelation).
func drawHistoryLegend(strip draw.Canvas, decor bool) {
	c := classColour(strain.Localization)
	entries := []struct {
		name  string
		thumb plot.Thumbnailer
	}{
		{"zone mean", historyLegendLine{draw.LineStyle{Color: c, Width: 1.2}}},
		{"frame's threshold", historyLegendLine{draw.LineStyle{Color: plotInk, Width: 1, Dashes: []vg.Length{4, 3}}}},
		{"95 % interval", spanBand{Fill: bandColour(c)}},
		{"back-dated onset", vLine{Style: draw.LineStyle{Color: c, Width: 1.4}}},
		{"trigger", vLine{Style: draw.LineStyle{Color: plotInk, Width: 0.9, Dashes: dotted}}},
	}
	if decor {
		entries = append(entries, struct {
			name  string
			thumb plot.Thumbnailer
		}{"per-point limit", historyLegendLine{draw.LineStyle{Color: plotInk, Width: 0.9, Dashes: dotted}}})
	}
	sty := historyLegendText()
	names := make([]string, len(entries))
	for k, e := range entries {
		names[k] = e.name
	}
	const thumbW, thumbH = 14, 9
	places, lines := historyLegendLayout(names, strip.Max.X-strip.Min.X)
	for k, e := range entries {
		pl := places[k]
		x := strip.Min.X + pl.X
		// Lines stacked about the strip's middle, the first on top.
		y := (strip.Min.Y+strip.Max.Y)/2 + (vg.Length(lines-1)/2-vg.Length(pl.Line))*historyLegendPitch
		tc := draw.Canvas{Canvas: strip.Canvas, Rectangle: vg.Rectangle{Min: vg.Point{X: x, Y: y - thumbH/2}, Max: vg.Point{X: x + thumbW, Y: y + thumbH/2}}}
		e.thumb.Thumbnail(&tc)
		strip.FillText(sty, vg.Point{X: x + thumbW + 3, Y: y}, e.name)
	}
}

// historyLegendText is the legend's text style.
func historyLegendText() draw.TextStyle {
	return draw.TextStyle{Color: plotInk, Font: font.From(plotFace, 8), XAlign: draw.XLeft, YAlign: draw.YCenter, Handler: plot.DefaultTextHandler}
}

// historyLegendPitch is the distance between two lines of the legend.
const historyLegendPitch = 0.38 * vg.Centimeter

// historyLegendPlace is where one legend entry starts: its line (0 on top)
// and its x from the strip's left edge.
type historyLegendPlace struct {
	Line int
	X    vg.Length
}

// historyLegendLayout places the legend's entries (a 14 pt sample, 3 pt,
// the name, then half a centimetre) left to right from 0.3 cm in, starting
// a new line where an entry would run past the strip's width (a
// decorrelation panel's sixth entry did, cut off at the figure's edge);
// it returns the places and the number of lines.
func historyLegendLayout(names []string, width vg.Length) ([]historyLegendPlace, int) {
	sty := historyLegendText()
	const left, thumbW, gap = 0.3 * vg.Centimeter, 14, 0.5 * vg.Centimeter
	places := make([]historyLegendPlace, len(names))
	x, line := left, 0
	for k, name := range names {
		w := thumbW + 3 + sty.Width(name)
		if x > left && x+w > width-0.1*vg.Centimeter {
			x, line = left, line+1
		}
		places[k] = historyLegendPlace{Line: line, X: x}
		x += w + gap
	}
	return places, line + 1
}

// historyLegendLine is a legend sample of a line style.
type historyLegendLine struct{ draw.LineStyle }

// Thumbnail implements plot.Thumbnailer.
func (l historyLegendLine) Thumbnail(c *draw.Canvas) {
	y := (c.Min.Y + c.Max.Y) / 2
	c.StrokeLine2(l.LineStyle, c.Min.X, y, c.Max.X, y)
}
