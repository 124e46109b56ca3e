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
	if err == nil || !strings.Contains(err.Error(), `unknown key "lense"`) || !strings.Contains(err.Error(), "outputs, lens, compensation_plate, standoff_mm, faces") {
		t.Errorf("misspelt lens key: %v", err)
	}
	if _, err = Parse([]byte("images: x\ntimes: {exif: true, fps: 2}\n"), "t.yaml"); err == nil || !strings.Contains(err.Error(), "give one of fps, csv, mtime and exif") {
		t.Errorf("exif with fps: %v", err)
	}
}

// The compensation plate and the stand-off are camera keys of a test and
// of a face (a face's own override the test's); a plate that is no shape
// and a negative stand-off are refused naming the key.
func TestCompensationPlateKeys(t *testing.T) {
	c, err := Parse([]byte("images: p/\ncompensation_plate: \"rect:300,0,400,200\"\nstandoff_mm: 450\nfaces:\n  - {name: north, compensation_plate: \"circle:50,50,20\", standoff_mm: 600}\n  - {name: south}\n"), "t.yaml")
	if err != nil {
		t.Fatal(err)
	}
	n, s := c.FaceTest(0), c.FaceTest(1)
	if n.CompensationPlate != "circle:50,50,20" || n.StandoffMM != 600 || s.CompensationPlate != "rect:300,0,400,200" || s.StandoffMM != 450 {
		t.Errorf("faces' plates %q, %q and stand-offs %g, %g", n.CompensationPlate, s.CompensationPlate, n.StandoffMM, s.StandoffMM)
	}
	for body, want := range map[string]string{
		"images: p/\ncompensation_plate: \"rect:1,2\"\n":                   "compensation_plate",
		"images: p/\nstandoff_mm: -3\n":                                    `standoff_mm "-3": expected a distance in mm ≥ 0`,
		"images: p/\nfaces: [{name: a, compensation_plate: \"blob:1\"}]\n": "faces[0].compensation_plate",
	} {
		if _, err := Parse([]byte(body), "t.yaml"); err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%q: %v, want it to say %q", body, err, want)
		}
	}
}
