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

// check checks every value of the section against its range (zero: the
// default), and its format and clock.
func (a AE) check() error {
	var p Problems
	p.add(checkBounds(
		bound{"ae.window_s", a.Window, a.Window == 0 || (a.Window > 0 && finite(a.Window)), "a finite positive window in s"},
		bound{"ae.k", a.K, a.K == 0 || (a.K >= 1 && finite(a.K)), "a finite factor of 1 or more"},
		bound{"ae.persistence", a.Persistence, a.Persistence >= 0, "1 window or more"},
		bound{"ae.gap_s", a.GapSeconds, a.GapSeconds == 0 || (a.GapSeconds > 0 && finite(a.GapSeconds)), "a finite positive number of seconds"},
		bound{"ae.background_s", a.Background, len(a.Background) == 0 || (len(a.Background) == 2 && finiteAll(a.Background) && a.Background[1] > a.Background[0]),
			"[t0, t1]: finite camera times in s, t1 after t0"},
		bound{"ae.skip_lines", a.SkipLines, a.SkipLines >= 0, "0 or more lines"},
	))
	if a.SkipLines >= 0 {
		if err := a.Format.Validate(); err != nil {
			p.add(fmt.Errorf("ae: %w", err))
		}
	}
	_, err := clockOf("ae", "ae_s", a.ClockOffset, a.Sync)
	p.add(err)
	return p.err()
}

// Clock is the AE record's clock against the camera's.
func (a AE) Clock() (loadlog.Clock, error) {
	if err := a.check(); err != nil {
		return loadlog.Clock{}, err
	}
	return clockOf("ae", "ae_s", a.ClockOffset, a.Sync)
}

// OnsetRule is the section's hit-rate onset rule (zero fields: aelog's
// defaults); Clock, which a run takes first, checks the section.
func (a AE) OnsetRule() aelog.OnsetRule {
	rule := aelog.OnsetRule{Window: a.Window, Factor: a.K, Persist: a.Persistence}
	if len(a.Background) == 2 {
		rule.BackgroundStart, rule.BackgroundEnd = &a.Background[0], &a.Background[1]
	}
	return rule
}
