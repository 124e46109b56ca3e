package frames

import (
	"fmt"

	"gocv.io/x/gocv"

	"spallscope/subset"
)

// Decoded is one frame of a sequence decoded in its file's own form (8-
// or 16-bit, gray or colour, as OpenCV holds it) and not yet widened to
// the float32 gray image the tracker reads: a 20 MP frame held this way
// is 20 MB at 8 bits or 40 MB at 16, against 80 MB as float32. A run
// decodes the next frame while the current one is tracked and widens it
// when the current one is done (Into), so that the frame read ahead
// costs little memory. A Decoded must be closed.
type Decoded struct {
	m      gocv.Mat      // the decoded pixels (empty when img holds the frame)
	img    *subset.Image // a frame of a sequence that is not a Decoder
	index  int
	source string
	what   string     // how a conversion error starts, as ReadInto's
	size   *frameSize // the sequence's, checked by Into (nil: none)
}

// Decoder is a Sequence that can decode a frame without widening it.
// Decode is not safe for use alongside the sequence's other reading
// methods; a run calls it from one goroutine at a time.
type Decoder interface {
	Decode(i int) (*Decoded, error)
}

// Decode decodes frame i of s: through s's Decode when s is a Decoder,
// else read whole (as float32, 4 bytes a pixel) with s.Read.
func Decode(s Sequence, i int) (*Decoded, error) {
	if d, ok := s.(Decoder); ok {
		return d.Decode(i)
	}
	img, err := s.Read(i)
	if err != nil {
		return nil, err
	}
	return &Decoded{img: img, index: i, source: s.Source(i)}, nil
}

// Into widens the frame into dst's storage when dst (nil: none) has the
// frame's size, else into a new image, checks the size against the
// sequence's (as ReadInto does) and returns the image. The levels are
// those ReadInto gives (FromMatInto).
func (d *Decoded) Into(dst *subset.Image) (*subset.Image, error) {
	if d.img != nil {
		img := dst
		if img == nil || !img.SameSize(d.img) || len(img.Pix) != len(d.img.Pix) {
			img = subset.NewImage(d.img.Width, d.img.Height, d.img.Depth)
		}
		img.Depth = d.img.Depth
		copy(img.Pix, d.img.Pix)
		return img, nil
	}
	img, err := FromMatInto(d.m, dst)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", d.what, err)
	}
	if d.size != nil {
		if err := d.size.check(img, d.index, d.source); err != nil {
			return nil, err
		}
	}
	return img, nil
}

// Close releases the decoded pixels.
func (d *Decoded) Close() {
	d.m.Close()
	d.img = nil
}

// Decode decodes frame i without widening it (Decoder).
func (s *fileSequence) Decode(i int) (*Decoded, error) {
	if i < 0 || i >= len(s.paths) {
		return nil, fmt.Errorf("frame %d: out of range (sequence has %d frames)", i, len(s.paths))
	}
	m, err := decodeImage(s.paths[i])
	if err != nil {
		return nil, fmt.Errorf("frame %d: %w", i, err)
	}
	return &Decoded{m: m, index: i, source: s.paths[i], size: &s.size,
		what: fmt.Sprintf("frame %d: read image %s", i, s.paths[i])}, nil
}

// Decode decodes frame i without widening it (Decoder). Frames are read
// in order from the video; an earlier frame than the last one read
// reopens it.
func (v *videoSequence) Decode(i int) (*Decoded, error) {
	if err := v.advance(i); err != nil {
		return nil, err
	}
	return v.decoded(i, v.mat.Clone()), nil
}

// decoded is frame i of the video held in m, which the Decoded owns only
// when its caller closes it (ReadInto keeps the sequence's own).
func (v *videoSequence) decoded(i int, m gocv.Mat) *Decoded {
	return &Decoded{m: m, index: i, source: v.Source(i), size: &v.size, what: fmt.Sprintf("frame %d (%s)", i, v.Source(i))}
}
