package dic

import (
	"fmt"

	"spallscope/subset"
)

// ReferenceMode says which frame subsets are correlated against.
type ReferenceMode string

const (
	// FixedReference correlates every frame against the reference frame.
	FixedReference ReferenceMode = "fixed"
	// IncrementalReference correlates against a recent frame, moving the
	// reference forward when correlation degrades (large strain, surface
	// change), and accumulates displacements back to the original
	// reference so results stay Lagrangian.
	IncrementalReference ReferenceMode = "incremental"
)

// Settings are the correlation settings of a run. Zero fields take the
// defaults of DefaultSettings.
type Settings struct {
	// Subset is the subset side in px: odd, at least 7.
	Subset int `json:"subset_px"`
	// Step is the grid spacing in px.
	Step int `json:"step_px"`
	// Order is the shape function: affine or quadratic.
	Order subset.ShapeOrder `json:"shape_order"`
	// Interpolation is the B-spline used for subpixel gray levels.
	Interpolation subset.Interpolation `json:"interpolation"`
	// Reference is the reference strategy.
	Reference ReferenceMode `json:"reference"`
	// UpdateBelow is the median ZNCC under which the incremental strategy
	// moves the reference forward.
	UpdateBelow float64 `json:"update_below_zncc"`
	// MinZNCC is the correlation a converged point needs to count as
	// measured (and to guide its neighbours); below it the point is lost:
	// decorrelated, spalled, or straddling a crack.
	MinZNCC float64 `json:"min_zncc"`
	// SearchRadius is the integer search radius in px for seed points.
	SearchRadius int `json:"search_radius_px"`
	// MinValidFraction is the smallest fraction of a subset's pixels that
	// must be inside the mask; a subset overlapping an opening uses only
	// its measured pixels when at least this fraction remains, else the
	// point is reported masked.
	MinValidFraction float64 `json:"min_valid_fraction"`
	// EdgeGuard is the width in px of the band along the rim of every
	// exclusion (openings, masked areas) whose pixels subsets leave out
	// (negative: none).
	EdgeGuard int `json:"edge_guard_px"`
	// ResidualFactor flags a converged point as lost when its ZNSSD exceeds
	// this many times the frame's median ZNSSD (and its ZNCC is below
	// 0.995): a subset the shape function cannot describe, as one
	// straddling a crack, matches clearly worse than its noise-limited
	// neighbours even when its ZNCC passes MinZNCC.
	ResidualFactor float64 `json:"residual_factor"`
	// Seeds are user-placed seed points (reference px); automatic seeds are
	// added for every part of the grid they do not reach.
	Seeds [][2]int `json:"seeds,omitempty"`
	// Workers is the number of goroutines solving points (0: GOMAXPROCS).
	// Results do not depend on it.
	Workers int `json:"-"`
}

// DefaultSettings are the settings used for zero fields: 21 px subsets on
// a 7 px step (a step of a third of the subset is common practice, no
// source), affine shape, bicubic spline, fixed reference.
func DefaultSettings() Settings {
	return Settings{
		Subset: 21, Step: 7, Order: subset.Affine, Interpolation: subset.Bicubic,
		Reference: FixedReference, UpdateBelow: 0.9, MinZNCC: 0.8,
		SearchRadius: 48, MinValidFraction: 0.75, EdgeGuard: 2, ResidualFactor: 10,
	}
}

// Effective returns the settings with the defaults of DefaultSettings in
// their zero fields, as a tracker uses them.
func (s Settings) Effective() Settings { return s.withDefaults() }

func (s Settings) withDefaults() Settings {
	d := DefaultSettings()
	if s.Subset == 0 {
		s.Subset = d.Subset
	}
	if s.Step == 0 {
		s.Step = d.Step
	}
	if s.Reference == "" {
		s.Reference = d.Reference
	}
	if s.UpdateBelow == 0 {
		s.UpdateBelow = d.UpdateBelow
	}
	if s.MinZNCC == 0 {
		s.MinZNCC = d.MinZNCC
	}
	if s.SearchRadius == 0 {
		s.SearchRadius = d.SearchRadius
	}
	if s.MinValidFraction == 0 {
		s.MinValidFraction = d.MinValidFraction
	}
	if s.EdgeGuard == 0 {
		s.EdgeGuard = d.EdgeGuard
	}
	if s.ResidualFactor == 0 {
		s.ResidualFactor = d.ResidualFactor
	}
	return s
}

// Validate reports the first setting that cannot be used, saying what is
// expected.
func (s Settings) Validate() error {
	s = s.withDefaults()
	switch {
	case s.Subset < 7 || s.Subset%2 == 0:
		return fmt.Errorf("subset %d px, expected an odd size of at least 7 px", s.Subset)
	case s.Step <= 0:
		return fmt.Errorf("step %d px, expected a positive number of pixels", s.Step)
	case s.Order != subset.Affine && s.Order != subset.Quadratic:
		return fmt.Errorf("shape order %v, expected affine or quadratic", s.Order)
	case s.Interpolation != subset.Bicubic && s.Interpolation != subset.Biquintic:
		return fmt.Errorf("interpolation %v, expected bicubic or biquintic", s.Interpolation)
	case s.Reference != FixedReference && s.Reference != IncrementalReference:
		return fmt.Errorf("reference %q, expected fixed or incremental", s.Reference)
	case !(s.MinZNCC > 0 && s.MinZNCC < 1):
		return fmt.Errorf("min ZNCC %g, expected between 0 and 1", s.MinZNCC)
	case !(s.UpdateBelow > 0 && s.UpdateBelow <= 1):
		return fmt.Errorf("reference update threshold %g, expected between 0 and 1", s.UpdateBelow)
	case s.SearchRadius < 1:
		return fmt.Errorf("search radius %d px, expected at least 1", s.SearchRadius)
	case s.EdgeGuard > s.Subset/2:
		return fmt.Errorf("edge guard %d px, expected at most half the subset (negative: none)", s.EdgeGuard)
	case s.ResidualFactor > 0 && s.ResidualFactor < 1:
		return fmt.Errorf("residual factor %g, expected 1 or more (negative: off)", s.ResidualFactor)
	case !(s.MinValidFraction > 0 && s.MinValidFraction <= 1):
		return fmt.Errorf("min valid fraction %g, expected in (0, 1]", s.MinValidFraction)
	}
	return nil
}

// solverConfig is the per-point solver configuration of the settings.
func (s Settings) solverConfig() subset.Config {
	return subset.Config{
		Radius: s.Subset / 2, Order: s.Order, MinValidFraction: s.MinValidFraction,
		MaxZNSSD: 2 * (1 - s.MinZNCC),
	}
}
