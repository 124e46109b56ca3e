package runfolder

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A lens record accepts its file while it holds the bytes it was hashed
// from (SHA-256 of "lens-a", computed with sha256sum, GNU coreutils), and
// refuses it, naming the file, once they change.
func TestLensRecordUnchanged(t *testing.T) {
	path := filepath.Join(t.TempDir(), "lens.json")
	if err := os.WriteFile(path, []byte("lens-a"), 0o644); err != nil {
		t.Fatal(err)
	}
	rec := &LensRecord{File: path, SHA256: "a496b2c65e7bf7ba56b4cbbe6fb58e397276f7ef193e2c30171a0507fd8ae890"}
	if err := rec.Unchanged(path); err != nil {
		t.Errorf("unchanged file: %v", err)
	}
	if err := os.WriteFile(path, []byte("lens-b"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := rec.Unchanged(path); err == nil || !strings.Contains(err.Error(), path) || !strings.Contains(err.Error(), "changed since tracking") {
		t.Errorf("changed file: error %v, want it to name %s and say it changed", err, path)
	}
	if err := (&LensRecord{File: path}).Unchanged(path); err != nil {
		t.Errorf("a record without a hash: %v, want it taken as it is", err)
	}
	if err := rec.Unchanged(filepath.Join(t.TempDir(), "gone.json")); err == nil || !strings.Contains(err.Error(), "gone.json") {
		t.Errorf("missing file: error %v, want it named", err)
	}
}
