package aelog

import (
	"fmt"
	"math"
	"slices"
)

// Gap is an interval without hits longer than the gap threshold: Start and
// End are the camera times of the hits on either side. A gap may be a quiet
// spell of the specimen or a pause of the acquisition; the file cannot
// tell which, so gaps are reported, never bridged, and the hit rate marks
// them.
type Gap struct {
	Start float64 `json:"start_s" yaml:"start_s"`
	End   float64 `json:"end_s" yaml:"end_s"`
}

// Duration returns End − Start in seconds.
func (g Gap) Duration() float64 { return g.End - g.Start }

// GapRule sets the threshold above which an interval between consecutive
// hits is a Gap. The zero GapRule is the default: 10 times the median
// interval between consecutive hits, and at least 1 s. The median, unlike
// the mean, is not pulled up by the gaps it is meant to find; the floor
// keeps the many near-simultaneous hits of one event on several sensors
// from making every pause a gap. (Common practice, no source.)
type GapRule struct {
	// Threshold, if above 0, is the threshold in seconds, and Factor and
	// Min are not used.
	Threshold float64 `json:"threshold_s,omitempty" yaml:"threshold_s,omitempty"`

	// Factor times the median interval is the threshold; 0 means 10.
	Factor float64 `json:"factor,omitempty" yaml:"factor,omitempty"`

	// Min is the least threshold in seconds; 0 means 1 s.
	Min float64 `json:"min_s,omitempty" yaml:"min_s,omitempty"`
}

// validate rejects values that are negative or not finite.
func (g GapRule) validate() error {
	for _, v := range []struct {
		name string
		v    float64
	}{{"threshold_s", g.Threshold}, {"factor", g.Factor}, {"min_s", g.Min}} {
		if !(v.v >= 0) || math.IsInf(v.v, 0) {
			return fmt.Errorf("gap rule: %s %g, expected a finite number 0 or more (0: the default)", v.name, v.v)
		}
	}
	return nil
}

// threshold returns the gap threshold in seconds for hits at times
// (non-decreasing). With a single hit there is no interval and the
// threshold is Min.
func (g GapRule) threshold(times []float64) float64 {
	if g.Threshold > 0 {
		return g.Threshold
	}
	factor, least := g.Factor, g.Min
	if factor == 0 {
		factor = 10
	}
	if least == 0 {
		least = 1
	}
	if len(times) < 2 {
		return least
	}
	d := make([]float64, len(times)-1)
	for i := range d {
		d[i] = times[i+1] - times[i]
	}
	slices.Sort(d)
	median := d[len(d)/2]
	if len(d)%2 == 0 {
		median = (d[len(d)/2-1] + d[len(d)/2]) / 2
	}
	return math.Max(factor*median, least)
}

// findGaps returns the intervals between consecutive hits longer than
// threshold.
func findGaps(times []float64, threshold float64) []Gap {
	var gaps []Gap
	for i := 1; i < len(times); i++ {
		if times[i]-times[i-1] > threshold {
			gaps = append(gaps, Gap{Start: times[i-1], End: times[i]})
		}
	}
	return gaps
}

// Gaps returns the intervals without hits longer than GapThreshold, in time
// order. The slice is a copy.
func (s *Series) Gaps() []Gap { return slices.Clone(s.gaps) }

// GapThreshold returns the threshold in seconds the series' gaps were
// found with.
func (s *Series) GapThreshold() float64 { return s.gapThreshold }
