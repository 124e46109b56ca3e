package job

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A face name is the name of its folder under RUN/faces: one that would
// leave it ("../../escape", "a/b", "..") stops the run before any face runs, with an
// error naming the face's entry, and nothing is written outside the run
// folder.
func TestFacesRefuseNamesThatLeaveTheFolder(t *testing.T) {
	for i, bad := range []string{"../../escape", "a/b", ".."} {
		tc := bandTest(t, "faces-bad", bandConfig+"faces:\n  - {name: front}\n  - {name: \""+bad+"\"}\n")
		out := filepath.Join(t.TempDir(), "run")
		_, err := Run(context.Background(), tc, out, "spallscope test", nil)
		if err == nil || !strings.Contains(err.Error(), "faces[1]") || !strings.Contains(err.Error(), "face name") {
			t.Errorf("face %q: error %v, want one naming faces[1] and the face name", bad, err)
		}
		if _, err := os.Stat(filepath.Join(out, FacesDir, "front")); err == nil {
			t.Errorf("face %q: the first face ran before the name was checked", bad)
		}
		if _, err := os.Stat(filepath.Join(filepath.Dir(out), "escape")); i == 0 && err == nil {
			t.Error("a folder was written outside the run folder")
		}
	}
}
