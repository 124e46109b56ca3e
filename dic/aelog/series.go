package aelog

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"spallscope/dic/loadlog"
)

// Series is an AE hit list on the camera clock, the clock of the DIC
// frames, so that its rates, gaps and onset can be set beside the strain
// field's. Make one with Log.Series; the zero Series has no hits.
type Series struct {
	log   *Log
	clock loadlog.Clock
	times []float64 // camera time of each hit, non-decreasing

	gapThreshold float64
	gaps         []Gap
}

// Series puts the hits of l on the camera clock: a hit at AE time t is at
// camera time clock.CameraTime(t), that is t − offset, where the clock's
// offset is AE time minus camera time (loadlog.Clock, used here for the AE
// system's clock as for the test frame's). It finds the log's gaps by rule
// g (see GapRule). It rejects a log without hits, an invalid clock or gap
// rule, and a hand-made log whose times are not finite and non-decreasing.
func (l *Log) Series(clock loadlog.Clock, g GapRule) (*Series, error) {
	if l == nil || len(l.Hits) == 0 {
		return nil, errors.New("aelog: series: no hits")
	}
	if err := clock.Validate(); err != nil {
		return nil, fmt.Errorf("aelog: series of %s: %w", l.Path, err)
	}
	if err := g.validate(); err != nil {
		return nil, fmt.Errorf("aelog: series of %s: %w", l.Path, err)
	}
	s := &Series{log: l, clock: clock, times: make([]float64, len(l.Hits))}
	for i, h := range l.Hits {
		t := clock.CameraTime(h.Time)
		if math.IsNaN(t) || math.IsInf(t, 0) {
			return nil, fmt.Errorf("aelog: series of %s: hit %d at %g s: expected a finite time", l.Path, i+1, h.Time)
		}
		if i > 0 && t < s.times[i-1] {
			return nil, fmt.Errorf("aelog: series of %s: hit %d at %g s is before hit %d at %g s; times must not decrease",
				l.Path, i+1, h.Time, i, l.Hits[i-1].Time)
		}
		s.times[i] = t
	}
	s.gapThreshold = g.threshold(s.times)
	s.gaps = findGaps(s.times, s.gapThreshold)
	return s, nil
}

// Len returns the number of hits.
func (s *Series) Len() int { return len(s.times) }

// Times returns the camera time of every hit, in the order of Log.Hits.
// The slice is a copy.
func (s *Series) Times() []float64 { return slices.Clone(s.times) }

// Span returns the camera times of the first and last hit: the record's
// span, on which rates and the onset's background are reckoned. NaN, NaN
// for a series without hits.
func (s *Series) Span() (t0, t1 float64) {
	if len(s.times) == 0 {
		return math.NaN(), math.NaN()
	}
	return s.times[0], s.times[len(s.times)-1]
}

// Cumulative returns, at the camera time of each hit, the number of hits so
// far (1, 2, 3, ...) and the sum of their energies in the log's energy
// unit. energy is nil when the log has no energy column. Hits that share a
// time each make their own step.
func (s *Series) Cumulative() (times, hits, energy []float64) {
	times = slices.Clone(s.times)
	hits = make([]float64, len(s.times))
	for i := range hits {
		hits[i] = float64(i + 1)
	}
	if s.log == nil || !s.log.Has.Energy {
		return times, hits, nil
	}
	energy = make([]float64, len(s.times))
	sum := 0.0
	for i, h := range s.log.Hits {
		sum += h.Energy
		energy[i] = sum
	}
	return times, hits, energy
}
