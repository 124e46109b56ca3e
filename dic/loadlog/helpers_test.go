package loadlog

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// writeLog writes content to a file named name in a fresh temporary
// directory and returns its path.
func writeLog(t *testing.T, name, content string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

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
