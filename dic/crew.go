package dic

import (
	"runtime"
	"sync"
	"sync/atomic"
	"time"
)

// crew keeps a pool's other workers running for the length of one frame's
// correlation, so that a batch of jobs finds them awake. Propagation
// solves a frame in about 1,800 batches of a few hundred microseconds at
// 20 MP, with the caller's bookkeeping between them; a worker started per
// batch, or parked between batches, is woken by the operating system
// (a futex and, on a virtual machine, the halted virtual CPU), which was
// measured to take 250 µs a batch on a 2-core virtual machine: the second
// core sat idle for half of every solve. A crew member instead waits for
// the next batch by spinning, yielding its processor to any other
// goroutine that is ready (the frame decoded ahead, the field written
// behind), and parks only after a gap longer than spinFor, so that an
// idle tracker does not hold a core.
//
// Which worker solves a job does not change its result, so a crew changes
// the time of a frame, never its field.
type crew struct {
	batch   atomic.Pointer[batch] // the batch open for work (nil: none yet)
	quit    atomic.Bool
	members []member
	wg      sync.WaitGroup
}

// member is one crew goroutine's way to be woken once parked.
type member struct {
	parked atomic.Bool
	wake   chan struct{}
}

// spinFor is how long a crew member waits for the next batch by spinning
// before it parks: longer than the bookkeeping between two batches (tens
// of microseconds), short enough that a tracker between frames or busy
// with a serial step frees its cores at once in human terms.
const spinFor = 500 * time.Microsecond

// batch is one call's jobs, shared by the caller and the crew: work is
// run by each worker (0 the caller, k the crew's k-th member), which
// claims jobs through next until none is left, each job once. active
// counts the crew members inside the batch; once closed, no member enters
// it.
type batch struct {
	work   func(worker int, next *atomic.Int64)
	next   atomic.Int64
	active atomic.Int32
	closed atomic.Bool
}

// startCrew starts n members, each running work for the batches posted.
func startCrew(n int) *crew {
	c := &crew{members: make([]member, n)}
	for i := range c.members {
		m := &c.members[i]
		m.wake = make(chan struct{}, 1)
		c.wg.Go(func() { c.serve(m, i+1) })
	}
	return c
}

// serve is one member's loop: enter each new batch, spin between them,
// park after spinFor without one, stop on quit.
func (c *crew) serve(m *member, worker int) {
	var last *batch
	idleSince := time.Now()
	for spins := 0; ; spins++ {
		if b := c.batch.Load(); b != last && b != nil {
			last = b
			b.active.Add(1)
			if !b.closed.Load() {
				b.work(worker, &b.next)
			}
			b.active.Add(-1)
			idleSince, spins = time.Now(), 0
			continue
		}
		if c.quit.Load() {
			return
		}
		if spins%64 == 63 && time.Since(idleSince) > spinFor {
			c.park(m, last)
			idleSince, spins = time.Now(), 0
			continue
		}
		runtime.Gosched()
	}
}

// park blocks member m until a batch after last is posted or the crew
// stops. parked is set before the batch is looked at once more: a batch
// posted in between either sees parked and wakes m, or was posted before
// and is seen here.
func (c *crew) park(m *member, last *batch) {
	m.parked.Store(true)
	if b := c.batch.Load(); (b != last && b != nil) || c.quit.Load() {
		if m.parked.CompareAndSwap(true, false) {
			return // no poster saw parked
		}
	}
	<-m.wake
}

// run posts work for the crew, runs it on the calling goroutine too, and
// returns once every job is done: it closes the batch when the caller
// finds no job left, and waits for the members already inside. A member
// still waking when the batch closes skips it.
func (c *crew) run(work func(worker int, next *atomic.Int64)) {
	b := &batch{work: work}
	c.batch.Store(b)
	c.wakeParked()
	work(0, &b.next)
	b.closed.Store(true)
	for b.active.Load() != 0 {
		runtime.Gosched()
	}
}

// wakeParked wakes the members that have parked.
func (c *crew) wakeParked() {
	for i := range c.members {
		if m := &c.members[i]; m.parked.CompareAndSwap(true, false) {
			m.wake <- struct{}{}
		}
	}
}

// stop ends the crew and waits for its goroutines.
func (c *crew) stop() {
	c.quit.Store(true)
	c.wakeParked()
	c.wg.Wait()
}
