package job

import (
	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/aelog"
	"spallscope/dic/loadlog"
	"spallscope/dic/runfolder"
)

// ae reads the test's acoustic-emission record, puts it on the camera's
// clock and records its cumulative hits, onset and gaps in run.json.
func ae(t *config.Test, out string) (*runfolder.AERecord, error) {
	c := t.AE
	lg, err := aelog.Read(t.Resolve(c.File), aelog.Format{TimeColumn: c.TimeColumn, AmplitudeColumn: c.AmplitudeColumn,
		EnergyColumn: c.EnergyColumn, CountsColumn: c.CountsColumn, ChannelColumn: c.ChannelColumn, TimeUnit: c.TimeUnit})
	if err != nil {
		return nil, err
	}
	clock := loadlog.Clock{Offset: c.ClockOffset}
	if len(c.Sync) == 2 {
		clock = loadlog.Synced(c.Sync[0], c.Sync[1])
	}
	s, err := lg.Series(clock, aelog.GapRule{Threshold: c.GapSeconds})
	if err != nil {
		return nil, err
	}
	rule := aelog.OnsetRule{Window: c.Window, Factor: c.K, Persist: c.Persistence}
	if len(c.Background) == 2 {
		rule.BackgroundStart, rule.BackgroundEnd = &c.Background[0], &c.Background[1]
	}
	return runfolder.RecordAE(out, lg, s, rule)
}
