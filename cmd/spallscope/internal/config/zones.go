package config

import (
	"fmt"
	"strconv"
	"strings"

	"spallscope/cmd/spallscope/internal/stage"
	"spallscope/dic/region"
	"spallscope/strain"
)

// Zones are the zone and onset settings (zero: the defaults of package
// strain). The zones command's options fill the same fields.
type Zones struct {
	Indicators      []string `yaml:"indicators"`
	Threshold       string   `yaml:"threshold"` // "6mad", "500ue" or both
	MinCells        int      `yaml:"min_cells"`
	MinZNCC         float64  `yaml:"min_zncc"`
	Persistence     int      `yaml:"persistence"`
	CalibrateBelow  float64  `yaml:"calibrate_below"`
	CalibrateFrames int      `yaml:"calibrate_frames"`
	K               float64  `yaml:"k"`
	UCS             float64  `yaml:"ucs_mpa"`
	LoadAngleDeg    float64  `yaml:"load_angle_deg"`
	CrownHalfAngle  float64  `yaml:"crown_half_angle_deg"`
	Reach           float64  `yaml:"reach"`
}

// Stage turns the section and the test's openings into the zones stage's
// settings; the caller adds what the run knows (scale, subset size).
func (z Zones) Stage(openings []Opening) (stage.ZoneStage, error) {
	st := stage.ZoneStage{CalibrateBelow: z.CalibrateBelow, CalibrateFrames: z.CalibrateFrames, K: z.K, UCS: z.UCS}
	if len(z.Indicators) > 0 {
		inds, err := strain.ParseIndicators(strings.Join(z.Indicators, ","))
		if err != nil {
			return st, err
		}
		st.Finder.Indicators = inds
	}
	if err := ParseThreshold(z.Threshold, &st.Finder.Thresholds); err != nil {
		return st, err
	}
	st.Finder.Thresholds.MinCells, st.Finder.Thresholds.MinZNCC = z.MinCells, z.MinZNCC
	st.Finder.Persistence = z.Persistence
	st.Finder.Sectors = strain.Sectors{LoadAngleDeg: z.LoadAngleDeg, CrownHalfAngle: z.CrownHalfAngle, Reach: z.Reach}
	for i, o := range openings {
		shape, err := region.ParseShape(o.Shape)
		if err != nil {
			return st, fmt.Errorf("openings[%d]: %w", i, err)
		}
		st.Finder.Sectors.Openings = append(st.Finder.Sectors.Openings, strain.Opening{Name: o.Name, Shape: shape})
		st.OpeningNames = append(st.OpeningNames, o.Name)
	}
	return st.Effective(), nil
}

// ParseThreshold reads "6mad", "500ue" or "6mad,500ue" into t (empty:
// 6mad).
func ParseThreshold(s string, t *strain.Thresholds) error {
	if s == "" {
		s = "6mad"
	}
	t.K, t.Absolute = 0, 0
	for _, part := range strings.Split(s, ",") {
		part = strings.TrimSpace(strings.ToLower(part))
		var err error
		switch {
		case strings.HasSuffix(part, "mad"):
			t.K, err = strconv.ParseFloat(strings.TrimSuffix(part, "mad"), 64)
		case strings.HasSuffix(part, "ue"):
			var ue float64
			ue, err = strconv.ParseFloat(strings.TrimSuffix(part, "ue"), 64)
			t.Absolute = ue * 1e-6
		default:
			err = fmt.Errorf("no unit")
		}
		if err != nil || t.K < 0 || t.Absolute < 0 {
			return fmt.Errorf(`threshold %q: expected "Kmad", "Nue" or both, such as 6mad,500ue`, s)
		}
	}
	if t.K == 0 {
		t.K = -1 // an absolute threshold alone: no relative bar
	}
	return nil
}
