// Package progress shows how far long work has come: one bar per task on
// a terminal (several at once for a campaign, drawn by
// github.com/vbauerster/mpb), plain lines about every tenth of a task
// otherwise, so a log file gets a few lines, not a line per update.
//
// Rates are counted from a task's first report, so the first tick of a
// task whose first unit was already done shows no rate rather than a
// meaningless one.
package progress

import (
	"io"
	"os"
)

// Reporter shows the progress of named tasks ("front/track"). It is safe
// for concurrent use by the tests of a campaign.
type Reporter interface {
	// Update reports that done of total units of task are finished.
	Update(task string, done, total int)
	// Wait ends the display; unfinished tasks are left as they stand.
	Wait()
}

// New returns bars when w is a terminal and plain lines otherwise.
func New(w io.Writer) Reporter {
	if isTerminal(w) {
		return NewBars(w, false)
	}
	return NewLines(w)
}

// Task adapts one task of r to a done-of-total callback.
func Task(r Reporter, task string) func(done, total int) {
	return func(done, total int) { r.Update(task, done, total) }
}

// Discard is a Reporter that shows nothing.
var Discard Reporter = discard{}

type discard struct{}

func (discard) Update(string, int, int) {}
func (discard) Wait()                   {}

// isTerminal reports whether w is a character device (a terminal).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}
