package config

import (
	"fmt"

	"spallscope/dic/aelog"
	"spallscope/dic/loadlog"
)

// AE maps an acoustic-emission hit list recorded beside the load — its
// file, its format (aelog.Format, whose keys sit in this section) and its
// clock — and the rule for its onset: the hit rate in Window-second
// windows first exceeds K times the early-test background for Persistence
// windows in a row.
type AE struct {
	File         string `yaml:"file"`
	aelog.Format `yaml:",inline"`
	ClockOffset  float64   `yaml:"clock_offset_s"` // AE time = camera time + offset
	Sync         []float64 `yaml:"sync"`           // [camera_s, ae_s]
	Window       float64   `yaml:"window_s"`
	K            float64   `yaml:"k"`
	Persistence  int       `yaml:"persistence"`
	Background   []float64 `yaml:"background_s"` // [t0, t1] camera time; default the first 10 %
	GapSeconds   float64   `yaml:"gap_s"`        // silence longer than this is a gap
}

// Clock is the AE record's clock against the camera's.
func (a AE) Clock() (loadlog.Clock, error) {
	switch {
	case len(a.Sync) == 2 && a.ClockOffset != 0:
		return loadlog.Clock{}, fmt.Errorf("ae: give clock_offset_s or sync, not both")
	case len(a.Sync) == 2:
		return loadlog.Synced(a.Sync[0], a.Sync[1]), nil
	case len(a.Sync) != 0:
		return loadlog.Clock{}, fmt.Errorf("ae.sync: %d numbers, expected [camera_s, ae_s]", len(a.Sync))
	}
	return loadlog.Clock{Offset: a.ClockOffset}, nil
}

// OnsetRule is the section's hit-rate onset rule (zero fields: aelog's
// defaults).
func (a AE) OnsetRule() aelog.OnsetRule {
	rule := aelog.OnsetRule{Window: a.Window, Factor: a.K, Persist: a.Persistence}
	if len(a.Background) == 2 {
		rule.BackgroundStart, rule.BackgroundEnd = &a.Background[0], &a.Background[1]
	}
	return rule
}
