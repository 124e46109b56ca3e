package frames

import (
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// ImageExtensions lists the still-image file endings that a directory
// sequence picks up (compared case-insensitively).
var ImageExtensions = []string{".tif", ".tiff", ".png", ".jpg", ".jpeg", ".bmp"}

// IsImageFile reports whether the name ends in one of ImageExtensions.
func IsImageFile(name string) bool {
	ext := strings.ToLower(filepath.Ext(name))
	for _, e := range ImageExtensions {
		if ext == e {
			return true
		}
	}
	return false
}

// ReadImage decodes an 8- or 16-bit gray or colour image file into a gray
// float32 image. Colour is converted to gray with OpenCV's standard luma
// weights; 16-bit levels are kept as they are (0–65535). The header is
// read first, in Go: a file whose header cannot be read or that declares
// more than MaxImageSide px a side or MaxImagePixels in all is refused
// before OpenCV sees it.
func ReadImage(path string) (*subset.Image, error) { return ReadImageInto(path, nil) }

// ReadImageInto is ReadImage into dst's storage when dst (nil: none) has
// the image's size, else into a new image; it returns the image. A run
// that reads frame after frame into one image leaves no 4 bytes a pixel
// to the collector per frame (80 MB at 20 MP).
func ReadImageInto(path string, dst *subset.Image) (*subset.Image, error) {
	m, err := decodeImage(path)
	if err != nil {
		return nil, err
	}
	defer m.Close()
	img, err := FromMatInto(m, dst)
	if err != nil {
		return nil, fmt.Errorf("read image %s: %w", path, err)
	}
	return img, nil
}

// decodeImage decodes an image file as OpenCV holds it (any depth, any
// colour), after ReadImage's checks of the file and its header. The
// caller must Close the result.
func decodeImage(path string) (gocv.Mat, error) {
	if _, err := os.Stat(path); err != nil {
		return gocv.Mat{}, fmt.Errorf("read image: %w", err)
	}
	if err := checkImageHeader(path); err != nil {
		return gocv.Mat{}, err
	}
	returnLargeBlocks()
	m := gocv.IMRead(path, gocv.IMReadAnyDepth|gocv.IMReadAnyColor)
	if m.Empty() {
		m.Close()
		return gocv.Mat{}, fmt.Errorf("read image %s: cannot decode (corrupt file or unsupported format; expected TIFF, PNG, JPEG or BMP)", path)
	}
	return m, nil
}

// FromMatInto converts an OpenCV image (1, 3 or 4 channels; 8-bit, 16-bit
// or 32-bit float) into a gray float32 image, in dst's storage when dst
// (nil: none) has m's size, else in a new image; it returns the image and
// does not take ownership of m. The levels are
// widened in Go, straight from the decoded 8- or 16-bit pixels, so no
// float32 copy of the frame is made on OpenCV's side (80 MB of C memory
// at 20 MP); they equal OpenCV's own conversion (convertTo CV_32F), which
// is exact for integers below 2²⁴.
func FromMatInto(m gocv.Mat, dst *subset.Image) (*subset.Image, error) {
	returnLargeBlocks()
	gray := m
	switch m.Channels() {
	case 1:
	case 3, 4:
		gray = gocv.NewMat()
		defer gray.Close()
		code := gocv.ColorBGRToGray
		if m.Channels() == 4 {
			code = gocv.ColorBGRAToGray
		}
		gocv.CvtColor(m, &gray, code)
	default:
		return nil, fmt.Errorf("%d channels, expected 1 (gray), 3 (colour) or 4 (colour with alpha)", m.Channels())
	}
	depth := 0
	switch int(gray.Type()) & 7 {
	case int(gocv.MatTypeCV8U):
		depth = 8
	case int(gocv.MatTypeCV16U):
		depth = 16
	case int(gocv.MatTypeCV32F):
	default:
		return nil, errors.New("unsupported pixel depth, expected 8-bit, 16-bit or 32-bit float")
	}
	if !gray.IsContinuous() {
		c := gray.Clone()
		defer c.Close()
		gray = c
	}
	w, h := gray.Cols(), gray.Rows()
	img := dst
	if img == nil || img.Width != w || img.Height != h || len(img.Pix) != w*h {
		img = subset.NewImage(w, h, depth)
	}
	img.Depth = depth
	pix := img.Pix
	switch depth {
	case 8:
		data, err := gray.DataPtrUint8()
		if err != nil {
			return nil, err
		}
		for i, v := range data[:len(pix)] {
			pix[i] = float32(v)
		}
	case 16:
		data, err := gray.DataPtrUint16()
		if err != nil {
			return nil, err
		}
		for i, v := range data[:len(pix)] {
			pix[i] = float32(v)
		}
	default:
		data, err := gray.DataPtrFloat32()
		if err != nil {
			return nil, err
		}
		copy(pix, data[:len(pix)])
	}
	return img, nil
}

// ToMat converts a gray float32 image to a single-channel OpenCV image of the
// given depth (8 or 16 bit), rounding and clamping to the depth's range. The
// caller must Close the result.
func ToMat(img *subset.Image, depth int) (gocv.Mat, error) {
	var buf []byte
	var mt gocv.MatType
	switch depth {
	case 8:
		mt = gocv.MatTypeCV8U
		buf = make([]byte, len(img.Pix))
		for i, v := range img.Pix {
			buf[i] = uint8(clampRound(v, 255))
		}
	case 16:
		mt = gocv.MatTypeCV16U
		buf = make([]byte, 2*len(img.Pix))
		for i, v := range img.Pix {
			q := uint16(clampRound(v, 65535))
			buf[2*i] = byte(q) // OpenCV stores 16-bit pixels in host (little-endian) order.
			buf[2*i+1] = byte(q >> 8)
		}
	default:
		return gocv.Mat{}, fmt.Errorf("bit depth %d, expected 8 or 16", depth)
	}
	return gocv.NewMatFromBytes(img.Height, img.Width, mt, buf)
}

func clampRound(v float32, max float64) float64 {
	x := math.Round(float64(v))
	if x < 0 || math.IsNaN(x) {
		return 0
	}
	if x > max {
		return max
	}
	return x
}

// WriteImage encodes img at the given bit depth (8 or 16) in the format named
// by the file's extension (PNG, TIFF, ...). It writes to a temporary name in
// the same folder and renames, so a file that exists is complete.
func WriteImage(path string, img *subset.Image, depth int) error {
	m, err := ToMat(img, depth)
	if err != nil {
		return fmt.Errorf("write image %s: %w", path, err)
	}
	defer m.Close()
	return WriteMat(path, m)
}

// WriteMat encodes an OpenCV image to path atomically (temporary name, then
// rename); the format follows the extension.
func WriteMat(path string, m gocv.Mat) error {
	ext := filepath.Ext(path)
	tmp := strings.TrimSuffix(path, ext) + ".partial" + ext
	if !gocv.IMWrite(tmp, m) {
		os.Remove(tmp)
		return fmt.Errorf("write image %s: OpenCV could not encode a %s file (check the folder exists and the extension)", path, ext)
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return fmt.Errorf("write image %s: %w", path, err)
	}
	return nil
}
