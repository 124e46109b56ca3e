package model

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"

	"spallscope/dic/runfolder"
)

// Dir is a run folder's subfolder of its model comparison.
const Dir = "model"

// File names of a comparison's outputs in its folder.
const (
	DiffFile    = "model-diff.csv"
	SummaryFile = "model-summary.json"
)

// Write writes a comparison into folder dir (created if needed): the
// difference field as CSV (DiffFile) and the summary as JSON
// (SummaryFile), each atomically so that a file that exists is complete.
//
// The CSV has one row per grid point in grid order: the reference position
// x, y (px), then one column per compared quantity, named <quantity>_diff,
// holding measured − model (px for u and v, y down; strains tension
// positive), NaN where the point was not compared.
func Write(dir string, c *Comparison) error {
	if c == nil {
		return fmt.Errorf("write model comparison to %s: no comparison", dir)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("write model comparison: %w", err)
	}
	err := runfolder.WriteAtomic(filepath.Join(dir, DiffFile), func(w *bufio.Writer) error {
		w.WriteString("x,y")
		for _, q := range c.Quantities {
			w.WriteString("," + q.String() + "_diff")
		}
		w.WriteByte('\n')
		buf := make([]byte, 0, 128)
		for i := range c.Points {
			p := &c.Points[i]
			buf = strconv.AppendInt(buf[:0], int64(p.X), 10)
			buf = append(buf, ',')
			buf = strconv.AppendInt(buf, int64(p.Y), 10)
			for _, q := range c.Quantities {
				buf = append(buf, ',')
				buf = strconv.AppendFloat(buf, p.Values[q], 'g', 8, 64)
			}
			buf = append(buf, '\n')
			if _, err := w.Write(buf); err != nil {
				return err
			}
		}
		return nil
	})
	if err != nil {
		return err
	}
	return runfolder.WriteJSON(filepath.Join(dir, SummaryFile), summaryOf(c))
}

// summary is the JSON form of a comparison, NaN written as null.
type summary struct {
	Model      string          `json:"model"`
	Format     Format          `json:"format"`
	Frame      int             `json:"frame"`
	FrameName  string          `json:"frame_name"`
	RadiusPx   float64         `json:"interpolation_radius_px"`
	Regular    bool            `json:"regular_grid"`
	Difference string          `json:"difference"`
	Quantities []quantitySumry `json:"quantities"`
	Outside    Outside         `json:"outside"`
	Warnings   []string        `json:"warnings,omitempty"`
}

type quantitySumry struct {
	Quantity    Quantity `json:"quantity"`
	Unit        string   `json:"unit,omitempty"`
	Count       int      `json:"count"`
	Bilinear    int      `json:"bilinear"`
	Uncovered   int      `json:"uncovered"`
	Bias        *float64 `json:"bias"`
	RMS         *float64 `json:"rms"`
	MaxAbs      *float64 `json:"max_abs"`
	Correlation *float64 `json:"correlation"`
	ModelRMS    *float64 `json:"model_rms"`
	Resolution  *float64 `json:"resolution,omitempty"`
	Ratio       *float64 `json:"rms_over_resolution,omitempty"`
}

func summaryOf(c *Comparison) summary {
	s := summary{
		Model: c.Model, Format: c.Format, Frame: c.Frame, FrameName: c.FrameName,
		RadiusPx: c.Radius, Regular: c.Regular, Outside: c.Outside, Warnings: c.Warnings(),
		Difference: "measured - model; px along x right, y down; strain tension positive, exy tensor shear",
	}
	for _, st := range c.Stats {
		q := quantitySumry{Quantity: st.Quantity, Unit: st.Unit, Count: st.Count, Bilinear: st.Bilinear, Uncovered: st.Uncovered,
			Bias: finite(st.Bias), RMS: finite(st.RMS), MaxAbs: finite(st.MaxAbs), Correlation: finite(st.Correlation), ModelRMS: finite(st.ModelRMS)}
		if st.Resolution > 0 {
			q.Resolution, q.Ratio = finite(st.Resolution), finite(st.Ratio())
		}
		s.Quantities = append(s.Quantities, q)
	}
	return s
}

// finite returns a pointer to v, nil for NaN or ±Inf (JSON null).
func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}
