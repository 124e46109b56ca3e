package frames

import (
	"bytes"
	"encoding/binary"
	"hash/crc32"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gocv.io/x/gocv"
)

// pngHeaderOnly returns a PNG file whose IHDR declares width × height
// pixels of 16-bit RGBA, followed by an empty IDAT and IEND: a few dozen
// bytes that claim gigabytes. Chunk layout and CRC-32 as the PNG
// specification (W3C, 2003, sections 5.3 and 11.2.2) lays them out.
func pngHeaderOnly(width, height uint32) []byte {
	var b bytes.Buffer
	b.WriteString("\x89PNG\r\n\x1a\n")
	chunk := func(kind string, data []byte) {
		binary.Write(&b, binary.BigEndian, uint32(len(data)))
		c := append([]byte(kind), data...)
		b.Write(c)
		binary.Write(&b, binary.BigEndian, crc32.ChecksumIEEE(c))
	}
	ihdr := make([]byte, 13)
	binary.BigEndian.PutUint32(ihdr[0:], width)
	binary.BigEndian.PutUint32(ihdr[4:], height)
	ihdr[8], ihdr[9] = 16, 6 // bit depth 16, colour type 6 (RGBA)
	chunk("IHDR", ihdr)
	chunk("IDAT", []byte{0x78, 0x9c, 0x03, 0x00, 0x00, 0x00, 0x00, 0x01})
	chunk("IEND", nil)
	return b.Bytes()
}

// A header declaring 100,000 × 100,000 px made OpenCV 4.6 abort the test
// binary (SIGABRT from an uncaught cv::Exception in imread); now it is an
// error naming the file and the declared size, and OpenCV is never asked.
func TestReadImageRefusesHugeHeader(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct {
		w, h uint32
		want string
	}{
		{100000, 100000, "declares 100000x100000 px (10000 MP)"},
		{30000, 30000, "declares 30000x30000 px (900 MP)"}, // each side allowed, the area not
		{70000, 8, "declares 70000x8 px"},
		{1<<31 - 1, 1, "declares 2147483647x1 px"},
	} {
		path := filepath.Join(dir, "huge.png")
		if err := os.WriteFile(path, pngHeaderOnly(c.w, c.h), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := ReadImage(path)
		if err == nil {
			t.Errorf("%dx%d: accepted", c.w, c.h)
			continue
		}
		for _, part := range []string{path, "png header", c.want, "at most 65535 px a side and 400 MP"} {
			if !strings.Contains(err.Error(), part) {
				t.Errorf("%dx%d: error %q lacks %q", c.w, c.h, err, part)
			}
		}
	}
	// Through a sequence the error names the frame too.
	os.WriteFile(filepath.Join(dir, "huge.png"), pngHeaderOnly(100000, 100000), 0o644)
	seq, err := Open(dir)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := seq.Read(0); err == nil || !strings.Contains(err.Error(), "frame 0") || !strings.Contains(err.Error(), "100000x100000") {
		t.Errorf("sequence: error %v should name frame 0 and the declared size", err)
	}
}

// Files whose header is not an image are refused by the header check with
// what was expected; a header cut short says so.
func TestReadImageUnreadableHeader(t *testing.T) {
	dir := t.TempDir()
	for name, data := range map[string][]byte{
		"text.png":  []byte("not an image at all"),
		"empty.tif": nil,
		"cut.png":   pngHeaderOnly(64, 64)[:20],
		"big.tif":   []byte("II+\x00\x08\x00\x00\x00"),
		"noifd.tif": []byte("II*\x00\xff\xff\x00\x00"),
	} {
		path := filepath.Join(dir, name)
		os.WriteFile(path, data, 0o644)
		_, err := ReadImage(path)
		if err == nil || !strings.Contains(err.Error(), path) || !strings.Contains(err.Error(), "cannot read the image header") {
			t.Errorf("%s: error %v, want one naming the file and the unreadable header", name, err)
		}
	}
}

// ImageSize reads a 32-bit float TIFF's size (written by OpenCV), which
// Go's TIFF package refuses ("unsupported feature: sample format"), with
// the package's own directory reader; big- and little-endian directories
// alike.
func TestImageSizeFloatTIFF(t *testing.T) {
	dir := t.TempDir()
	m := gocv.NewMatWithSize(7, 11, gocv.MatTypeCV32F)
	defer m.Close()
	path := filepath.Join(dir, "f.tif")
	if !gocv.IMWrite(path, m) {
		t.Skip("OpenCV here cannot write a float TIFF")
	}
	w, h, format, err := ImageSize(path)
	if err != nil || w != 11 || h != 7 || format != "tiff" {
		t.Errorf("float TIFF: %dx%d %q %v, want 11x7 tiff", w, h, format, err)
	}
	// A hand-made big-endian directory: one SHORT width, one LONG length.
	var b bytes.Buffer
	b.WriteString("MM\x00*")
	binary.Write(&b, binary.BigEndian, uint32(8))
	binary.Write(&b, binary.BigEndian, uint16(2))
	binary.Write(&b, binary.BigEndian, []uint16{256, 3, 0, 1, 300, 0})
	binary.Write(&b, binary.BigEndian, []uint16{257, 4, 0, 1})
	binary.Write(&b, binary.BigEndian, uint32(70000))
	path = filepath.Join(dir, "be.tif")
	os.WriteFile(path, b.Bytes(), 0o644)
	if w, h, err := tiffSizeOf(path); err != nil || w != 300 || h != 70000 {
		t.Errorf("big-endian directory: %dx%d %v, want 300x70000", w, h, err)
	}
	if _, err := ReadImage(path); err == nil || !strings.Contains(err.Error(), "300x70000") {
		t.Errorf("tall TIFF: error %v should name 300x70000", err)
	}
}

func tiffSizeOf(path string) (int, int, error) {
	f, err := os.Open(path)
	if err != nil {
		return 0, 0, err
	}
	defer f.Close()
	return tiffSize(f)
}
