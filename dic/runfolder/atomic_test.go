package runfolder

import (
	"bufio"
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// A failed write leaves the previous file intact and no temporary behind
// (the rename-into-place rule of the run folder, common practice, no source).
func TestWriteAtomicKeepsOldFileOnError(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "zones.csv")
	if err := WriteAtomic(p, func(w *bufio.Writer) error { _, err := w.WriteString("v1\n"); return err }); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("disk full")
	err := WriteAtomic(p, func(w *bufio.Writer) error { w.WriteString("half"); return boom })
	if !errors.Is(err, boom) {
		t.Fatalf("error %v should wrap the writer's error", err)
	}
	if b, _ := os.ReadFile(p); string(b) != "v1\n" {
		t.Errorf("file now %q, want the old content", b)
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 1 {
		t.Errorf("%d entries in the folder, want only the file", len(ents))
	}
}
