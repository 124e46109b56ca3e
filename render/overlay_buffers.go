package render

import "image"

// overlayBuffers are an overlay's photo-sized arrays: the field's raster,
// the gray photo, the coloured field, the canvas and its BGR copy, 320 MB
// at 20 MP. Run keeps them
// from frame to frame, so that a frame of a long run leaves none of them
// as garbage (nor pages to fault in again for the next frame). Each use
// overwrites every element it hands out.
type overlayBuffers struct {
	raster       []float32
	gray, colour []byte
	rgba, bgr    []byte
}

// newRGBA returns a width×height canvas, in buf's array when buf is not
// nil; its pixels are not cleared.
func (buf *overlayBuffers) newRGBA(width, height int) *image.RGBA {
	if buf == nil {
		return image.NewRGBA(image.Rect(0, 0, width, height))
	}
	buf.rgba = resize(buf.rgba, 4*width*height)
	return &image.RGBA{Pix: buf.rgba, Stride: 4 * width, Rect: image.Rect(0, 0, width, height)}
}

// resize returns s with length n, in s's array when it is large enough.
func resize[T any](s []T, n int) []T {
	if cap(s) >= n {
		return s[:n]
	}
	return make([]T, n)
}
