package aelog_test

import (
	"fmt"

	"spallscope/dic/aelog"
	"spallscope/dic/loadlog"
)

// The example file of the package documentation (invented numbers), put on
// the camera clock with the AE clock 2 s ahead. Worked by hand: camera
// times 0.25 ... 3.0 s; 1 s windows from 0.25, 1.25 and 2.25 s hold 2, 2
// and 4 hits; energies add up to 2900 aJ; the median interval is 0.25 s,
// so the gap threshold is the 2.5 s of 10 × 0.25 s; the background span is
// the first 10 % of 2.75 s, [0.25, 0.525) s, with 1 hit: 1/0.275 s ≈ 3.6
// hits/s, and no 1 s window holds more than 3 × 3.6 ≈ 10.9 hits.
func Example() {
	log, err := aelog.Read("testdata/example.csv", aelog.Format{})
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := log.Series(loadlog.Clock{Offset: 2}, aelog.GapRule{})
	if err != nil {
		fmt.Println(err)
		return
	}
	t0, t1 := s.Span()
	fmt.Printf("%d hits, camera %.2f..%.2f s\n", s.Len(), t0, t1)
	times, rates := s.HitRate(1)
	for i := range times {
		fmt.Printf("window from %.2f s: %g hits/s\n", times[i], rates[i])
	}
	_, _, energy := s.Cumulative()
	fmt.Printf("energy %g %s, %d gaps (threshold %g s)\n", energy[len(energy)-1], log.EnergyUnit, len(s.Gaps()), s.GapThreshold())
	onset, ok, err := s.Onset(aelog.OnsetRule{})
	switch {
	case err != nil:
		fmt.Println(err)
	case ok:
		fmt.Printf("onset at %.2f s\n", onset.Time)
	default:
		fmt.Printf("no onset (background %.1f hits/s)\n", onset.Background)
	}
	// Output:
	// 8 hits, camera 0.25..3.00 s
	// window from 0.25 s: 2 hits/s
	// window from 1.25 s: 2 hits/s
	// window from 2.25 s: 4 hits/s
	// energy 2900 aJ, 0 gaps (threshold 2.5 s)
	// no onset (background 3.6 hits/s)
}
