// Package subset measures the motion of one subset of a speckle image: the
// gray image type with its interpolant, shape functions, the correlation
// criterion and the inverse compositional Gauss–Newton solver.
//
// It works on plain float32 slices and never touches files or goroutines;
// whole-field tracking over a grid lives in package dic.
package subset

import "fmt"

// Image is a gray image stored row-major as float32 gray levels.
//
// Gray levels keep the scale of the source: 0–255 for 8-bit images and
// 0–65535 for 16-bit images, so that no depth is lost on conversion. Pixel
// (x, y) is at Pix[y*Width+x]; positions are measured from the centre of the
// top-left pixel, x to the right and y down.
type Image struct {
	Width, Height int
	// Depth is the bit depth of the source (8 or 16); 0 means unknown.
	Depth int
	Pix   []float32
}

// NewImage returns a zeroed image of the given size.
func NewImage(width, height, depth int) *Image {
	if width < 0 || height < 0 {
		panic(fmt.Sprintf("subset: negative image size %dx%d", width, height))
	}
	return &Image{Width: width, Height: height, Depth: depth, Pix: make([]float32, width*height)}
}

// At returns the gray level of pixel (x, y). It panics if the pixel lies
// outside the image, like indexing a slice.
func (m *Image) At(x, y int) float32 { return m.Pix[y*m.Width+x] }

// Set sets the gray level of pixel (x, y).
func (m *Image) Set(x, y int, v float32) { m.Pix[y*m.Width+x] = v }

// Row returns the pixels of row y, sharing storage with the image.
func (m *Image) Row(y int) []float32 { return m.Pix[y*m.Width : (y+1)*m.Width] }

// MaxLevel is the largest gray level the source depth can hold
// (255 for 8-bit, 65535 for 16-bit, 1 when the depth is unknown).
func (m *Image) MaxLevel() float64 {
	switch m.Depth {
	case 8:
		return 255
	case 16:
		return 65535
	}
	return 1
}

// SameSize reports whether two images have the same width and height.
func (m *Image) SameSize(o *Image) bool { return m.Width == o.Width && m.Height == o.Height }
