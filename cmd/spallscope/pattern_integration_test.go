package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/frames"
	"spallscope/dic/synth"
)

// writeSpeckles renders a still synthetic pattern (frame selects its
// noise) and writes it as an 8-bit PNG.
func writeSpeckles(t *testing.T, path string, frame int) {
	t.Helper()
	sp, err := synth.NewSpeckles(synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 9}, 96, 80)
	if err != nil {
		t.Fatal(err)
	}
	img, err := synth.Render(synth.Scene{Speckles: sp}, synth.Camera{Depth: 8, Noise: 2, Seed: 9}, 96, 80, frame)
	if err != nil {
		t.Fatal(err)
	}
	if err := frames.WriteImage(path, img, 8); err != nil {
		t.Fatal(err)
	}
}

// The command reads a PNG and its static twin, prints the summary and
// writes the JSON and the map; the map is the image's size.
func TestPatternCommand(t *testing.T) {
	dir := t.TempDir()
	a, b := filepath.Join(dir, "a.png"), filepath.Join(dir, "b.png")
	writeSpeckles(t, a, 0)
	writeSpeckles(t, b, 1)
	outDir := filepath.Join(dir, "check")
	out, err := run(t, "pattern", a, "--static", b, "--subset", "15", "--out", outDir)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"96x80 px, 8-bit", "speckle size", "static pair", "smallest subset for σ_u ≤ 0.01 px", "pattern_map.png"} {
		if !strings.Contains(out, want) {
			t.Errorf("summary lacks %q:\n%s", want, out)
		}
	}
	data, err := os.ReadFile(filepath.Join(outDir, "pattern.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rep map[string]any
	if err := json.Unmarshal(data, &rep); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"mean_gray", "contrast_gray", "saturated_fraction", "dark_fraction", "mean_intensity_gradient",
		"speckle_size_px", "noise_gray", "noise_source", "subsets", "smallest_subset", "map"} {
		if _, ok := rep[k]; !ok {
			t.Errorf("pattern.json lacks %q", k)
		}
	}
	// Camera noise 2 plus 8-bit rounding: √(4 + 1/12) = 2.02 levels
	// (Widrow's quantisation theorem); 96×80 px give about ± 1 %, ± 10 % allowed.
	if n, _ := rep["noise_gray"].(float64); rep["noise_source"] != "static-pair" || n < 1.82 || n > 2.22 {
		t.Errorf("noise %v from %v, want 2.02 ± 10 %% from the static pair", rep["noise_gray"], rep["noise_source"])
	}
	m, err := frames.ReadImage(filepath.Join(outDir, "pattern_map.png"))
	if err != nil {
		t.Fatal(err)
	}
	if m.Width != 96 || m.Height != 80 {
		t.Errorf("map is %dx%d, want the image's 96x80", m.Width, m.Height)
	}
}

func TestPatternBadInput(t *testing.T) {
	dir := t.TempDir()
	a := filepath.Join(dir, "a.png")
	writeSpeckles(t, a, 0)
	missing := filepath.Join(dir, "missing.png")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{missing, "--out", dir}, "missing.png"},
		{[]string{a, "--static", missing, "--out", dir}, "missing.png"},
		{[]string{a, "--noise", "2", "--static", a, "--out", dir}, "give one"},
		{[]string{a, "--subset", "20", "--out", dir}, "odd size"},
		{[]string{a, "--noise", "-1", "--out", dir}, "--noise -1"},
		{[]string{a, "--interp", "linear", "--out", dir}, `--interp "linear"`},
	}
	for _, c := range cases {
		if _, err := run(t, append([]string{"pattern"}, c.args...)...); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want it to say %q", c.args, err, c.want)
		}
	}
}
