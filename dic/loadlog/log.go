package loadlog

import (
	"math"
	"sort"
)

// Log is a test frame's load log: one row per sample, in the frame's own
// clock.
type Log struct {
	Path string // the file it was read from

	// Time is the log clock in seconds, one entry per row; it never
	// decreases, but consecutive rows may have equal times.
	Time []float64

	// Force is in newtons, compression positive (see
	// Format.CompressionNegative).
	Force []float64

	// Stroke is the actuator stroke in millimetres, nil when the file has
	// no stroke column.
	Stroke []float64

	// Notes are remarks on the reading that are not errors: units assumed
	// or disagreeing with the header, repeated times, forces that are
	// mostly negative. Callers show them to the user.
	Notes []string
}

// Len returns the number of rows.
func (l *Log) Len() int { return len(l.Time) }

// Span returns the first and last time of the log, in seconds on the log
// clock.
func (l *Log) Span() (start, end float64) {
	if len(l.Time) == 0 {
		return math.NaN(), math.NaN()
	}
	return l.Time[0], l.Time[len(l.Time)-1]
}

// ForceAt returns the force in newtons at logTime, interpolated linearly
// between the rows around it. Outside the log's span it returns the force
// of the nearest end and inSpan=false. Where consecutive rows share a time,
// the force jumps there: at that time exactly it is the later row's, just
// before it tends to the earlier row's.
func (l *Log) ForceAt(logTime float64) (newtons float64, inSpan bool) {
	return interpolate(l.Time, l.Force, logTime)
}

// StrokeAt returns the stroke in millimetres at logTime, as ForceAt does
// the force; it returns NaN and false when the log has no stroke.
func (l *Log) StrokeAt(logTime float64) (mm float64, inSpan bool) {
	if l.Stroke == nil {
		return math.NaN(), false
	}
	return interpolate(l.Time, l.Stroke, logTime)
}

// PeakForce returns the largest force in newtons and the log time of its
// first row.
func (l *Log) PeakForce() (newtons, logTime float64) {
	if len(l.Force) == 0 {
		return math.NaN(), math.NaN()
	}
	k := 0
	for i, f := range l.Force {
		if f > l.Force[k] {
			k = i
		}
	}
	return l.Force[k], l.Time[k]
}

// interpolate returns ys at t, interpolated linearly on xs (non-decreasing,
// same length as ys). Outside [xs[0], xs[n-1]] it returns the nearest end
// value and false; for NaN t, NaN and false.
func interpolate(xs, ys []float64, t float64) (float64, bool) {
	n := len(xs)
	if n == 0 || n != len(ys) || math.IsNaN(t) {
		return math.NaN(), false
	}
	if t < xs[0] {
		return ys[0], false
	}
	if t > xs[n-1] {
		return ys[n-1], false
	}
	// i is the first row after t, so xs[i-1] <= t < xs[i] and i >= 1.
	i := sort.Search(n, func(i int) bool { return xs[i] > t })
	if i == n {
		return ys[n-1], true
	}
	x0, x1 := xs[i-1], xs[i]
	w := (t - x0) / (x1 - x0)
	return ys[i-1] + w*(ys[i]-ys[i-1]), true
}
