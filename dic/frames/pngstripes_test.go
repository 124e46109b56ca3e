package frames

import (
	"hash/adler32"
	"image/png"
	"os"
	"path/filepath"
	"testing"

	"gocv.io/x/gocv"
)

// A PNG written in parallel stripes decodes, with Go's image/png (which
// checks every chunk's CRC-32 and the zlib stream's Adler-32 sum) and with
// OpenCV's reader (libpng), to the image written, every byte: sizes with
// one row and one column, with a part stripe, and with more stripes than
// workers; the content is noise (stored blocks) beside flat runs and ramps.
func TestWritePNGStripesDecodesExactly(t *testing.T) {
	dir := t.TempDir()
	for _, sz := range [][2]int{{1, 1}, {7, 1}, {1, 130}, {333, 200}, {640, 64*9 + 5}} {
		w, h := sz[0], sz[1]
		pix := make([]byte, 3*w*h)
		s := uint32(7)
		for y := 0; y < h; y++ {
			for x := 0; x < w; x++ {
				i := 3 * (y*w + x)
				s = s*1664525 + 1013904223
				switch {
				case x < w/3:
					pix[i], pix[i+1], pix[i+2] = byte(s>>24), byte(s>>16), byte(s>>8)
				case x < 2*w/3:
					pix[i], pix[i+1], pix[i+2] = 255, 255, 255
				default:
					pix[i], pix[i+1], pix[i+2] = byte(x), byte(y), byte(x+y)
				}
			}
		}
		m, err := gocv.NewMatFromBytes(h, w, gocv.MatTypeCV8UC3, pix)
		if err != nil {
			t.Fatal(err)
		}
		path := filepath.Join(dir, "stripes.png")
		if err := WritePNGStripes(path, m); err != nil {
			t.Fatal(err)
		}
		m.Close()
		f, err := os.Open(path)
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(f)
		f.Close()
		if err != nil {
			t.Fatalf("%dx%d: image/png: %v", w, h, err)
		}
		if b := img.Bounds(); b.Dx() != w || b.Dy() != h {
			t.Fatalf("%dx%d: decoded %v", w, h, b)
		}
		bad := 0
		for y := 0; y < h; y++ {
			for x := 0; x < w; x++ {
				r, g, b, a := img.At(x, y).RGBA()
				i := 3 * (y*w + x)
				if byte(r>>8) != pix[i+2] || byte(g>>8) != pix[i+1] || byte(b>>8) != pix[i] || a != 0xffff {
					bad++
				}
			}
		}
		cv := gocv.IMRead(path, gocv.IMReadUnchanged)
		got, _ := cv.DataPtrUint8()
		if cv.Cols() != w || cv.Rows() != h || cv.Channels() != 3 || string(got) != string(pix) {
			t.Errorf("%dx%d: OpenCV reads %dx%d×%d, not the bytes written", w, h, cv.Cols(), cv.Rows(), cv.Channels())
		}
		cv.Close()
		if bad > 0 {
			t.Errorf("%dx%d: %d pixels differ after image/png", w, h, bad)
		}
		if _, err := os.Stat(filepath.Join(dir, "stripes.partial.png")); err == nil {
			t.Errorf("the temporary file is left")
		}
	}
}

// The combined Adler-32 sum of two runs equals the sum of the runs joined
// (hash/adler32 of the whole as the reference), for a second run shorter
// and longer than the modulus 65521.
func TestAdler32Combine(t *testing.T) {
	data := make([]byte, 200000)
	for i := range data {
		data[i] = byte(i*7 + i/300)
	}
	for _, cut := range []int{0, 1, 1000, 65521, 70000, 199999, 200000} {
		got := adler32Combine(adler32.Checksum(data[:cut]), adler32.Checksum(data[cut:]), len(data)-cut)
		if want := adler32.Checksum(data); got != want {
			t.Errorf("cut at %d: combined %08x, expected %08x", cut, got, want)
		}
	}
}
