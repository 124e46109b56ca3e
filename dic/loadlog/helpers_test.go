package loadlog

import (
	"math"
	"testing"

	"spallscope/dic/logtable/logtabletest"
)

// writeLog writes a log file for a test (see logtabletest.WriteFile).
func writeLog(t *testing.T, name, content string) string {
	return logtabletest.WriteFile(t, name, content)
}

// wantParseError checks an error's place (see logtabletest.WantParseError).
var wantParseError = logtabletest.WantParseError

// mustRead reads a log written by writeLog and fails the test on error.
func mustRead(t *testing.T, name, content string, f Format) *Log {
	t.Helper()
	l, err := Read(writeLog(t, name, content), f)
	if err != nil {
		t.Fatalf("Read: %v", err)
	}
	return l
}

// near reports whether got is within rel (relative) of want.
func near(got, want, rel float64) bool {
	if got == want {
		return true
	}
	return math.Abs(got-want) <= rel*math.Max(math.Abs(got), math.Abs(want))
}
