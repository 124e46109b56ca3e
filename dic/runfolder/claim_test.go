package runfolder

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// A folder with the user's files in it is refused and left as it was; a
// new folder, an empty one and a run folder are accepted (the tool deletes
// only in folders it made: our own rule, no outside source).
func TestClaimRefusesForeignFolder(t *testing.T) {
	foreign := t.TempDir()
	keep := filepath.Join(foreign, "thesis.docx")
	os.WriteFile(keep, []byte("only copy"), 0o644)
	os.Mkdir(filepath.Join(foreign, FieldsDir), 0o755)
	if err := Claim(foreign, "spallscope test"); !errors.Is(err, ErrForeignFolder) {
		t.Fatalf("foreign folder: got %v, want ErrForeignFolder", err)
	}
	if _, err := os.Stat(keep); err != nil {
		t.Fatalf("user's file touched: %v", err)
	}
	if _, err := os.Stat(filepath.Join(foreign, ManifestFile)); !os.IsNotExist(err) {
		t.Fatal("run.json written into a foreign folder")
	}

	fresh := filepath.Join(t.TempDir(), "a", "run")
	if err := Claim(fresh, "spallscope test"); err != nil {
		t.Fatalf("new folder: %v", err)
	}
	if !IsRunFolder(fresh) {
		t.Fatal("claimed folder not marked")
	}
	os.WriteFile(filepath.Join(fresh, "onset.json"), []byte("{}"), 0o644)
	if err := Claim(fresh, "spallscope test"); err != nil {
		t.Fatalf("own run folder refused: %v", err)
	}
	if err := Claim(t.TempDir(), "spallscope test"); err != nil {
		t.Fatalf("empty folder: %v", err)
	}
	// A run folder from before the mark: run.json with a stages section.
	old := t.TempDir()
	SetSection(old, "stages", map[string]any{"track": map[string]any{"complete": true}})
	os.Mkdir(filepath.Join(old, FieldsDir), 0o755)
	if err := Claim(old, "spallscope test"); err != nil {
		t.Fatalf("unmarked older run folder: %v", err)
	}
}

// The temporary files of writes cut short are removed; complete files and
// files merely named alike stay.
func TestRemovePartials(t *testing.T) {
	dir := t.TempDir()
	os.Mkdir(filepath.Join(dir, FieldsDir), 0o755)
	keep := []string{filepath.Join(dir, FieldsDir, "f_0001.csv"), filepath.Join(dir, "notes.partial-1.txt")}
	gone := []string{filepath.Join(dir, FieldsDir, ".f_0002.csv.partial-123"), filepath.Join(dir, ".run.json.partial-9")}
	for _, p := range append(keep, gone...) {
		os.WriteFile(p, []byte("x"), 0o644)
	}
	n, err := RemovePartials(dir)
	if err != nil || n != 2 {
		t.Fatalf("RemovePartials = %d, %v; want 2, nil", n, err)
	}
	for _, p := range keep {
		if _, err := os.Stat(p); err != nil {
			t.Errorf("%s removed", p)
		}
	}
	for _, p := range gone {
		if _, err := os.Stat(p); err == nil {
			t.Errorf("%s left", p)
		}
	}
}

// A folder whose only entries are the lock and another process's
// temporary run.json (a frame part claiming the test folder at the same
// moment) is claimed; a temporary beside a foreign file does not make the
// folder claimable.
func TestClaimWhileAnotherWritesTheMark(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "."+ManifestFile+partialMark+"3866761699"), []byte(`{"fol`), 0o644)
	os.WriteFile(filepath.Join(dir, LockFile), []byte("1 host 2026-12-03T00:00:00Z\n"), 0o644)
	if err := Claim(dir, "spallscope test"); err != nil {
		t.Fatalf("folder with only a temporary run.json and the lock: %v", err)
	}
	if !IsRunFolder(dir) {
		t.Fatal("claimed folder not marked")
	}
	foreign := t.TempDir()
	os.WriteFile(filepath.Join(foreign, "."+ManifestFile+partialMark+"1"), nil, 0o644)
	os.WriteFile(filepath.Join(foreign, "notes.txt"), []byte("mine"), 0o644)
	if err := Claim(foreign, "spallscope test"); !errors.Is(err, ErrForeignFolder) {
		t.Fatalf("foreign file beside a temporary: got %v, want ErrForeignFolder", err)
	}
}
