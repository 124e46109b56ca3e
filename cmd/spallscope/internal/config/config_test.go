package config

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const example = `# our own example block test
name: block-07
images: photos/
reference: 0
times: {fps: 0.5}
scale: {mm_per_px: 0.05}
openings:
  - {name: A, shape: "circle:1012,980,240"}
correlation:
  subset: 25
  step: 8
strain: {window: 9, static_frames: 4}
load:
  file: frame.csv
  area_mm2: 5000
  clock_offset_s: 3.5
`

func TestParseExample(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "block.yaml")
	os.WriteFile(path, []byte(example), 0o644)
	c, err := Read(path)
	if err != nil {
		t.Fatal(err)
	}
	if c.Name != "block-07" || c.Correlation.Subset != 25 || c.Strain.StaticFrames != 4 || c.Load.ClockOffset != 3.5 || c.Openings[0].Name != "A" {
		t.Errorf("parsed %+v", c)
	}
	// Relative paths resolve against the config's folder.
	if got := c.Resolve(c.Images); got != filepath.Join(dir, "photos") {
		t.Errorf("images resolve to %s", got)
	}
}

func TestConfigErrors(t *testing.T) {
	cases := []struct {
		yaml, want string
	}{
		{"images: x\nimagez: y\n", `line 2: unknown key "imagez" at the top level; valid keys there: name, images, reference`},
		{"images: x\ncorrelation:\n  subset: 21\n  stpe: 5\n", `line 4: unknown key "stpe" in correlation; valid keys there: subset, step, order`},
		{"images: x\nopenings:\n  - {name: A, shap: x}\n", `line 3: unknown key "shap" in openings[0]; valid keys there: name, shape`},
		{"images: [x\n", "test.yaml"},
		{"reference: 0\n", "images: required"},
		{"images: x\nload: {file: f.csv}\n", "load.area_mm2: required"},
		{"images: x\ntimes: {fps: 2, mtime: true}\n", "give one of fps, csv, mtime and exif"},
	}
	for _, c := range cases {
		_, err := Parse([]byte(c.yaml), "test.yaml")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want it to contain %q", c.yaml, err, c.want)
		}
	}
	// Malformed YAML names the line.
	_, err := Parse([]byte("images: x\nstrain:\n  window: 9\n   measure: green\n"), "bad.yaml")
	if err == nil || !strings.Contains(err.Error(), "bad.yaml line 3 column") {
		t.Errorf("malformed YAML: %v", err)
	}
}
