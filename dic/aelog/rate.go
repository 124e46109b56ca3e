package aelog

import "math"

// MaxWindows is the most windows HitRate returns; a window so short that
// the record would need more gives no rate at all rather than exhaust
// memory.
const MaxWindows = 1 << 24

// HitRate returns the hit rate in hits per second in consecutive windows
// of width window seconds laid from the first hit: window i is
// [times[i], times[i+1]) with times[i] = t0 + i·window, t0 the camera time
// of the first hit, and the last window holds the last hit. rates[i] is
// the number of hits in window i divided by window, so that the rates times
// the window add up to the number of hits.
//
// A window that holds no hit and overlaps a Gap has rate NaN, so that a
// plot shows the gap as missing rather than as a quiet spell; a window
// holding a hit always has its count, so no hit is hidden.
//
// HitRate returns nil slices when window is not a positive finite number
// or the record would need more than MaxWindows windows.
func (s *Series) HitRate(window float64) (times, rates []float64) {
	if len(s.times) == 0 || !(window > 0) || math.IsInf(window, 0) {
		return nil, nil
	}
	t0, t1 := s.Span()
	nf := math.Floor((t1-t0)/window) + 1
	if !(nf <= MaxWindows) {
		return nil, nil
	}
	n := int(nf)
	// Rounding in (t1−t0)/window may leave the last hit just outside the
	// last window or add an empty window after it.
	for n < MaxWindows && t0+float64(n)*window <= t1 {
		n++
	}
	for n > 1 && t0+float64(n-1)*window > t1 {
		n--
	}
	if t0+float64(n)*window <= t1 {
		return nil, nil
	}
	times = make([]float64, n)
	rates = make([]float64, n)
	j, g := 0, 0 // first hit not yet counted; first gap not wholly before the window
	for i := range n {
		a, b := t0+float64(i)*window, t0+float64(i+1)*window
		k := j
		for k < len(s.times) && s.times[k] < b {
			k++
		}
		count := k - j
		j = k
		for g < len(s.gaps) && s.gaps[g].End <= a {
			g++
		}
		times[i] = a
		if count == 0 && g < len(s.gaps) && s.gaps[g].Start < b {
			rates[i] = math.NaN()
			continue
		}
		rates[i] = float64(count) / window
	}
	return times, rates
}
