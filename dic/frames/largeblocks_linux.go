//go:build linux

package frames

// #include <malloc.h>
import "C"

import "sync"

// largeBlocksOnce guards the allocator setting of returnLargeBlocks.
var largeBlocksOnce sync.Once

// returnLargeBlocks makes glibc's allocator map every block of 1 MB or
// more on its own and unmap it when it is freed, so that the memory of a
// decoded frame goes back to the system with the frame. A decoded 20 MP
// frame is one such block on OpenCV's side (20 MB at 8 bits, 40 MB at
// 16). glibc's default threshold for mapping a block alone rises to the
// size of the largest mapped block freed so far (up to 32 MB, mallopt(3)),
// after which frames are carved from the allocator's arenas instead; cgo
// calls from different threads use different arenas, and each arena kept
// its last frame: 76 MB of a 20 MP run's resident memory in three arenas
// (measured in /proc/PID/smaps). Setting the threshold fixes it (and turns
// the dynamic rise off). A mapping and its page faults cost about a
// millisecond a frame.
func returnLargeBlocks() {
	largeBlocksOnce.Do(func() { C.mallopt(C.M_MMAP_THRESHOLD, 1<<20) })
}
