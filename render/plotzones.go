package render

import (
	"fmt"
	"image/color"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg/draw"

	"spallscope/strain/strainfile"
)

// plotZoneCount is how many zones the zone histories draw: the largest
// ones, so the legend stays readable.
const plotZoneCount = 8

// zoneHistory is one zone's rows, in frame order.
type zoneHistory struct {
	Zone      int
	Indicator string
	Sector    string
	Rows      []strainfile.ZoneRow
	MaxArea   float64
}

// Label names the zone in a legend.
func (h zoneHistory) Label() string {
	return fmt.Sprintf("zone %d · %s · %s", h.Zone, h.Indicator, h.Sector)
}

// zoneHistories groups zone rows by zone id and indicator, largest first.
func zoneHistories(rows []strainfile.ZoneRow, area func(strainfile.ZoneRow) float64) []zoneHistory {
	type key struct {
		zone int
		ind  string
	}
	byKey := map[key]*zoneHistory{}
	var order []key
	for _, z := range rows {
		k := key{z.Zone, z.Indicator}
		h := byKey[k]
		if h == nil {
			h = &zoneHistory{Zone: z.Zone, Indicator: z.Indicator, Sector: z.Sector}
			byKey[k] = h
			order = append(order, k)
		}
		h.Rows = append(h.Rows, z)
		h.MaxArea = max(h.MaxArea, area(z))
	}
	out := make([]zoneHistory, 0, len(order))
	for _, k := range order {
		out = append(out, *byKey[k])
	}
	slices.SortStableFunc(out, func(a, b zoneHistory) int {
		switch {
		case a.MaxArea > b.MaxArea:
			return -1
		case a.MaxArea < b.MaxArea:
			return 1
		}
		return a.Zone - b.Zone
	})
	return out
}

// zoneArea returns the area of a zone in mm² when the run has a scale, in
// px² otherwise, with the unit.
func (r *runRecords) zoneArea() (func(strainfile.ZoneRow) float64, string) {
	if r.Scale.Known() {
		return func(z strainfile.ZoneRow) float64 { return z.AreaMM2 }, "mm²"
	}
	return func(z strainfile.ZoneRow) float64 { return z.AreaPx2 }, "px²"
}

// plotZoneAreas draws the area of the largest zones frame by frame. It
// reports false when the run has no zones.
func plotZoneAreas(r *runRecords) (Figure, bool, error) {
	if len(r.Zones) == 0 {
		return Figure{}, false, nil
	}
	area, unit := r.zoneArea()
	hs := zoneHistories(r.Zones, area)
	p := newPlot("Zone area", r.Axis.Label(), "area, "+unit)
	drawn := min(len(hs), plotZoneCount)
	for k, h := range hs[:drawn] {
		var pts []framePoint
		for _, z := range h.Rows {
			pts = append(pts, framePoint{r.ZoneFrame(z), plotter.XY{X: r.ZoneX(z), Y: area(z)}})
		}
		if err := addSeriesRuns(p, frameRuns(pts), plotColour(k), sectorGlyph(h.Sector), h.Indicator == "decorrelation", h.Label()); err != nil {
			return Figure{}, false, fmt.Errorf("zone area plot: %w", err)
		}
	}
	p.Y.Min = 0
	spanFrames(p, r)
	caption := fmt.Sprintf("Area of each localized zone (grid cells flagged by its indicator) in every frame it was found; %d largest of %d zones drawn, decorrelated zones dashed.", drawn, len(hs))
	fig, err := writeFigure(r.plotRoot(), "zones_area", "Zone area", caption, p.Draw)
	return fig, err == nil, err
}

// plotZonePeaks draws the peak inelastic strain of the largest strain zones
// frame by frame (decorrelated zones have no strain and are left out). It
// reports false when there are none.
func plotZonePeaks(r *runRecords) (Figure, bool, error) {
	var strainRows []strainfile.ZoneRow
	for _, z := range r.Zones {
		if z.Indicator != "decorrelation" {
			strainRows = append(strainRows, z)
		}
	}
	if len(strainRows) == 0 {
		return Figure{}, false, nil
	}
	area, _ := r.zoneArea()
	hs := zoneHistories(strainRows, area)
	p := newPlot("Zone peak strain", r.Axis.Label(), "peak indicator strain, µε")
	drawn := min(len(hs), plotZoneCount)
	for k, h := range hs[:drawn] {
		var pts []framePoint
		for _, z := range h.Rows {
			pts = append(pts, framePoint{r.ZoneFrame(z), plotter.XY{X: r.ZoneX(z), Y: 1e6 * z.Peak}})
		}
		if err := addSeriesRuns(p, frameRuns(pts), plotColour(k), sectorGlyph(h.Sector), false, h.Label()); err != nil {
			return Figure{}, false, fmt.Errorf("zone peak plot: %w", err)
		}
	}
	p.Y.Min = 0
	spanFrames(p, r)
	caption := fmt.Sprintf("Peak of each zone's indicator (inelastic strain above the elastic baseline) in µε; %d largest of %d strain zones drawn.", drawn, len(hs))
	fig, err := writeFigure(r.plotRoot(), "zones_peak", "Zone peak strain", caption, p.Draw)
	return fig, err == nil, err
}

// addSeries adds a line through points to p and to its legend.
func addSeries(p *plot.Plot, xy plotter.XYs, c color.Color, shape draw.GlyphDrawer, dashed bool, label string) error {
	return addSeriesRuns(p, []plotter.XYs{xy}, c, shape, dashed, label)
}

// addSeriesRuns adds a series drawn as separate lines, one per run of
// consecutive frames, so that frames without a value leave a gap; the
// legend gets one entry.
func addSeriesRuns(p *plot.Plot, runs []plotter.XYs, c color.Color, shape draw.GlyphDrawer, dashed bool, label string) error {
	for k, xy := range runs {
		l, pts, err := plotter.NewLinePoints(xy)
		if err != nil {
			return err
		}
		seriesLine(l, c, dashed)
		seriesPoints(pts, c, shape, 2.6)
		p.Add(l, pts)
		if k == 0 {
			p.Legend.Add(label, l, pts)
		}
	}
	return nil
}

// framePoint is a value at a frame: its position in the sequence (−1 when
// not known) and its place on the plot.
type framePoint struct {
	Frame int
	plotter.XY
}

// frameRuns sorts points by frame and splits them where a frame is
// missing.
func frameRuns(pts []framePoint) []plotter.XYs {
	slices.SortStableFunc(pts, func(a, b framePoint) int { return a.Frame - b.Frame })
	var runs []plotter.XYs
	for i, p := range pts {
		if i == 0 || p.Frame < 0 || pts[i-1].Frame < 0 || p.Frame != pts[i-1].Frame+1 {
			runs = append(runs, nil)
		}
		runs[len(runs)-1] = append(runs[len(runs)-1], p.XY)
	}
	return runs
}

// spanFrames widens the horizontal axis of a history plot to every frame
// of the run, so that all histories share the test's time span.
func spanFrames(p *plot.Plot, r *runRecords) {
	for _, x := range r.Axis.X {
		p.X.Min, p.X.Max = min(p.X.Min, x), max(p.X.Max, x)
	}
}
