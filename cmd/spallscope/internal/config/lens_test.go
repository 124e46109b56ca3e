package config

import (
	"strings"
	"testing"
)

// The lens key is a top-level key of a test and of a face (a face's lens
// replaces the test's, like its other keys), listed among the valid keys
// of an unknown-key error; times.exif is one rule among fps, csv and
// mtime, and Marshal writes both back.
func TestLensAndExifKeys(t *testing.T) {
	c, err := Parse([]byte("images: photos/\nlens: cal/lens.json\ntimes: {exif: true}\nfaces:\n  - {name: north, lens: north.json}\n  - {name: south}\n"), "t.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if c.Lens != "cal/lens.json" || !c.Times.EXIF {
		t.Errorf("parsed lens %q, exif %v", c.Lens, c.Times.EXIF)
	}
	if n, s := c.FaceTest(0), c.FaceTest(1); n.Lens != "north.json" || s.Lens != "cal/lens.json" {
		t.Errorf("faces' lenses %q and %q, want north.json and the test's cal/lens.json", n.Lens, s.Lens)
	}
	data, err := Marshal(c)
	if err != nil {
		t.Fatal(err)
	}
	if back, err := Parse(data, "t.yaml"); err != nil || back.Lens != c.Lens || !back.Times.EXIF {
		t.Errorf("marshalled\n%s\nreads back as %+v, %v", data, back, err)
	}
	_, err = Parse([]byte("images: x\nlense: l.json\n"), "t.yaml")
	if err == nil || !strings.Contains(err.Error(), `unknown key "lense"`) || !strings.Contains(err.Error(), "outputs, lens, faces") {
		t.Errorf("misspelt lens key: %v", err)
	}
	if _, err = Parse([]byte("images: x\ntimes: {exif: true, fps: 2}\n"), "t.yaml"); err == nil || !strings.Contains(err.Error(), "give one of fps, csv, mtime and exif") {
		t.Errorf("exif with fps: %v", err)
	}
}
