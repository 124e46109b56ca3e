package synth

import (
	"errors"
	"fmt"
	"time"

	"spallscope/dic/frames"
)

// ExifClock is the camera's clock as it stamps each photo's EXIF capture
// time (needs format jpg): frame 0 at Start (local time, "YYYY:MM:DD
// HH:MM:SS"), later frames at Start plus their camera time, with
// milliseconds in SubSecTimeOriginal unless NoSubseconds, and Offset
// ("±HH:MM") in OffsetTimeOriginal when given.
type ExifClock struct {
	Start        string `json:"start"`
	Offset       string `json:"offset,omitempty"`
	NoSubseconds bool   `json:"no_subseconds,omitempty"`
}

const exifLayout = "2006:01:02 15:04:05"

// Validate reports a clock that cannot be written.
func (c *ExifClock) Validate() error {
	var errs []error
	if _, err := time.Parse(exifLayout, c.Start); err != nil {
		errs = append(errs, fmt.Errorf("start %q, expected YYYY:MM:DD HH:MM:SS", c.Start))
	}
	if c.Offset != "" {
		if _, err := time.Parse("-07:00", c.Offset); err != nil {
			errs = append(errs, fmt.Errorf("offset %q, expected ±HH:MM", c.Offset))
		}
	}
	return errors.Join(errs...)
}

// Tags returns the capture-time tags of a photo taken t s after frame 0.
// The time is rounded to the millisecond, the resolution of the tags.
func (c *ExifClock) Tags(t float64) frames.CaptureTags {
	start, _ := time.Parse(exifLayout, c.Start)
	at := start.Add(time.Duration(t*1e3+0.5) * time.Millisecond)
	tags := frames.CaptureTags{DateTimeOriginal: at.Format(exifLayout), OffsetTimeOriginal: c.Offset}
	if !c.NoSubseconds {
		tags.SubSecTimeOriginal = fmt.Sprintf("%03d", at.Nanosecond()/1e6)
	}
	return tags
}
