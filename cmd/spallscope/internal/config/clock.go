package config

import (
	"fmt"

	"spallscope/dic/loadlog"
)

// clockOf is a log's clock against the camera's, from a section's offset
// (log time = camera time + offset) or its sync pair [camera_s, log_s],
// checked: finite numbers, not both. section names the section in errors
// ("load", "ae", "faces[1]") and logName the log's time in the sync pair's
// description ("log_s", "ae_s").
func clockOf(section, logName string, offset float64, sync []float64) (loadlog.Clock, error) {
	switch {
	case len(sync) != 0 && offset != 0:
		return loadlog.Clock{}, fmt.Errorf("%s: give clock_offset_s or sync, not both", section)
	case len(sync) != 0:
		if len(sync) != 2 || !finiteAll(sync) {
			return loadlog.Clock{}, &FieldError{Key: key(section, "sync"), Value: fmt.Sprint(sync), Expected: fmt.Sprintf("[camera_s, %s]: two finite times in s", logName)}
		}
		return loadlog.Synced(sync[0], sync[1]), nil
	}
	return loadlog.Clock{Offset: offset}, checkBounds(bound{key(section, "clock_offset_s"), offset, finite(offset), "a finite number of seconds"})
}
