package config

import (
	"fmt"

	"spallscope/strain/model"
)

// Model is a numerical model's field to hold against the measurement: a
// CSV of points (x, y and any of u, v, exx, eyy, exy) at the load level
// LoadMPa, compared at the frame whose nominal stress is nearest. Its
// origin is at reference pixel Origin, its lengths in Units (mm with the
// face's scale, or px), its y axis up the image when YUp. With several
// faces it belongs to the face named Face (default the first).
type Model struct {
	File                string    `yaml:"file"`
	LoadMPa             float64   `yaml:"load_mpa"`
	Frame               string    `yaml:"frame"` // instead of load_mpa
	Units               string    `yaml:"units"`
	Origin              []float64 `yaml:"origin_px"`
	YUp                 bool      `yaml:"y_up"`
	CompressionPositive bool      `yaml:"compression_positive"`
	Face                string    `yaml:"face"`
}

// Format is how the model file maps onto the photos (mm when Units is
// empty), without the scale, which comes from the run.
func (m Model) Format() model.Format {
	f := model.Format{Units: model.Units(m.Units), YUp: m.YUp, CompressionPositive: m.CompressionPositive}
	if f.Units == "" {
		f.Units = model.MM
	}
	if len(m.Origin) == 2 {
		f.OriginX, f.OriginY = m.Origin[0], m.Origin[1]
	}
	return f
}

// check checks the section's own values; the test checks what it needs
// from the rest (a scale for mm, the face).
func (m Model) check() error {
	var p Problems
	if m.File != "" && m.LoadMPa == 0 && m.Frame == "" {
		p.add(fmt.Errorf("model: give load_mpa (the model's load level) or frame"))
	}
	p.add(checkBounds(
		bound{"model.load_mpa", m.LoadMPa, m.LoadMPa == 0 || (m.LoadMPa > 0 && finite(m.LoadMPa)), "a finite positive stress in MPa (compression positive)"},
		bound{"model.origin_px", m.Origin, len(m.Origin) == 0 || (len(m.Origin) == 2 && finiteAll(m.Origin)), "[x, y]: a finite point in px"},
		bound{"model.units", m.Units, m.Units == "" || m.Units == "mm" || m.Units == "px", "mm or px"},
	))
	return p.err()
}
