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

// check checks every value of the section against its range (zero: the
// default); Stage runs it, and so does a config's check. Out of range,
// these settings do not fail: they give onsets at the reference frame (a
// ZNCC limit above 1 marks every point decorrelated) or none at all (a NaN
// threshold marks nothing), so each is refused here.
func (z Zones) check() error {
	var p Problems
	p.add(checkBounds(
		bound{"zones.min_cells", z.MinCells, z.MinCells >= 0, "a zone size of 1 grid point or more"},
		bound{"zones.min_zncc", z.MinZNCC, z.MinZNCC >= -1 && z.MinZNCC <= 1, "a ZNCC between -1 and 1"},
		bound{"zones.persistence", z.Persistence, z.Persistence >= 0, "1 frame or more"},
		bound{"zones.calibrate_below", z.CalibrateBelow, z.CalibrateBelow >= 0 && z.CalibrateBelow <= 1, "a fraction of the peak stress in (0, 1]"},
		bound{"zones.calibrate_frames", z.CalibrateFrames, z.CalibrateFrames >= 0, "1 frame or more"},
		bound{"zones.k", z.K, finite(z.K) && z.K >= 0, "a finite stress ratio of 0 or more"},
		bound{"zones.ucs_mpa", z.UCS, finite(z.UCS) && z.UCS >= 0, "a finite strength in MPa (0: unknown)"},
		bound{"zones.load_angle_deg", z.LoadAngleDeg, z.LoadAngleDeg >= -360 && z.LoadAngleDeg <= 360, "an angle between -360 and 360 degrees"},
		bound{"zones.crown_half_angle_deg", z.CrownHalfAngle, z.CrownHalfAngle >= 0 && z.CrownHalfAngle < 90, "an angle between 0 and 90 degrees"},
		bound{"zones.reach", z.Reach, z.Reach == 0 || (z.Reach > 0 && finite(z.Reach)), "a finite positive number of equivalent radii"},
	))
	if len(z.Indicators) > 0 {
		inds, err := strain.ParseIndicators(strings.Join(z.Indicators, ","))
		seen := map[strain.Indicator]bool{}
		for _, ind := range inds {
			if seen[ind] {
				err = fmt.Errorf("%s twice", ind)
			}
			seen[ind] = true
		}
		if err != nil {
			p.add(&FieldError{Key: "zones.indicators", Value: strings.Join(z.Indicators, ","), Expected: "some of e1, e_eq, gamma_max and decorrelation, each once"})
		}
	}
	var t strain.Thresholds
	p.add(parseThreshold(z.Threshold, &t))
	return p.err()
}

// Stage turns the section and the test's openings into the zones stage's
// settings; the caller adds what the run knows (scale, subset size).
func (z Zones) Stage(openings []Opening) (stage.ZoneStage, error) {
	st := stage.ZoneStage{CalibrateBelow: z.CalibrateBelow, CalibrateFrames: z.CalibrateFrames, K: z.K, UCS: z.UCS}
	if err := z.check(); err != nil {
		return st, err
	}
	if len(z.Indicators) > 0 {
		st.Finder.Indicators, _ = strain.ParseIndicators(strings.Join(z.Indicators, ",")) // checked
	}
	parseThreshold(z.Threshold, &st.Finder.Thresholds) // checked
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

// parseThreshold reads "6mad", "500ue" or "6mad,500ue" into t (empty:
// 6mad). Each number must be finite and positive, each unit given once:
// "0mad" alone would put the bar at the frame's median and mark half the
// points, a NaN or infinite one would mark none.
func parseThreshold(s string, t *strain.Thresholds) error {
	text := s
	if s == "" {
		s = "6mad"
	}
	t.K, t.Absolute = 0, 0
	bad := &FieldError{Key: "zones.threshold", Value: text, Expected: `"Kmad", "Nue" or both, such as 6mad,500ue, with finite positive numbers`}
	for _, part := range strings.Split(s, ",") {
		part = strings.TrimSpace(strings.ToLower(part))
		num, unit, dst := "", 1.0, &t.K
		switch {
		case strings.HasSuffix(part, "mad"):
			num = strings.TrimSuffix(part, "mad")
		case strings.HasSuffix(part, "ue"):
			num, unit, dst = strings.TrimSuffix(part, "ue"), 1e-6, &t.Absolute
		default:
			return bad
		}
		v, err := strconv.ParseFloat(num, 64)
		v *= unit // a microstrain so small it rounds to 0 is no threshold either
		if err != nil || !(v > 0) || !finite(v) || *dst != 0 {
			return bad
		}
		*dst = v
	}
	if t.K == 0 {
		t.K = -1 // an absolute threshold alone: no relative bar
	}
	return nil
}
