package render

import (
	"fmt"
	"slices"

	"gonum.org/v1/plot/plotter"
)

// plotSectorHistories draws, for each sector, the largest zone peak of the
// strain indicators in each frame: how far inelastic strain had gone in
// the crown, the sidewalls, the pillars and elsewhere. Frames without a
// zone in a sector leave a gap (nothing above the threshold). Localization
// onsets are marked on their sector's line. It reports false when there
// are no strain zones.
func plotSectorHistories(r *runRecords) (Figure, bool, error) {
	type cell struct {
		frame int
		x     float64
	}
	peaks := map[string]map[cell]float64{}
	for _, z := range r.Zones {
		if z.Indicator == "decorrelation" {
			continue
		}
		m := peaks[z.Sector]
		if m == nil {
			m = map[cell]float64{}
			peaks[z.Sector] = m
		}
		c := cell{r.ZoneFrame(z), r.ZoneX(z)}
		m[c] = max(m[c], z.Peak)
	}
	if len(peaks) == 0 {
		return Figure{}, false, nil
	}
	sectors := make([]string, 0, len(peaks))
	for s := range peaks {
		sectors = append(sectors, s)
	}
	slices.SortFunc(sectors, func(a, b string) int { return legendSectorRank(a) - legendSectorRank(b) })
	p := newPlot("Largest zone peak per sector", r.Axis.Label(), "largest zone peak, µε")
	for k, sec := range sectors {
		var pts []framePoint
		for c, v := range peaks[sec] {
			pts = append(pts, framePoint{c.frame, plotter.XY{X: c.x, Y: 1e6 * v}})
		}
		slices.SortFunc(pts, func(a, b framePoint) int { return a.Frame - b.Frame })
		if err := addSeriesRuns(p, frameRuns(pts), plotColour(k), sectorGlyph(sec), false, sec); err != nil {
			return Figure{}, false, fmt.Errorf("sector plot: %w", err)
		}
	}
	if r.Onset != nil {
		var xy plotter.XYs
		for _, o := range r.Onset.Onsets {
			if o.Class == "localization" && plotFinite(o.Peak) {
				xy = append(xy, plotter.XY{X: r.OnsetX(o), Y: 1e6 * o.Peak})
			}
		}
		if len(xy) > 0 {
			s, err := plotter.NewScatter(xy)
			if err != nil {
				return Figure{}, false, fmt.Errorf("sector plot: %w", err)
			}
			seriesPoints(s, classColour("localization"), ringGlyphBold{}, 6)
			p.Add(s)
			p.Legend.Add("localization onset", s)
		}
	}
	p.Y.Min = 0
	spanFrames(p, r)
	caption := "For each sector, the largest peak of the strain indicators (inelastic strain above the elastic baseline) among its zones, frame by frame; rings mark the localization onsets."
	fig, err := writeFigure(r.plotRoot(), "sectors_peak", "Largest zone peak per sector", caption, p.Draw)
	return fig, err == nil, err
}
