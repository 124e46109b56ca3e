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

// MaxWorkers is the most goroutines correlation.workers may ask for: far
// more than any node's cores, and few enough that a slip (a million)
// cannot exhaust memory with goroutines.
const MaxWorkers = 1024

// check checks every value of the section against its range (zero: the
// default); Settings runs it, and so does a config's check.
func (c Correlation) check() error {
	var p Problems
	subsetSize := c.Subset
	if subsetSize == 0 {
		subsetSize = dic.DefaultSettings().Subset
	}
	p.add(checkBounds(
		bound{"correlation.subset", c.Subset, c.Subset == 0 || (c.Subset >= 7 && c.Subset%2 == 1), "an odd size of at least 7 px"},
		bound{"correlation.step", c.Step, c.Step >= 0, "a positive number of px"},
		bound{"correlation.update_below", c.UpdateBelow, c.UpdateBelow == 0 || (c.UpdateBelow > 0 && c.UpdateBelow <= 1), "a ZNCC in (0, 1]"},
		bound{"correlation.min_zncc", c.MinZNCC, c.MinZNCC == 0 || (c.MinZNCC > 0 && c.MinZNCC < 1), "a ZNCC between 0 and 1"},
		bound{"correlation.residual_factor", c.ResidualFactor, finite(c.ResidualFactor) && (c.ResidualFactor <= 0 || c.ResidualFactor >= 1), "a finite factor of 1 or more (negative: off)"},
		bound{"correlation.search_radius", c.SearchRadius, c.SearchRadius >= 0, "a positive number of px"},
		bound{"correlation.edge_guard", c.EdgeGuard, c.EdgeGuard <= subsetSize/2, fmt.Sprintf("at most half the subset, %d px (negative: none)", subsetSize/2)},
		bound{"correlation.min_valid", c.MinValid, c.MinValid == 0 || (c.MinValid > 0 && c.MinValid <= 1), "a fraction in (0, 1]"},
		bound{"correlation.workers", c.Workers, c.Workers >= 0 && c.Workers <= MaxWorkers, fmt.Sprintf("0 (all cores) up to %d", MaxWorkers)},
	))
	switch c.Order {
	case "", "affine", "1", "quadratic", "2":
	default:
		p.add(&FieldError{Key: "correlation.order", Value: c.Order, Expected: "affine (1) or quadratic (2)"})
	}
	if c.Interpolation != "" {
		if _, err := subset.ParseInterpolation(c.Interpolation); err != nil {
			p.add(&FieldError{Key: "correlation.interpolation", Value: c.Interpolation, Expected: "bicubic or biquintic (cubic or quintic)"})
		}
	}
	switch dic.ReferenceMode(c.Reference) {
	case "", dic.FixedReference, dic.IncrementalReference:
	default:
		p.add(&FieldError{Key: "correlation.reference", Value: c.Reference, Expected: "fixed or incremental"})
	}
	for i, s := range c.Seeds {
		if len(s) != 2 || s[0] < 0 || s[1] < 0 {
			p.add(&FieldError{Key: fmt.Sprintf("correlation.seeds[%d]", i), Value: fmt.Sprint(s), Expected: "[x, y]: a point in px, x and y 0 or more"})
		}
	}
	return p.err()
}

// Settings turns the section into tracker settings, checked.
func (c Correlation) Settings() (dic.Settings, error) {
	s := dic.Settings{Subset: c.Subset, Step: c.Step, UpdateBelow: c.UpdateBelow, MinZNCC: c.MinZNCC,
		ResidualFactor: c.ResidualFactor, SearchRadius: c.SearchRadius, EdgeGuard: c.EdgeGuard,
		MinValidFraction: c.MinValid, Reference: dic.ReferenceMode(c.Reference), Workers: c.Workers}
	if err := c.check(); err != nil {
		return s, err
	}
	s.Order = subset.Affine
	if c.Order == "quadratic" || c.Order == "2" {
		s.Order = subset.Quadratic
	}
	if c.Interpolation != "" {
		s.Interpolation, _ = subset.ParseInterpolation(c.Interpolation) // checked
	}
	for _, p := range c.Seeds {
		s.Seeds = append(s.Seeds, [2]int{p[0], p[1]})
	}
	// dic's own check stays as the tracker's guard: with every value in
	// range above, it fails only if the two disagree.
	return s.Effective(), s.Validate()
}
