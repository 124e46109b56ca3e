package config

import (
	"fmt"

	"spallscope/dic"
)

// Scale is the image scale: a factor, or a known distance between two
// reference points [x1, y1, x2, y2, mm].
type Scale struct {
	MMPerPx float64   `yaml:"mm_per_px"`
	Line    []float64 `yaml:"line"`
}

// Value returns the image scale (0: not given, results in px only).
func (s Scale) Value() (dic.Scale, error) {
	switch {
	case s.MMPerPx != 0 && len(s.Line) != 0:
		return 0, fmt.Errorf("scale: give mm_per_px or line, not both")
	case len(s.Line) == 5:
		return dic.ScaleFromPoints(s.Line[0], s.Line[1], s.Line[2], s.Line[3], s.Line[4])
	case len(s.Line) != 0:
		return 0, fmt.Errorf("scale.line: %d numbers, expected [x1, y1, x2, y2, mm]", len(s.Line))
	case s.MMPerPx < 0:
		return 0, fmt.Errorf("scale %g mm/px, expected a positive number", s.MMPerPx)
	}
	return dic.Scale(s.MMPerPx), nil
}
