package stage

import (
	"os"
	"runtime"
	"runtime/debug"
	"sync"

	"spallscope/dic"
)

// lowGCPercent is the garbage collector's heap growth between
// collections while a stage over large arrays is live, in per cent of the
// live heap (Go's default, GOGC, is 100). Such a stage's live heap is
// frames, splines and fields held from frame to frame (587 MB at 20 MP
// and a 10 px step while tracking, measured: the reference, the frame
// read into one image, their two spline planes, the points' prepared sums
// and sample buffers); what a frame leaves behind is little more than its
// field, 33 MB. With the
// default the heap grows to twice the live size, 1.2 GB at 20 MP, to hold
// dead fields and photos between collections. A collection's work is the
// pointers it scans, a few MB here whatever the frame size, as frames,
// planes, fields and pixels hold none: measured at 20 MP, 10–15 ms of
// wall time and 5–8 ms of CPU a collection, about one a frame at 5 %
// while tracking, against 5–6 s a frame.
const lowGCPercent = 5

// lowGC counts the holders of the lowered growth (live trackers, the
// job's overlays), and holds the growth to restore when none is left.
var lowGC struct {
	sync.Mutex
	holders int
	restore int
}

// CollectOften sets the collector's growth to lowGCPercent until the
// returned function is called (once), unless GOGC is set in the
// environment (GOGC=100 keeps Go's default). Calls nest: the growth
// is restored when the last holder lets go. A tracker holds it until it
// is collected (collectOften), the job while it draws the overlays;
// stages over grid values alone keep Go's default, as at 5 % the
// collector's minimum heap shrinks too (4 MB × GOGC/100) and their small
// heaps were collected about three times as often (zones twice as slow,
// measured at 20 MP).
func CollectOften() (restore func()) {
	if _, set := os.LookupEnv("GOGC"); set {
		return func() {}
	}
	lowGC.Lock()
	if lowGC.holders == 0 {
		lowGC.restore = debug.SetGCPercent(lowGCPercent)
	}
	lowGC.holders++
	lowGC.Unlock()
	var once sync.Once
	return func() {
		once.Do(func() {
			lowGC.Lock()
			defer lowGC.Unlock()
			if lowGC.holders--; lowGC.holders == 0 {
				debug.SetGCPercent(lowGC.restore)
			}
		})
	}
}

// collectOften holds CollectOften's growth until tracker has been
// collected, not until the stage returns: restored while the caller still
// holds the tracker, the next collection's goal would be twice the
// tracker's live heap, which the next stage would fill on top of the dead
// tracker (measured: 1.27 GB at 20 MP, against 0.8 GB).
func collectOften(tracker *dic.Tracker) {
	restore := CollectOften()
	runtime.AddCleanup(tracker, func(restore func()) { restore() }, restore)
}
