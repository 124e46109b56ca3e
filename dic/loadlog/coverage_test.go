package loadlog

import (
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"
)

// benchStress's log spans camera −1.5 to 2.5 s (log 0–4 s, offset 1.5 s).

// A log that ends before the last frames: those frames are counted and
// named, and At flags them out of span (it gives the last row's stress,
// which callers must not present as measured). Before, nothing said so.
func TestCoverLogEndsEarly(t *testing.T) {
	s := benchStress(t)
	times := []float64{0, 1, 2, 3, 4}
	c, err := s.Cover(times)
	if err != nil {
		t.Fatal(err)
	}
	if c.Start != -1.5 || c.End != 2.5 || c.Frames != 5 || c.Inside != 3 || c.Outside() != 2 || !reflect.DeepEqual(c.After, []int{3, 4}) || c.Before != nil {
		t.Errorf("coverage %+v, want frames 3 and 4 after the log", c)
	}
	want := "2 of 5 frames are outside the load log: 2 frames, 3 to 4 (3 to 4 s) after the load log ends at 2.5 s; their stress is not measured (flagged not in span)"
	if c.Note != want {
		t.Errorf("note\n got %q\nwant %q", c.Note, want)
	}
	for _, i := range c.After {
		if _, in := s.At(times[i]); in {
			t.Errorf("At(%g) in span, want not", times[i])
		}
	}
}

func TestCoverBeforeAfterAndNotFinite(t *testing.T) {
	s := benchStress(t)
	c, err := s.Cover([]float64{-3, -1.5, 0, math.NaN(), 2.5, 7})
	if err != nil {
		t.Fatal(err)
	}
	want := "3 of 6 frames are outside the load log: frame 0 (-3 s) before the load log starts at -1.5 s; frame 5 (7 s) after the load log ends at 2.5 s; frame 3 (NaN s) without a finite time; their stress is not measured (flagged not in span)"
	if c.Inside != 3 || c.Note != want {
		t.Errorf("coverage %+v,\nwant note %q", c, want)
	}
	all, err := s.Cover([]float64{-1.5, 2.5})
	if err != nil || all.Note != "" || all.Outside() != 0 {
		t.Errorf("frames on the log's ends: %+v %v, want all covered and no note", all, err)
	}
	none, err := s.Cover(nil)
	if err != nil || none.Frames != 0 || none.Note != "" {
		t.Errorf("no frames: %+v %v, want no error", none, err)
	}
}

// A log that never overlaps the camera clock (a wrong offset, another
// test's log) is an error wrapping ErrNoOverlap; before, every frame got
// the last row's stress.
func TestCoverNoOverlap(t *testing.T) {
	s := benchStress(t)
	_, err := s.Cover([]float64{100, 101, 102})
	if !errors.Is(err, ErrNoOverlap) {
		t.Fatalf("error %v, want ErrNoOverlap", err)
	}
	for _, part := range []string{s.Log.Path, "spans camera times -1.5 to 2.5 s (log clock 0 to 4 s, offset 1.5 s)", "none of the 3 frames (100 to 102 s)", "check the clock offset or sync pair"} {
		if !strings.Contains(err.Error(), part) {
			t.Errorf("error %q lacks %q", err, part)
		}
	}
	if _, err := s.Cover([]float64{math.NaN()}); !errors.Is(err, ErrNoOverlap) {
		t.Errorf("only a NaN time: error %v, want ErrNoOverlap", err)
	}
	if _, err := (&Stress{}).Cover([]float64{1}); err == nil {
		t.Error("a Stress without a log: want an error")
	}
}

// The numeric options of the package: an area so small that forces become
// infinite stresses, a clock whose offset pushes times past float64, a
// comment prefix that would swallow data rows. Each error names the option.
func TestOptionsInRange(t *testing.T) {
	l := mustRead(t, "bench.csv", benchLog, Format{})
	if _, err := NewStress(l, 1e-310, Clock{}); err == nil || !strings.Contains(err.Error(), "loaded area 1e-310 mm² is not a finite stress") {
		t.Errorf("area 1e-310: error %v, want the non-finite stress named", err)
	}
	far := &Log{Path: "far", Time: []float64{0, 1e308}, Force: []float64{1, 2}}
	if _, err := NewStress(far, 2500, Clock{Offset: -1e308}); err == nil || !strings.Contains(err.Error(), "far row 2: log time 1e+308 s is camera time +Inf s") {
		t.Errorf("offset −1e308 on a log to 1e308 s: error %v, want row 2's infinite camera time refused", err)
	}
	nan := &Log{Path: "hand", Time: []float64{0, 1}, Force: []float64{1, math.NaN()}}
	if _, err := NewStress(nan, 2500, Clock{}); err == nil || !strings.Contains(err.Error(), "hand row 2: force NaN N") {
		t.Errorf("hand-made NaN force: error %v, want row 2 named", err)
	}
	path := writeLog(t, "c.csv", "time_s,force_kN\n0,1\n1,2\n")
	for _, c := range []struct {
		f    Format
		want string
	}{
		{Format{Comment: "1"}, `comment "1": a comment prefix that starts like a number would skip data rows`},
		{Format{Comment: " #"}, `comment " #": a comment prefix cannot start with a blank`},
		{Format{SkipLines: -3}, "skip_lines -3"},
	} {
		if _, err := Read(path, c.f); err == nil || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), path) {
			t.Errorf("%+v: error %v, want %q and the file", c.f, err, c.want)
		}
	}
}
