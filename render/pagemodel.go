package render

import (
	"encoding/json"
	"fmt"
	"html/template"
	"os"
	"path/filepath"

	"spallscope/strain/model"
)

// pageModel is the page's measured-against-model section.
type pageModel struct {
	Model, Frame string
	Rows         []pageModelRow
	Images       []template.URL
	Warnings     []string
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
		Model      string `json:"model"`
		FrameName  string `json:"frame_name"`
		Quantities []struct {
			Quantity    any      `json:"quantity"`
			Unit        string   `json:"unit"`
			Count       int      `json:"count"`
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
	pm := &pageModel{Model: filepath.Base(s.Model), Frame: s.FrameName, Warnings: s.Warnings}
	for _, q := range s.Quantities {
		pm.Rows = append(pm.Rows, pageModelRow{Quantity: fmt.Sprint(q.Quantity), Unit: q.Unit, Count: fmt.Sprint(q.Count),
			Bias: f(q.Bias, "%.3g"), RMS: f(q.RMS, "%.3g"), Max: f(q.MaxAbs, "%.3g"), Correlation: f(q.Correlation, "%.3f"), Ratio: f(q.Ratio, "%.2f")})
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
