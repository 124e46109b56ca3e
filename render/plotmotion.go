package render

import (
	"errors"
	"fmt"
	"io/fs"

	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"spallscope/dic/runfolder"
)

// plotMagnification draws each frame's apparent isotropic magnification
// in µε (run.json's "motion" section): the compensation plate's, which
// was taken out of the fields, or the far field's, which was only
// measured; with the strain noise floor as dotted lines at ±1 floor. It
// reports false when the run has no motion record.
func plotMagnification(r *runRecords) (Figure, bool, error) {
	var rec runfolder.MotionRecord
	if err := runfolder.Section(r.Dir, runfolder.MotionSection, &rec); err != nil {
		if errors.Is(err, fs.ErrNotExist) {
			return Figure{}, false, nil
		}
		return Figure{}, false, err
	}
	var pts []framePoint
	unfitted := map[string]bool{}
	for _, f := range rec.Unfitted {
		unfitted[f] = true
	}
	for _, m := range rec.Frames {
		x, ok := r.Axis.Of(m.Frame)
		if !ok || unfitted[m.Frame] {
			continue
		}
		pts = append(pts, framePoint{r.Axis.index[m.Frame], plotter.XY{X: x, Y: 1e6 * m.Magnification}})
	}
	if len(pts) == 0 {
		return Figure{}, false, nil
	}
	p := newPlot("Apparent magnification", r.Axis.Label(), "magnification, µε")
	label, how := "far field (measured, not taken out)", "fitted to the specimen's points far from its openings; under load it holds the specimen's own mean in-plane strain as well, so it is shown, not taken out"
	if rec.Source == runfolder.MotionFromPlate {
		label, how = "compensation plate (taken out of the fields)", fmt.Sprintf("fitted to the compensation plate %s and taken out of the specimen's field about the %s", rec.Plate, rec.CentreIs)
	}
	if err := addSeriesRuns(p, frameRuns(pts), plotColour(0), sectorGlyph(""), false, label); err != nil {
		return Figure{}, false, fmt.Errorf("magnification plot: %w", err)
	}
	if b := rec.Baseline; b != nil && len(b.Stress) == len(rec.Frames) {
		var line []framePoint
		for k, m := range rec.Frames {
			if x, ok := r.Axis.Of(m.Frame); ok {
				line = append(line, framePoint{r.Axis.index[m.Frame], plotter.XY{X: x, Y: 1e6 * (b.Intercept + b.PerMPa*b.Stress[k])}})
			}
		}
		if err := addSeriesRuns(p, frameRuns(line), plotColour(1), sectorGlyph(""), true, "elastic line (calibration frames)"); err != nil {
			return Figure{}, false, fmt.Errorf("magnification plot: %w", err)
		}
		how += fmt.Sprintf("; dashed, its line against stress over the %d calibration frames, which the onset detection takes out of every point", b.Frames)
	}
	all := make([]plotter.XY, 0, len(pts))
	for _, q := range pts {
		all = append(all, q.XY)
	}
	legendAwayFrom(p, all)
	floor := ""
	if res := r.Resolution; res != nil && res.Frames > 0 {
		f := 1e6 * (res.Exx + res.Eyy) / 2
		sty := draw.LineStyle{Color: plotInk, Width: vg.Points(0.8), Dashes: dotted}
		p.Add(hLine{Y: f, Style: sty}, hLine{Y: -f, Style: sty})
		floor = fmt.Sprintf(" Dotted: ± the strain noise floor (%.0f µε, the mean of exx's and eyy's).", f)
	}
	spanFrames(p, r)
	w := ""
	if rec.StandoffMM > 0 {
		w = fmt.Sprintf(" At the stand-off of %g mm, 1000 µε is %.3g mm of motion towards the camera.", rec.StandoffMM, rec.StandoffMM*1e-3/(1+1e-3))
	}
	caption := fmt.Sprintf("Apparent isotropic magnification of each frame, %s: out-of-plane motion w shows as an apparent strain of about w/Z (Sutton et al. 2008).%s%s", how, floor, w)
	fig, err := writeFigure(r.plotRoot(), "magnification", "Apparent magnification", caption, p.Draw)
	return fig, err == nil, err
}
