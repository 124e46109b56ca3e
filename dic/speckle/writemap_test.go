package speckle

import (
	"image/png"
	"math"
	"os"
	"path/filepath"
	"testing"

	"spallscope/dic/synth"
)

// Viridis end and middle colours, from the colour map's published table
// (van der Walt & Smith, mpl-colormaps, CC0): entry 0 is (0.267004,
// 0.004874, 0.329415), entry 128 (0.127568, 0.566949, 0.550556) and entry
// 255 (0.993248, 0.906157, 0.143936), times 255.
var (
	viridisLow  = [3]float64{68.09, 1.24, 84.00}
	viridisMid  = [3]float64{32.53, 144.57, 140.39}
	viridisHigh = [3]float64{253.28, 231.07, 36.70}
)

// checkColour reports a pixel farther than 3 levels per channel from want.
func checkColour(t *testing.T, path string, x, y int, want [3]float64, what string) {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f) // Go's own decoder, independent of OpenCV
	if err != nil {
		t.Fatal(err)
	}
	r, g, b, _ := img.At(x, y).RGBA()
	got := [3]float64{float64(r >> 8), float64(g >> 8), float64(b >> 8)}
	for i := range got {
		if math.Abs(got[i]-want[i]) > 3 {
			t.Errorf("%s: pixel (%d, %d) is %v, want viridis %v", what, x, y, got, want)
			return
		}
	}
}

// TestWriteMapScale draws maps whose colours are known: a face half
// speckled and half flat (good texture at the top of the fixed noise scale,
// none at the bottom), and a diagonal ramp c + a(x + y) whose every
// interior subset has SSSIG = n·a² (calculus) and so predicts σ_u = √2σ/
// (21a) for 21-px subsets: with the target set to that value the interior
// sits in the middle of the scale.
func TestWriteMapScale(t *testing.T) {
	dir := t.TempDir()
	img := render(t, synth.Pattern{Radius: 2.5, Coverage: 0.5, Seed: 7}, 200, nil, 0, 0)
	half := *img
	half.Pix = append([]float32(nil), img.Pix...)
	half.Height = 100
	half.Pix = half.Pix[:200*100]
	for y := 0; y < 100; y++ {
		for x := 100; x < 200; x++ {
			half.Set(x, y, 128)
		}
	}
	r, err := Assess(&half, Options{Noise: 1, Target: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "half.png")
	if err := WriteMap(path, r); err != nil {
		t.Fatal(err)
	}
	checkColour(t, path, 30, 50, viridisHigh, "speckled half")
	checkColour(t, path, 175, 50, viridisLow, "flat half")

	const a = 5.0
	rr, err := Assess(ramp(96, 96, 16, a, a, 1000), Options{Noise: 1, Target: math.Sqrt2 / (21 * a)})
	if err != nil {
		t.Fatal(err)
	}
	path = filepath.Join(dir, "ramp.png")
	if err := WriteMap(path, rr); err != nil {
		t.Fatal(err)
	}
	checkColour(t, path, 48, 48, viridisMid, "ramp meeting the target exactly")
	// Without a noise level the scale is relative: the most textured
	// subset is brightest, flat ones darkest.
	rel := *r
	rel.Noise = 0
	path = filepath.Join(dir, "relative.png")
	if err := WriteMap(path, &rel); err != nil {
		t.Fatal(err)
	}
	m, best := rel.Map, 0
	for i, s := range m.SSSIG {
		if s > m.SSSIG[best] {
			best = i
		}
	}
	checkColour(t, path, m.X0+best%m.Columns*m.Step, m.Y0+best/m.Columns*m.Step, viridisHigh, "most textured subset")
	checkColour(t, path, 175, 50, viridisLow, "flat half, relative scale")
	if err := WriteMap(filepath.Join(dir, "none.png"), &Report{}); err == nil {
		t.Error("a report without a map was drawn")
	}
}
