package config

import (
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
func (a AE) Clock() (loadlog.Clock, error) { return clockOf("ae", a.ClockOffset, a.Sync) }

// OnsetRule is the section's hit-rate onset rule (zero fields: aelog's
// defaults).
func (a AE) OnsetRule() aelog.OnsetRule {
	rule := aelog.OnsetRule{Window: a.Window, Factor: a.K, Persist: a.Persistence}
	if len(a.Background) == 2 {
		rule.BackgroundStart, rule.BackgroundEnd = &a.Background[0], &a.Background[1]
	}
	return rule
}
