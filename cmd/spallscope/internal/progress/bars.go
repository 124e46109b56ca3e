package progress

import (
	"io"
	"sync"
	"time"

	"github.com/vbauerster/mpb/v8"
	"github.com/vbauerster/mpb/v8/decor"
)

// Bars draws one bar per task on a terminal through mpb; a finished task's
// bar is removed, so a campaign shows the tasks under way.
type Bars struct {
	p     *mpb.Progress
	mu    sync.Mutex
	tasks map[string]*barTask
}

type barTask struct {
	bar   *mpb.Bar
	total int
	mu    sync.Mutex
	rate  rate
	done  int
}

// NewBars returns bars drawn on w; force draws them even when w is not a
// terminal (for tests).
func NewBars(w io.Writer, force bool) *Bars {
	opts := []mpb.ContainerOption{mpb.WithOutput(w), mpb.WithWidth(32), mpb.WithRefreshRate(150 * time.Millisecond)}
	if force {
		opts = append(opts, mpb.ForceTTY(), mpb.WithAutoRefresh())
	}
	return &Bars{p: mpb.New(opts...), tasks: map[string]*barTask{}}
}

// Update implements Reporter.
func (b *Bars) Update(task string, done, total int) {
	b.mu.Lock()
	t := b.tasks[task]
	if t == nil || t.total != total {
		if t != nil {
			t.bar.Abort(true)
		}
		t = &barTask{total: total, rate: newRate(time.Now(), done)}
		t.bar = b.p.AddBar(int64(max(total, 1)),
			mpb.BarRemoveOnComplete(),
			mpb.PrependDecorators(decor.Name(task, decor.WCSyncSpaceR), decor.CountersNoUnit("%d/%d", decor.WCSyncSpace)),
			mpb.AppendDecorators(decor.Any(func(decor.Statistics) string {
				t.mu.Lock()
				defer t.mu.Unlock()
				return t.rate.describe(time.Now(), t.done, t.total)
			}, decor.WCSyncSpace)))
		b.tasks[task] = t
	}
	b.mu.Unlock()
	t.mu.Lock()
	t.done = done
	t.mu.Unlock()
	t.bar.SetCurrent(int64(done))
	if done >= total {
		b.mu.Lock()
		delete(b.tasks, task)
		b.mu.Unlock()
	}
}

// Wait implements Reporter: bars of unfinished tasks stop where they
// stand, and the display ends.
func (b *Bars) Wait() {
	b.mu.Lock()
	for name, t := range b.tasks {
		t.bar.Abort(false)
		delete(b.tasks, name)
	}
	b.mu.Unlock()
	b.p.Wait()
}
