package job

import (
	"fmt"
	"strconv"
	"strings"

	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic"
	"spallscope/dic/loadlog"
	"spallscope/strain"
	"spallscope/subset"
)

// Correlation turns a config's correlation section into tracker settings.
func Correlation(c config.Correlation) (dic.Settings, error) {
	s := dic.Settings{Subset: c.Subset, Step: c.Step, UpdateBelow: c.UpdateBelow, MinZNCC: c.MinZNCC,
		SearchRadius: c.SearchRadius, EdgeGuard: c.EdgeGuard, Reference: dic.ReferenceMode(c.Reference)}
	var err error
	if c.Order != "" {
		if s.Order, err = subset.ParseShapeOrder(c.Order); err != nil {
			return s, err
		}
	}
	if c.Interpolation != "" {
		if s.Interpolation, err = subset.ParseInterpolation(c.Interpolation); err != nil {
			return s, err
		}
	}
	for _, p := range c.Seeds {
		s.Seeds = append(s.Seeds, [2]int{p[0], p[1]})
	}
	return s, s.Validate()
}

// Scale returns the config's image scale (0 if not given).
func Scale(c config.Scale) (dic.Scale, error) {
	if len(c.Line) == 5 {
		return dic.ScaleFromPoints(c.Line[0], c.Line[1], c.Line[2], c.Line[3], c.Line[4])
	}
	if c.MMPerPx < 0 {
		return 0, fmt.Errorf("scale %g mm/px, expected a positive number", c.MMPerPx)
	}
	return dic.Scale(c.MMPerPx), nil
}

// Window turns a config's strain section into a strain window (default 9).
func Window(c config.Strain) (strain.Window, error) {
	w := strain.Window{Size: c.Window, Order: c.Order}
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
	return w, nil
}

// Stress reads the load log of a config's load section (path resolved by
// the caller); nil without a file.
func Stress(l config.Load, path string) (*loadlog.Stress, error) {
	if path == "" {
		return nil, nil
	}
	lg, err := loadlog.Read(path, loadlog.Format{TimeColumn: l.TimeColumn, ForceColumn: l.ForceColumn,
		TimeUnit: l.TimeUnit, ForceUnit: l.ForceUnit, CompressionNegative: l.CompressionNegative})
	if err != nil {
		return nil, err
	}
	clock := loadlog.Clock{Offset: l.ClockOffset}
	if len(l.Sync) == 2 {
		if l.ClockOffset != 0 {
			return nil, fmt.Errorf("load: give clock_offset_s or sync, not both")
		}
		clock = loadlog.Synced(l.Sync[0], l.Sync[1])
	}
	return loadlog.NewStress(lg, l.AreaMM2, clock)
}

// Threshold reads "6mad", "500ue" or "6mad,500ue" into t (empty: 6mad).
func Threshold(s string, t *strain.Thresholds) error {
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
