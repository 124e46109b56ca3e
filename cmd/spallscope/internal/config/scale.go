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

// check checks the scale; prefix is the section's key ("scale", or
// "faces[1].scale").
func (s Scale) check(prefix string) error {
	_, err := s.value(prefix)
	return err
}

// value is the scale, checked: a positive finite factor, or five finite
// numbers whose two points are distinct and whose distance gives a
// positive finite factor (an infinite coordinate gave a scale of 0, that
// is none, without a word).
func (s Scale) value(prefix string) (dic.Scale, error) {
	switch {
	case s.MMPerPx != 0 && len(s.Line) != 0:
		return 0, fmt.Errorf("%s: give mm_per_px or line, not both", prefix)
	case len(s.Line) != 0:
		bad := &FieldError{Key: key(prefix, "line"), Value: fmt.Sprint(s.Line), Expected: "[x1, y1, x2, y2, mm]: two distinct points in px and their distance in mm, all finite"}
		if len(s.Line) != 5 || !finiteAll(s.Line) {
			return 0, bad
		}
		v, err := dic.ScaleFromPoints(s.Line[0], s.Line[1], s.Line[2], s.Line[3], s.Line[4])
		if err != nil || !(v > 0) || !finite(float64(v)) {
			return 0, bad
		}
		return v, nil
	}
	if err := checkBounds(bound{key(prefix, "mm_per_px"), s.MMPerPx, s.MMPerPx == 0 || (s.MMPerPx > 0 && finite(s.MMPerPx)), "a finite positive number of mm per px"}); err != nil {
		return 0, err
	}
	return dic.Scale(s.MMPerPx), nil
}

// Value returns the image scale (0: not given, results in px only).
func (s Scale) Value() (dic.Scale, error) { return s.value("scale") }

// given reports whether the scale is set.
func (s Scale) given() bool { return s.MMPerPx != 0 || len(s.Line) != 0 }
