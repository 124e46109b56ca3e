package frames

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/jpeg"
	"math"

	exif "github.com/dsoprea/go-exif/v3"
	exifcommon "github.com/dsoprea/go-exif/v3/common"

	"spallscope/subset"
)

// CaptureTags are the capture-time tags of a photo as a camera writes
// them (EXIF 2.32, tags 0x9003, 0x9291 and 0x9011); an empty one is left
// out.
type CaptureTags struct {
	DateTimeOriginal   string // "2006:01:02 15:04:05"
	SubSecTimeOriginal string // digits of the fraction of a second
	OffsetTimeOriginal string // "+01:00"
}

// ExifBlock returns the EXIF block (TIFF header and directories) holding
// the tags in the EXIF sub-directory, built with go-exif's IFD builder.
func ExifBlock(tags CaptureTags) ([]byte, error) {
	im, err := exifcommon.NewIfdMappingWithStandard()
	if err != nil {
		return nil, err
	}
	ib := exif.NewIfdBuilder(im, exif.NewTagIndex(), exifcommon.IfdStandardIfdIdentity, exifcommon.EncodeDefaultByteOrder)
	if err := ib.AddStandardWithName("Software", "spallscope"); err != nil {
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

// EncodeJPEG returns img encoded by Go's image/jpeg at the given quality
// (1 to 100) with the tags in an APP1 "Exif" segment right after the
// start-of-image marker, where cameras put it.
func EncodeJPEG(img image.Image, tags CaptureTags, quality int) ([]byte, error) {
	block, err := ExifBlock(tags)
	if err != nil {
		return nil, err
	}
	var enc bytes.Buffer
	if err := jpeg.Encode(&enc, img, &jpeg.Options{Quality: quality}); err != nil {
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

// GrayJPEG encodes img (gray levels of 8 bits, rounded and clamped) as a
// gray JPEG at the given quality with the capture-time tags, as a camera
// that stamps its clock into each photo would. Write it with
// runfolder.WriteAtomic.
func GrayJPEG(img *subset.Image, tags CaptureTags, quality int) ([]byte, error) {
	g := image.NewGray(image.Rect(0, 0, img.Width, img.Height))
	for i, v := range img.Pix {
		g.Pix[i] = uint8(math.Min(255, math.Max(0, math.Round(float64(v)))))
	}
	return EncodeJPEG(g, tags, quality)
}
