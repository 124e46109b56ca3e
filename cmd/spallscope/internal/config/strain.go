package config

import (
	"fmt"

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

// check checks every value of the section against its range (zero: the
// default); StrainWindow runs it, and so does a config's check.
func (c Strain) check() error {
	size := c.Window
	if size == 0 {
		size = 9
	}
	var p Problems
	p.add(checkBounds(
		bound{"strain.window", c.Window, c.Window == 0 || (c.Window >= 3 && c.Window%2 == 1), "an odd number of grid points, at least 3"},
		bound{"strain.order", c.Order, c.Order >= 0 && c.Order <= 2, "1 (plane) or 2 (quadratic)"},
		// More points than the window holds would leave every strain unmeasured.
		bound{"strain.min_points", c.MinPoints, c.MinPoints >= 0 && c.MinPoints <= size*size, fmt.Sprintf("0 (half the window) up to the window's %d points", size*size)},
		bound{"strain.static_frames", c.StaticFrames, c.StaticFrames >= 0, "0 or more frames"},
	))
	if c.Measure != "" {
		if _, err := strain.ParseMeasure(c.Measure); err != nil {
			p.add(&FieldError{Key: "strain.measure", Value: c.Measure, Expected: "engineering, green or hencky"})
		}
	}
	return p.err()
}

// StrainWindow turns the section into a strain window.
func (c Strain) StrainWindow() (strain.Window, error) {
	w := strain.Window{Size: c.Window, Order: c.Order, MinPoints: c.MinPoints}
	if err := c.check(); err != nil {
		return w, err
	}
	if w.Size == 0 {
		w.Size = 9
	}
	if c.Measure != "" {
		w.Measure, _ = strain.ParseMeasure(c.Measure) // checked
	}
	return w.Effective(), nil
}
