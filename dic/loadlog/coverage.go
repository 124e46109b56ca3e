package loadlog

import (
	"errors"
	"fmt"
	"math"
	"strings"
)

// ErrNoOverlap is wrapped by the error Stress.Cover returns when no frame
// time falls within the load log's span: the clock offset or sync pair is
// most likely wrong, or the log belongs to another test.
var ErrNoOverlap = errors.New("no frame falls within the load log")

// Coverage says which frames a load log covers. Frames outside the log's
// span get the stress of the log's nearest end from Stress.At, flagged
// inSpan=false; Coverage counts them so that the caller can say so.
type Coverage struct {
	// Start and End are the log's first and last row on the camera clock.
	Start, End float64

	// Frames is the number of frame times checked; Inside of them lie in
	// [Start, End].
	Frames, Inside int

	// Before and After list the indices of the frames before Start and
	// after End, in order; NotFinite those whose time is NaN or infinite.
	Before, After, NotFinite []int

	// Note describes the frames outside the log for the user (how many,
	// which, their times), "" when the log covers every frame.
	Note string
}

// Outside returns the number of frames the log does not cover.
func (c Coverage) Outside() int { return c.Frames - c.Inside }

// Cover checks the frame times against the log's span. It returns an error
// wrapping ErrNoOverlap when no frame lies within the span (and there is
// at least one frame); otherwise the Coverage, whose Note says what the log
// does not cover. Callers show the Note beside the results and leave the
// stress of frames outside the span out of fits and tables (the frames'
// inSpan is false).
func (s *Stress) Cover(times []float64) (Coverage, error) {
	if s == nil || s.Log == nil || s.Log.Len() == 0 {
		return Coverage{}, errors.New("loadlog: coverage: no load log rows")
	}
	t0, t1 := s.Log.Span()
	c := Coverage{Start: s.Clock.CameraTime(t0), End: s.Clock.CameraTime(t1), Frames: len(times)}
	for i, t := range times {
		switch {
		case math.IsNaN(t) || math.IsInf(t, 0):
			c.NotFinite = append(c.NotFinite, i)
		case t < c.Start:
			c.Before = append(c.Before, i)
		case t > c.End:
			c.After = append(c.After, i)
		default:
			c.Inside++
		}
	}
	if c.Frames > 0 && c.Inside == 0 {
		lo, hi := timeRange(times)
		return c, fmt.Errorf("loadlog: %s spans camera times %g to %g s (log clock %g to %g s, offset %g s), but none of the %d frames (%g to %g s) falls within it; check the clock offset or sync pair: %w",
			s.Log.Path, c.Start, c.End, t0, t1, s.Clock.offset(), c.Frames, lo, hi, ErrNoOverlap)
	}
	c.Note = c.describe(times)
	return c, nil
}

// describe writes the Note of the frames at times.
func (c Coverage) describe(times []float64) string {
	if c.Outside() == 0 {
		return ""
	}
	var parts []string
	if len(c.Before) > 0 {
		parts = append(parts, fmt.Sprintf("%s before the load log starts at %g s", describeFrames(c.Before, times), c.Start))
	}
	if len(c.After) > 0 {
		parts = append(parts, fmt.Sprintf("%s after the load log ends at %g s", describeFrames(c.After, times), c.End))
	}
	if len(c.NotFinite) > 0 {
		parts = append(parts, fmt.Sprintf("%s without a finite time", describeFrames(c.NotFinite, times)))
	}
	return fmt.Sprintf("%d of %d frames are outside the load log: %s; their stress is not measured (flagged not in span)",
		c.Outside(), c.Frames, strings.Join(parts, "; "))
}

// describeFrames writes a run of frame indices and their camera times:
// "frame 7 (12.5 s)" or "3 frames, 7 to 9 (12.5 to 13.5 s)". The indices
// are in increasing order; times of a run are its first and last frame's.
func describeFrames(idx []int, times []float64) string {
	first, last := idx[0], idx[len(idx)-1]
	if len(idx) == 1 {
		return fmt.Sprintf("frame %d (%g s)", first, times[first])
	}
	return fmt.Sprintf("%d frames, %d to %d (%g to %g s)", len(idx), first, last, times[first], times[last])
}

// timeRange returns the least and greatest finite time, NaN, NaN without
// one.
func timeRange(times []float64) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, t := range times {
		if !math.IsNaN(t) && !math.IsInf(t, 0) {
			lo, hi = math.Min(lo, t), math.Max(hi, t)
		}
	}
	if lo > hi {
		return math.NaN(), math.NaN()
	}
	return lo, hi
}
