package config

import (
	"fmt"

	"spallscope/dic/loadlog"
)

// Load maps the test frame's log: the file, the loaded area, the log's
// format (columns, units, delimiter, ...: loadlog.Format, whose keys sit
// in this section) and its clock against the camera's. The load options of
// the zones command fill the same fields.
type Load struct {
	File           string  `yaml:"file"`
	AreaMM2        float64 `yaml:"area_mm2"`
	loadlog.Format `yaml:",inline"`
	ClockOffset    float64   `yaml:"clock_offset_s"`
	Sync           []float64 `yaml:"sync"` // [camera_s, log_s]
}

// check checks the section: with a file, a finite positive area and a
// usable format; without one, no area or clock (they would do nothing);
// a finite clock either way.
func (l Load) check() error {
	var p Problems
	if l.File == "" {
		for _, set := range []struct {
			key string
			on  bool
		}{{"load.area_mm2", l.AreaMM2 != 0}, {"load.clock_offset_s", l.ClockOffset != 0}, {"load.sync", len(l.Sync) != 0}} {
			if set.on {
				p.add(&FieldError{Key: "load.file", With: set.key, Expected: "the load log the area and clock apply to"})
			}
		}
		return p.err()
	}
	switch {
	case l.AreaMM2 == 0:
		p.add(&FieldError{Key: "load.area_mm2", With: "load.file", Expected: "the loaded area in mm² (nominal stress = force / area)"})
	default:
		p.add(checkBounds(bound{"load.area_mm2", l.AreaMM2, l.AreaMM2 > 0 && finite(l.AreaMM2), "a finite positive area in mm² (nominal stress = force / area)"}))
	}
	p.add(checkBounds(bound{"load.skip_lines", l.SkipLines, l.SkipLines >= 0, "0 or more lines"}))
	if l.SkipLines >= 0 {
		if err := l.Format.Validate(); err != nil {
			p.add(fmt.Errorf("load: %w", err))
		}
	}
	_, err := clockOf("load", "log_s", l.ClockOffset, l.Sync)
	p.add(err)
	return p.err()
}

// Stress reads the log at path (the section's file, resolved by the
// caller) into nominal stress on the camera's clock; nil without a file.
func (l Load) Stress(path string) (*loadlog.Stress, error) {
	if err := l.check(); err != nil {
		return nil, err
	}
	if path == "" {
		return nil, nil
	}
	clock, _ := clockOf("load", "log_s", l.ClockOffset, l.Sync) // checked
	lg, err := loadlog.Read(path, l.Format)
	if err != nil {
		return nil, err
	}
	return loadlog.NewStress(lg, l.AreaMM2, clock)
}
