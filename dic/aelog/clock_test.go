package aelog

import (
	"math"
	"testing"

	"spallscope/dic/loadlog"
)

// TestClockOffset checks that an AE clock 3.5 s ahead of the camera (log
// time = camera time + 3.5 s, loadlog.Clock's definition) moves every
// derived time by −3.5 s and leaves the counts alone. Tolerance 1e-9 s for
// the subtraction's rounding.
func TestClockOffset(t *testing.T) {
	ts := append(riseList(), steps(60, 80, 0.5)...) // a rise at 20 s and a gap 40..60 s
	l := logAt(ts)
	base := mustSeries(t, l, loadlog.Clock{}, GapRule{})
	for _, c := range []struct {
		name  string
		clock loadlog.Clock
	}{
		{"offset", loadlog.Clock{Offset: 3.5}},
		{"sync", loadlog.Synced(10, 13.5)}, // camera 10 s is AE 13.5 s
	} {
		s := mustSeries(t, l, c.clock, GapRule{})
		const tol = 1e-9
		moved := func(what string, got, want float64) {
			if !same(got, want-3.5, tol) {
				t.Errorf("%s: %s %g s, want %g − 3.5 s", c.name, what, got, want)
			}
		}
		// A hit at AE time 20 s is at camera time 16.5 s.
		if got := s.Times()[40]; l.Hits[40].Time != 20 || got != 16.5 {
			t.Errorf("%s: hit at AE 20 s is at camera %g s, want 16.5 s", c.name, got)
		}
		b0, b1 := base.Span()
		s0, s1 := s.Span()
		moved("span start", s0, b0)
		moved("span end", s1, b1)

		bt, br := base.HitRate(1)
		st, sr := s.HitRate(1)
		if len(st) != len(bt) {
			t.Fatalf("%s: %d windows, want %d", c.name, len(st), len(bt))
		}
		for i := range bt {
			moved("window", st[i], bt[i])
			if !same(sr[i], br[i], 0) {
				t.Errorf("%s: window %d rate %g, want %g as without the offset", c.name, i, sr[i], br[i])
			}
		}
		bct, _, _ := base.Cumulative()
		sct, _, _ := s.Cumulative()
		for i := range bct {
			moved("cumulative", sct[i], bct[i])
		}
		bg, sg := base.Gaps(), s.Gaps()
		if len(bg) != 1 || len(sg) != 1 {
			t.Fatalf("%s: gaps %v and %v, want one each", c.name, bg, sg)
		}
		moved("gap start", sg[0].Start, bg[0].Start)
		moved("gap end", sg[0].End, bg[0].End)

		bo, bok, _ := base.Onset(OnsetRule{})
		so, sok, err := s.Onset(OnsetRule{})
		if err != nil || !bok || !sok {
			t.Fatalf("%s: onsets ok %v, %v, err %v", c.name, bok, sok, err)
		}
		moved("onset", so.Time, bo.Time)
		moved("background start", so.BackgroundStart, bo.BackgroundStart)
		if so.Background != bo.Background || math.IsNaN(so.Time) {
			t.Errorf("%s: background %g, want %g", c.name, so.Background, bo.Background)
		}
	}
}
