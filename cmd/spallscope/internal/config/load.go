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

// Stress reads the log at path (the section's file, resolved by the
// caller) into nominal stress on the camera's clock; nil without a file.
func (l Load) Stress(path string) (*loadlog.Stress, error) {
	if path == "" {
		if l.AreaMM2 != 0 || len(l.Sync) != 0 || l.ClockOffset != 0 {
			return nil, fmt.Errorf("load: the area, sync and clock offset need a load log file")
		}
		return nil, nil
	}
	clock, err := clockOf("load", l.ClockOffset, l.Sync) // checked before the log is read
	if err != nil {
		return nil, err
	}
	lg, err := loadlog.Read(path, l.Format)
	if err != nil {
		return nil, err
	}
	return loadlog.NewStress(lg, l.AreaMM2, clock)
}
