package aelog

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// OnsetRule sets how Series.Onset finds the onset of AE activity. The zero
// OnsetRule is the default: 1 s windows, k = 3, P = 3, background over the
// first 10 % of the record.
//
// The rule (common practice of threshold-on-background detection, no
// source for these particular numbers):
//
//   - The background rate B is the number of hits in the background span
//     [b0, b1) divided by its length b1 − b0. The span is
//     BackgroundStart..BackgroundEnd in camera time if given (cut to the
//     record's span), else the first BackgroundFraction of the record:
//     [t0, t0 + BackgroundFraction·(t1 − t0)), t0 and t1 the first and last
//     hit.
//   - B has a floor of one hit per background span, 1/(b1 − b0): a span
//     without hits would otherwise make any hit an onset. Onset.Floored
//     says when the floor was used.
//   - The onset is the camera time of the first hit at or after b0 such
//     that each of the Persist consecutive windows [t, t+w), [t+w, t+2w),
//     ... [t+(P−1)w, t+Pw) holds more than Factor·B·w hits: the rate
//     exceeds k × background there and stays above it for P windows. The
//     window slides from hit to hit, so the onset is the hit that starts
//     the rise; windows past the last hit hold none, so a rise at the very
//     end of the record cannot be confirmed and is not reported.
type OnsetRule struct {
	// Window is the width w of the sliding window in seconds; 0 means 1 s.
	Window float64 `json:"window_s,omitempty" yaml:"window_s,omitempty"`

	// Factor is k, how many times the background the rate must exceed; 0
	// means 3. It must be at least 1.
	Factor float64 `json:"factor,omitempty" yaml:"factor,omitempty"`

	// Persist is P, the number of consecutive windows above k × background;
	// 0 means 3.
	Persist int `json:"persist,omitempty" yaml:"persist,omitempty"`

	// BackgroundFraction is the early part of the record used for the
	// background when no span is given, in (0, 1]; 0 means 0.1.
	BackgroundFraction float64 `json:"background_fraction,omitempty" yaml:"background_fraction,omitempty"`

	// BackgroundStart and BackgroundEnd give the background span in camera
	// seconds instead. Give both or neither.
	BackgroundStart *float64 `json:"background_start_s,omitempty" yaml:"background_start_s,omitempty"`
	BackgroundEnd   *float64 `json:"background_end_s,omitempty" yaml:"background_end_s,omitempty"`
}

// Onset is the result of Series.Onset: the onset time and the figures it
// was judged by, which a report shows beside it.
type Onset struct {
	// Time is the camera time of the onset; NaN when there is none.
	Time float64 `json:"time_s"`

	// BackgroundStart and BackgroundEnd are the background span used, in
	// camera seconds; BackgroundHits the hits in it.
	BackgroundStart float64 `json:"background_start_s"`
	BackgroundEnd   float64 `json:"background_end_s"`
	BackgroundHits  int     `json:"background_hits"`

	// Background is the background rate B in hits per second, after the
	// floor; Floored says the span held no hit and the floor was used.
	Background float64 `json:"background_hits_per_s"`
	Floored    bool    `json:"floored"`

	// Threshold is k·B in hits per second, the rate each window must exceed.
	Threshold float64 `json:"threshold_hits_per_s"`

	// Rate is the hit rate in the first window of the onset, NaN when there
	// is no onset.
	Rate float64 `json:"rate_hits_per_s"`

	// Window and Persist are the rule's w and P, defaults filled in.
	Window  float64 `json:"window_s"`
	Persist int     `json:"persist"`
}

// Onset finds the onset of AE activity by rule r (see OnsetRule) and
// returns it with ok=true, or with ok=false and Time NaN when the rate
// never rises above the threshold for long enough; the background figures
// are filled in either way. It rejects an invalid rule, a background span
// outside the record and a record that spans no time.
func (s *Series) Onset(r OnsetRule) (onset Onset, ok bool, err error) {
	w, k, p, frac, err := r.defaults()
	if err != nil {
		return Onset{}, false, fmt.Errorf("aelog: onset: %w", err)
	}
	if len(s.times) == 0 {
		return Onset{}, false, errors.New("aelog: onset: no hits")
	}
	t0, t1 := s.Span()
	if !(t1 > t0) {
		return Onset{}, false, fmt.Errorf("aelog: onset: the %d hits of %s are all at %g s; a background rate needs a record that spans time", len(s.times), s.log.Path, t0)
	}
	if math.IsInf(t1-t0, 0) {
		return Onset{}, false, fmt.Errorf("aelog: onset: the record of %s spans %g..%g s, too long to take rates over", s.log.Path, t0, t1)
	}
	b0, b1 := t0, t0+frac*(t1-t0)
	if r.BackgroundStart != nil {
		b0, b1 = math.Max(*r.BackgroundStart, t0), math.Min(*r.BackgroundEnd, t1)
		if !(b1 > b0) {
			return Onset{}, false, fmt.Errorf("aelog: onset: background span %g..%g s does not overlap the record %g..%g s (camera time)",
				*r.BackgroundStart, *r.BackgroundEnd, t0, t1)
		}
	}
	o := Onset{Time: math.NaN(), Rate: math.NaN(), BackgroundStart: b0, BackgroundEnd: b1, Window: w, Persist: p}
	o.BackgroundHits = s.count(b0, b1)
	n := o.BackgroundHits
	if n == 0 {
		n, o.Floored = 1, true
	}
	o.Background = float64(n) / (b1 - b0)
	o.Threshold = k * o.Background
	need := o.Threshold * w // a window must hold more hits than this
	for i := sort.SearchFloat64s(s.times, b0); i < len(s.times); i++ {
		t := s.times[i]
		if i > 0 && t == s.times[i-1] {
			continue // the same windows as the previous hit's
		}
		above := true
		for j := range p {
			a := t + float64(j)*w
			if float64(s.count(a, a+w)) <= need {
				above = false
				break
			}
		}
		if above {
			o.Time = t
			o.Rate = float64(s.count(t, t+w)) / w
			return o, true, nil
		}
	}
	return o, false, nil
}

// count returns the number of hits at camera times in [a, b).
func (s *Series) count(a, b float64) int {
	return sort.SearchFloat64s(s.times, b) - sort.SearchFloat64s(s.times, a)
}

// defaults checks r and returns w, k, P and the background fraction with
// the defaults filled in.
func (r OnsetRule) defaults() (w, k float64, p int, frac float64, err error) {
	w, k, p, frac = r.Window, r.Factor, r.Persist, r.BackgroundFraction
	if w == 0 {
		w = 1
	}
	if k == 0 {
		k = 3
	}
	if p == 0 {
		p = 3
	}
	if frac == 0 {
		frac = 0.1
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !(w > 0) || !finite(w):
		err = fmt.Errorf("window_s %g, expected a positive number of seconds", r.Window)
	case !(k >= 1) || !finite(k):
		err = fmt.Errorf("factor %g, expected a finite number 1 or more", r.Factor)
	case p < 0:
		err = fmt.Errorf("persist %d, expected a positive number of windows", r.Persist)
	case !(frac > 0 && frac <= 1):
		err = fmt.Errorf("background_fraction %g, expected a fraction in (0, 1]", r.BackgroundFraction)
	case (r.BackgroundStart == nil) != (r.BackgroundEnd == nil):
		err = errors.New("a background span needs both background_start_s and background_end_s")
	case r.BackgroundStart != nil && !(finite(*r.BackgroundStart) && finite(*r.BackgroundEnd) && *r.BackgroundEnd > *r.BackgroundStart):
		err = fmt.Errorf("background span %g..%g s, expected finite times with the end after the start", *r.BackgroundStart, *r.BackgroundEnd)
	}
	return w, k, p, frac, err
}
