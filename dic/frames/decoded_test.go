package frames

import (
	"fmt"
	"image"
	"image/color"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spallscope/subset"
)

// readOnly is a Sequence that is not a Decoder: Decode reads its frames
// whole.
type readOnly struct{ Sequence }

// A frame decoded and widened (Decode, Into) has the levels, depth and
// storage ReadInto gives, whether the sequence decodes it itself (still
// images, 8- and 16-bit files written by Go's image/png, an encoder
// independent of OpenCV) or reads it whole (a sequence that is not a
// Decoder); a frame of another size than the first is refused naming it,
// as ReadInto refuses it.
func TestDecodeIntoMatchesReadInto(t *testing.T) {
	dir := t.TempDir()
	level := func(k int) func(x, y int) uint16 {
		return func(x, y int) uint16 { return uint16(x*1031 + y*4099 + k*77) }
	}
	for k := range 2 {
		m := image.NewGray(image.Rect(0, 0, 31, 17))
		for y := 0; y < 17; y++ {
			for x := 0; x < 31; x++ {
				m.SetGray(x, y, color.Gray{Y: uint8(level(k)(x, y))})
			}
		}
		writePNG(t, filepath.Join(dir, fmt.Sprintf("f%d.png", k)), m)
	}
	writePNG(t, filepath.Join(dir, "f2.png"), gray16(31, 17, level(2)))
	writePNG(t, filepath.Join(dir, "f3.png"), gray16(30, 17, level(3)))
	for _, whole := range []bool{false, true} {
		seq, err := Open(dir)
		if err != nil {
			t.Fatal(err)
		}
		ref, err := Open(dir)
		if err != nil {
			t.Fatal(err)
		}
		if whole {
			seq = readOnly{seq}
		}
		var img, want *subset.Image
		for k := range 3 {
			d, err := Decode(seq, k)
			if err != nil {
				t.Fatal(err)
			}
			prev := img
			img, err = d.Into(img)
			d.Close()
			if err != nil {
				t.Fatal(err)
			}
			if want, err = ref.ReadInto(k, want); err != nil {
				t.Fatal(err)
			}
			if k > 0 && img != prev {
				t.Errorf("whole %v, frame %d: widened into new storage, want the image passed in", whole, k)
			}
			if img.Depth != want.Depth || !img.SameSize(want) || !slices.Equal(img.Pix, want.Pix) {
				t.Errorf("whole %v, frame %d: depth %d, %dx%d, levels differ %v; want ReadInto's depth %d, %dx%d",
					whole, k, img.Depth, img.Width, img.Height, !slices.Equal(img.Pix, want.Pix), want.Depth, want.Width, want.Height)
			}
		}
		_, readErr := ref.ReadInto(3, nil)
		d, err := Decode(seq, 3)
		if err == nil {
			_, err = d.Into(img)
			d.Close()
		}
		if err == nil || readErr == nil || err.Error() != readErr.Error() || !strings.Contains(err.Error(), "f3.png") {
			t.Errorf("whole %v, 30x17 frame 3 after 31x17 frames: error %v, want ReadInto's %v naming f3.png", whole, err, readErr)
		}
		if _, err := Decode(seq, 4); err == nil || !strings.Contains(err.Error(), "out of range") {
			t.Errorf("whole %v, frame 4 of 4: error %v, want out of range", whole, err)
		}
	}
}
