package job

import (
	"errors"
	"fmt"

	"spallscope/cmd/spallscope/internal/stage"
)

// Stopped is the error of a run stopped between frames because its
// context was done (Ctrl-C, a terminate signal from the shell or a
// cluster's scheduler): it says which stage stopped, what is kept, and
// that running the same command again resumes.
type Stopped struct {
	Dir   string
	Stage *stage.Stopped
}

func (e *Stopped) Error() string {
	s := e.Stage
	var kept string
	switch {
	case s.Stage == "track" && s.Total > 0:
		kept = fmt.Sprintf("the displacement fields of %d of %d frames are kept", s.Done, s.Total)
	case s.Total > 0:
		kept = fmt.Sprintf("the stages before %s are kept; %s starts again", s.Stage, s.Stage)
	default:
		kept = fmt.Sprintf("the stages before %s are kept", s.Stage)
	}
	return fmt.Sprintf("stopped (%v) in the %s stage: %s in %s, and no file is half-written; run the same command again to resume", s.Cause, s.Stage, kept, e.Dir)
}

func (e *Stopped) Unwrap() error { return e.Stage }

// IsStopped reports whether err is a run stopped by its context.
func IsStopped(err error) bool {
	var s *Stopped
	return errors.As(err, &s)
}

// stopped turns a stage's stop into the run's error.
func (r *testRun) stopped(s *stage.Stopped) error { return &Stopped{Dir: r.out, Stage: s} }
