package stage

import "fmt"

// Stopped is the error of a stage that stopped between frames because its
// context was done (an interrupt, a terminate signal, a deadline): the
// first Done of Total frames are finished and written whole; the frame it
// was about to start is not.
type Stopped struct {
	Stage       string
	Done, Total int
	// Cause is why the context ended (context.Cause).
	Cause error
}

func (e *Stopped) Error() string {
	return fmt.Sprintf("%s stopped after %d of %d frames: %v", e.Stage, e.Done, e.Total, e.Cause)
}

func (e *Stopped) Unwrap() error { return e.Cause }
