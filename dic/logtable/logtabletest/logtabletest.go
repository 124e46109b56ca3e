// Package logtabletest holds the test support shared by the packages that
// read instrument logs on logtable (loadlog, aelog): writing a log file for
// a test and checking that an error points at the right line and column.
package logtabletest

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/logtable"
)

// WriteFile writes content to a file named name in a fresh temporary
// directory and returns its path.
func WriteFile(t testing.TB, name, content string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// WantParseError checks that err is a *logtable.ParseError at line and
// column (0: none) whose message contains every one of parts.
func WantParseError(t testing.TB, name string, err error, line, col int, parts ...string) {
	t.Helper()
	var pe *logtable.ParseError
	if !errors.As(err, &pe) {
		t.Errorf("%s: error %v, want a *ParseError", name, err)
		return
	}
	if pe.Line != line || pe.Column != col {
		t.Errorf("%s: error at line %d column %d, want line %d column %d: %v", name, pe.Line, pe.Column, line, col, err)
	}
	for _, p := range parts {
		if !strings.Contains(err.Error(), p) {
			t.Errorf("%s: error %q does not contain %q", name, err, p)
		}
	}
}

// WantBrief checks that err's message is at most limit bytes long: an
// error about a huge cell shows an excerpt of it, never all of it.
func WantBrief(t testing.TB, name string, err error, limit int) {
	t.Helper()
	if err != nil && len(err.Error()) > limit {
		t.Errorf("%s: error of %d bytes, want at most %d: %.200s…", name, len(err.Error()), limit, err)
	}
}
