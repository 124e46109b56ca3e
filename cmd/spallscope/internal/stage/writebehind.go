package stage

import "spallscope/dic"

// writeBehind writes a frame's field in a goroutine of its own while the
// next frame is tracked: formatting and writing a 20 MP run's field
// (200 000 points at a 10 px step) takes a few tenths of a second of one
// core, which the tracker leaves idle between frames. At most one write
// is in flight: start is called only after wait has returned the write
// before, so the fields are written in frame order and a failed write is
// seen before the next one starts.
type writeBehind struct {
	pending chan writtenField // the write in flight (nil: none)
}

// writtenField is the outcome of one write: the frame's index and the
// field as written to the fields folder, or the error that stopped it.
type writtenField struct {
	index int
	field *dic.Field
	err   error
}

// start runs write, the write of frame index, in its own goroutine.
// The write before must have been waited for.
func (w *writeBehind) start(index int, write func() (*dic.Field, error)) {
	c := make(chan writtenField, 1)
	w.pending = c
	go func() {
		f, err := write()
		c <- writtenField{index, f, err}
	}()
}

// wait waits for the write in flight and returns its outcome; ok is false
// when none was in flight.
func (w *writeBehind) wait() (out writtenField, ok bool) {
	if w.pending == nil {
		return writtenField{}, false
	}
	out = <-w.pending
	w.pending = nil
	return out, true
}
