package aelog

import (
	"math"
	"testing"

	"spallscope/dic/loadlog"
	"spallscope/dic/logtable/logtabletest"
)

// writeList writes a hit list for a test (see logtabletest.WriteFile).
func writeList(t *testing.T, name, content string) string {
	return logtabletest.WriteFile(t, name, content)
}

// mustRead reads a list written by writeList and fails the test on error.
func mustRead(t *testing.T, name, content string, f Format) *Log {
	t.Helper()
	l, err := Read(writeList(t, name, content), f)
	if err != nil {
		t.Fatalf("Read: %v", err)
	}
	return l
}

// wantParseError checks an error's place (see logtabletest.WantParseError).
var wantParseError = logtabletest.WantParseError

// logAt returns a Log with one hit of energy 1 at each time, for tests of
// the derived series.
func logAt(times []float64) *Log {
	l := &Log{Path: "test", Has: Columns{Energy: true}}
	for _, t := range times {
		l.Hits = append(l.Hits, Hit{Time: t, Energy: 1})
	}
	return l
}

// mustSeries returns l's series on clock with the gap rule g.
func mustSeries(t *testing.T, l *Log, clock loadlog.Clock, g GapRule) *Series {
	t.Helper()
	s, err := l.Series(clock, g)
	if err != nil {
		t.Fatalf("Series: %v", err)
	}
	return s
}

// steps returns the times from, from+step, ... below to (to excluded),
// each computed as from + i·step so that errors do not pile up.
func steps(from, to, step float64) []float64 {
	var ts []float64
	for i := 0; ; i++ {
		t := from + float64(i)*step
		if t >= to {
			return ts
		}
		ts = append(ts, t)
	}
}

// same reports whether a and b are equal within tol, NaN equal to NaN.
func same(a, b, tol float64) bool {
	if math.IsNaN(a) || math.IsNaN(b) {
		return math.IsNaN(a) && math.IsNaN(b)
	}
	return math.Abs(a-b) <= tol
}

// equalSlices checks got against want element by element within tol.
func equalSlices(t *testing.T, what string, got, want []float64, tol float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Errorf("%s: %d values %v, want %d %v", what, len(got), got, len(want), want)
		return
	}
	for i := range got {
		if !same(got[i], want[i], tol) {
			t.Errorf("%s[%d] = %g, want %g (±%g)", what, i, got[i], want[i], tol)
		}
	}
}
