package render

import "image"

// overlayBuffers are an overlay's large arrays: the BGR canvas (photo and
// panel, 69 MB at 20 MP) and the panel's RGBA image (12 MB), and the colour table. Run keeps them
// from frame to frame, so that a frame of a long run leaves none of them
// as garbage (nor pages to fault in again for the next frame). Each use
// overwrites every element it hands out.
type overlayBuffers struct {
	raster []float32
	bgr    []byte
	rgba   []byte
	blend  *blendTable // the last frame's colours (0.85 MB)
}

// table returns the last frame's blend table (nil: none, or no buf).
func (buf *overlayBuffers) table() *blendTable {
	if buf == nil {
		return nil
	}
	return buf.blend
}

// keep keeps t for the next frame when buf is not nil.
func (buf *overlayBuffers) keep(t *blendTable) {
	if buf != nil {
		buf.blend = t
	}
}

// canvas returns n bytes of canvas, in buf's array when buf is not nil;
// they are not cleared.
func (buf *overlayBuffers) canvas(n int) []byte {
	if buf == nil {
		return make([]byte, n)
	}
	buf.bgr = resize(buf.bgr, n)
	return buf.bgr
}

// newRGBA returns an image of r, in buf's array when buf is not nil; its
// pixels are not cleared.
func (buf *overlayBuffers) newRGBA(r image.Rectangle) *image.RGBA {
	if buf == nil {
		return image.NewRGBA(r)
	}
	buf.rgba = resize(buf.rgba, 4*r.Dx()*r.Dy())
	return &image.RGBA{Pix: buf.rgba, Stride: 4 * r.Dx(), Rect: r}
}

// resize returns s with length n, in s's array when it is large enough.
func resize[T any](s []T, n int) []T {
	if cap(s) >= n {
		return s[:n]
	}
	return make([]T, n)
}
