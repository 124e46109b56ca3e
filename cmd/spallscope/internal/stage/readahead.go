package stage

import (
	"spallscope/dic/frames"
	"spallscope/subset"
)

// readAhead decodes the next frame of a sequence in a goroutine of its
// own while the current frame is tracked: decoding a 20 MP PNG takes
// about half a second of one core, which the tracker, parallel on all
// cores, leaves idle between frames. The frame read ahead is held as it
// decodes (frames.Decoded: 20–40 MB at 20 MP), not as the tracker's
// float32 image (80 MB); it is widened into the run's one image on the
// stage's goroutine, when the frame before is done. At most one frame is
// decoded at a time; stop waits for it, so no goroutine outlives the
// stage.
type readAhead struct {
	seq     frames.Sequence
	pending chan decodedFrame // the frame being decoded (nil: none)
	index   int               // its index
}

// decodedFrame is the outcome of decoding one frame.
type decodedFrame struct {
	d   *frames.Decoded
	err error
}

// start begins decoding frame i, if the sequence has it and no frame is
// being decoded.
func (r *readAhead) start(i int) {
	if r.pending != nil || i < 0 || i >= r.seq.Len() {
		return
	}
	c := make(chan decodedFrame, 1)
	r.pending, r.index = c, i
	go func() {
		d, err := frames.Decode(r.seq, i)
		c <- decodedFrame{d, err}
	}()
}

// read returns frame i widened into dst's storage (frames.Decoded.Into):
// the frame decoded ahead when it is frame i, else decoded now.
func (r *readAhead) read(i int, dst *subset.Image) (*subset.Image, error) {
	var f decodedFrame
	if r.pending != nil && r.index == i {
		f = <-r.pending
		r.pending = nil
	} else {
		r.stop()
		f.d, f.err = frames.Decode(r.seq, i)
	}
	if f.err != nil {
		return nil, f.err
	}
	defer f.d.Close()
	return f.d.Into(dst)
}

// stop waits for the frame being decoded, if any, and lets go of it.
func (r *readAhead) stop() {
	if r.pending == nil {
		return
	}
	if f := <-r.pending; f.d != nil {
		f.d.Close()
	}
	r.pending = nil
}
