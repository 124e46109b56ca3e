package speckle

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spallscope/dic/synth"
	"spallscope/subset"
)

// TestClippingFractions plants a known number of pixels at the top and
// bottom levels of an 8-bit image (counting, no source needed).
func TestClippingFractions(t *testing.T) {
	img := ramp(100, 50, 8, 1, 1, 40) // levels 40…188: nothing clipped
	for i := 0; i < 137; i++ {
		img.Pix[i*29%len(img.Pix)] = 255
	}
	for i := 0; i < 59; i++ {
		img.Pix[4999-i] = 0
	}
	r, err := Assess(img, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Saturated != 137.0/5000 || r.Dark != 59.0/5000 {
		t.Errorf("saturated %g, dark %g; want %g and %g", r.Saturated, r.Dark, 137.0/5000, 59.0/5000)
	}
	if !hasNote(r, "saturated") || !hasNote(r, "clipped dark") {
		t.Errorf("2.7 %% saturated and 1.2 %% dark pixels should be noted: %q", r.Notes)
	}
}

// TestMIGOfRamp: the gradient of c + a·x + b·y is (a, b) everywhere
// (calculus), so the mean intensity gradient is √(a² + b²); the Sobel/8
// operator returns it exactly. Mean and contrast of the ramp follow from
// the uniform distribution of x and y over the grid: the mean is the
// value at the centre and the variance a²(w²−1)/12 + b²(h²−1)/12.
func TestMIGOfRamp(t *testing.T) {
	const w, h, a, b, c = 64, 48, 2.5, -1.5, 200.0
	r, err := Assess(ramp(w, h, 16, a, b, c), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if want := math.Hypot(a, b); math.Abs(r.MIG-want) > 1e-9 {
		t.Errorf("MIG %.12g, want %.12g", r.MIG, want)
	}
	if want := c + a*(w-1)/2 + b*(h-1)/2; math.Abs(r.Mean-want) > 1e-9 {
		t.Errorf("mean %g, want %g", r.Mean, want)
	}
	if want := math.Sqrt(a*a*(w*w-1)/12 + b*b*(h*h-1)/12); relErr(r.Contrast, want) > 1e-9 {
		t.Errorf("contrast %g, want %g", r.Contrast, want)
	}
	if r.SpeckleSize != 0 || !hasNote(r, "are a plane") {
		t.Errorf("a ramp has no speckles once its plane is removed: size %g, notes %q", r.SpeckleSize, r.Notes)
	}
}

// TestFlatImage: one gray level everywhere is not an error; the report
// says there is no texture and no subset will do, and it still encodes
// (no NaN or infinity) and draws.
func TestFlatImage(t *testing.T) {
	img := subset.NewImage(80, 60, 8)
	for i := range img.Pix {
		img.Pix[i] = 128
	}
	r, err := Assess(img, Options{Noise: 2})
	if err != nil {
		t.Fatal(err)
	}
	if r.Textured || r.MIG != 0 || r.SpeckleSize != 0 || r.Contrast != 0 || r.SmallestSubset != 0 || r.SmallestSubsetText != "none" {
		t.Errorf("flat image: textured %v, MIG %g, size %g, contrast %g, smallest %d %q", r.Textured, r.MIG, r.SpeckleSize, r.Contrast, r.SmallestSubset, r.SmallestSubsetText)
	}
	if !hasNote(r, "no texture") {
		t.Errorf("notes %q should say there is no texture", r.Notes)
	}
	for _, s := range r.Subsets {
		if s.SSSIG != 0 || s.Predicted != 0 || s.MeetsTarget {
			t.Errorf("flat image, subset %d: %+v", s.Size, s)
		}
	}
	if _, err := json.Marshal(r); err != nil {
		t.Errorf("flat report does not encode: %v", err)
	}
	if err := WriteMap(filepath.Join(t.TempDir(), "flat.png"), r); err != nil {
		t.Error(err)
	}
}

// TestAssessErrors: options that do not fit are errors that say why.
func TestAssessErrors(t *testing.T) {
	img := ramp(64, 48, 8, 1, 1, 10)
	cases := []struct {
		opt  Options
		want string
	}{
		{Options{Static: ramp(64, 40, 8, 1, 1, 10)}, "static image is 64x40, the image 64x48"},
		{Options{Static: ramp(64, 48, 16, 1, 1, 10)}, "bit depth 16, the image 8"},
		{Options{Subset: 20}, "odd size"},
		{Options{Subset: 51}, "does not fit in the 64x48 image"},
		{Options{Noise: 2, Static: img}, "give one"},
		{Options{Noise: -1}, "noise -1"},
		{Options{Target: -0.01}, "target -0.01"},
	}
	for _, c := range cases {
		if _, err := Assess(img, c.opt); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%+v: error %v, want it to say %q", c.opt, err, c.want)
		}
	}
	if _, err := Assess(&subset.Image{}, Options{}); err == nil {
		t.Error("empty image: no error")
	}
}

// TestReportJSON writes a report and reads it back as generic JSON: the
// fields a lab script reads are present under their names.
func TestReportJSON(t *testing.T) {
	img := render(t, synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 6}, 96, nil, 2, 0)
	r, err := Assess(img, Options{Noise: 2})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "pattern.json")
	if err := WriteJSON(path, r); err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var got map[string]any
	if err := json.Unmarshal(data, &got); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"mean_gray", "contrast_gray", "saturated_fraction", "dark_fraction", "mean_intensity_gradient",
		"speckle_size_px", "correlation_radius_px", "noise_gray", "noise_source", "subsets", "smallest_subset", "smallest_subset_px", "map", "notes"} {
		if _, ok := got[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if got["noise_source"] != "given" || got["noise_gray"] != 2.0 {
		t.Errorf("noise %v from %v, want 2 given", got["noise_gray"], got["noise_source"])
	}
}

func hasNote(r *Report, s string) bool {
	for _, n := range r.Notes {
		if strings.Contains(n, s) {
			return true
		}
	}
	return false
}
