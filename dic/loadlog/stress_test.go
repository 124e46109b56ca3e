package loadlog

import (
	"math"
	"strings"
	"testing"
)

// benchLog is an invented log: two comment lines, a header and five rows.
const benchLog = `# bench test 7, invented numbers
# 50 x 50 mm prism, loaded area 2500 mm2
time_s,force_kN
0.0,0
1.0,50
2.0,120
3.0,200
4.0,150
`

func benchStress(t *testing.T) *Stress {
	t.Helper()
	l := mustRead(t, "bench.csv", benchLog, Format{})
	s, err := NewStress(l, 2500, Clock{Offset: 1.5})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestStressAtWithOffset(t *testing.T) {
	s := benchStress(t)
	if len(s.Log.Notes) != 0 {
		t.Errorf("notes %q, want none (units are in the header)", s.Log.Notes)
	}
	// Hand-worked, σ = F/A with linear interpolation (definitions):
	// camera 1.25 s + offset 1.5 s = log 2.75 s, between rows 2.0 s (120 kN)
	// and 3.0 s (200 kN): F = 120 + 0.75·(200−120) = 180 kN = 180000 N;
	// σ = 180000 N / 2500 mm² = 72 MPa.
	for _, c := range []struct{ camera, want float64 }{
		{1.25, 72},
		{0.5, 48},  // log 2.0 s, on a row: 120000 / 2500
		{-1.0, 10}, // log 0.5 s: 25 kN = 25000 N / 2500 mm²
		{2.0, 70},  // log 3.5 s: 175 kN / 2500 mm²
	} {
		got, in := s.At(c.camera)
		if !near(got, c.want, 1e-12) || !in {
			t.Errorf("At(%g) = %g, %v; want %g MPa, true", c.camera, got, in, c.want)
		}
	}
	// Peak 200 kN at log 3.0 s = camera 1.5 s: 200000 / 2500 = 80 MPa.
	peak, at := s.Peak()
	if peak != 80 || at != 1.5 {
		t.Errorf("Peak() = %g MPa at %g s, want 80 MPa at 1.5 s", peak, at)
	}
	// 72 / 80 = 90 %.
	if p := s.PercentOfPeak(72); !near(p, 90, 1e-12) {
		t.Errorf("PercentOfPeak(72) = %g, want 90", p)
	}
}

func TestFramesOutsideSpan(t *testing.T) {
	s := benchStress(t)
	// Log span 0–4 s is camera −1.5 to 2.5 s (offset 1.5 s).
	got := s.Frames([]float64{-5, -1.5, 0, 1.25, 2.5, 10})
	want := []FrameStress{
		{Time: -5, Stress: 0, Percent: 0, InSpan: false},    // before the log: first row, 0 kN
		{Time: -1.5, Stress: 0, Percent: 0, InSpan: true},   // first row exactly
		{Time: 0, Stress: 34, Percent: 42.5, InSpan: true},  // log 1.5 s: 85 kN / 2500; 34/80
		{Time: 1.25, Stress: 72, Percent: 90, InSpan: true}, // as in TestStressAtWithOffset
		{Time: 2.5, Stress: 60, Percent: 75, InSpan: true},  // last row exactly: 150 kN / 2500
		{Time: 10, Stress: 60, Percent: 75, InSpan: false},  // after the log: last row
	}
	for i := range want {
		g, w := got[i], want[i]
		if g.Time != w.Time || !near(g.Stress, w.Stress, 1e-12) || !near(g.Percent, w.Percent, 1e-12) || g.InSpan != w.InSpan {
			t.Errorf("frame %d: got %+v, want %+v", i, g, w)
		}
	}
}

func TestSyncPairEqualsOffset(t *testing.T) {
	l := mustRead(t, "bench.csv", benchLog, Format{})
	// Camera 10 s ↔ log 13.5 s is an offset of 13.5 − 10 = 3.5 s.
	sync := Synced(10, 13.5)
	if got := sync.LogTime(0); got != 3.5 {
		t.Fatalf("LogTime(0) = %g, want 3.5", got)
	}
	a, err := NewStress(l, 2500, sync)
	if err != nil {
		t.Fatal(err)
	}
	b, err := NewStress(l, 2500, Clock{Offset: 3.5})
	if err != nil {
		t.Fatal(err)
	}
	for _, ct := range []float64{-4, -3.5, -2.25, -1, 0.5, 1} {
		sa, ia := a.At(ct)
		sb, ib := b.At(ct)
		if sa != sb || ia != ib {
			t.Errorf("At(%g): sync pair %g %v, offset %g %v", ct, sa, ia, sb, ib)
		}
	}
	// Camera −2.25 s is log 1.25 s: 50 + 0.25·70 = 67.5 kN; 67500 / 2500 = 27 MPa.
	if got, _ := a.At(-2.25); !near(got, 27, 1e-12) {
		t.Errorf("At(-2.25) = %g, want 27 MPa", got)
	}
	if _, at := a.Peak(); at != -0.5 {
		t.Errorf("peak camera time %g, want 3.0 − 3.5 = −0.5 s", at)
	}
}

func TestClockValidate(t *testing.T) {
	half := 2.0
	nan := math.NaN()
	for _, c := range []struct {
		clock Clock
		want  string // "" for valid
	}{
		{Clock{}, ""},
		{Clock{Offset: -2}, ""},
		{Synced(1, 2), ""},
		{Clock{Offset: 3.5, SyncFrameTime: Synced(10, 13.5).SyncFrameTime, SyncLogTime: Synced(10, 13.5).SyncLogTime}, "not both"},
		{Clock{SyncFrameTime: &half}, "both sync_frame_time_s and sync_log_time_s"},
		{Clock{SyncLogTime: &half}, "both sync_frame_time_s and sync_log_time_s"},
		{Clock{Offset: nan}, "finite"},
		{Synced(nan, 1), "finite"},
	} {
		err := c.clock.Validate()
		if c.want == "" {
			if err != nil {
				t.Errorf("%+v: %v", c.clock, err)
			}
			continue
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: error %v, want one containing %q", c.clock, err, c.want)
		}
	}
}

func TestNewStressRejects(t *testing.T) {
	l := mustRead(t, "bench.csv", benchLog, Format{})
	for _, a := range []float64{0, -2500, math.NaN(), math.Inf(1)} {
		if _, err := NewStress(l, a, Clock{}); err == nil || !strings.Contains(err.Error(), "positive area") {
			t.Errorf("area %g: error %v, want one asking for a positive area", a, err)
		}
	}
	both := Synced(10, 13.5)
	both.Offset = 3.5
	if _, err := NewStress(l, 2500, both); err == nil || !strings.Contains(err.Error(), "not both") {
		t.Errorf("offset and sync pair: error %v, want a refusal", err)
	}
	if _, err := NewStress(nil, 2500, Clock{}); err == nil {
		t.Error("nil log accepted")
	}
	if _, err := NewStress(&Log{}, 2500, Clock{}); err == nil {
		t.Error("empty log accepted")
	}
}

func TestPercentOfPeakWithoutCompression(t *testing.T) {
	// Common practice, no source: a percentage of a peak that is not a
	// compressive load means nothing.
	l := &Log{Time: []float64{0, 1}, Force: []float64{0, -10}}
	s, err := NewStress(l, 1, Clock{})
	if err != nil {
		t.Fatal(err)
	}
	if p := s.PercentOfPeak(0); !math.IsNaN(p) {
		t.Errorf("PercentOfPeak = %g, want NaN when the peak is 0", p)
	}
	if fs := s.Frames([]float64{0.5}); !math.IsNaN(fs[0].Percent) || fs[0].Stress != -5 {
		t.Errorf("Frames = %+v, want stress −5 MPa and NaN percent", fs)
	}
}

func TestStressWithoutLog(t *testing.T) {
	var s Stress
	if v, in := s.At(1); !math.IsNaN(v) || in {
		t.Errorf("At on a Stress without a Log = %g %v, want NaN false", v, in)
	}
	if v, at := s.Peak(); !math.IsNaN(v) || !math.IsNaN(at) {
		t.Errorf("Peak on a Stress without a Log = %g %g, want NaN NaN", v, at)
	}
}
