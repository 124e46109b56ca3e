package export

import (
	"bufio"
	"errors"
	"fmt"

	"spallscope/dic/runfolder"
)

// errIncomplete is what a stack closed before its last frame reports; the
// partial file is then removed by the atomic write.
var errIncomplete = errors.New("npy: stack closed before its last frame")

// stack streams one (frames, rows, cols) NPY array to its file a frame at
// a time. The header, written first, states the final shape; each add
// appends one (rows, cols) plane. The file is written through
// runfolder.WriteAtomic in a goroutine that receives the planes, so it
// appears under its name only once every frame is in, and a stack closed
// early leaves nothing behind.
type stack struct {
	path   string
	dtype  string
	frames int
	planes chan []float64
	done   chan error // the atomic write's result, sent once
	err    error      // the result, once received
	ended  bool       // done was received
	closed bool       // planes was closed
}

// newStack starts writing the stack of frames planes of rows×cols values
// to path.
func newStack(path, dtype string, frames, rows, cols int) *stack {
	s := &stack{path: path, dtype: dtype, frames: frames, planes: make(chan []float64), done: make(chan error, 1)}
	go func() {
		s.done <- runfolder.WriteAtomic(path, func(w *bufio.Writer) error {
			h, err := npyHeader(dtype, []int{frames, rows, cols})
			if err != nil {
				return err
			}
			if _, err := w.Write(h); err != nil {
				return err
			}
			var buf []byte
			got := 0
			for p := range s.planes {
				if got == frames {
					return fmt.Errorf("npy: more than %d frames", frames)
				}
				if len(p) != rows*cols {
					return fmt.Errorf("npy: frame %d has %d values, expected %d×%d", got, len(p), rows, cols)
				}
				buf = appendValues(buf[:0], dtype, p)
				if _, err := w.Write(buf); err != nil {
					return err
				}
				got++
			}
			if got != frames {
				return fmt.Errorf("%w (%d of %d frames)", errIncomplete, got, frames)
			}
			return nil
		})
	}()
	return s
}

// add appends the next frame's plane. The stack keeps p: the caller must
// not change it afterwards. A write that already failed is reported here,
// so an export stops at the first full disk rather than at the end.
func (s *stack) add(p []float64) error {
	if s.closed {
		return fmt.Errorf("write %s: stack already closed", s.path)
	}
	if s.ended {
		return s.err // the write failed: it only ends early on an error
	}
	select {
	case s.planes <- p:
		return nil
	case s.err = <-s.done:
		s.ended = true
		return s.err
	}
}

// close ends the stack and returns the result of its write: nil when every
// frame was added and the file renamed into place, an error otherwise (and
// no file).
func (s *stack) close() error {
	if s.closed {
		return s.err
	}
	s.closed = true
	close(s.planes)
	if !s.ended {
		s.err = <-s.done
		s.ended = true
	}
	return s.err
}
