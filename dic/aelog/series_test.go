package aelog

import (
	"math"
	"testing"

	"spallscope/dic/loadlog"
)

// tenHits is a hand-worked hit list (invented numbers): ten hits whose
// times and energies are exact in binary, so that the sums below are exact.
//
//	time s   0    0.25 0.5  1.25 2    2.5  2.75 3    3.5  4.75
//	energy   1.5  0.25 4    2    0.5  8    1    0.75 3    16
//	cum. E   1.5  1.75 5.75 7.75 8.25 16.25 17.25 18  21   37
const tenHits = "# ten hits, invented\n" +
	"time_s,energy_aJ,counts\n" +
	"0,1.5,3\n0.25,0.25,1\n0.5,4,9\n1.25,2,5\n2,0.5,2\n" +
	"2.5,8,17\n2.75,1,4\n3,0.75,2\n3.5,3,7\n4.75,16,30\n"

func TestCumulativeHandWorked(t *testing.T) {
	l := mustRead(t, "ten.csv", tenHits, Format{})
	s := mustSeries(t, l, loadlog.Clock{}, GapRule{})
	times, hits, energy := s.Cumulative()
	// Cumulative sums by definition (common practice, no source); the
	// values are worked by hand in the comment on tenHits. Exact.
	equalSlices(t, "times", times, []float64{0, 0.25, 0.5, 1.25, 2, 2.5, 2.75, 3, 3.5, 4.75}, 0)
	equalSlices(t, "hits", hits, []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, 0)
	equalSlices(t, "energy", energy, []float64{1.5, 1.75, 5.75, 7.75, 8.25, 16.25, 17.25, 18, 21, 37}, 0)
	if l.EnergyUnit != "aJ" {
		t.Errorf("energy unit %q, want aJ from the header", l.EnergyUnit)
	}
}

func TestCumulativeWithoutEnergy(t *testing.T) {
	l := mustRead(t, "amp.csv", "time_s,amplitude_dB\n0,40\n1,41\n1,42\n", Format{})
	s := mustSeries(t, l, loadlog.Clock{}, GapRule{})
	times, hits, energy := s.Cumulative()
	// Equal times each make a step (definition of a cumulative count).
	equalSlices(t, "times", times, []float64{0, 1, 1}, 0)
	equalSlices(t, "hits", hits, []float64{1, 2, 3}, 0)
	if energy != nil {
		t.Errorf("energy %v for a list without an energy column, want nil", energy)
	}
}

func TestHitRateHandWorked(t *testing.T) {
	l := mustRead(t, "ten.csv", tenHits, Format{})
	s := mustSeries(t, l, loadlog.Clock{}, GapRule{})
	// Rate = hits in [t_i, t_i + w) / w, windows laid from the first hit
	// (definition, common practice, no source). Counted by hand from the
	// times of tenHits; exact. The median interval is 0.5 s, so the gap
	// threshold is 5 s and no window is NaN.
	for _, c := range []struct {
		w            float64
		times, rates []float64
	}{
		{1, []float64{0, 1, 2, 3, 4}, []float64{3, 1, 3, 2, 1}},
		{2, []float64{0, 2, 4}, []float64{2, 2.5, 0.5}},
		{0.5, []float64{0, 0.5, 1, 1.5, 2, 2.5, 3, 3.5, 4, 4.5}, []float64{4, 2, 2, 0, 2, 4, 2, 2, 0, 2}},
		{10, []float64{0}, []float64{1}},
	} {
		times, rates := s.HitRate(c.w)
		equalSlices(t, "times", times, c.times, 0)
		equalSlices(t, "rates", rates, c.rates, 0)
	}
}

func TestHitRateAddsUp(t *testing.T) {
	// Σ rate·w over the windows is the number of hits, whatever the
	// window (definition). Hits every 0.1 s put many on window edges, where
	// rounding could lose or double one. Tolerance 1e-9 hits.
	l := logAt(steps(3, 17.05, 0.1))
	s := mustSeries(t, l, loadlog.Clock{}, GapRule{})
	for _, w := range []float64{0.1, 0.3, 0.7, 1, 2.5, 100} {
		_, rates := s.HitRate(w)
		sum := 0.0
		for _, r := range rates {
			sum += r * w
		}
		if math.Abs(sum-float64(l.Len())) > 1e-9 {
			t.Errorf("window %g s: rates add up to %g hits, want %d", w, sum, l.Len())
		}
	}
}

func TestHitRateBadWindow(t *testing.T) {
	s := mustSeries(t, logAt([]float64{0, 1, 2}), loadlog.Clock{}, GapRule{})
	for _, w := range []float64{0, -1, math.NaN(), math.Inf(1), 1e-12} {
		if times, rates := s.HitRate(w); times != nil || rates != nil {
			t.Errorf("window %g s: %d windows, want none", w, len(times))
		}
	}
}

func TestSeriesRejects(t *testing.T) {
	x, y := 1.0, 2.0
	for _, c := range []struct {
		name  string
		l     *Log
		clock loadlog.Clock
		g     GapRule
	}{
		{"nil", nil, loadlog.Clock{}, GapRule{}},
		{"empty", &Log{}, loadlog.Clock{}, GapRule{}},
		{"clock", logAt([]float64{0, 1}), loadlog.Clock{Offset: 1, SyncFrameTime: &x, SyncLogTime: &y}, GapRule{}},
		{"half-sync", logAt([]float64{0, 1}), loadlog.Clock{SyncFrameTime: &x}, GapRule{}},
		{"unsorted", logAt([]float64{0, 2, 1}), loadlog.Clock{}, GapRule{}},
		{"nan", logAt([]float64{0, math.NaN()}), loadlog.Clock{}, GapRule{}},
		{"gap", logAt([]float64{0, 1}), loadlog.Clock{}, GapRule{Factor: -1}},
		{"gap-nan", logAt([]float64{0, 1}), loadlog.Clock{}, GapRule{Threshold: math.NaN()}},
	} {
		if _, err := c.l.Series(c.clock, c.g); err == nil {
			t.Errorf("%s: accepted", c.name)
		}
	}
}

func TestLogSpan(t *testing.T) {
	l := mustRead(t, "ten.csv", tenHits, Format{})
	if t0, t1 := l.Span(); t0 != 0 || t1 != 4.75 {
		t.Errorf("Span = %g, %g, want 0, 4.75", t0, t1)
	}
	if t0, t1 := (&Log{}).Span(); !math.IsNaN(t0) || !math.IsNaN(t1) {
		t.Errorf("empty Span = %g, %g, want NaN, NaN", t0, t1)
	}
}
