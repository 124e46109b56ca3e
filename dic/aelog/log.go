package aelog

import "math"

// Hit is one row of an AE hit list: one hit on one sensor, or one event
// when the list holds events rather than hits. Each row counts once in
// the rates and sums.
type Hit struct {
	// Time is the hit's arrival time in seconds on the AE system's clock.
	Time float64

	// Amplitude is the peak amplitude in dB (dB_AE); Energy is in the
	// file's own unit (Log.EnergyUnit); Counts is the number of threshold
	// crossings. Each is 0 when the file has no such column (see Log.Has).
	Amplitude, Energy, Counts float64

	// Channel is the sensor's channel number, 0 without a channel column.
	Channel int
}

// Columns says which of a hit's measures the file holds.
type Columns struct {
	Amplitude, Energy, Counts, Channel bool
}

// Log is an AE hit list as read from a file, in the AE system's clock.
type Log struct {
	Path string // the file it was read from

	// Hits are in file order; their times never decrease, but consecutive
	// hits may share a time (hits of one event on several sensors).
	Hits []Hit

	// Has says which columns the file has; the fields of Hit for the
	// others are zero.
	Has Columns

	// EnergyUnit is the unit of Hit.Energy as Format.EnergyUnit or the
	// header names it, "" when neither does.
	EnergyUnit string

	// Notes are remarks on the reading that are not errors: units assumed
	// or disagreeing with the header. Callers show them to the user.
	Notes []string
}

// Len returns the number of hits.
func (l *Log) Len() int { return len(l.Hits) }

// Span returns the times of the first and last hit, in seconds on the AE
// clock; NaN, NaN for a log without hits.
func (l *Log) Span() (t0, t1 float64) {
	if len(l.Hits) == 0 {
		return math.NaN(), math.NaN()
	}
	return l.Hits[0].Time, l.Hits[len(l.Hits)-1].Time
}
