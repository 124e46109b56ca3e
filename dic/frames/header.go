package frames

import (
	"bufio"
	"encoding/binary"
	"errors"
	"fmt"
	"image"
	"io"
	"os"

	// Header readers for image.DecodeConfig: the formats a sequence may
	// hold and a few more, all decoded by Go without OpenCV.
	_ "image/gif"
	_ "image/jpeg"
	_ "image/png"

	_ "golang.org/x/image/bmp"
	_ "golang.org/x/image/tiff"
	_ "golang.org/x/image/webp"
)

// MaxImageSide is the largest width or height in pixels an image file may
// declare, and MaxImagePixels the largest width × height. ReadImage checks
// a file's header against them before OpenCV decodes it: OpenCV 4.6 aborts
// the whole process (an uncaught C++ exception) on some headers declaring
// huge sizes, and a small file may declare gigabytes of pixels. 65,535 is
// the most a JPEG can hold; 400 MP is over twice the largest still camera
// sensor we know of (about 150 MP, from memory) and costs 1.6 GB per frame
// as float32 gray.
const (
	MaxImageSide   = 65535
	MaxImagePixels = 400_000_000
)

// ImageSize returns the width and height the header of the image file at
// path declares, and the format's name ("png", "tiff", ...), without
// decoding its pixels. It reads the formats Go's image packages know
// (PNG, JPEG, GIF, BMP, TIFF, WebP) and, beyond them, the first image of
// any baseline TIFF, such as the 32-bit float files Go's TIFF package does
// not decode.
func ImageSize(path string) (width, height int, format string, err error) {
	f, err := os.Open(path)
	if err != nil {
		return 0, 0, "", err
	}
	defer f.Close()
	cfg, format, err := image.DecodeConfig(bufio.NewReader(f))
	if err == nil {
		return cfg.Width, cfg.Height, format, nil
	}
	if w, h, terr := tiffSize(f); terr == nil {
		return w, h, "tiff", nil
	} else if !errors.Is(terr, errNotTIFF) {
		return 0, 0, "tiff", terr
	}
	if errors.Is(err, image.ErrFormat) {
		return 0, 0, "", errors.New("not a TIFF, PNG, JPEG, BMP, GIF or WebP file")
	}
	return 0, 0, format, err
}

// checkImageHeader refuses an image file whose header cannot be read or
// declares a size beyond MaxImageSide or MaxImagePixels.
func checkImageHeader(path string) error {
	w, h, format, err := ImageSize(path)
	if err != nil {
		return fmt.Errorf("read image %s: cannot read the image header (%w); expected a TIFF, PNG, JPEG or BMP file", path, err)
	}
	if w <= 0 || h <= 0 || w > MaxImageSide || h > MaxImageSide || int64(w)*int64(h) > MaxImagePixels {
		return fmt.Errorf("read image %s: the %s header declares %dx%d px (%.0f MP); expected at most %d px a side and %d MP",
			path, format, w, h, float64(w)*float64(h)/1e6, MaxImageSide, MaxImagePixels/1_000_000)
	}
	return nil
}

// errNotTIFF is tiffSize's error for a file without a TIFF signature.
var errNotTIFF = errors.New("not a TIFF file")

// TIFF tags and field types (TIFF 6.0 specification, Adobe 1992, sections
// 2 and 8).
const (
	tiffImageWidth  = 256
	tiffImageLength = 257
	tiffShort       = 3
	tiffLong        = 4
)

// tiffSize reads ImageWidth and ImageLength from the first image file
// directory of a classic TIFF (not BigTIFF).
func tiffSize(r io.ReaderAt) (width, height int, err error) {
	var head [8]byte
	if _, err := r.ReadAt(head[:], 0); err != nil {
		return 0, 0, errNotTIFF
	}
	var bo binary.ByteOrder
	switch string(head[:4]) {
	case "II*\x00":
		bo = binary.LittleEndian
	case "MM\x00*":
		bo = binary.BigEndian
	case "II+\x00", "MM\x00+":
		return 0, 0, errors.New("BigTIFF files are not read")
	default:
		return 0, 0, errNotTIFF
	}
	off := int64(bo.Uint32(head[4:]))
	var count [2]byte
	if _, err := r.ReadAt(count[:], off); err != nil {
		return 0, 0, fmt.Errorf("TIFF directory at byte %d: %w", off, err)
	}
	n := int(bo.Uint16(count[:]))
	entries := make([]byte, 12*n)
	if _, err := r.ReadAt(entries, off+2); err != nil {
		return 0, 0, fmt.Errorf("TIFF directory at byte %d with %d entries: %w", off, n, err)
	}
	for i := 0; i < n; i++ {
		e := entries[12*i : 12*i+12]
		tag, typ := bo.Uint16(e), bo.Uint16(e[2:])
		if tag != tiffImageWidth && tag != tiffImageLength {
			continue
		}
		var v int
		switch typ {
		case tiffShort:
			v = int(bo.Uint16(e[8:]))
		case tiffLong:
			v = int(bo.Uint32(e[8:]))
		default:
			return 0, 0, fmt.Errorf("TIFF tag %d has field type %d, expected SHORT or LONG", tag, typ)
		}
		if tag == tiffImageWidth {
			width = v
		} else {
			height = v
		}
	}
	if width == 0 || height == 0 {
		return 0, 0, errors.New("TIFF directory lacks ImageWidth or ImageLength")
	}
	return width, height, nil
}
