// Package exiftest writes photos with known EXIF capture times for tests:
// small gray JPEGs through frames.EncodeJPEG (Go's image/jpeg with an
// APP1 "Exif" segment built by github.com/dsoprea/go-exif's IFD builder),
// which the frames package reads back through its own code path. It is
// for tests only.
package exiftest

import (
	"image"
	"os"

	"spallscope/dic/frames"
)

// Tags are the capture-time tags of a photo; an empty one is left out.
type Tags = frames.CaptureTags

// Block returns the EXIF block (TIFF header and directories) holding the
// tags in the EXIF sub-directory.
func Block(tags Tags) ([]byte, error) { return frames.ExifBlock(tags) }

// JPEG returns img encoded as a JPEG (quality 95) with the tags.
func JPEG(img image.Image, tags Tags) ([]byte, error) { return frames.EncodeJPEG(img, tags, 95) }

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
