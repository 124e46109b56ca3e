package aelog

import (
	"math"
	"slices"
	"testing"

	"spallscope/dic/loadlog"
)

// riseList is the hand-worked onset case (invented): one hit every 0.5 s
// from 0 to 19.5 s, then 10 hits/s from 20 s to 40 s. The record spans
// 0..40 s, so the default background span is [0, 4) s: 8 hits, 2 hits/s,
// and the threshold is 3 × 2 = 6 hits/s, more than 6 hits in a 1 s window.
// The window from the hit at 19.5 s holds 19.5 and 20.0..20.4, 6 hits, not
// more than 6; the windows from 20, 21 and 22 s hold 10 each. Onset: 20 s.
func riseList() []float64 {
	return append(steps(0, 20, 0.5), steps(20, 40.05, 0.1)...)
}

func TestOnsetHandWorked(t *testing.T) {
	s := mustSeries(t, logAt(riseList()), loadlog.Clock{}, GapRule{})
	o, ok, err := s.Onset(OnsetRule{})
	if err != nil || !ok {
		t.Fatalf("Onset: ok %v, err %v", ok, err)
	}
	// Tolerance of the brief: one window (1 s). The hand-worked value is
	// exactly the hit at 20 s.
	if math.Abs(o.Time-20) > o.Window {
		t.Errorf("onset %g s, want 20 s ± %g s", o.Time, o.Window)
	}
	if o.Time != 20 {
		t.Errorf("onset %g s, want the hit at 20 s (hand-worked)", o.Time)
	}
	// Background figures, hand-worked in the comment on riseList; exact.
	want := Onset{Time: 20, BackgroundStart: 0, BackgroundEnd: 4, BackgroundHits: 8, Background: 2, Threshold: 6, Rate: 10, Window: 1, Persist: 3}
	if o != want {
		t.Errorf("onset %+v, want %+v", o, want)
	}
}

// splitmix64 is a small deterministic generator for the Poisson-like case,
// written out so that the numbers cannot change with the Go release.
type splitmix64 uint64

func (x *splitmix64) float() float64 {
	*x += 0x9e3779b97f4a7c15
	z := uint64(*x)
	z = (z ^ z>>30) * 0xbf58476d1ce4e5b9
	z = (z ^ z>>27) * 0x94d049bb133111eb
	z ^= z >> 31
	return (float64(z>>11) + 0.5) / (1 << 53) // in (0, 1)
}

// poissonTimes returns hit times of a Poisson process of rate per second on
// [from, to): exponential intervals −ln(U)/rate.
func poissonTimes(x *splitmix64, from, to, rate float64) []float64 {
	var ts []float64
	for t := from - math.Log(x.float())/rate; t < to; t -= math.Log(x.float()) / rate {
		ts = append(ts, t)
	}
	return ts
}

func TestOnsetPoissonLike(t *testing.T) {
	// Random-looking but fixed: 2 hits/s to 20 s, 10 hits/s from 20 to
	// 40 s. The rule should find the rise within one window of 20 s
	// (tolerance of the brief); the exact hit depends on the draw.
	x := splitmix64(20260101)
	ts := append(poissonTimes(&x, 0, 20, 2), poissonTimes(&x, 20, 40, 10)...)
	s := mustSeries(t, logAt(ts), loadlog.Clock{}, GapRule{})
	o, ok, err := s.Onset(OnsetRule{})
	if err != nil || !ok {
		t.Fatalf("Onset: ok %v, err %v (background %g hits/s)", ok, err, o.Background)
	}
	if math.Abs(o.Time-20) > o.Window {
		t.Errorf("onset %g s, want 20 s ± %g s (background %g hits/s, %d hits)", o.Time, o.Window, o.Background, o.BackgroundHits)
	}
}

func TestOnsetNone(t *testing.T) {
	// A steady 2 hits/s for 40 s never holds more than 6 hits in 1 s
	// (hand-worked: every 1 s window from a hit holds 2).
	s := mustSeries(t, logAt(steps(0, 40.25, 0.5)), loadlog.Clock{}, GapRule{})
	o, ok, err := s.Onset(OnsetRule{})
	if err != nil || ok {
		t.Fatalf("Onset: ok %v (%g s), err %v; want no onset", ok, o.Time, err)
	}
	if !math.IsNaN(o.Time) || !math.IsNaN(o.Rate) || o.Background != 2 {
		t.Errorf("no onset: time %g, rate %g, background %g; want NaN, NaN, 2", o.Time, o.Rate, o.Background)
	}
}

func TestOnsetPersistence(t *testing.T) {
	// 2 hits/s, with a burst of 10 hits/s over [20, 22) s only: two 1 s
	// windows above 6 hits, then 2 hits/s again. P = 3 needs three windows
	// in a row: no onset (hand-worked: the third window from a hit in the
	// burst lies in [22, 25) s and holds 2 background hits; the window from
	// 19.5 s holds 6). P = 2: 20 s.
	ts := append(append(steps(0, 20, 0.5), steps(20, 21.95, 0.1)...), steps(22, 40.25, 0.5)...)
	s := mustSeries(t, logAt(ts), loadlog.Clock{}, GapRule{})
	if o, ok, err := s.Onset(OnsetRule{}); err != nil || ok {
		t.Errorf("P=3: onset %g s (ok %v, err %v), want none", o.Time, ok, err)
	}
	o, ok, err := s.Onset(OnsetRule{Persist: 2})
	if err != nil || !ok || o.Time != 20 {
		t.Errorf("P=2: onset %g s (ok %v, err %v), want 20 s", o.Time, ok, err)
	}
}

func TestOnsetAtTheEnd(t *testing.T) {
	// A rise in the last 2 s of the record: the third window lies past the
	// last hit and holds none, so the onset cannot be confirmed (OnsetRule:
	// windows past the last hit hold none).
	ts := append(steps(0, 38, 0.5), steps(38, 40.05, 0.1)...)
	s := mustSeries(t, logAt(ts), loadlog.Clock{}, GapRule{})
	if o, ok, err := s.Onset(OnsetRule{}); err != nil || ok {
		t.Errorf("onset %g s (ok %v, err %v), want none", o.Time, ok, err)
	}
}

func TestOnsetBackgroundFloor(t *testing.T) {
	// One hit at 0 s, silence, then 1 hit/s from 12 s to 30 s. The given
	// background span [1, 11) s holds no hit: the floor makes the
	// background 1 hit / 10 s = 0.1 hits/s, the threshold 0.3 hits/s, and
	// one hit per 1 s window is above it. The search starts at 1 s, so the
	// onset is the hit at 12 s (hand-worked; exact).
	ts := append([]float64{0}, steps(12, 30.5, 1)...)
	s := mustSeries(t, logAt(ts), loadlog.Clock{}, GapRule{})
	b0, b1 := 1.0, 11.0
	o, ok, err := s.Onset(OnsetRule{BackgroundStart: &b0, BackgroundEnd: &b1})
	if err != nil || !ok {
		t.Fatalf("Onset: ok %v, err %v", ok, err)
	}
	if o.Time != 12 || !o.Floored || o.BackgroundHits != 0 || o.Background != 0.1 || math.Abs(o.Threshold-0.3) > 1e-15 {
		t.Errorf("onset %+v, want 12 s, floored, 0 hits, background 0.1, threshold 0.3 hits/s", o)
	}
	// The silence is also a gap: median interval 1 s, threshold 10 s, and
	// 0..12 s is longer.
	if g := s.Gaps(); !slices.Equal(g, []Gap{{0, 12}}) {
		t.Errorf("gaps %v, want [{0 12}]", g)
	}
}

func TestOnsetBackgroundSpanCut(t *testing.T) {
	// A span reaching before the first hit is cut to the record: [-5, 4)
	// becomes [0, 4), 8 hits, 2 hits/s, as the default (hand-worked in
	// riseList).
	s := mustSeries(t, logAt(riseList()), loadlog.Clock{}, GapRule{})
	b0, b1 := -5.0, 4.0
	o, ok, err := s.Onset(OnsetRule{BackgroundStart: &b0, BackgroundEnd: &b1})
	if err != nil || !ok || o.BackgroundStart != 0 || o.BackgroundEnd != 4 || o.Background != 2 || o.Time != 20 {
		t.Errorf("onset %+v (ok %v, err %v), want span 0..4 s, 2 hits/s, onset 20 s", o, ok, err)
	}
}

func TestOnsetRejects(t *testing.T) {
	s := mustSeries(t, logAt(riseList()), loadlog.Clock{}, GapRule{})
	a, b, late := 5.0, 1.0, 50.0
	for _, c := range []struct {
		name string
		r    OnsetRule
	}{
		{"window", OnsetRule{Window: -1}},
		{"window-nan", OnsetRule{Window: math.NaN()}},
		{"factor", OnsetRule{Factor: 0.5}},
		{"persist", OnsetRule{Persist: -2}},
		{"fraction", OnsetRule{BackgroundFraction: 1.5}},
		{"half-span", OnsetRule{BackgroundStart: &a}},
		{"reversed", OnsetRule{BackgroundStart: &a, BackgroundEnd: &b}},
		{"outside", OnsetRule{BackgroundStart: &late, BackgroundEnd: &[]float64{60}[0]}},
	} {
		if _, _, err := s.Onset(c.r); err == nil {
			t.Errorf("%s: accepted %+v", c.name, c.r)
		}
	}
	one := mustSeries(t, logAt([]float64{3, 3}), loadlog.Clock{}, GapRule{})
	if _, _, err := one.Onset(OnsetRule{}); err == nil {
		t.Error("a record that spans no time: accepted")
	}
}
