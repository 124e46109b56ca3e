package config

import (
	"fmt"

	"spallscope/dic/loadlog"
)

// clockOf is a log's clock against the camera's, from a section's offset
// (log time = camera time + offset) or its sync pair [camera_s, log_s];
// section names the section in errors.
func clockOf(section string, offset float64, sync []float64) (loadlog.Clock, error) {
	switch {
	case len(sync) == 2 && offset != 0:
		return loadlog.Clock{}, fmt.Errorf("%s: give clock_offset_s or sync, not both", section)
	case len(sync) == 2:
		return loadlog.Synced(sync[0], sync[1]), nil
	case len(sync) != 0:
		return loadlog.Clock{}, fmt.Errorf("%s.sync: %d numbers, expected [camera_s, log_s]", section, len(sync))
	}
	return loadlog.Clock{Offset: offset}, nil
}
