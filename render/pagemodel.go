package render

import (
	"encoding/json"
	"fmt"
	"html/template"
	"os"
	"path/filepath"
	"strings"

	"spallscope/strain/model"
)

// pageModel is the page's measured-against-model section.
type pageModel struct {
	Model, Frame string
	Rows         []pageModelRow
	Images       []template.URL
	// Outside counts the model points outside the measured region (no
	// measured value to compare with), and names the first of them
	// (shown behind a toggle).
	Outside *pageModelOutside
	// Uncovered counts, per quantity, the measured points without a model
	// value; UncoveredWhy says why they have none.
	Uncovered    string
	UncoveredWhy string
	// Warnings are the summary's other warnings, as written.
	Warnings []string
}

// pageModelOutside is the count of model points without a measured value
// and the list of the first of them.
type pageModelOutside struct {
	Summary string
	Points  []string
	More    string
}

type pageModelRow struct {
	Quantity, Unit, Count, Bias, RMS, Max, Correlation, Ratio string
}

// modelSection reads RUN/model/model-summary.json and the side-by-side
// images; nil when the run holds no comparison.
func modelSection(dir string, im pageImages) (*pageModel, error) {
	data, err := os.ReadFile(filepath.Join(dir, model.Dir, model.SummaryFile))
	if err != nil {
		return nil, nil
	}
	var s struct {
		Model      string        `json:"model"`
		FrameName  string        `json:"frame_name"`
		RadiusPx   float64       `json:"interpolation_radius_px"`
		Outside    model.Outside `json:"outside"`
		Quantities []struct {
			Quantity    string   `json:"quantity"`
			Unit        string   `json:"unit"`
			Count       int      `json:"count"`
			Uncovered   int      `json:"uncovered"`
			Bias        *float64 `json:"bias"`
			RMS         *float64 `json:"rms"`
			MaxAbs      *float64 `json:"max_abs"`
			Correlation *float64 `json:"correlation"`
			Ratio       *float64 `json:"rms_over_resolution"`
		} `json:"quantities"`
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal(data, &s); err != nil {
		return nil, fmt.Errorf("report: model summary: %w", err)
	}
	f := func(v *float64, format string) string {
		if v == nil {
			return "–"
		}
		return fmt.Sprintf(format, *v)
	}
	pm := &pageModel{Model: filepath.Base(s.Model), Frame: s.FrameName}
	// The warnings the comparison writes about points without a value are
	// shown as counts (the list behind a toggle); any other is shown as
	// written. The known ones are rebuilt by the comparison's own
	// Warnings from the summary's counts.
	known := model.Comparison{Outside: s.Outside, Radius: s.RadiusPx}
	var uncovered []string
	for _, q := range s.Quantities {
		pm.Rows = append(pm.Rows, pageModelRow{Quantity: q.Quantity, Unit: q.Unit, Count: fmt.Sprint(q.Count),
			Bias: f(q.Bias, "%.3g"), RMS: f(q.RMS, "%.3g"), Max: f(q.MaxAbs, "%.3g"), Correlation: f(q.Correlation, "%.3f"), Ratio: f(q.Ratio, "%.2f")})
		if q.Uncovered > 0 {
			uncovered = append(uncovered, fmt.Sprintf("%s %d", q.Quantity, q.Uncovered))
			if mq, ok := modelQuantity(q.Quantity); ok {
				known.Stats = append(known.Stats, model.Stats{Quantity: mq, Uncovered: q.Uncovered})
			}
		}
	}
	knownSet := map[string]bool{}
	for _, w := range known.Warnings() {
		knownSet[w] = true
	}
	for _, w := range s.Warnings {
		if !knownSet[w] {
			pm.Warnings = append(pm.Warnings, w)
		}
	}
	if o := s.Outside; o.Count > 0 {
		po := &pageModelOutside{Summary: fmt.Sprintf("%d of %d model points lie outside the measured region and have no measured value to compare with", o.Count, o.Total)}
		for _, pt := range o.First {
			po.Points = append(po.Points, fmt.Sprintf("line %d: model (%g, %g) at (%.1f, %.1f) px", pt.Line, pt.ModelX, pt.ModelY, pt.X, pt.Y))
		}
		if more := o.Count - len(o.First); more > 0 {
			po.More = fmt.Sprintf("and %d more, not named in the summary", more)
		}
		pm.Outside = po
	}
	if len(uncovered) > 0 {
		pm.Uncovered = strings.Join(uncovered, ", ")
		pm.UncoveredWhy = fmt.Sprintf("no model point within %s px, or too few to fix a plane; not compared", formatFactor(s.RadiusPx))
	}
	imgs, _ := filepath.Glob(filepath.Join(dir, model.Dir, "compare_*.png"))
	for _, p := range imgs {
		u, err := im.URL(p)
		if err != nil {
			return nil, err
		}
		pm.Images = append(pm.Images, u)
	}
	return pm, nil
}

// modelQuantity returns the model quantity of a column name.
func modelQuantity(name string) (model.Quantity, bool) {
	for _, q := range model.Quantities {
		if q.String() == name {
			return q, true
		}
	}
	return 0, false
}
