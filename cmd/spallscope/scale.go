package main

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"spallscope/dic"
)

// scaleFlags set the image scale: a factor, or a known distance between two
// reference points.
type scaleFlags struct {
	factor float64
	line   string
}

func (s *scaleFlags) register(cmd *cobra.Command) {
	cmd.Flags().Float64Var(&s.factor, "scale", 0, "image scale in mm per px")
	cmd.Flags().StringVar(&s.line, "scale-line", "", "image scale from a known distance: x1,y1,x2,y2,MM (two reference points in px and their distance in mm)")
}

func (s *scaleFlags) scale() (dic.Scale, error) {
	switch {
	case s.factor < 0:
		return 0, fmt.Errorf("--scale %g, expected a positive number of mm per px", s.factor)
	case s.factor > 0 && s.line != "":
		return 0, fmt.Errorf("give --scale or --scale-line, not both")
	case s.factor > 0:
		return dic.Scale(s.factor), nil
	case s.line == "":
		return 0, nil
	}
	parts := strings.Split(s.line, ",")
	var v [5]float64
	if len(parts) != 5 {
		return 0, fmt.Errorf("--scale-line %q, expected x1,y1,x2,y2,MM", s.line)
	}
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return 0, fmt.Errorf("--scale-line %q: %q is not a number", s.line, p)
		}
		v[i] = x
	}
	return dic.ScaleFromPoints(v[0], v[1], v[2], v[3], v[4])
}
