package job

import (
	"spallscope/cmd/spallscope/internal/config"
	"spallscope/dic/aelog"
	"spallscope/dic/runfolder"
)

// ae reads the test's acoustic-emission record, puts it on the camera's
// clock and records its cumulative hits, onset and gaps in run.json.
func ae(t *config.Test, out string) (*runfolder.AERecord, error) {
	c := t.AE
	clock, err := c.Clock()
	if err != nil {
		return nil, err
	}
	lg, err := aelog.Read(t.Resolve(c.File), c.Format)
	if err != nil {
		return nil, err
	}
	s, err := lg.Series(clock, aelog.GapRule{Threshold: c.GapSeconds})
	if err != nil {
		return nil, err
	}
	return runfolder.RecordAE(out, lg, s, c.OnsetRule())
}
