package frames

import (
	"math"
	"path/filepath"
	"testing"

	"gocv.io/x/gocv"
)

// A 32-bit float TIFF written by OpenCV keeps its NaN and infinite pixels
// through ReadImage; NonFinite and Describe count them and leave them out
// of the gray-level statistics (before, one NaN made Min, Mean and Max NaN).
func TestFloatTIFFNonFinitePixels(t *testing.T) {
	m := gocv.NewMatWithSize(3, 4, gocv.MatTypeCV32F)
	defer m.Close()
	levels := []float32{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}
	levels[1], levels[6], levels[11] = float32(math.NaN()), float32(math.Inf(1)), float32(math.NaN())
	for i, v := range levels {
		m.SetFloatAt(i/4, i%4, v)
	}
	path := filepath.Join(t.TempDir(), "f.tif")
	if !gocv.IMWrite(path, m) {
		t.Skip("OpenCV here cannot write a float TIFF")
	}
	img, err := ReadImage(path)
	if err != nil {
		t.Fatal(err)
	}
	if img.Depth != 0 || img.Width != 4 || img.Height != 3 {
		t.Fatalf("float TIFF: depth %d, %dx%d; want 0 (float), 4x3", img.Depth, img.Width, img.Height)
	}
	if n := NonFinite(img); n != 3 {
		t.Errorf("NonFinite = %d, want 3", n)
	}
	s := Describe(img)
	// Finite levels 1 3 4 5 6 8 9 10 11: mean 57/9.
	if s.NonFinite != 3 || s.Min != 1 || s.Max != 11 || math.Abs(s.Mean-57.0/9) > 1e-12 {
		t.Errorf("Describe = %+v, want 3 non-finite, min 1, max 11, mean 57/9", s)
	}
	for i := range img.Pix {
		img.Pix[i] = float32(math.NaN())
	}
	if s := Describe(img); s.NonFinite != 12 || !math.IsNaN(s.Mean) || !math.IsNaN(s.Min) {
		t.Errorf("all NaN: %+v, want 12 non-finite and NaN statistics", s)
	}
}
