package loadlog

import (
	"errors"
	"fmt"
	"math"
)

// Clock relates the camera's clock (frame times) to the test frame's log
// clock. It is given either as an offset or as a sync pair: one moment read
// on both clocks, such as the frame in which a trigger lamp lights and the
// log row of the trigger. Both clocks are assumed to run at the same rate.
//
// The zero Clock says the two clocks agree. An Offset of zero cannot be
// told from no offset, so a sync pair with Offset 0 is accepted.
type Clock struct {
	// Offset is log time minus camera time, in seconds:
	// log time = camera time + Offset.
	Offset float64 `json:"offset_s,omitempty" yaml:"offset_s,omitempty"`

	// SyncFrameTime and SyncLogTime are a sync pair: camera time
	// *SyncFrameTime is log time *SyncLogTime. Give both or neither.
	SyncFrameTime *float64 `json:"sync_frame_time_s,omitempty" yaml:"sync_frame_time_s,omitempty"`
	SyncLogTime   *float64 `json:"sync_log_time_s,omitempty" yaml:"sync_log_time_s,omitempty"`
}

// Synced returns the Clock of a sync pair: camera time cameraTime is log
// time logTime.
func Synced(cameraTime, logTime float64) Clock {
	return Clock{SyncFrameTime: &cameraTime, SyncLogTime: &logTime}
}

// Validate rejects a clock given both an offset and a sync pair, half a
// sync pair, and times that are not finite.
func (c Clock) Validate() error {
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case (c.SyncFrameTime == nil) != (c.SyncLogTime == nil):
		return errors.New("clock: a sync pair needs both sync_frame_time_s and sync_log_time_s")
	case c.SyncFrameTime != nil && c.Offset != 0:
		return fmt.Errorf("clock: give either offset_s (%g s) or a sync pair, not both", c.Offset)
	case !finite(c.Offset):
		return fmt.Errorf("clock: offset_s %g, expected a finite number of seconds", c.Offset)
	case c.SyncFrameTime != nil && !(finite(*c.SyncFrameTime) && finite(*c.SyncLogTime)):
		return fmt.Errorf("clock: sync pair %g s ↔ %g s, expected finite times", *c.SyncFrameTime, *c.SyncLogTime)
	}
	return nil
}

// offset returns log time minus camera time: the sync pair's when one is
// given, else Offset.
func (c Clock) offset() float64 {
	if c.SyncFrameTime != nil && c.SyncLogTime != nil {
		return *c.SyncLogTime - *c.SyncFrameTime
	}
	return c.Offset
}

// LogTime returns the log time of a camera time. For a clock that fails
// Validate with both an offset and a sync pair, the sync pair is used.
func (c Clock) LogTime(cameraTime float64) float64 { return cameraTime + c.offset() }

// CameraTime returns the camera time of a log time; it undoes LogTime.
func (c Clock) CameraTime(logTime float64) float64 { return logTime - c.offset() }
