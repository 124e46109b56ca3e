package aelog

import (
	"math"
	"slices"
	"testing"

	"spallscope/dic/loadlog"
)

// silenceList is the hand-worked gap case (invented): a hit every 0.5 s
// from 0 to 40 s and from 70 to 100 s, both ends included: 81 + 61 hits
// with a 30 s silence between. The median interval is 0.5 s, so the
// default threshold is 10 × 0.5 = 5 s.
func silenceList() []float64 {
	return append(steps(0, 40.25, 0.5), steps(70, 100.25, 0.5)...)
}

func TestGapReported(t *testing.T) {
	s := mustSeries(t, logAt(silenceList()), loadlog.Clock{}, GapRule{})
	if got := s.GapThreshold(); got != 5 {
		t.Errorf("gap threshold %g s, want 5 s (10 × median 0.5 s)", got)
	}
	if g := s.Gaps(); !slices.Equal(g, []Gap{{Start: 40, End: 70}}) {
		t.Fatalf("gaps %v, want one from 40 s to 70 s", g)
	}
	if d := s.Gaps()[0].Duration(); d != 30 {
		t.Errorf("gap lasts %g s, want 30 s", d)
	}
}

func TestGapInRate(t *testing.T) {
	s := mustSeries(t, logAt(silenceList()), loadlog.Clock{}, GapRule{})
	times, rates := s.HitRate(1)
	// 101 windows from 0 s (the last, [100, 101), holds the hit at 100 s).
	// Hand-worked: [39, 40) holds 39 and 39.5: 2 hits/s; [40, 41) holds
	// the hit at 40 s: 1 hit/s, not NaN, since it has a hit; [41, 42) to
	// [69, 70) hold none inside the gap: NaN, 29 windows; [70, 71) holds
	// 70 and 70.5: 2 hits/s; [100, 101): 1 hit/s.
	if len(times) != 101 || times[100] != 100 {
		t.Fatalf("%d windows ending at %g s, want 101 from 0 to 100 s", len(times), times[len(times)-1])
	}
	want := map[int]float64{0: 2, 39: 2, 40: 1, 70: 2, 99: 2, 100: 1}
	for i := 41; i <= 69; i++ {
		want[i] = math.NaN()
	}
	nan := 0
	for i, r := range rates {
		if w, ok := want[i]; ok && !same(r, w, 0) {
			t.Errorf("window %d [%g, %g) s: rate %g, want %g", i, times[i], times[i]+1, r, w)
		}
		if math.IsNaN(r) {
			nan++
		}
	}
	if nan != 29 {
		t.Errorf("%d NaN windows, want the 29 inside the gap", nan)
	}
}

func TestGapThresholdRules(t *testing.T) {
	ts := silenceList()
	for _, c := range []struct {
		name      string
		g         GapRule
		threshold float64
		gaps      int
	}{
		// A fixed threshold longer than the silence: no gap, and the
		// silent windows are plain zeros.
		{"fixed", GapRule{Threshold: 40}, 40, 0},
		{"factor", GapRule{Factor: 2, Min: 0.5}, 1, 1},
		{"min", GapRule{Min: 31}, 31, 0},
	} {
		s := mustSeries(t, logAt(ts), loadlog.Clock{}, c.g)
		if s.GapThreshold() != c.threshold || len(s.Gaps()) != c.gaps {
			t.Errorf("%s: threshold %g s, %d gaps; want %g s, %d", c.name, s.GapThreshold(), len(s.Gaps()), c.threshold, c.gaps)
		}
		if c.gaps == 0 {
			if _, rates := s.HitRate(1); rates[50] != 0 {
				t.Errorf("%s: rate %g in the silence without a gap, want 0", c.name, rates[50])
			}
		}
	}
}

func TestGapFloorOfOneSecond(t *testing.T) {
	// Hits every 0.01 s: 10 × the median is 0.1 s, below the 1 s floor. A
	// 0.5 s pause is not a gap, a 1.5 s pause is (GapRule default).
	ts := append(append(steps(0, 2, 0.01), steps(2.5, 4, 0.01)...), steps(5.49, 6, 0.01)...)
	s := mustSeries(t, logAt(ts), loadlog.Clock{}, GapRule{})
	if s.GapThreshold() != 1 {
		t.Errorf("threshold %g s, want the 1 s floor", s.GapThreshold())
	}
	g := s.Gaps()
	if len(g) != 1 || !same(g[0].Start, 3.99, 1e-9) || !same(g[0].End, 5.49, 1e-9) {
		t.Errorf("gaps %v, want one from 3.99 s to 5.49 s", g)
	}
}
