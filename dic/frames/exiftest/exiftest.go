// Package exiftest writes photos with known EXIF capture times for tests:
// JPEGs encoded by Go's image/jpeg with an APP1 "Exif" segment built by
// github.com/dsoprea/go-exif's IFD builder, the library the frames package
// reads them back with through its own code path. It is for tests only.
package exiftest

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/jpeg"
	"os"

	exif "github.com/dsoprea/go-exif/v3"
	exifcommon "github.com/dsoprea/go-exif/v3/common"
)

// Tags are the capture-time tags of a photo; an empty one is left out.
type Tags struct {
	DateTimeOriginal   string
	SubSecTimeOriginal string
	OffsetTimeOriginal string
}

// Block returns the EXIF block (TIFF header and directories) holding the
// tags in the EXIF sub-directory.
func Block(tags Tags) ([]byte, error) {
	im, err := exifcommon.NewIfdMappingWithStandard()
	if err != nil {
		return nil, err
	}
	ib := exif.NewIfdBuilder(im, exif.NewTagIndex(), exifcommon.IfdStandardIfdIdentity, exifcommon.EncodeDefaultByteOrder)
	if err := ib.AddStandardWithName("Software", "spallscope test"); err != nil {
		return nil, err
	}
	sub, err := exif.GetOrCreateIbFromRootIb(ib, "IFD/Exif")
	if err != nil {
		return nil, err
	}
	for _, t := range []struct{ name, value string }{
		{"DateTimeOriginal", tags.DateTimeOriginal},
		{"SubSecTimeOriginal", tags.SubSecTimeOriginal},
		{"OffsetTimeOriginal", tags.OffsetTimeOriginal},
	} {
		if t.value == "" {
			continue
		}
		if err := sub.AddStandardWithName(t.name, t.value); err != nil {
			return nil, fmt.Errorf("tag %s: %w", t.name, err)
		}
	}
	return exif.NewIfdByteEncoder().EncodeToExif(ib)
}

// JPEG returns img encoded as a JPEG with the tags in an APP1 segment
// right after the start-of-image marker, where cameras put it.
func JPEG(img image.Image, tags Tags) ([]byte, error) {
	block, err := Block(tags)
	if err != nil {
		return nil, err
	}
	var enc bytes.Buffer
	if err := jpeg.Encode(&enc, img, &jpeg.Options{Quality: 95}); err != nil {
		return nil, err
	}
	data := enc.Bytes()
	seg := append([]byte("Exif\x00\x00"), block...)
	if len(seg)+2 > 0xFFFF {
		return nil, fmt.Errorf("EXIF block of %d bytes is too large for one segment", len(seg))
	}
	var out bytes.Buffer
	out.Write(data[:2]) // SOI
	out.Write([]byte{0xFF, 0xE1})
	binary.Write(&out, binary.BigEndian, uint16(len(seg)+2))
	out.Write(seg)
	out.Write(data[2:])
	return out.Bytes(), nil
}

// WriteJPEG writes a small gray JPEG with the tags to path.
func WriteJPEG(path string, tags Tags) error {
	img := image.NewGray(image.Rect(0, 0, 16, 16))
	for i := range img.Pix {
		img.Pix[i] = uint8(i * 7)
	}
	data, err := JPEG(img, tags)
	if err != nil {
		return err
	}
	return os.WriteFile(path, data, 0o644)
}
