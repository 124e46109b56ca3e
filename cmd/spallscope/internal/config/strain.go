package config

import (
	"spallscope/strain"
)

// Strain are the strain settings. The strain command's options fill the
// same fields.
type Strain struct {
	// Window is the strain window in grid points per side (default 9).
	Window int `yaml:"window"`
	// Order is the fit over the window: 1 plane, 2 quadratic.
	Order int `yaml:"order"`
	// MinPoints is the fewest valid points in a window (0: half of it).
	MinPoints int    `yaml:"min_points"`
	Measure   string `yaml:"measure"`
	// StaticFrames is the number of first frames that are static shots,
	// whose scatter gives the noise floor.
	StaticFrames int `yaml:"static_frames"`
}

// StrainWindow turns the section into a strain window.
func (c Strain) StrainWindow() (strain.Window, error) {
	w := strain.Window{Size: c.Window, Order: c.Order, MinPoints: c.MinPoints}
	if w.Size == 0 {
		w.Size = 9
	}
	if c.Measure != "" {
		m, err := strain.ParseMeasure(c.Measure)
		if err != nil {
			return w, err
		}
		w.Measure = m
	}
	return w.Effective(), nil
}
