package progress

import (
	"fmt"
	"io"
	"sync"
	"time"
)

// Lines prints a task's progress as plain lines: at its first report,
// about every tenth of it, and at its end. No terminal control codes.
type Lines struct {
	w     io.Writer
	now   func() time.Time
	mu    sync.Mutex
	tasks map[string]*lineTask
}

type lineTask struct {
	total, tenth int
	rate         rate
}

// NewLines returns a Lines reporter writing to w.
func NewLines(w io.Writer) *Lines {
	return &Lines{w: w, now: time.Now, tasks: map[string]*lineTask{}}
}

// Update implements Reporter.
func (l *Lines) Update(task string, done, total int) {
	l.mu.Lock()
	defer l.mu.Unlock()
	now := l.now()
	t := l.tasks[task]
	if t == nil || t.total != total || done < t.rate.startDone {
		t = &lineTask{total: total, tenth: -1, rate: newRate(now, done)}
		l.tasks[task] = t
	}
	tenth := done * 10 / max(total, 1)
	if tenth == t.tenth && done != total {
		return
	}
	t.tenth = tenth
	fmt.Fprintf(l.w, "%s %d/%d  %s\n", task, done, total, t.rate.describe(now, done, total))
	if done == total {
		delete(l.tasks, task)
	}
}

// Wait implements Reporter.
func (l *Lines) Wait() {}
