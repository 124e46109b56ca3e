package frames

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Two frames with one name would write one field file (fields/<name>.csv),
// the second over the first, and the run would report one frame's
// displacements as another's. They are refused when the sequence opens,
// naming both files: two extensions in a folder, two folders in a list,
// two names that differ in case alone (one file on a case-insensitive
// file system, common practice, no source). A name with a control
// character is refused too. Before, all of these opened.
func TestFrameNamesAreDistinct(t *testing.T) {
	img := gray16(8, 6, func(x, y int) uint16 { return uint16(x * y) })
	dir := t.TempDir()
	for _, p := range []string{"ext/img_001.png", "ext/img_001.tif", "lst/a/x.png", "lst/b/x.png", "case/IMG_1.png", "case/img_1.png", "ctl/a\nb.png", "ok/a.png", "ok/b.png"} {
		path := filepath.Join(dir, p)
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		writePNG(t, path, img)
	}
	list := filepath.Join(dir, "lst", "frames.lst")
	os.WriteFile(list, []byte("a/x.png\nb/x.png\n"), 0o644)
	for _, c := range []struct {
		spec string
		want []string
	}{
		{filepath.Join(dir, "ext"), []string{"img_001.png and ", "img_001.tif both have the name \"img_001\""}},
		{list, []string{filepath.Join("a", "x.png") + " and ", filepath.Join("b", "x.png") + " both have the name \"x\""}},
		{filepath.Join(dir, "case"), []string{"IMG_1.png and ", "img_1.png both have the name \"img_1\""}},
		{filepath.Join(dir, "ctl"), []string{`its name "a\nb" holds the control character U+000A`}},
	} {
		_, err := Open(c.spec)
		for _, w := range c.want {
			if err == nil || !strings.Contains(err.Error(), w) {
				t.Errorf("%s: error %v, want %q", c.spec, err, w)
			}
		}
	}
	if seq, err := Open(filepath.Join(dir, "ok")); err != nil || seq.Len() != 2 {
		t.Errorf("two distinct frames: %v", err)
	}
}
