package config

import (
	"fmt"

	"spallscope/dic"
	"spallscope/subset"
)

// Correlation are the tracking settings (zero: the defaults of
// dic.DefaultSettings). The command line's track options fill the same
// fields.
type Correlation struct {
	Subset        int     `yaml:"subset"`
	Step          int     `yaml:"step"`
	Order         string  `yaml:"order"`         // affine | quadratic (1 | 2)
	Interpolation string  `yaml:"interpolation"` // bicubic | biquintic (cubic | quintic)
	Reference     string  `yaml:"reference"`     // fixed | incremental
	UpdateBelow   float64 `yaml:"update_below"`
	MinZNCC       float64 `yaml:"min_zncc"`
	// ResidualFactor flags points whose ZNSSD exceeds this many times the
	// frame's median (negative: off).
	ResidualFactor float64 `yaml:"residual_factor"`
	SearchRadius   int     `yaml:"search_radius"`
	EdgeGuard      int     `yaml:"edge_guard"`
	// MinValid is the smallest measured fraction of a subset's pixels.
	MinValid float64 `yaml:"min_valid"`
	Seeds    [][]int `yaml:"seeds"`
	// Workers is the number of goroutines (0: all cores); results do not
	// depend on it, so it is not part of the track stage's fingerprint.
	Workers int `yaml:"workers"`
}

// Settings turns the section into tracker settings, checked.
func (c Correlation) Settings() (dic.Settings, error) {
	s := dic.Settings{Subset: c.Subset, Step: c.Step, UpdateBelow: c.UpdateBelow, MinZNCC: c.MinZNCC,
		ResidualFactor: c.ResidualFactor, SearchRadius: c.SearchRadius, EdgeGuard: c.EdgeGuard,
		MinValidFraction: c.MinValid, Reference: dic.ReferenceMode(c.Reference), Workers: c.Workers}
	switch c.Order {
	case "", "affine", "1":
		s.Order = subset.Affine
	case "quadratic", "2":
		s.Order = subset.Quadratic
	default:
		return s, &FieldError{"correlation.order", c.Order, "affine (1) or quadratic (2)"}
	}
	if c.Interpolation != "" {
		var err error
		if s.Interpolation, err = subset.ParseInterpolation(c.Interpolation); err != nil {
			return s, &FieldError{"correlation.interpolation", c.Interpolation, "bicubic or biquintic (cubic or quintic)"}
		}
	}
	if c.Workers < 0 {
		return s, &FieldError{"correlation.workers", fmt.Sprint(c.Workers), "0 (all cores) or more"}
	}
	for i, p := range c.Seeds {
		if len(p) != 2 {
			return s, fmt.Errorf("seeds[%d]: %d numbers, expected [x, y]", i, len(p))
		}
		s.Seeds = append(s.Seeds, [2]int{p[0], p[1]})
	}
	return s.Effective(), s.Validate()
}
